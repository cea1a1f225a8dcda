/**
 * The staged analysis gives the same numbers as one full pass (issue 16):
 * random recipes and edits, each run stage by stage with the caches and
 * memos a worker keeps, some cancelled part-way (the consumer stops pulling),
 * and the last one compared with a fresh `analyse()` that shares nothing.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { AnalysisMemo, analyse, analyseStaged, analyseSteps, applyStage, isStageUpdate, STAGES, type AnalyseRequest, type AnalyseResult, type StageUpdate } from '../../../src/core/analysis/index.ts';
import { PipelineCache } from '../../../src/core/pipeline.ts';
import { emptyRecipe, makeRecipeStep, type Recipe } from '../../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../../src/core/steps/registry.ts';
import { createTrace, type Trace } from '../../../src/core/trace.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { DETECT_PAUSE_EVERY } from '../../../src/core/measure/peak-table.ts';

function synthetic(seed: number, n: number): Trace {
  const rng = makeRng(seed);
  const x = Array.from({ length: n }, (_, i) => i * 0.01);
  const y = x.map((t) => 2 + 0.05 * t + 6 * Math.exp(-0.5 * ((t - 4) / 0.08) ** 2) + 1.2 * Math.exp(-0.5 * ((t - 9) / 0.2) ** 2)
    + 0.6 * Math.exp(-0.5 * ((t - 9.5) / 0.06) ** 2) + 0.1 * rng.normal());
  return createTrace({ name: `syn-${seed}`, x, y, source: { fileName: 'syn.csv', sha256: '0'.repeat(64), rowsRead: n, rowsSkipped: 0 } });
}

/** A step as data, so fast-check can shrink it. */
type StepSpec = { step: 'moving-average' | 'savitzky-golay' | 'despike' | 'boxcar' | 'baseline'; size: number };
const stepSpec = fc.record({
  step: fc.constantFrom<StepSpec['step']>('moving-average', 'savitzky-golay', 'despike', 'boxcar', 'baseline'),
  size: fc.integer({ min: 1, max: 9 }),
});

function recipeOf(specs: StepSpec[]): Recipe {
  const r = emptyRecipe();
  for (const s of specs) {
    const def = stepDefinition(s.step)!;
    const params = s.step === 'boxcar' ? { size: 1 + (s.size % 3) }
      : s.step === 'baseline' ? { method: 'asls', lambda: 10 ** (3 + (s.size % 4)) }
        : s.step === 'savitzky-golay' ? { window: 2 * s.size + 5, order: 2 }
          : { window: 2 * s.size + 1 };
    const st = makeRecipeStep(def, params);
    r.steps.push({ ...st, uid: `u${r.steps.length}` });
  }
  return r;
}

/** The result with what may differ between runs (times, cache hits) left out, and arrays as plain lists. */
function numbers(v: unknown): unknown {
  if (v === null || typeof v !== 'object') return v;
  if (ArrayBuffer.isView(v)) return Array.from(v as Float64Array);
  if (Array.isArray(v)) return v.map(numbers);
  const out: Record<string, unknown> = {};
  for (const [k, x] of Object.entries(v)) if (k !== 'ms' && k !== 'cached') out[k] = numbers(x);
  return out;
}

describe('staged analysis', () => {
  it('stages land in the table-of-contents order, each once (alternatives once per alternative), the last with nothing pending', () => {
    const t = synthetic(1, 1200);
    const req: AnalyseRequest = {
      sampleId: t.id, scanIds: [], recipe: recipeOf([{ step: 'moving-average', size: 3 }]),
      alternatives: [{ id: 'a', label: 'a', recipe: recipeOf([{ step: 'savitzky-golay', size: 2 }]) }, { id: 'b', label: 'b', recipe: recipeOf([{ step: 'moving-average', size: 1 }]) }],
    };
    const updates = [...analyseStaged(req, new Map([[t.id, t]]), STEP_REGISTRY)];
    expect(updates.map((u) => u.stage)).toEqual(['processed', 'residual', 'noise', 'peaks', 'bumps', 'alternative', 'alternative', 'loss']);
    expect(updates[5].pending).toEqual(['alternative', 'loss']);
    expect(updates.at(-1)!.pending).toEqual([]);
    // Every update names only later stages as pending.
    for (const u of updates) for (const p of u.pending) expect(STAGES.indexOf(p)).toBeGreaterThanOrEqual(STAGES.indexOf(u.stage));
    // The residual verdict before the loss check is the tests alone; the loss stage sets the final one.
    expect(updates[0].patch).toHaveProperty('residual');
    expect(updates[1].patch).toHaveProperty('diagnostics');
    expect(updates.at(-1)!.patch).toHaveProperty('diagnostics');
  });

  it('equals one full pass over random recipes and edits, including runs cancelled between stages', () => {
    const t = synthetic(7, 1500);
    const traces = new Map([[t.id, t]]);
    fc.assert(fc.property(
      fc.array(stepSpec, { minLength: 0, maxLength: 3 }),
      fc.array(fc.record({ at: fc.nat(), size: fc.integer({ min: 1, max: 9 }), cut: fc.integer({ min: 0, max: 8 }), alt: fc.boolean() }), { minLength: 1, maxLength: 4 }),
      fc.array(fc.array(stepSpec, { minLength: 1, maxLength: 2 }), { maxLength: 2 }),
      fc.boolean(),
      (specs, edits, altSpecs, raw) => {
        // What a worker keeps between requests.
        const pipeline = new PipelineCache(96);
        const memo = new AnalysisMemo();
        const current = specs.slice();
        let last: AnalyseRequest | null = null;
        let staged: AnalyseResult | null = null;
        for (let e = 0; e < edits.length; e++) {
          const ed = edits[e];
          if (current.length) current[ed.at % current.length] = { ...current[ed.at % current.length], size: ed.size };
          // Some edits change an alternative instead (its memo entry must not be reused then).
          if (ed.alt && altSpecs.length) altSpecs[0] = [{ ...altSpecs[0][0], size: ed.size }, ...altSpecs[0].slice(1)];
          const alternatives = altSpecs.map((a, k) => ({ id: `alt${k}`, label: `alternative ${k}`, recipe: recipeOf(a) }));
          const req: AnalyseRequest = {
            sampleId: t.id, scanIds: [], recipe: recipeOf(current), alternatives,
            peaks: raw ? { measureOn: 'raw', minProminenceSigma: 2, minSnr: 2, minWidth: 0, minSeparation: 0, snrDefinition: 'rms', pharmacopoeialMultiplier: 5, negative: false, detectionLimit: 3, quantitationLimit: 10 } : undefined,
          };
          // Every edit but the last may be cancelled after `cut` stages (a newer request came in).
          const cut = e === edits.length - 1 ? Infinity : ed.cut;
          const gen = analyseStaged(req, traces, STEP_REGISTRY, { pipeline, memo });
          let n = 0;
          let result: AnalyseResult | null = null;
          let update: IteratorResult<StageUpdate, void>;
          while (n < cut && !(update = gen.next()).done) { result = applyStage(result, update.value); n++; }
          gen.return();
          last = req;
          staged = result;
        }
        const once = analyse(last!, traces, STEP_REGISTRY);
        expect(numbers(staged)).toEqual(numbers(once));
      },
    ), { numRuns: 25, seed: 16 });
  });

  it('pauses inside peak detection, and a run dropped at any pause leaves nothing behind that changes the next result', () => {
    // 30 000 points of noise with two peaks: some 3 000 candidates pass the prominence test, more than one pause's worth.
    const t = synthetic(11, 30_000);
    const traces = new Map([[t.id, t]]);
    const req = (w: number): AnalyseRequest => ({
      sampleId: t.id, scanIds: [], recipe: recipeOf([{ step: 'moving-average', size: w }]),
      alternatives: [{ id: 'a', label: 'a', recipe: recipeOf([{ step: 'savitzky-golay', size: 2 }]) }],
    });
    const steps = [...analyseSteps(req(1), traces, STEP_REGISTRY)];
    const stageAt = steps.map((u, k) => (isStageUpdate(u) ? u.stage : (steps.slice(k).find((v) => isStageUpdate(v)) as StageUpdate).stage));
    const pauses = stageAt.filter((s, k) => steps[k] === undefined);
    // The raw reference (in the peaks stage) pauses, and so may the noise-bump simulation (when not cached yet) and
    // the alternative; the stages before detection never do.
    expect(pauses.filter((s) => s === 'peaks').length).toBeGreaterThanOrEqual(1);
    for (const s of pauses) expect(['peaks', 'bumps', 'alternative', 'loss']).toContain(s);
    expect(DETECT_PAUSE_EVERY).toBeLessThan(3000);
    const fresh = numbers(analyse(req(2), traces, STEP_REGISTRY));
    for (let cut = 0; cut < steps.length; cut++) {
      if (steps[cut] !== undefined) continue;
      // What a worker keeps: the first request is dropped at this pause, the next one runs whole on the same caches.
      const pipeline = new PipelineCache(96);
      const memo = new AnalysisMemo();
      const gen = analyseSteps(req(1), traces, STEP_REGISTRY, { pipeline, memo });
      for (let k = 0; k <= cut; k++) gen.next();
      gen.return();
      let result: AnalyseResult | null = null;
      for (const u of analyseSteps(req(2), traces, STEP_REGISTRY, { pipeline, memo })) if (isStageUpdate(u)) result = applyStage(result, u);
      expect(numbers(result)).toEqual(fresh);
    }
  });
});
