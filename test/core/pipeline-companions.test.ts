/**
 * Issue 20: the blank and the repeated scans follow the sample through the
 * stack. The linearity checks follow from linearity itself (for a linear
 * operator L, L(s − b) = L(s) − L(b), and the mean of (sᵢ − b) is the mean of
 * sᵢ minus b), so they must hold to rounding: 1e-12 of the largest |y|.
 */
import { describe, expect, it } from 'vitest';
import { PipelineCache, runPipeline } from '../../src/core/pipeline.ts';
import { emptyRecipe, makeRecipeStep, type Recipe } from '../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../src/core/steps/registry.ts';
import { createTrace, type Trace } from '../../src/core/trace.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import type { StepParams } from '../../src/core/steps/types.ts';
import { carryNoise } from '../../src/core/measure/noise-carry.ts';
import { constantProfile } from '../../src/core/measure/noise-profile.ts';

const N = 1000;
function trace(name: string, seed: number, peak = 10, sigma = 0.2): Trace {
  const rng = makeRng(seed);
  const x = Array.from({ length: N }, (_, i) => i * 0.1);
  const y = x.map((t) => 2 + 0.05 * t + peak * Math.exp(-0.5 * ((t - 50) / 0.8) ** 2) + 3 * Math.exp(-0.5 * ((t - 20) / 0.5) ** 2) + sigma * rng.normal());
  return createTrace({ name, x, y, source: { fileName: `${name}.csv`, sha256: '0'.repeat(64), rowsRead: N, rowsSkipped: 0 } });
}

function recipeOf(...steps: [string, Partial<StepParams>?][]): Recipe {
  const r = emptyRecipe();
  for (const [id, p] of steps) r.steps.push(makeRecipeStep(stepDefinition(id)!, p));
  return r;
}

function maxAbs(a: Float64Array): number { let m = 0; for (const v of a) m = Math.max(m, Math.abs(v)); return m; }
function maxDiff(a: Float64Array, b: Float64Array): number { let m = 0; for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i])); return m; }

const sample = trace('sample', 1);
const blank = trace('blank', 2, 0.4);
const scans = [trace('scan 2', 3), trace('scan 3', 4), trace('scan 4', 5)];
const raw = { x: sample.x, y: sample.y };

const LINEAR: [string, Partial<StepParams>][] = [
  ['moving-average', { window: 7 }],
  ['savitzky-golay', { window: 15, order: 3 }],
  ['frequency-filter', { kind: 'low-pass', cutoff: 0.2 }],
];

describe('companions follow the sample (linearity, alignment off)', () => {
  for (const [id, p] of LINEAR) {
    it(`${id}: step then subtract blank equals subtract blank then step, to 1e-12 of max |y| (linearity)`, () => {
      const a = runPipeline(raw, sample.id, recipeOf([id, p], ['blank-subtraction']), STEP_REGISTRY, { blank });
      const b = runPipeline(raw, sample.id, recipeOf(['blank-subtraction'], [id, p]), STEP_REGISTRY, { blank });
      expect(a.runs.every((r) => r.status === 'ok')).toBe(true);
      expect(b.runs.every((r) => r.status === 'ok')).toBe(true);
      expect(maxDiff(a.final.y, b.final.y)).toBeLessThanOrEqual(1e-12 * maxAbs(a.final.y));
      // And it is not trivially so: the raw blank would differ by the blank's smoothed-away noise.
      const naive = new Float64Array(N);
      const smoothedSample = runPipeline(raw, sample.id, recipeOf([id, p]), STEP_REGISTRY).final.y;
      for (let i = 0; i < N; i++) naive[i] = smoothedSample[i] - blank.y[i];
      expect(maxDiff(naive, a.final.y)).toBeGreaterThan(0.1);
    });

    it(`${id} then subtract blank then average scans equals ${id}, average scans, subtract blank (linearity)`, () => {
      const a = runPipeline(raw, sample.id, recipeOf([id, p], ['blank-subtraction'], ['ensemble-average']), STEP_REGISTRY, { blank, scans });
      const b = runPipeline(raw, sample.id, recipeOf([id, p], ['ensemble-average'], ['blank-subtraction']), STEP_REGISTRY, { blank, scans });
      expect(maxDiff(a.final.y, b.final.y)).toBeLessThanOrEqual(1e-12 * maxAbs(a.final.y));
    });
  }

  it('subtract blank then average scans equals average scans then subtract blank (the blank fully subtracted, not 1/n of it)', () => {
    const a = runPipeline(raw, sample.id, recipeOf(['blank-subtraction'], ['ensemble-average']), STEP_REGISTRY, { blank, scans });
    const b = runPipeline(raw, sample.id, recipeOf(['ensemble-average'], ['blank-subtraction']), STEP_REGISTRY, { blank, scans });
    expect(maxDiff(a.final.y, b.final.y)).toBeLessThanOrEqual(1e-12 * maxAbs(a.final.y));
    // Direct: mean of all four minus the blank.
    const want = new Float64Array(N);
    for (let i = 0; i < N; i++) want[i] = (sample.y[i] + scans.reduce((s, t) => s + t.y[i], 0)) / 4 - blank.y[i];
    expect(maxDiff(a.final.y, want)).toBeLessThanOrEqual(1e-12 * maxAbs(want));
  });

  it('the step notes say what was applied to the blank and scans; the blank is not subtracted from itself', () => {
    const r = runPipeline(raw, sample.id, recipeOf(['moving-average', { window: 5 }], ['blank-subtraction'], ['ensemble-average']), STEP_REGISTRY, { blank, scans });
    const [ma, bs, ea] = r.runs.map((x) => x.output!.notes.join(' '));
    expect(ma).toContain('Applied with the same parameters to the blank "blank", the scan "scan 2", the scan "scan 3", the scan "scan 4".');
    expect(bs).toContain('The blank is not subtracted from itself');
    expect(bs).toContain('the scan "scan 2"');
    expect(ea).toContain('Each scan was processed by every step before this one');
    // The processed blank: smoothed, not subtracted, not averaged.
    const maOnly = runPipeline({ x: blank.x, y: blank.y }, blank.id, recipeOf(['moving-average', { window: 5 }]), STEP_REGISTRY).final.y;
    expect(maxDiff(r.companions.blank!.y, maOnly)).toBe(0);
    // The raw companions are untouched.
    expect(r.companions.blank!.y).not.toBe(blank.y);
  });

  it('a step that does not fit a companion leaves it as it was and says so', () => {
    const short = createTrace({ name: 'short blank', x: [0, 50, 99.9, 100, 101, 102].slice(0, 5), y: [1, 1, 1, 1, 1], source: { fileName: 's.csv', sha256: '0'.repeat(64), rowsRead: 5, rowsSkipped: 0 } });
    const r = runPipeline(raw, sample.id, recipeOf(['moving-average', { window: 7 }]), STEP_REGISTRY, { blank: short });
    expect(r.runs[0].status).toBe('ok');
    expect(r.runs[0].output!.notes.join(' ')).toMatch(/Not applied to the blank "short blank", which stays as it was before this step: /);
    expect(r.companions.blank!.y).toBe(short.y);
  });

  it('companion outputs are cached like the sample\'s: a rerun takes every one from the cache', () => {
    const cache = new PipelineCache();
    const recipe = recipeOf(['moving-average', { window: 5 }], ['savitzky-golay', { window: 11, order: 2 }], ['blank-subtraction'], ['ensemble-average']);
    const first = runPipeline(raw, sample.id, recipe, STEP_REGISTRY, { blank, scans }, cache);
    const size = cache.size;
    // 4 sample outputs; blank through MA and SG (2); each scan through MA, SG and blank subtraction (9).
    expect(size).toBe(4 + 2 + 9);
    const second = runPipeline(raw, sample.id, recipe, STEP_REGISTRY, { blank, scans }, cache);
    expect(cache.size).toBe(size);
    expect(second.runs.every((r) => r.cached)).toBe(true);
    expect(second.companions.blank!.y).toBe(first.companions.blank!.y);
    second.companions.scans.forEach((s, k) => expect(s.y).toBe(first.companions.scans[k].y));
  });

  it('the processed blank\'s noise after a k-point moving average is within 5 % of σ/√k (mean of 200 seeded realisations; white noise, variance of a mean of k independent values)', () => {
    for (const k of [5, 15]) {
      let sum = 0;
      for (let r = 0; r < 200; r++) {
        const rng = makeRng(7000 + r);
        const x = Array.from({ length: 2000 }, (_, i) => i);
        const b = createTrace({ name: 'b', x, y: x.map(() => rng.normal()), source: { fileName: 'b.csv', sha256: '0'.repeat(64), rowsRead: 2000, rowsSkipped: 0 } });
        const s = createTrace({ name: 's', x, y: x.map(() => 0), source: { fileName: 's.csv', sha256: '0'.repeat(64), rowsRead: 2000, rowsSkipped: 0 } });
        const run = runPipeline({ x: s.x, y: s.y }, s.id, recipeOf(['moving-average', { window: k }]), STEP_REGISTRY, { blank: b });
        const pb = run.companions.blank!.y;
        // Interior only (the ends shrink the window); sample SD about the mean.
        let m = 0, q = 0, c = 0;
        for (let i = k; i < pb.length - k; i++) { m += pb[i]; c++; }
        m /= c;
        for (let i = k; i < pb.length - k; i++) q += (pb[i] - m) ** 2;
        sum += Math.sqrt(q / (c - 1));
      }
      const mean = sum / 200;
      console.log(`${k}-point moving average, 200 seeds: processed blank SD ${mean.toFixed(4)}, σ/√k ${(1 / Math.sqrt(k)).toFixed(4)}`);
      expect(Math.abs(mean / (1 / Math.sqrt(k)) - 1)).toBeLessThan(0.05);
    }
  });

  it('carried noise counts the blank as processed: after a 5-point average and blank subtraction σ² = (σs² + σb²)/5', () => {
    const recipe = recipeOf(['moving-average', { window: 5 }], ['blank-subtraction']);
    const run = runPipeline(raw, sample.id, recipe, STEP_REGISTRY, { blank });
    const white = Float64Array.of(1);
    const src = (s: number) => ({ sigma: s, rho: white, profile: constantProfile(N, s) });
    const c = carryNoise(raw, run, recipe, STEP_REGISTRY, { blank }, { sample: src(0.2), blank: src(0.3) }, 'companions-test');
    expect(c.route).toBe('linear');
    expect(c.sigma).toBeCloseTo(Math.sqrt((0.04 + 0.09) / 5), 10);
    // Before issue 20 the raw blank was subtracted: σ² = 0.04/5 + 0.09.
    expect(Math.abs(c.sigma - Math.sqrt(0.04 / 5 + 0.09))).toBeGreaterThan(0.1);
  });
});
