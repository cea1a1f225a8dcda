/**
 * Issue 16, "the page takes in little": series longer than WHOLE_UP_TO stay
 * in the worker; the page gets min/max drawings for its view and the exact
 * arrays on request. Checked here: what crosses, that a drawing keeps a
 * one-point spike, and that what the page asks for afterwards (an export's
 * whole result, a stretch, the nearest point) is bit-for-bit the analysis's
 * own arrays.
 */
import { describe, expect, test } from 'vitest';
import { drawSeries, SeriesStore, WHOLE_UP_TO, type View } from '../../src/worker/series.ts';
import { exactResult, farOf, type ComputeBackend } from '../../src/worker/bridge.ts';
import type { AnalyseResult, StageUpdate } from '../../src/core/analysis/index.ts';
import type { FromWorker } from '../../src/worker/api.ts';
import { nearestPoint } from '../../src/ui/plot-view.ts';
import { emptyRecipe } from '../../src/core/method.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { fakeWorker } from './fake-worker.ts';

function signal(n: number, seed = 1) {
  const rng = makeRng(seed);
  const x = Float64Array.from({ length: n }, (_, i) => i * 0.001);
  const y = Float64Array.from({ length: n }, () => rng.normal());
  return { x, y };
}

function result(n: number): AnalyseResult {
  const p = signal(n, 1), r = signal(n, 2), alt = signal(n, 3);
  return {
    sampleId: 's', processed: p, residual: { x: p.x, y: r.y }, diagnostics: null, baseline: signal(n, 4).y, intermediate: null,
    runs: [], events: [], noise: null, peaks: [], peakOptions: null, noiseBumps: null, ms: 0,
    loss: { ledger: { alternatives: [], rows: [] } as never, noiseLevelRows: 0, noiseLevelShown: false, narrowestFwhmPoints: null, advice: [], currentWarnings: [], currentWeakened: [],
      outcomes: [{ id: 'a', label: 'a', processed: alt, diagnostics: null, noiseSigma: null, peakCount: 0, problems: [] }] },
  };
}

describe('what crosses', () => {
  test('series up to WHOLE_UP_TO points cross whole; longer ones are replaced by empty arrays and listed with their drawing', () => {
    const store = new SeriesStore();
    const short = store.thin(result(WHOLE_UP_TO), 1);
    expect(short.far).toEqual([]);
    expect(short.patch.processed!.x.length).toBe(WHOLE_UP_TO);
    const long = store.thin(result(100_000), 1);
    expect(long.far.map((f) => f.field).sort()).toEqual(['baseline', 'outcome', 'processed', 'residual']);
    expect(long.patch.processed!.x.length).toBe(0);
    expect(long.patch.baseline!.length).toBe(0);
    expect(long.patch.loss!.outcomes[0].processed.y.length).toBe(0);
    // About four points per pixel column (min and max of each half column, the ends and one neighbour each side).
    for (const f of long.far) expect(f.drawn.x.length).toBeLessThanOrEqual(4 * 1000 + 4);
  });

  test('the same arrays keep the same number (an unchanged series can be told from a new one)', () => {
    const store = new SeriesStore();
    const r = result(20_000);
    const a = store.thin(r, 1).far.find((f) => f.field === 'processed')!;
    const b = store.thin({ processed: r.processed }, 2).far[0];
    const c = store.thin({ processed: { x: r.processed.x, y: r.processed.y.slice() } }, 3).far[0];
    expect(b.ref).toBe(a.ref);
    expect(c.ref).not.toBe(a.ref);
  });

  test('a one-point spike survives the drawing, at full view and zoomed in', () => {
    const s = signal(1_000_000, 5);
    s.y[654_321] = 1e3;
    for (const view of [{ from: -Infinity, to: Infinity, columns: 800 }, { from: 600, to: 700, columns: 800 }] as View[]) {
      const d = drawSeries(s.x, s.y, view);
      expect(Math.max(...d.y)).toBe(1e3);
      expect(d.x.length).toBeLessThanOrEqual(4 * 800 + 4);
      // Covers the view with no gap wider than one half column.
      const from = Math.max(view.from, s.x[0]), to = Math.min(view.to, s.x[s.x.length - 1]);
      expect(d.x[0]).toBeLessThanOrEqual(from);
      expect(d.x[d.x.length - 1]).toBeGreaterThanOrEqual(to);
      let gap = 0;
      for (let i = 1; i < d.x.length; i++) gap = Math.max(gap, d.x[i] - d.x[i - 1]);
      expect(gap).toBeLessThanOrEqual(((to - from) / (2 * view.columns)) * 2.01);
    }
  });
});

describe('what the page asks for afterwards is exact', () => {
  test('slice and nearest give the analysis\'s own values', () => {
    const store = new SeriesStore();
    const r = result(50_000);
    const f = store.thin(r, 1).far.find((g) => g.field === 'processed')!;
    const [whole] = store.slice([f.ref]);
    expect(whole.x).toEqual(r.processed.x);
    expect(whole.y).toEqual(r.processed.y);
    expect(whole.y).not.toBe(r.processed.y); // a copy: the worker's own stays usable after the transfer
    const [part] = store.slice([f.ref], 10, 11);
    expect(part.x[0]).toBeLessThan(10);
    expect(part.x[part.x.length - 1]).toBeGreaterThan(11);
    expect(part.x.length).toBe(1003);
    for (const x of [-5, 0, 12.3456, 49.9994, 1e9]) {
      const [p] = store.nearest([f.ref], x);
      const q = nearestPoint({ name: 'processed', ...r.processed }, x)!;
      expect([p!.x, p!.y, p!.index]).toEqual([q.x, q.y, q.index]);
    }
  });

  test('series of jobs older than the newest three are let go, and asking for them says so', () => {
    const store = new SeriesStore(3);
    const refs = [1, 2, 3, 4].map((job) => store.thin({ processed: signal(20_000, job) }, job).far[0].ref);
    expect(() => store.slice([refs[0]])).toThrow(/no longer kept/);
    expect(store.slice([refs[3]])[0].x.length).toBe(20_000);
  });

  test('a stage through the bridge keeps its placeholders marked, and an export\'s whole result is bit-for-bit the analysis\'s', async () => {
    const store = new SeriesStore();
    const r = result(30_000);
    const { backend, posted, answer } = fakeWorker();
    backend.setInputs([]);
    let got: StageUpdate | null = null;
    void backend.analyse({ sampleId: 's', scanIds: [], recipe: emptyRecipe() }, (u) => { got = u; });
    const call = posted.find((m) => m.type === 'call')!;
    const thin = store.thin(r, 1);
    const { peaks: _peaks, ...patch } = thin.patch;
    void _peaks;
    const msg: FromWorker = { type: 'stage', jobId: (call as { jobId: number }).jobId, update: { stage: 'loss', sampleId: 's', pending: [], patch }, far: thin.far };
    answer(msg);
    const shown = { ...r, ...got!.patch } as AnalyseResult;
    expect(farOf(shown.processed)?.field).toBe('processed');
    expect(farOf(shown.baseline)?.field).toBe('baseline');
    expect(shown.processed.x.length).toBe(0);
    const asking: ComputeBackend = { ...backend, slice: async (refs, from, to) => structuredClone(store.slice(refs, from, to)) };
    const exact = await exactResult(asking, shown);
    expect(exact.processed).toEqual(r.processed);
    expect(exact.residual).toEqual(r.residual);
    expect(exact.baseline).toEqual(r.baseline);
    expect(exact.loss!.outcomes[0].processed).toEqual(r.loss!.outcomes[0].processed);
    // Nothing long: the result is handed back as it is, without asking the worker.
    const small = result(100);
    expect(await exactResult({ ...backend, slice: () => Promise.reject(new Error('asked')) }, small)).toBe(small);
  });
});
