/**
 * src/state/results-slice.ts on a fresh store each, fed the staged analysis
 * of a seeded synthetic trace update by update, as the worker's messages
 * arrive: a stage's update replaces only the fields it sets (the others keep
 * their identity, so panels reading them do not redraw), every landing is
 * counted per stage, and the folded result equals the whole analysis of the
 * same request (core/analysis `analyse`, the reference path the exports use).
 */
import { describe, expect, it } from 'vitest';
import { analyse, analyseStaged, STAGES, type AnalyseRequest, type AnalyseResult } from '../../src/core/analysis/index.ts';
import { emptyRecipe, makeRecipeStep } from '../../src/core/method.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { STEP_REGISTRY, stepDefinition } from '../../src/core/steps/registry.ts';
import { createTrace, type Trace } from '../../src/core/trace.ts';
import { createAppStore } from '../../src/state/store.ts';

function trace(id: string): Trace {
  const rng = makeRng(7);
  const x = Array.from({ length: 1500 }, (_, i) => i * 0.01);
  const y = x.map((t) => 1 + 5 * Math.exp(-0.5 * ((t - 6) / 0.1) ** 2) + 0.8 * Math.exp(-0.5 * ((t - 10) / 0.2) ** 2) + 0.05 * rng.normal());
  return createTrace({ id, name: id, x, y, source: { fileName: `${id}.csv`, sha256: '0'.repeat(64), rowsRead: x.length, rowsSkipped: 0 } });
}

function request(t: Trace): AnalyseRequest {
  const recipe = emptyRecipe();
  recipe.steps.push({ ...makeRecipeStep(stepDefinition('moving-average')!, { window: 5 }), uid: 'm1' });
  return { sampleId: t.id, scanIds: [], recipe };
}

/** Everything but the timings (every `ms` field, at any depth), for comparing two results. */
function noMs(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(noMs);
  if (v && typeof v === 'object' && !ArrayBuffer.isView(v)) return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, k === 'ms' ? 0 : noMs(x)]));
  return v;
}

describe('results slice', () => {
  it('stage by stage: only the stage’s own fields change identity, each landing is counted, pending follows the update', () => {
    const t = trace('s1');
    const app = createAppStore();
    expect(app.getState()).toMatchObject({ result: null, resultSeq: 0, pending: [], busy: false, computeError: null });
    app.getState().setPending(STAGES.filter((s) => s !== 'alternative'));
    app.getState().setComputeError('an older failure');
    let k = 0;
    for (const u of analyseStaged(request(t), new Map([[t.id, t]]), STEP_REGISTRY)) {
      const before = app.getState();
      app.getState().takeStage(u);
      const after = app.getState();
      k += 1;
      expect(after.resultSeq).toBe(k);
      expect(after.pending).toEqual(u.pending);
      expect(after.computeError).toBeNull();
      for (const [stage, n] of Object.entries(after.stageSeq)) expect(n, stage).toBe(before.stageSeq[stage as keyof typeof before.stageSeq] + (stage === u.stage ? 1 : 0));
      if (before.result) {
        for (const key of Object.keys(after.result!) as (keyof AnalyseResult)[]) {
          if (!(key in u.patch)) expect(after.result![key], `${u.stage} left ${key} alone`).toBe(before.result[key]);
        }
      }
    }
    expect(k).toBeGreaterThanOrEqual(5);
    expect(app.getState().pending).toEqual([]);
    // Folded, the stages give what the whole analysis gives for the same request.
    expect(noMs(app.getState().result!)).toEqual(noMs(analyse(request(t), new Map([[t.id, t]]), STEP_REGISTRY)));
  });

  it('an update for another sample starts from an empty result, never mixing two traces’ fields', () => {
    const a = trace('a'), b = trace('b');
    const app = createAppStore();
    app.getState().setResult(analyse(request(a), new Map([[a.id, a]]), STEP_REGISTRY));
    const first = analyseStaged(request(b), new Map([[b.id, b]]), STEP_REGISTRY).next().value!;
    expect(first.stage).toBe('processed');
    app.getState().takeStage(first);
    const r = app.getState().result!;
    expect(r.sampleId).toBe('b');
    expect(r.peaks).toEqual([]);
    expect(r.noise).toBeNull();
  });

  it('a whole result: counted once, every stage counted, pending and the error cleared; null clears it without counting', () => {
    const t = trace('w');
    const app = createAppStore();
    app.getState().setPending(['noise', 'peaks']);
    app.getState().setComputeError('x');
    const r = analyse(request(t), new Map([[t.id, t]]), STEP_REGISTRY);
    app.getState().setResult(r);
    const s = app.getState();
    expect(s.result).toBe(r);
    expect(s.resultSeq).toBe(1);
    expect(Object.values(s.stageSeq).every((n) => n === 1)).toBe(true);
    expect(s.pending).toEqual([]);
    expect(s.computeError).toBeNull();
    app.getState().setResult(null);
    expect(app.getState()).toMatchObject({ result: null, resultSeq: 1 });
    expect(Object.values(app.getState().stageSeq).every((n) => n === 1)).toBe(true);
  });

  it('busy mark and the computation error are set as given', () => {
    const app = createAppStore();
    app.getState().setBusy(true);
    app.getState().setComputeError('The worker stopped.');
    expect(app.getState()).toMatchObject({ busy: true, computeError: 'The worker stopped.' });
  });
});
