// The noise figure the page and exports use (src/core/measure/noise-report.ts).
// Sources: white noise through a k-point moving average keeps σ/√k (REFERENCES.md;
// any statistics text); the SE of an SD estimate ≈ 1/√(2N) (from memory) for the
// tolerances; RMS about a straight line over a marked range, by hand.
import { describe, expect, it } from 'vitest';
import { DEFAULT_NOISE_SETTINGS, cachedNoiseModel, measureNoise, noiseCheckLines, noiseSummaryLines } from '../../../src/core/measure/noise-report.ts';
import { runPipeline } from '../../../src/core/pipeline.ts';
import { emptyRecipe, makeRecipeStep } from '../../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../../src/core/steps/registry.ts';
import { normalArray } from '../../../src/core/numeric/random.ts';

const n = 20000, sigma = 0.4;
const x = Float64Array.from({ length: n }, (_, i) => i * 0.01);
const y = Float64Array.from(normalArray(31, n), (e, i) => 5 + 0.001 * i + sigma * e);
const raw = { x, y };

describe('measureNoise on the raw trace', () => {
  it('automatic: σ of seeded white noise on a slow drift within 5 %, assumptions held, checks listed', () => {
    const r = measureNoise(raw, raw, DEFAULT_NOISE_SETTINGS, null);
    // SE of an SD from 2·10⁴ points ≈ 0.5 %; the automatic estimate uses differences and a robust scale, so allow 5 %.
    expect(Math.abs(r.sigma.sigma / sigma - 1)).toBeLessThan(0.05);
    expect(r.carried).toBeNull();
    expect(r.profile.points).toBe(n);
    expect(r.assumptionsHeld).toBe(r.checks.every((c) => c.held !== false));
    expect(r.sigma.description.length).toBeGreaterThan(20);
  });

  it('rms over a marked quiet range: RMS about a line, by hand on a ±a alternation on a slope', () => {
    const a = 0.25;
    const qy = Float64Array.from(x, (v, i) => 2 + 3 * v + (i % 2 ? a : -a));
    const q = { x, y: qy };
    const r = measureNoise(q, q, { method: 'rms', quietRange: [10, 30] }, null);
    // RMS of ±a about the fitted line is a (the line's tilt from an even count of ± points is negligible: SD with n − 2 divisor ≈ a·√(N/(N − 2))).
    expect(r.sigma.sigma).toBeCloseTo(a, 3);
    expect(r.peakToPeak?.sigma).toBeCloseTo(2 * a, 6);
  });

  it('an unknown method from an older session falls back to the automatic estimate and says so', () => {
    const r = measureNoise(raw, raw, { method: 'nonsense' as never, quietRange: null }, null);
    expect(r.notes.join(' ')).toMatch(/no longer offered/);
    expect(Math.abs(r.sigma.sigma / sigma - 1)).toBeLessThan(0.05);
  });

  it('a blank method without a blank is a note and a failed assumption, never a silent fallback', () => {
    const r = measureNoise(raw, raw, { method: 'blank', quietRange: null }, null);
    expect(r.notes.length + r.checks.filter((c) => c.held === false).length).toBeGreaterThan(0);
    expect(r.assumptionsHeld).toBe(false);
  });
});

describe('measureNoise carried through a stack', () => {
  it('a 9-point moving average: σ/3 on the measured trace (white noise, σ/√k)', () => {
    const recipe = emptyRecipe();
    recipe.steps.push(makeRecipeStep(stepDefinition('moving-average')!, { window: 9 } as never));
    const run = runPipeline(raw, 'noise-report-test', recipe, STEP_REGISTRY);
    const r = measureNoise(run.final, raw, DEFAULT_NOISE_SETTINGS, { run, recipe, registry: STEP_REGISTRY, ctx: {}, cacheKey: 'noise-report-test' });
    expect(r.carried).not.toBeNull();
    expect(Math.abs(r.sigma.sigma / (r.rawSigma!.sigma / 3) - 1)).toBeLessThan(0.01);
    expect(r.sigma.method).toMatch(/carried-/);
  });
});

describe('lines for the exports', () => {
  it('each check in words with held / DID NOT HOLD / not tested', () => {
    expect(noiseCheckLines([
      { id: 'a', held: true, text: 'one' }, { id: 'b', held: false, text: 'two' }, { id: 'c', held: null, text: 'three' },
    ] as never)).toEqual(['Noise check (held): one', 'Noise check (DID NOT HOLD): two', 'Noise check (not tested): three']);
  });

  it('the summary states the verdict first and marks a provisional S/N', () => {
    const r = measureNoise(raw, raw, DEFAULT_NOISE_SETTINGS, null);
    const lines = noiseSummaryLines(r);
    expect(lines[0]).toMatch(r.assumptionsHeld ? /all that could be tested held/ : /DID NOT HOLD/);
    expect(lines.some((l) => /PROVISIONAL/.test(l))).toBe(false);
    expect(noiseSummaryLines({ ...r, provisional: true, assumptionsHeld: false }).join('\n')).toMatch(/AT LEAST ONE DID NOT HOLD[\s\S]*PROVISIONAL/);
  });

  it('cachedNoiseModel returns the same model for the same array', () => {
    const a = cachedNoiseModel(y);
    expect(cachedNoiseModel(y)).toBe(a);
  });
});
