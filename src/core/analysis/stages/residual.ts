/**
 * Stage 2: the residual (raw − processed on the processed grid, minus what
 * baseline correction and blank subtraction removed on purpose) and its tests.
 */
import type { PipelineResult } from '../../pipeline.ts';
import type { Signal } from '../../steps/types.ts';
import { interpolateLinear } from '../../numeric/interpolate.ts';
import { residual as residualOf, residualDiagnostics, type ResidualDiagnostics } from '../../measure/residual-tests.ts';

export function maxAbs(y: Float64Array): number {
  let m = 0;
  for (let i = 0; i < y.length; i++) { const a = Math.abs(y[i]); if (a > m) m = a; }
  return m;
}

/** {@link maxAbs} of a raw trace's y, once per array (issue 16: raw-trace results are computed once and kept). */
const rawScales = new WeakMap<Float64Array, number>();
export function rawScaleOf(y: Float64Array): number {
  let m = rawScales.get(y);
  if (m === undefined) { m = maxAbs(y); rawScales.set(y, m); }
  return m;
}

/**
 * The residual of a pipeline run. When it cannot be formed (processed x
 * outside the raw range) it is zero and `ok` is false, with the reason in the note.
 */
export function residualOfRun(raw: Signal, run: PipelineResult): { residual: Signal; note?: string; ok: boolean } {
  try {
    const r = residualOf(raw, run.final);
    let note = r.note ?? undefined;
    const removed = deliberateRemovals(raw, run);
    if (removed) {
      const on = removed.x.length === r.x.length ? removed.y : interpolateLinear(removed.x, removed.y, r.x);
      for (let i = 0; i < r.y.length; i++) r.y[i] -= Number.isFinite(on[i]) ? on[i] : 0;
      note = `${note ? `${note} ` : ''}What baseline correction and blank subtraction removed on purpose is left out of the residual, so it shows only what the other steps took away.`;
    }
    return { residual: { x: r.x, y: r.y }, note, ok: true };
  } catch (e) {
    return { residual: { x: run.final.x, y: new Float64Array(run.final.x.length) }, note: `${(e as Error).message} The residual is not shown.`, ok: false };
  }
}

/** The residual's tests, before the loss check can hold the verdict back; null when no step ran. */
export function residualTests(raw: Signal, residual: Signal, processedSomething: boolean): ResidualDiagnostics | null {
  return processedSomething && residual.y.length >= 3 ? residualDiagnostics(residual.y, rawScaleOf(raw.y)) : null;
}

/** Steps whose change to the trace is a deliberate removal, not a loss. */
const DELIBERATE = new Set(['baseline', 'blank-subtraction']);

/**
 * Sum of what the deliberate steps removed (their input minus their output),
 * carried on the grid of the last such step; null when there were none.
 */
function deliberateRemovals(raw: Signal, run: PipelineResult): Signal | null {
  let input: Signal = raw;
  let acc: Signal | null = null;
  for (const r of run.runs) {
    if (r.status !== 'ok' || !r.output) continue;
    const out = r.output;
    if (DELIBERATE.has(r.step) && out.x.length === input.x.length) {
      const d = new Float64Array(out.y.length);
      for (let i = 0; i < d.length; i++) d[i] = input.y[i] - out.y[i];
      if (acc && acc.x.length !== out.x.length) {
        const moved = interpolateLinear(acc.x, acc.y, out.x);
        for (let i = 0; i < d.length; i++) d[i] += Number.isFinite(moved[i]) ? moved[i] : 0;
      } else if (acc) {
        for (let i = 0; i < d.length; i++) d[i] += acc.y[i];
      }
      acc = { x: out.x, y: d };
    }
    input = { x: out.x, y: out.y };
  }
  return acc;
}
