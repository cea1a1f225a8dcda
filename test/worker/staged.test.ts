/**
 * Issue 16: the worker side posts each stage as it lands and a newer request
 * stops older work between stages; the page drops updates of superseded
 * requests and takes the rest into the store stage by stage.
 */
import { describe, expect, test } from 'vitest';
import { createTrace } from '../../src/core/trace.ts';
import { emptyRecipe, makeRecipeStep } from '../../src/core/method.ts';
import { stepDefinition } from '../../src/core/steps/registry.ts';
import { inProcessBackend, LatestOnly } from '../../src/worker/bridge.ts';
import { createAppStore } from '../../src/state/store.ts';
import type { AnalyseRequest, StageUpdate } from '../../src/core/analysis/index.ts';
import { makeRng } from '../../src/core/numeric/random.ts';

function trace() {
  const rng = makeRng(3);
  const x = Array.from({ length: 3000 }, (_, i) => i * 0.01);
  const y = x.map((t) => 5 * Math.exp(-0.5 * ((t - 12) / 0.1) ** 2) + 0.05 * rng.normal());
  return createTrace({ id: 's', name: 's', x, y, source: { fileName: 's.csv', sha256: '0'.repeat(64), rowsRead: 3000, rowsSkipped: 0 } });
}

function request(window: number): AnalyseRequest {
  const r = emptyRecipe();
  r.steps.push({ ...makeRecipeStep(stepDefinition('moving-average')!, { window }), uid: 'ma' });
  return { sampleId: 's', scanIds: [], recipe: r, alternatives: [{ id: 'a', label: 'a', recipe: emptyRecipe() }] };
}

describe('staged work on the worker side', () => {
  test('a newer request supersedes an older one: none of the older updates reach the page, the newer lands whole', async () => {
    const backend = inProcessBackend();
    backend.setInputs([trace()]);
    const sched = new LatestOnly(backend);
    const got: [number, string][] = [];
    const first = sched.run(request(5), (u) => got.push([5, u.stage]));
    const second = sched.run(request(9), (u) => got.push([9, u.stage]));
    expect(await first).toBeNull();
    expect(await second).toBe(true);
    expect(got.filter(([w]) => w === 5)).toEqual([]);
    expect(got.map(([, s]) => s)).toEqual(['processed', 'residual', 'noise', 'peaks', 'bumps', 'alternative', 'loss']);
  });

  test('a request superseded between stages stops there (the backend reports it unfinished)', async () => {
    const backend = inProcessBackend();
    backend.setInputs([trace()]);
    const stages: string[] = [];
    let started: Promise<boolean> | null = null;
    const first = backend.analyse(request(5), (u) => {
      stages.push(u.stage);
      // A newer request arrives while the first is between its first and second stage.
      if (u.stage === 'processed') started = backend.analyse(request(7), () => undefined);
    });
    expect(await first).toBe(false);
    expect(stages).toEqual(['processed']);
    expect(await started!).toBe(true);
  });
});

describe('the store takes partial results', () => {
  test('a stage replaces only its own fields (the others keep their identity) and the pending list says what is provisional', async () => {
    const store = createAppStore();
    const backend = inProcessBackend();
    backend.setInputs([trace()]);
    const updates: StageUpdate[] = [];
    await backend.analyse(request(5), (u) => updates.push(u));
    const snapshots = updates.map((u) => { store.getState().takeStage(u); return store.getState(); });
    const [processed, residual, noise, peaks] = snapshots;
    expect(processed.pending).toEqual(['residual', 'noise', 'peaks', 'bumps', 'alternative', 'loss']);
    expect(residual.result!.processed).toBe(processed.result!.processed);
    expect(noise.result!.residual).toBe(processed.result!.residual);
    expect(noise.result!.diagnostics).toBe(residual.result!.diagnostics);
    expect(peaks.result!.noise).toBe(noise.result!.noise);
    expect(noise.stageSeq.peaks).toBe(0);
    expect(peaks.stageSeq.peaks).toBe(1);
    const last = snapshots.at(-1)!;
    expect(last.pending).toEqual([]);
    expect(last.result!.loss).not.toBeNull();
    // The verdict before the loss check is the residual tests' own; the final one is combined with the loss check.
    expect(residual.result!.diagnostics).not.toBeNull();
    expect(last.result!.diagnostics!.level).toBeDefined();
  });
});
