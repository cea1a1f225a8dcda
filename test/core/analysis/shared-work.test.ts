/**
 * The staged analysis with work done on another thread (issue 16;
 * core/analysis/index.ts and pause.ts): on a long trace the residual's tests
 * and the later part of every long detection are offered, and a consumer
 * that answers them with jobs done "elsewhere" (here: after a timer, on
 * structured copies, as a message between threads makes them) gets the same
 * result as one full pass on one thread, with the stages in the same order;
 * a residual job that comes back empty (declined, cancelled) leaves the tests
 * to the stage itself, with the same result.
 */
import { describe, expect, it } from 'vitest';
import { analyse, analyseSteps, applyStage, isStageUpdate, RESIDUAL_SHARE_MIN, type AnalyseRequest, type AnalyseResult } from '../../../src/core/analysis/index.ts';
import { drain, isShareOffer, type ShareAnswer, type ShareOffer } from '../../../src/core/analysis/pause.ts';
import { measureShareStepwise, type SharedJob } from '../../../src/core/measure/peak-table.ts';
import { residualDiagnostics } from '../../../src/core/measure/residual-tests.ts';
import { emptyRecipe, makeRecipeStep } from '../../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../../src/core/steps/registry.ts';
import { createTrace } from '../../../src/core/trace.ts';
import { makeBenchTrace } from '../../bench/bench-trace.ts';

/** A job done after a timer on structured copies; `empty` makes it come back without a result. */
function elsewhere<T>(work: () => T, empty = false): SharedJob<T> {
  let result: T | undefined;
  const settled = new Promise<void>((resolve) => setTimeout(() => { if (!empty) result = structuredClone(work()); resolve(); }, 0));
  return { settled, result: () => result, cancel: () => {} };
}

function answer(offer: ShareOffer, log: string[], residualEmpty: boolean): ShareAnswer {
  const copy = structuredClone(offer);
  if ('share' in copy) { log.push('detection'); return elsewhere(() => drain(measureShareStepwise(copy.share))); }
  log.push('residual');
  return elsewhere(() => residualDiagnostics(copy.residual.y, copy.residual.rawScale), residualEmpty);
}

async function stagedWithSharing(request: AnalyseRequest, traces: Map<string, ReturnType<typeof createTrace>>, residualEmpty = false) {
  const steps = analyseSteps(request, traces, STEP_REGISTRY);
  let result: AnalyseResult | null = null;
  const order: string[] = [];
  const offers: string[] = [];
  let reply: ShareAnswer;
  for (;;) {
    const r = steps.next(reply);
    reply = undefined;
    if (r.done) break;
    const v = r.value;
    if (isShareOffer(v)) reply = answer(v, offers, residualEmpty);
    else if (v instanceof Promise) await v;
    else if (isStageUpdate(v)) { order.push(v.stage); result = applyStage(result, v); }
  }
  return { result: result!, order, offers };
}

/** Numbers and words of a result, without timings ('ms') and cache marks ('cached'), which differ between runs. */
function comparable(r: AnalyseResult): string {
  return JSON.stringify(r, (k, v: unknown) => (k === 'ms' || k === 'cached' ? undefined : ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v));
}

/** Equal strings, or a failure that shows where they part (the results are megabytes long). */
function expectSame(a: string, b: string): void {
  let i = 0;
  while (i < a.length && a[i] === b[i]) i++;
  expect(i === a.length && i === b.length ? 'same' : `differ at ${i}: …${a.slice(Math.max(0, i - 200), i + 100)}… against …${b.slice(Math.max(0, i - 200), i + 100)}…`).toBe('same');
}

describe('the staged analysis with work shared to another thread', () => {
  const n = RESIDUAL_SHARE_MIN + 1000;
  const t = makeBenchTrace(n);
  const trace = createTrace({ id: 's', name: 'bench', x: t.x, y: t.y, source: { fileName: 'bench.csv', sha256: '0'.repeat(64), rowsRead: n, rowsSkipped: 0 } });
  const traces = new Map([[trace.id, trace]]);
  const recipe = emptyRecipe();
  recipe.steps.push(makeRecipeStep(stepDefinition('moving-average')!, { window: 5 }));
  const request: AnalyseRequest = { sampleId: trace.id, scanIds: [], recipe };
  const alone = analyse(request, traces, STEP_REGISTRY);

  it('gives the one-thread result, stage for stage in the same order; the residual\'s tests and the long detections were offered', async () => {
    const { result, order, offers } = await stagedWithSharing(request, traces);
    expect(order).toEqual(['processed', 'residual', 'noise', 'peaks', 'bumps', 'loss']);
    expect(offers[0]).toBe('residual');
    expect(offers.filter((o) => o === 'residual')).toHaveLength(1);
    expect(offers.filter((o) => o === 'detection').length).toBeGreaterThanOrEqual(1);
    expect(result.diagnostics).not.toBeNull();
    expect(result.peaks.length).toBeGreaterThan(50);
    expectSame(comparable(result), comparable(alone));
  }, 120_000);

  it('a residual job that comes back empty leaves the tests to the stage: the same result', async () => {
    const { result, order } = await stagedWithSharing(request, traces, true);
    expect(order.slice(0, 3)).toEqual(['processed', 'residual', 'noise']);
    expectSame(comparable(result), comparable(alone));
  }, 120_000);

  it('a shorter residual is not offered (its tests take a few milliseconds)', async () => {
    const s = makeBenchTrace(RESIDUAL_SHARE_MIN - 1);
    const short = createTrace({ id: 'short', name: 'short', x: s.x, y: s.y, source: { fileName: 's.csv', sha256: '0'.repeat(64), rowsRead: s.x.length, rowsSkipped: 0 } });
    const { offers } = await stagedWithSharing({ ...request, sampleId: short.id }, new Map([[short.id, short]]));
    expect(offers).not.toContain('residual');
  }, 120_000);
});
