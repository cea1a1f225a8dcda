/**
 * Resampling onto an evenly spaced x grid by straight-line interpolation.
 */
import { interpolateLinear } from '../numeric/interpolate.ts';
import { MIN_POINTS } from '../trace.ts';
import type { Signal, StepDefinition, StepOutput } from './types.ts';

/** Most points the resample step will produce. */
export const RESAMPLE_MAX_POINTS = 20_000_000;

/**
 * Linear interpolation of (x, y) onto `count` evenly spaced points from x[0]
 * to x[n−1] inclusive; the ends are kept exactly and the last grid point is
 * set to x[n−1] itself so rounding cannot push it outside the data.
 * @param x strictly ascending x (not changed), at least 2 points.
 * @param y samples, same length (not changed).
 * @param count number of output points, whole number ≥ 2.
 * @throws RangeError for unequal lengths, fewer than 2 points, or a bad count.
 */
export function resampleLinear(x: Float64Array, y: Float64Array, count: number): { x: Float64Array; y: Float64Array } {
  if (x.length !== y.length) throw new RangeError(`x has ${x.length} values but y has ${y.length}.`);
  if (x.length < 2) throw new RangeError('Resampling needs at least 2 points.');
  if (!Number.isInteger(count) || count < 2) throw new RangeError(`The number of points must be a whole number ≥ 2 (got ${count}).`);
  const n = x.length;
  const x0 = x[0];
  const x1 = x[n - 1];
  const grid = new Float64Array(count);
  const step = (x1 - x0) / (count - 1);
  for (let i = 0; i < count; i++) grid[i] = x0 + i * step;
  grid[count - 1] = x1;
  return { x: grid, y: interpolateLinear(x, y, grid) };
}

export type ResampleParams = {
  /** Output points; 0 means as many as the input. */
  points: number;
};

/** The resample step. */
export const resampleStep: StepDefinition<ResampleParams> = {
  id: 'resample',
  label: 'Resample to even spacing',
  summary:
    'Puts the trace onto evenly spaced x from the first to the last x, reading each new point off the straight line between its two measured neighbours. ' +
    'It is needed before the steps that assume even spacing (Savitzky–Golay, frequency filter, local-order fit) when the instrument logged uneven times. ' +
    'Straight-line interpolation slightly lowers and broadens sharp peak tops, and using fewer points than measured loses detail narrower than the new step.',
  params: [
    {
      key: 'points', label: 'Number of points', kind: 'int', unit: 'count', min: 0, max: RESAMPLE_MAX_POINTS,
      help: `Points in the resampled trace, spread evenly from the first to the last x; 0 keeps the same number as the input. At least ${MIN_POINTS}.`,
    },
  ],
  defaults: { points: 0 },
  validate(params) {
    const m = params.points;
    if (typeof m !== 'number' || Number.isNaN(m)) return 'The number of points is not a number; enter a whole number, or 0 to keep the input count.';
    if (!Number.isFinite(m) || !Number.isInteger(m)) return `The number of points must be a whole number, not ${m}.`;
    if (m < 0) return `The number of points cannot be negative (got ${m}); use 0 to keep the input count.`;
    if (m !== 0 && m < MIN_POINTS) return `A trace needs at least ${MIN_POINTS} points (got ${m}); use 0 to keep the input count.`;
    if (m > RESAMPLE_MAX_POINTS) return `The number of points may be at most ${RESAMPLE_MAX_POINTS} (got ${m}).`;
    return null;
  },
  apply(input: Signal, params): StepOutput {
    const n = input.y.length;
    const count = params.points === 0 ? n : params.points;
    const r = resampleLinear(input.x, input.y, count);
    const step = (input.x[n - 1] - input.x[0]) / (count - 1);
    const notes = [`${n} points interpolated onto ${count} evenly spaced points, step ${step.toPrecision(6)} x-units.`];
    if (count < n) notes.push(`Fewer points than measured: detail narrower than about ${(2 * step).toPrecision(3)} x-units can be lost.`);
    return { x: r.x, y: r.y, notes };
  },
};
