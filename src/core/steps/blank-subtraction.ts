/**
 * Blank subtraction: take a measured blank (the same method run without the
 * analyte) away from the sample, point by point.
 */
import type { Signal, StepDefinition } from './types.ts';
import { interpolateLinear } from '../numeric/interpolate.ts';

export interface BlankSubtractionParams extends Record<string, number> {
  /** Factor the blank is multiplied by before subtraction (ratio). */
  scale: number;
}

/** A number as a short string for messages (6 significant digits). */
export function formatNumber(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(6))) : String(v);
}

/** True when both grids have the same length and every x is exactly equal. */
export function sameGrid(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * Explain why a second trace (blank, scan) cannot be put on the target's x
 * grid without extrapolating, or return null when it covers the whole grid.
 * @param target the x grid that must be covered (ascending)
 * @param other the x grid of the trace to be interpolated (ascending)
 * @param what how to name the other trace in the message, e.g. "the blank"
 */
export function gridCoverageProblem(target: Float64Array, other: Float64Array, what: string): string | null {
  const s0 = target[0], s1 = target[target.length - 1];
  const b0 = other[0], b1 = other[other.length - 1];
  const ranges = `the sample runs from x = ${formatNumber(s0)} to ${formatNumber(s1)}, ${what} from ${formatNumber(b0)} to ${formatNumber(b1)}`;
  if (b1 < s0 || b0 > s1) return `The sample and ${what} do not overlap: ${ranges}. Load ${what} measured over the same range.`;
  const parts: string[] = [];
  if (b0 > s0) parts.push(`x = ${formatNumber(s0)} to ${formatNumber(b0)}`);
  if (b1 < s1) parts.push(`x = ${formatNumber(b1)} to ${formatNumber(s1)}`);
  if (parts.length > 0) {
    return `${capitalise(what)} does not cover the sample from ${parts.join(' and from ')} (${ranges}); values there would have to be invented by extrapolation, so the step refuses. Keep the common range with the "Keep an x-range (trim)" step before this one, or load ${what} that covers it.`;
  }
  return null;
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/**
 * Sample minus scale·blank on the sample's grid. When the grids are equal the
 * blank is used as it is; otherwise it is linearly interpolated onto the
 * sample's x (never extrapolated: call {@link gridCoverageProblem} first).
 * @param sample x ascending; not changed
 * @param blank x ascending; not changed
 * @param scale factor (ratio) applied to the blank, default 1
 * @returns y of the difference (new array) and whether interpolation was used
 * @throws RangeError when the blank does not cover the sample's x range or scale is not finite
 */
export function subtractBlank(sample: Signal, blank: Signal, scale = 1): { y: Float64Array; interpolated: boolean } {
  if (!Number.isFinite(scale)) throw new RangeError(`The blank scale factor must be a finite number, not ${scale}.`);
  const interpolated = !sameGrid(sample.x, blank.x);
  if (interpolated) {
    const problem = gridCoverageProblem(sample.x, blank.x, 'the blank');
    if (problem) throw new RangeError(problem);
  }
  const b = interpolated ? interpolateLinear(blank.x, blank.y, sample.x) : blank.y;
  const y = new Float64Array(sample.y.length);
  for (let i = 0; i < y.length; i++) y[i] = sample.y[i] - scale * b[i];
  return { y, interpolated };
}

export const blankSubtractionStep: StepDefinition<BlankSubtractionParams> = {
  id: 'blank-subtraction',
  linear: true,
  label: 'Subtract blank',
  summary:
    'Subtracts the trace you marked as blank, times a scale factor, from the signal point by point. ' +
    'It removes what the solvent, cell or system adds on its own, such as drift or a fixed band. ' +
    'The blank goes through every step above this one with the same settings, as the signal does, and is subtracted from each repeated scan too. ' +
    'The blank\'s own noise is added to the result, and anything in the blank that is really in the sample too is removed with it.',
  params: [
    {
      key: 'scale', label: 'Blank scale factor', kind: 'number', unit: 'ratio', min: 0, max: 10, step: 0.01,
      help: 'The blank is multiplied by this before subtraction; 1 subtracts it as measured.',
    },
  ],
  defaults: { scale: 1 },
  validate(params, input, ctx) {
    const { scale } = params;
    if (typeof scale !== 'number' || !Number.isFinite(scale)) return 'The blank scale factor is not a number; give a value from 0 to 10 (1 subtracts the blank as measured).';
    if (scale < 0 || scale > 10) return `The blank scale factor must be from 0 to 10, not ${formatNumber(scale)}.`;
    if (!ctx.blank) return 'There is no blank: mark a loaded trace as blank to use this step.';
    if (sameGrid(input.x, ctx.blank.x)) return null;
    return gridCoverageProblem(input.x, ctx.blank.x, 'the blank');
  },
  apply(input, params, ctx) {
    const blank = ctx.blank;
    if (!blank) throw new RangeError('There is no blank: mark a loaded trace as blank to use this step.');
    const { y, interpolated } = subtractBlank(input, blank, params.scale);
    const notes = [`Subtracted ${params.scale === 1 ? 'the blank' : `${formatNumber(params.scale)} × the blank`} "${blank.name}".`];
    if (interpolated) notes.push('The blank was measured on different x values; it was interpolated linearly onto the sample\'s x before subtraction.');
    return { x: input.x, y, notes };
  },
};
