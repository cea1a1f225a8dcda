/**
 * Boxcar averaging: non-overlapping groups of points, each replaced by one
 * point (the mean), so the trace gets shorter.
 */
import { MIN_POINTS } from '../trace.ts';
import type { Signal, StepDefinition, StepOutput } from './types.ts';

/** What happens to the points left over when n is not a multiple of the group size. */
export type BoxcarTail = 'drop' | 'keep';

/** Largest group size the step accepts, in points. */
export const BOXCAR_MAX_GROUP = 100000;

/**
 * Boxcar average: consecutive, non-overlapping groups of `size` points, each
 * replaced by the mean of its y at the mean of its x (the group's centre).
 * n points give floor(n/size) points; a trailing part-group of r = n mod size
 * points is dropped ('drop', default) or kept as the mean of its r points
 * ('keep', giving ceil(n/size) points). Works on uneven x.
 * @param x ascending x (not changed).
 * @param y samples, same length (not changed).
 * @param size points per group, whole number ≥ 1.
 * @param tail 'drop' (default) or 'keep'.
 * @returns new x and y, plus the number of trailing points dropped (0 with 'keep').
 * @throws RangeError for a bad size, unequal lengths, or a size larger than the data.
 */
export function boxcarAverage(
  x: Float64Array,
  y: Float64Array,
  size: number,
  tail: BoxcarTail = 'drop',
): { x: Float64Array; y: Float64Array; dropped: number } {
  if (x.length !== y.length) throw new RangeError(`x has ${x.length} values but y has ${y.length}.`);
  if (!Number.isInteger(size) || size < 1) throw new RangeError(`The group size must be a whole number of points ≥ 1 (got ${size}).`);
  if (tail !== 'drop' && tail !== 'keep') throw new RangeError(`Unknown tail handling "${String(tail)}"; choose drop or keep.`);
  const n = y.length;
  if (size > n) throw new RangeError(`The group size (${size} points) is larger than the data (${n} points).`);
  const full = Math.floor(n / size);
  const rest = n - full * size;
  const count = tail === 'keep' && rest > 0 ? full + 1 : full;
  const ox = new Float64Array(count);
  const oy = new Float64Array(count);
  for (let g = 0; g < count; g++) {
    const start = g * size;
    const end = Math.min(start + size, n);
    let sx = 0;
    let sy = 0;
    for (let i = start; i < end; i++) {
      sx += x[i];
      sy += y[i];
    }
    ox[g] = sx / (end - start);
    oy[g] = sy / (end - start);
  }
  return { x: ox, y: oy, dropped: tail === 'keep' ? 0 : rest };
}

export type BoxcarParams = {
  /** Points per group. */
  size: number;
  tail: BoxcarTail;
};

/** The boxcar-averaging step. */
export const boxcarStep: StepDefinition<BoxcarParams> = {
  id: 'boxcar',
  label: 'Boxcar average',
  summary:
    'Splits the trace into consecutive groups of k points and replaces each group by one point, its mean, placed at the mean x of the group. ' +
    'It cuts noise by about √k and makes long traces k times shorter, which helps when the trace is sampled far more finely than its narrowest peak. ' +
    'Any feature narrower than a group is averaged away, peak tops are flattened, and the point count and spacing change for every later step.',
  params: [
    {
      key: 'size', label: 'Points per group', kind: 'int', unit: 'points', min: 2, max: BOXCAR_MAX_GROUP,
      help: 'Number of consecutive points averaged into one output point; the result has about n / size points.',
    },
    {
      key: 'tail', label: 'Left-over points', kind: 'choice', unit: 'none',
      choices: [
        { value: 'drop', label: 'drop them (default)' },
        { value: 'keep', label: 'keep their mean' },
      ],
      help: 'When the number of points is not a multiple of the group size, the last few points form a short group: drop it, or keep it as the mean of the points it has (noisier than the others).',
    },
  ],
  defaults: { size: 4, tail: 'drop' },
  validate(params, input) {
    const k = params.size;
    const n = input.y.length;
    if (typeof k !== 'number' || Number.isNaN(k)) return 'The group size is not a number; enter a whole number of points such as 4.';
    if (!Number.isFinite(k) || !Number.isInteger(k)) return `The group size must be a whole number of points, not ${k}.`;
    if (k < 2) return `The group size must be at least 2 points (got ${k}); 1 would change nothing.`;
    if (k > BOXCAR_MAX_GROUP) return `The group size may be at most ${BOXCAR_MAX_GROUP} points (got ${k}).`;
    if (k > n) return `The group size (${k} points) is larger than the trace (${n} points).`;
    if (params.tail !== 'drop' && params.tail !== 'keep') return `Unknown handling of left-over points "${String(params.tail)}"; choose drop or keep.`;
    const out = params.tail === 'keep' ? Math.ceil(n / k) : Math.floor(n / k);
    if (out < MIN_POINTS) {
      return `Groups of ${k} would leave only ${out} point(s) of ${n}; a trace needs at least ${MIN_POINTS}, so use groups of at most ${Math.floor(n / MIN_POINTS)}.`;
    }
    return null;
  },
  apply(input: Signal, params): StepOutput {
    const r = boxcarAverage(input.x, input.y, params.size, params.tail);
    const n = input.y.length;
    const rest = n % params.size;
    const notes = [`${n} points averaged in groups of ${params.size}: ${r.y.length} points out.`];
    if (rest === 0) notes.push('The points divided evenly into groups; nothing was left over.');
    else if (params.tail === 'drop') notes.push(`The last ${rest} point(s) did not fill a group and were dropped.`);
    else notes.push(`The last output point is the mean of only ${rest} point(s), so it is noisier than the others.`);
    return { x: r.x, y: r.y, notes, figures: { pointsIn: n, pointsOut: r.y.length, pointsDropped: r.dropped } };
  },
};
