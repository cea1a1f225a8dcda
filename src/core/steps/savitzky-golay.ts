/**
 * Savitzky–Golay smoothing and derivatives as a processing step.
 *
 * Why not ml-savitzky-golay for everything: version 5.0.0 defaults to the
 * first derivative, returns n − window + 1 points unless asked to pad, and
 * pads by copying values (its 'replicate', 'circular', 'symmetric' modes)
 * after filtering instead of fitting the end windows. Our default keeps
 * every point and fits the ends ('interp', as SciPy), so polynomials up to
 * the chosen order pass unchanged right to the last point. We therefore
 * compute weights and edges ourselves (src/core/numeric/savgol.ts) and the
 * tests check our interior values against ml-savitzky-golay with an
 * explicit derivative.
 */
import { savgolCoefficients, savitzkyGolay } from '../numeric/savgol.ts';
import type { SavgolMode } from '../numeric/savgol.ts';
import { meanStep } from '../numeric/interpolate.ts';
import { checkOddWindow } from './checks.ts';
import type { Signal, StepDefinition, StepOutput } from './types.ts';

export { savgolCoefficients, savitzkyGolay };
export type { SavgolMode, SavgolOptions } from '../numeric/savgol.ts';

/** Largest window the step accepts, in points (cost grows as points × window). */
export const SAVGOL_MAX_WINDOW = 2001;
/** Highest polynomial order the step accepts. */
export const SAVGOL_MAX_ORDER = 6;

const MODES: readonly SavgolMode[] = ['interp', 'mirror', 'nearest', 'constant', 'wrap'];

/**
 * White-noise gain of a linear filter: √Σc², the factor by which the SD of
 * uncorrelated noise is multiplied (e.g. 0.6969 for the 5-point quadratic;
 * weights of Savitzky & Golay 1964, Anal. Chem. 36:1627, as corrected by
 * Steinier, Termonia & Deltour 1972, Anal. Chem. 44:1906).
 */
export function noiseGain(c: Float64Array): number {
  let s = 0;
  for (let k = 0; k < c.length; k++) s += c[k] * c[k];
  return Math.sqrt(s);
}

export type SavitzkyGolayParams = {
  /** Odd number of points in each fit. */
  window: number;
  /** Polynomial order 0…6, below the window. */
  order: number;
  /** 0 smooths; 1 or 2 gives that derivative in y-units per x-unit (per x-unit²). */
  derivative: number;
  edge: SavgolMode;
};

/** The Savitzky–Golay step. */
export const savitzkyGolayStep: StepDefinition<SavitzkyGolayParams> = {
  id: 'savitzky-golay',
  linear: true,
  label: 'Savitzky–Golay',
  summary:
    'Fits a polynomial by least squares to the window around each point and replaces the point by the fitted value (or its first or second derivative). ' +
    'It keeps peak heights and widths much better than a moving average of the same width, especially with order 4, and suits peaks several windows wide. ' +
    'A window wider than about one peak half-height width still lowers and broadens peaks, higher orders remove less noise, and narrow spikes or small shoulders can be erased or turned into ripples.',
  params: [
    {
      key: 'window', label: 'Window', kind: 'int', unit: 'points', min: 3, max: SAVGOL_MAX_WINDOW, step: 2, odd: true,
      help: 'Odd number of points in each local fit; about one peak half-height width is a common choice.',
    },
    {
      key: 'order', label: 'Polynomial order', kind: 'int', unit: 'count', min: 0, max: SAVGOL_MAX_ORDER,
      help: 'Degree of the fitted polynomial, below the window; 2 is usual, 4 keeps narrow peaks better but removes less noise.',
    },
    {
      key: 'derivative', label: 'Derivative', kind: 'int', unit: 'count', min: 0, max: 2,
      help: '0 smooths; 1 or 2 returns that derivative of the fit, divided by the mean x step to the power of the derivative.',
    },
    {
      key: 'edge', label: 'At the ends', kind: 'choice', unit: 'none',
      choices: [
        { value: 'interp', label: 'fit the end windows (default)' },
        { value: 'mirror', label: 'mirror the data' },
        { value: 'nearest', label: 'repeat the end value' },
        { value: 'constant', label: 'pad with zeros' },
        { value: 'wrap', label: 'wrap around' },
      ],
      help: 'Fit the end windows: the polynomial fitted to the first (last) window gives the outer half-window of points. The other choices make up data past the ends and filter it as usual.',
    },
  ],
  defaults: { window: 11, order: 2, derivative: 0, edge: 'interp' },
  needsEvenSpacing: true,
  validate(params, input) {
    const w = checkOddWindow(params.window, input.y.length, SAVGOL_MAX_WINDOW);
    if (w) return w;
    const o = params.order;
    if (typeof o !== 'number' || !Number.isInteger(o) || o < 0 || o > SAVGOL_MAX_ORDER) {
      return `The polynomial order must be a whole number from 0 to ${SAVGOL_MAX_ORDER} (got ${o}).`;
    }
    if (o >= params.window) return `The polynomial order (${o}) must be smaller than the window (${params.window} points).`;
    const d = params.derivative;
    if (typeof d !== 'number' || !Number.isInteger(d) || d < 0 || d > 2) return `The derivative must be 0, 1 or 2 (got ${d}).`;
    if (d > o) return `A polynomial of order ${o} has no derivative of order ${d}; raise the order to at least ${d}.`;
    if (!MODES.includes(params.edge)) return `Unknown end handling "${String(params.edge)}"; choose one of ${MODES.join(', ')}.`;
    return null;
  },
  apply(input: Signal, params): StepOutput {
    const dx = meanStep(input.x);
    const y = savitzkyGolay(input.y, params.window, params.order, { deriv: params.derivative, delta: dx, mode: params.edge });
    const notes: string[] = [];
    const figures: Record<string, number> = {};
    if (params.derivative === 0) {
      const g = noiseGain(savgolCoefficients(params.window, params.order, 0));
      figures.noiseGain = g;
      notes.push(`Order ${params.order} over ${params.window} points: white noise SD expected to be multiplied by ${g.toFixed(3)}.`);
    } else {
      notes.push(`Derivative ${params.derivative} of an order-${params.order} fit over ${params.window} points, in y-units per x-unit${params.derivative === 2 ? '²' : ''} (mean step ${dx.toPrecision(6)}).`);
    }
    if (params.edge !== 'interp') notes.push(`The outer ${(params.window - 1) / 2} points at each end use made-up data ("${params.edge}").`);
    return { x: Float64Array.from(input.x), y, notes, figures };
  },
};
