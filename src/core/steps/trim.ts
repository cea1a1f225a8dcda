/**
 * Keep one x-range (issue 17): the points of the trace from one x to
 * another, the rest left out of everything after this step. Nothing is
 * interpolated or changed inside the range.
 */
import { lowerBound } from '../numeric/decimate.ts';
import { MIN_POINTS } from '../trace.ts';
import type { Signal, StepDefinition, StepOutput } from './types.ts';

export type TrimParams = {
  /** One [from, to] range in x-units. */
  range: [number, number][];
};

const fmt = (v: number) => String(Number(v.toPrecision(6)));

/** Indices [i0, i1) of the points with from ≤ x ≤ to. */
function span(x: Float64Array, from: number, to: number): [number, number] {
  const i0 = lowerBound(x, from);
  let i1 = lowerBound(x, to);
  while (i1 < x.length && x[i1] <= to) i1++;
  return [i0, i1];
}

export const trimStep: StepDefinition<TrimParams> = {
  id: 'trim',
  label: 'Keep an x-range (trim)',
  summary:
    'Keeps the points from one x to another and leaves out the rest, for example to match a blank that covers less than the sample or to drop an injection artefact at the start. ' +
    'Points inside the range are kept exactly as they are. Peaks, noise and every export after this step see only the kept range.',
  params: [
    { key: 'range', label: 'x-range to keep', kind: 'ranges', unit: 'x-units', help: 'One range, from and to in x-units; mark it on the plot and take the marked range.' },
  ],
  defaults: { range: [] },
  validate(params, input: Signal) {
    const r = params.range;
    if (!Array.isArray(r) || r.length === 0) return 'No x-range chosen yet: mark the range to keep on the plot (“Mark a range”) and use it here.';
    if (r.length > 1) return `Only one range can be kept (got ${r.length}); remove the others.`;
    const [a, b] = r[0];
    if (!Number.isFinite(a) || !Number.isFinite(b)) return 'The range to keep needs a finite start and end.';
    const [i0, i1] = span(input.x, Math.min(a, b), Math.max(a, b));
    if (i1 - i0 < MIN_POINTS) return `The range ${fmt(Math.min(a, b))} to ${fmt(Math.max(a, b))} holds ${i1 - i0} point${i1 - i0 === 1 ? '' : 's'} of this trace (it runs from ${fmt(input.x[0])} to ${fmt(input.x[input.x.length - 1])}); a trace needs at least ${MIN_POINTS}.`;
    return null;
  },
  apply(input: Signal, params): StepOutput {
    const [a, b] = params.range[0];
    const [i0, i1] = span(input.x, Math.min(a, b), Math.max(a, b));
    const n = input.x.length;
    return {
      x: input.x.slice(i0, i1),
      y: input.y.slice(i0, i1),
      notes: [`Kept ${i1 - i0} of ${n} points, x = ${fmt(input.x[i0])} to ${fmt(input.x[i1 - 1])}; ${i0} left out before and ${n - i1} after.`],
      figures: { pointsIn: n, pointsOut: i1 - i0 },
    };
  },
};
