/**
 * Issue 14: S/N is marked provisional while the σ of the processed trace is still being carried through a stack
 * with a non-linear step (by simulation), and never shown as final before the noise and peak stages of the newest
 * request have landed. The staged analysis is fed, update by update, into the page's store as the worker's messages
 * are (`setPending` when the request leaves, `takeStage` per update), and the marks the panels read are checked
 * after each one.
 */
import { describe, expect, it } from 'vitest';
import { analyseStaged, sigmaProvisional, snrProvisional, STAGES, type AnalyseRequest } from '../../src/core/analysis/index.ts';
import { emptyRecipe, makeRecipeStep } from '../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../src/core/steps/registry.ts';
import { createTrace } from '../../src/core/trace.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { createAppStore } from '../../src/state/store.ts';

function trace() {
  const rng = makeRng(14);
  const x = Array.from({ length: 4000 }, (_, i) => i * 0.01);
  const y = x.map((t) => 1 + 5 * Math.exp(-0.5 * ((t - 12) / 0.1) ** 2) + 0.8 * Math.exp(-0.5 * ((t - 25) / 0.2) ** 2) + 0.05 * rng.normal());
  return createTrace({ name: 'syn', x, y, source: { fileName: 'syn.csv', sha256: '0'.repeat(64), rowsRead: x.length, rowsSkipped: 0 } });
}

describe('S/N provisional while σ is carried through the stack', () => {
  it('a despiking step (not linear: σ carried by simulation): marked from the request until the noise and peak stages land, then final', () => {
    const t = trace();
    const recipe = emptyRecipe();
    recipe.steps.push({ ...makeRecipeStep(stepDefinition('despike')!, {}), uid: 'd1' });
    const req: AnalyseRequest = { sampleId: t.id, scanIds: [], recipe };
    const useApp = createAppStore();
    const marks = () => {
      const s = useApp.getState();
      return { sigma: sigmaProvisional(s.pending, s.result?.noise ?? null), snr: snrProvisional(s.pending, s.result?.noise ?? null) };
    };
    // A result of an earlier request is on the page: final.
    expect(marks()).toEqual({ sigma: false, snr: false });
    // The request leaves: every stage pending, as the controller sets it.
    useApp.getState().setPending(STAGES.filter((s) => s !== 'alternative'));
    expect(marks()).toEqual({ sigma: true, snr: true });
    const seen: { stage: string; sigma: boolean; snr: boolean }[] = [];
    for (const u of analyseStaged(req, new Map([[t.id, t]]), STEP_REGISTRY)) {
      useApp.getState().takeStage(u);
      seen.push({ stage: u.stage, ...marks() });
    }
    expect(seen).toEqual([
      { stage: 'processed', sigma: true, snr: true },
      { stage: 'residual', sigma: true, snr: true },
      // σ landed (carried by simulation, below), the table measured with it not yet.
      { stage: 'noise', sigma: false, snr: true },
      { stage: 'peaks', sigma: false, snr: false },
      { stage: 'bumps', sigma: false, snr: false },
      { stage: 'loss', sigma: false, snr: false },
    ]);
    const noise = useApp.getState().result!.noise!;
    expect(noise.carried?.route).toBe('simulated');
    expect(noise.provisional).toBe(false);
    // The next edit marks it again until its own stages land.
    useApp.getState().setPending(STAGES.filter((s) => s !== 'alternative'));
    expect(marks()).toEqual({ sigma: true, snr: true });
  });

  it('a noise report that says its σ is not final keeps S/N provisional with nothing pending', () => {
    const t = trace();
    const useApp = createAppStore();
    const req: AnalyseRequest = { sampleId: t.id, scanIds: [], recipe: emptyRecipe() };
    for (const u of analyseStaged(req, new Map([[t.id, t]]), STEP_REGISTRY)) useApp.getState().takeStage(u);
    const n = useApp.getState().result!.noise!;
    expect(sigmaProvisional([], n)).toBe(false);
    expect(sigmaProvisional([], { ...n, provisional: true })).toBe(true);
    expect(snrProvisional([], { ...n, provisional: true })).toBe(true);
  });
});
