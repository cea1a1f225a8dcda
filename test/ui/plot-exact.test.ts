/**
 * src/ui/plot-exact.ts: useExactSignal, the exact arrays of a series that
 * may have stayed in the worker (src/worker/series.ts). Its promises (from
 * its header): no series gives null; a series that crossed whole is handed
 * back itself, its arrays unchanged and the worker not asked; a series that
 * stayed in the worker gives null while its arrays are on their way. The
 * fetch itself runs in an effect, which static rendering does not run; the
 * exact arrays a fetch brings back are checked bit for bit in
 * test/worker/series.test.ts (exactResult, through the same bridge's
 * slice call that exactSignal makes).
 */
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it, vi } from 'vitest';
import type { Signal } from '../../src/core/steps/types.ts';
import type { AnalyseResult, StageUpdate } from '../../src/core/analysis/index.ts';
import { emptyRecipe } from '../../src/core/method.ts';
import type { FromWorker } from '../../src/worker/api.ts';
import { farOf } from '../../src/worker/bridge.ts';
import { SeriesStore, WHOLE_UP_TO } from '../../src/worker/series.ts';
import * as service from '../../src/state/service.ts';
import { useExactSignal } from '../../src/ui/plot-exact.ts';
import { fakeWorker } from '../worker/fake-worker.ts';

/** What the hook gives on the page's first drawing of a component. */
function firstRender(s: Signal | null, wanted?: boolean): Signal | null | 'unset' {
  let out: Signal | null | 'unset' = 'unset';
  const Probe = () => { out = useExactSignal(s, wanted); return null; };
  renderToStaticMarkup(createElement(Probe));
  return out;
}

const series = (n: number): Signal => ({ x: Float64Array.from({ length: n }, (_, i) => i * 0.01), y: Float64Array.from({ length: n }, (_, i) => Math.sin(i / 7)) });

/** A processed series that stayed in the worker: a stage passed through the bridge with a stand-in worker (as test/worker/series.test.ts does). */
function farProcessed(): Signal {
  const store = new SeriesStore();
  const n = WHOLE_UP_TO + 1000;
  const p = series(n);
  const r = { sampleId: 's', processed: p, residual: { x: p.x, y: p.y }, baseline: undefined, intermediate: null } as unknown as AnalyseResult;
  const { backend, posted, answer } = fakeWorker();
  backend.setInputs([]);
  let got: StageUpdate | null = null;
  void backend.analyse({ sampleId: 's', scanIds: [], recipe: emptyRecipe() }, (u) => { got = u; });
  const call = posted.find((m) => m.type === 'call') as { jobId: number };
  const thin = store.thin(r, 1);
  const msg: FromWorker = { type: 'stage', jobId: call.jobId, update: { stage: 'loss', sampleId: 's', pending: [], patch: thin.patch }, far: thin.far };
  answer(msg);
  return got!.patch.processed!;
}

describe('useExactSignal', () => {
  it('no series: null', () => {
    expect(firstRender(null)).toBeNull();
  });

  it('a series that crossed whole is handed back itself, its arrays unchanged, without asking the worker', () => {
    const s = series(500);
    const before = { x: Array.from(s.x), y: Array.from(s.y) };
    const slice = vi.spyOn(service.getBackend(), 'slice');
    expect(farOf(s)).toBeUndefined();
    const got = firstRender(s);
    expect(got).toBe(s);
    expect(Array.from(s.x)).toEqual(before.x);
    expect(Array.from(s.y)).toEqual(before.y);
    expect(firstRender(s, false)).toBe(s); // "not wanted" does not hide a series the page already has
    expect(slice).not.toHaveBeenCalled();
    slice.mockRestore();
  });

  it('a series that stayed in the worker gives null while its arrays are on their way (never its empty placeholder)', () => {
    const far = farProcessed();
    expect(farOf(far)?.field).toBe('processed');
    expect(far.x.length).toBe(0); // the placeholder the page holds
    expect(firstRender(far)).toBeNull();
    expect(firstRender(far, false)).toBeNull();
  });
});
