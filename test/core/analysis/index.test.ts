// The analysis entry point (src/core/analysis/index.ts): analyse and applyStage
// (this file was analysis.test.ts; the staged run is tested in staged.test.ts).
import { describe, expect, it } from 'vitest';
import { analyse, applyStage } from '../../../src/core/analysis/index.ts';
import { PipelineCache } from '../../../src/core/pipeline.ts';
import { makeRecipeStep, emptyRecipe } from '../../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../../src/core/steps/registry.ts';
import { savitzkyGolay } from '../../../src/core/numeric/savgol.ts';
import { createTrace } from '../../../src/core/trace.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

function synthetic(seed: number) {
  const rng = makeRng(seed);
  const n = 2000;
  const x = Array.from({ length: n }, (_, i) => i * 0.01);
  const y = x.map((t) => 1 + 0.2 * t + 10 * Math.exp(-0.5 * ((t - 7) / 0.15) ** 2) + 0.8 * Math.exp(-0.5 * ((t - 14) / 0.1) ** 2) + 0.1 * rng.normal());
  return createTrace({ name: 'syn', x, y, source: { fileName: 'syn.csv', sha256: '0'.repeat(64), rowsRead: n, rowsSkipped: 0 } });
}

describe('analyse', () => {
  it('with no steps: residual is zero, peaks found with H/σ near the true ratio, noise from the automatic estimate', () => {
    const t = synthetic(1);
    const r = analyse({ sampleId: t.id, scanIds: [], recipe: emptyRecipe() }, new Map([[t.id, t]]), STEP_REGISTRY);
    expect(r.residual.y.every((v) => v === 0)).toBe(true);
    expect(r.diagnostics).toBeNull();
    expect(r.noise!.sigma.method).toBe('finest-scale-mad');
    expect(Math.abs(r.noise!.sigma.sigma - 0.1)).toBeLessThan(0.01);
    const big = r.peaks.find((p) => Math.abs(p.x - 7) < 0.02)!;
    // The small peak is broad (σ = 10 points) and noisy at its top: its apex may wander a few points.
    const small = r.peaks.find((p) => Math.abs(p.x - 14) < 0.05)!;
    // True S/N: 10/0.1 = 100 and 0.8/0.1 = 8; heights within 3σ of the noise, σ estimate within 10 %.
    expect(big.snrRms).toBeGreaterThan(85);
    expect(big.snrRms).toBeLessThan(115);
    expect(small.flag).toBe('detectable');
  });

  it('the residual shows only what the smoothing removed, not the baseline taken out on purpose', () => {
    const t = synthetic(2);
    const recipe = emptyRecipe();
    const base = makeRecipeStep(stepDefinition('baseline')!, { method: 'polynomial', order: 1, ranges: [[0, 5], [9, 13], [16, 19.99]] });
    const sg = makeRecipeStep(stepDefinition('savitzky-golay')!, { window: 11, order: 2 });
    recipe.steps.push(base, sg);
    const cache = new PipelineCache();
    const r = analyse({ sampleId: t.id, scanIds: [], recipe }, new Map([[t.id, t]]), STEP_REGISTRY, cache);
    expect(r.runs.map((x) => x.status)).toEqual(['ok', 'ok']);
    const corrected = r.runs[0];
    expect(corrected.points).toBe(2000);
    // Independently: SG (interp edges) of the baseline-corrected signal; residual = corrected − smoothed.
    const baseOnly = analyse({ sampleId: t.id, scanIds: [], recipe: { ...recipe, steps: [base] } }, new Map([[t.id, t]]), STEP_REGISTRY, cache);
    const smoothed = savitzkyGolay(baseOnly.processed.y, 11, 2, { mode: 'interp' });
    for (let i = 0; i < 2000; i += 97) expect(r.residual.y[i]).toBeCloseTo(baseOnly.processed.y[i] - smoothed[i], 12);
    expect(r.residualNote).toMatch(/on purpose/);
    // A smoother's residual alternates (too many runs); on 2000 points the runs test rejects at p < 0.001,
    // so the verdict reads 'caution' (never clean), but it shows no slow structure.
    expect(r.diagnostics!.level).toBe('caution');
    expect(r.diagnostics!.runs.z).toBeGreaterThan(0);
  });

  it('never changes the loaded trace', () => {
    const t = synthetic(3);
    const before = Array.from(t.y);
    const recipe = emptyRecipe();
    for (const d of STEP_REGISTRY) if (!['blank-subtraction', 'ensemble-average'].includes(d.id)) recipe.steps.push(makeRecipeStep(d));
    analyse({ sampleId: t.id, scanIds: [], recipe }, new Map([[t.id, t]]), STEP_REGISTRY);
    expect(Array.from(t.y)).toEqual(before);
  });
});

describe('analyse on extreme values', () => {
  it('a trace with one value of -5.7e307 among zeros gives a result, not an exception', () => {
    const y = new Array(200).fill(0);
    y[100] = -5.7e307;
    const t = createTrace({ name: 'x', x: y.map((_, i) => i), y, source: { fileName: 'x.csv', sha256: '0'.repeat(64), rowsRead: 200, rowsSkipped: 0 } });
    const r = analyse({ sampleId: t.id, scanIds: [], recipe: emptyRecipe() }, new Map([[t.id, t]]), STEP_REGISTRY);
    expect(r.processed.y.length).toBe(200);
    // Every second difference outside the one feature is exactly zero: S/N cannot be measured, and the page says why instead of failing.
    expect(r.noise!.sigma.sigma).toBe(0);
    expect(r.peaks).toEqual([]);
    expect(r.peakProblem).toMatch(/noise is zero/);
  });
});

describe('applyStage', () => {
  it('folds a patch into a new object, keeping the identity of fields the stage did not set; another sample starts afresh', () => {
    const first = applyStage(null, { stage: 'processed', sampleId: 's', patch: { ms: 1 }, pending: ['residual'] });
    expect(first.sampleId).toBe('s');
    expect(first.peaks).toEqual([]);
    const peaks = first.peaks;
    const second = applyStage(first, { stage: 'noise', sampleId: 's', patch: { ms: 2 }, pending: [] });
    expect(second).not.toBe(first);
    expect(second.ms).toBe(2);
    expect(second.peaks).toBe(peaks);
    expect(first.ms).toBe(1);
    const other = applyStage(second, { stage: 'processed', sampleId: 't', patch: {}, pending: [] });
    expect(other.sampleId).toBe('t');
    expect(other.ms).toBe(0);
  });
});
