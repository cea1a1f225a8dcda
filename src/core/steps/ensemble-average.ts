/**
 * Ensemble averaging: the mean of repeated scans of the same sample, point by point.
 */
import type { StepDefinition, StepOutput } from './types.ts';
import { interpolateLinear, isEvenlySpaced, meanStep, sameGrid } from '../numeric/interpolate.ts';
import { estimateShift, correlationAtLag, shiftSeries, type ShiftInterpolation } from '../numeric/align.ts';
import { formatNumber, gridCoverageProblem } from './checks.ts';
import { robustSigmaOfDifferences } from '../numeric/median.ts';

export interface EnsembleAverageParams extends Record<string, number | string | boolean> {
  /** Align each scan to the signal before averaging. */
  align: boolean;
  /** Largest shift tried, points. */
  maxShift: number;
  /** How a scan is moved by a fraction of a point. */
  interpolation: ShiftInterpolation;
  /** A scan correlating less than this with the signal (after alignment) is named (ratio, Pearson r). */
  minCorrelation: number;
}

/**
 * Robust white-noise SD from point-to-point differences:
 * 1.4826·MAD(Δy)/√2. Differencing removes slow signal; the √2 undoes the
 * doubling of variance that differencing causes for white noise; 1.4826·MAD
 * is the Gaussian-consistent SD (Hampel 1974). Common practice.
 * @param y signal with at least 3 points; not changed
 */
export function noiseFromDifferences(y: Float64Array): number {
  if (y.length < 3) throw new RangeError(`A noise estimate needs at least 3 points; there are ${y.length}.`);
  const d = new Float64Array(y.length - 1);
  for (let i = 0; i < d.length; i++) d[i] = y[i + 1] - y[i];
  return robustSigmaOfDifferences(d, Math.SQRT2);
}

/** A shift in words: points and x-units. */
function formatShift(s: number, dx: number, xUnit: string): string {
  const sign = s > 0 ? '+' : s < 0 ? '−' : '';
  return `${sign}${Math.abs(s).toFixed(2)} points (${sign}${Number(Math.abs(s * dx).toPrecision(3))}${xUnit ? ` ${xUnit}` : ' in x'})`;
}

export const ensembleAverageStep: StepDefinition<EnsembleAverageParams> = {
  id: 'ensemble-average',
  // Aligning decides each shift from the data, so the step is linear only without it.
  linear: (params) => params.align !== true,
  label: 'Average repeated scans',
  summary:
    'Replaces the signal by the point-by-point mean of itself and every trace you marked as a repeated scan, on the signal\'s x values. ' +
    'Random noise drops by about √n for n scans while anything that repeats in every scan is kept. ' +
    'The scans go through every step above this one with the same settings, as the signal does. Anything that changes between scans (drift, a shifted peak) is blurred unless the scans are aligned first.',
  params: [
    {
      key: 'align', label: 'Align each scan to the signal first', kind: 'boolean', unit: 'none',
      help: 'Moves each scan by the shift that best matches it to the signal (cross-correlation, refined below one point) before averaging. Off by default so that methods saved before alignment existed give the same numbers.',
    },
    { key: 'maxShift', label: 'Largest shift', kind: 'int', unit: 'points', min: 1, max: 500, help: 'Shifts up to this many points either way are tried.' },
    {
      key: 'interpolation', label: 'Moving by part of a point', kind: 'choice', unit: 'none',
      choices: [
        { value: 'sinc', label: 'windowed sinc (keeps heights best)' },
        { value: 'cubic', label: 'cubic' },
      ],
      help: 'How a scan is moved by a fraction of a point. At a half-point shift a peak of σ = 1 point keeps 99.8 % of its height with the windowed sinc, 97.1 % with cubic and 91.0 % with straight lines between points.',
    },
    {
      key: 'minCorrelation', label: 'Name scans correlating below', kind: 'number', unit: 'ratio', min: 0, max: 1, step: 0.01,
      help: 'A scan whose correlation with the signal (after alignment) is below this is named, so you can check it or leave it out. Noise lowers the correlation of a good scan too: r is about S²/(S² + σ²), S the spread of the signal, σ the noise.',
    },
  ],
  defaults: { align: false, maxShift: 10, interpolation: 'sinc', minCorrelation: 0.8 },
  validate(params, input, ctx) {
    const scans = ctx.scans ?? [];
    if (scans.length === 0) return 'There are no repeated scans: mark the other loaded scans of this sample as scans to average them.';
    if (params.align === true) {
      if (!Number.isInteger(params.maxShift) || params.maxShift < 1) return `The largest shift must be a whole number of points, at least 1, not ${String(params.maxShift)}.`;
      if (params.maxShift >= input.x.length / 2) return `The largest shift (${params.maxShift} points) must be less than half the trace (${input.x.length} points).`;
      if (!isEvenlySpaced(input.x)) return 'Aligning scans shifts them by points, which assumes evenly spaced x, and these x values are not. Add the step "Resample to even spacing" before it, or turn alignment off.';
    }
    for (const scan of scans) {
      if (sameGrid(input.x, scan.x)) continue;
      const problem = gridCoverageProblem(input.x, scan.x, `the scan "${scan.name}"`);
      if (problem) return problem;
    }
    return null;
  },
  apply(input, params, ctx): StepOutput {
    const scans = ctx.scans ?? [];
    const n = input.y.length;
    const sum = Float64Array.from(input.y);
    let count = 1;
    let interpolatedCount = 0;
    const notes: string[] = [];
    const align = params.align === true;
    const kind: ShiftInterpolation = params.interpolation === 'cubic' ? 'cubic' : 'sinc';
    const minR = typeof params.minCorrelation === 'number' ? params.minCorrelation : 0.8;
    const dx = meanStep(input.x);
    // Per scan, in the order of ctx.scans (NaN for a scan counted once as the signal itself): what a panel lists.
    const shifts = new Float64Array(scans.length).fill(NaN);
    const correlations = new Float64Array(scans.length).fill(NaN);
    const perScan: string[] = [];
    const poor: string[] = [];
    const atLimit: string[] = [];
    scans.forEach((scan, k) => {
      const equalGrid = sameGrid(input.x, scan.x);
      // A scan that is the signal itself (the sample also marked as a scan) would be counted twice.
      if (equalGrid && sameGrid(input.y, scan.y)) {
        notes.push(`The scan "${scan.name}" is identical to the signal; it was counted once.`);
        return;
      }
      let ys = scan.y;
      if (!equalGrid) {
        const problem = gridCoverageProblem(input.x, scan.x, `the scan "${scan.name}"`);
        if (problem) throw new RangeError(problem);
        ys = interpolateLinear(scan.x, scan.y, input.x);
        interpolatedCount++;
      }
      if (align) {
        const est = estimateShift(input.y, ys, Math.round(params.maxShift), kind);
        shifts[k] = est.shift;
        correlations[k] = est.correlation;
        if (est.atLimit) atLimit.push(scan.name);
        if (est.shift !== 0) ys = shiftSeries(ys, est.shift, kind);
        perScan.push(`"${scan.name}" ${formatShift(est.shift, dx, scan.xUnit)}, r ${est.correlation.toFixed(3)}`);
      } else {
        correlations[k] = correlationAtLag(input.y, ys, 0);
      }
      if (!(correlations[k] >= minR)) poor.push(`"${scan.name}" (r ${Number.isFinite(correlations[k]) ? correlations[k].toFixed(3) : 'not measurable'})`);
      for (let i = 0; i < n; i++) sum[i] += ys[i];
      count++;
    });
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) y[i] = sum[i] / count;
    const noiseBefore = noiseFromDifferences(input.y);
    const noiseAfter = noiseFromDifferences(y);
    const expectedGain = Math.sqrt(count);
    const measuredGain = noiseAfter > 0 ? noiseBefore / noiseAfter : Infinity;
    notes.unshift(
      `Averaged ${count} scans (the signal and ${count - 1} marked scan${count === 2 ? '' : 's'}): for independent random noise the noise should fall by √${count} = ${formatNumber(expectedGain)}; measured from point-to-point differences it fell by ${formatNumber(measuredGain)}.`,
    );
    if (interpolatedCount > 0) notes.push(`${interpolatedCount} scan(s) had different x values and were interpolated linearly onto the signal's x.`);
    let largest = 0;
    for (const v of shifts) if (Number.isFinite(v)) largest = Math.max(largest, Math.abs(v));
    if (align) {
      notes.push(`Each scan was aligned to the signal before averaging (the shift of best cross-correlation within ±${params.maxShift} points, refined below one point by a parabola through the correlation peak, moved by ${kind === 'sinc' ? 'windowed-sinc' : 'cubic'} interpolation; the first or last points a shift uncovers repeat the scan's end value). Shifts (positive: the scan ran later than the signal) and correlation with the signal after alignment: ${perScan.join('; ')}.`);
      if (atLimit.length) notes.push(`The best shift of ${atLimit.map((a) => `"${a}"`).join(', ')} lies at the largest shift tried (±${params.maxShift} points): the true shift may be larger; raise the largest shift.`);
    } else {
      notes.push('The scans were averaged as they are, without alignment: a peak that moves between scans is blurred.');
    }
    if (poor.length) notes.push(`Correlating poorly with the signal (r below ${minR}${align ? ' after alignment' : ''}): ${poor.join(', ')}. Check ${poor.length === 1 ? 'it' : 'them'}, or leave ${poor.length === 1 ? 'it' : 'them'} out.`);
    return {
      x: input.x,
      y,
      notes,
      figures: { n: count, expectedGain, noiseBefore, noiseAfter, measuredGain, ...(align ? { largestShiftPoints: largest } : {}), poorlyCorrelated: poor.length },
      extra: { scanShift: shifts, scanCorrelation: correlations },
    };
  },
};
