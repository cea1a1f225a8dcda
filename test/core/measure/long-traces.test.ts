/**
 * Long traces of the kinds issue 14 was found on, invented here (no real
 * physiological recording is available offline): a 108,000-point trace shaped
 * like an electrocardiogram (narrow tall beats every 200 points, broad waves
 * between, respiratory wander of 50 σ and a random walk), and 10⁶ points of
 * noise. White noise σ = 1 is added, so the truth is known. Before this
 * change, S/N came out 2.3–3.4 × too high on such traces after smoothing.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../../src/core/analysis/index.ts';
import { emptyRecipe, makeRecipeStep, type Recipe } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { createTrace } from '../../../src/core/trace.ts';
import { makeRng, normalArray } from '../../../src/core/numeric/random.ts';
import { addGaussian } from './families.ts';

function ecgLike(n: number, seed: number): Float64Array {
  const rng = makeRng(seed);
  const y = new Float64Array(n);
  let walk = 0;
  for (let i = 0; i < n; i++) {
    walk += 0.05 * rng.normal();
    y[i] = walk + 50 * Math.sin((2 * Math.PI * i) / 1000) + rng.normal();
  }
  for (let c = 100; c < n - 60; c += 190 + 20 * rng.uniform()) {
    addGaussian(y, c - 40, 25, 15);      // P wave
    addGaussian(y, c - 3, 3, -20);       // Q
    addGaussian(y, c, 6, 120);           // R: narrow and tall
    addGaussian(y, c + 4, 3, -30);       // S
    addGaussian(y, c + 60, 40, 30);      // T wave
  }
  return y;
}

function run(y: Float64Array, rec: Recipe) {
  const x = Float64Array.from({ length: y.length }, (_, i) => i / 250);
  const t = createTrace({ id: 'l', name: 'l', x, y, source: { fileName: 'l.csv', sha256: '0'.repeat(64), rowsRead: y.length, rowsSkipped: 0 } });
  return analyse({ sampleId: 'l', scanIds: [], recipe: rec }, new Map([['l', t]]), STEP_REGISTRY);
}

function recipe(...steps: [string, Record<string, unknown>][]): Recipe {
  const r = emptyRecipe();
  for (const [id, p] of steps) r.steps.push(makeRecipeStep(STEP_REGISTRY.find((d) => d.id === id)!, p as never));
  return r;
}

describe('long traces', () => {
  it('electrocardiogram-like trace, 108,000 points: raw σ within 5 %; after a 5-point average within 5 % of 1/√5', () => {
    const y = ecgLike(108000, 1);
    const raw = run(y, emptyRecipe());
    expect(Math.abs(raw.noise!.sigma.sigma - 1)).toBeLessThan(0.05);
    const ma = run(y, recipe(['moving-average', { window: 5 }]));
    expect(Math.abs(ma.noise!.sigma.sigma * Math.sqrt(5) - 1)).toBeLessThan(0.05);
    expect(ma.noise!.carried!.route).toBe('linear');
  }, 120_000);

  it('10⁶ points of white noise after Savitzky–Golay 11/2: within 3 % of 0.4555 (√Σc², REFERENCES.md)', () => {
    const r = run(normalArray(77, 1_000_000), recipe(['savitzky-golay', { window: 11, order: 2 }]));
    expect(Math.abs(r.noise!.sigma.sigma / 0.4555 - 1)).toBeLessThan(0.03);
  }, 120_000);
});
