import { describe, expect, it } from 'vitest';
import { defaultPeakOptions, detectPeaks } from '../../../src/core/measure/peak-table.ts';
import { findLocalMaxima, peakProminences } from '../../../src/core/measure/peak-detection.ts';
import { PipelineCache } from '../../../src/core/pipeline.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import type { StepOutput } from '../../../src/core/steps/types.ts';

/** Seeded trace: Gaussian peaks on white noise of SD 0.05 (invented data). */
function trace(n: number, seed: number): { x: Float64Array; y: Float64Array } {
  const rng = makeRng(seed);
  const x = new Float64Array(n), y = new Float64Array(n);
  for (let i = 0; i < n; i++) { x[i] = i * 0.01; y[i] = 0.05 * rng.normal(); }
  for (let k = 0; k < n / 400; k++) {
    const c = rng.uniform() * n, s = 3 + 20 * rng.uniform(), h = 0.2 + 3 * rng.uniform();
    for (let i = Math.max(0, Math.floor(c - 6 * s)); i <= Math.min(n - 1, Math.ceil(c + 6 * s)); i++) y[i] += h * Math.exp(-0.5 * ((i - c) / s) ** 2);
  }
  return { x, y };
}

describe('detectPeaks with reused temporaries', () => {
  it('gives the same table for a trace whatever was detected before, and earlier tables stay as they were', () => {
    const a = trace(20000, 11), b = trace(5000, 12);
    const o = defaultPeakOptions(0.05, 0.01);
    const first = detectPeaks(a.x, a.y, o);
    const firstJson = JSON.stringify(first);
    detectPeaks(b.x, b.y, { ...o, negative: true });
    const again = detectPeaks(a.x, a.y, o);
    expect(JSON.stringify(again)).toBe(firstJson);
    expect(JSON.stringify(first)).toBe(firstJson);
    expect(first.length).toBeGreaterThan(10);
  });

  it('keeps the exported primitives returning their own arrays (not the reused ones)', () => {
    const a = trace(20000, 13);
    const maxima = findLocalMaxima(a.y);
    const prom = peakProminences(a.y, maxima);
    const copy = Float64Array.from(prom.prominences);
    detectPeaks(a.x, a.y, defaultPeakOptions(0.05, 0.01));
    expect(Array.from(prom.prominences)).toEqual(Array.from(copy));
  });
});

describe('PipelineCache byte budget', () => {
  const out = (x: Float64Array, n: number): StepOutput => ({ x, y: new Float64Array(n), notes: [] });

  it('counts a shared x once and drops the oldest outputs beyond the budget, keeping the newest', () => {
    const n = 1000, bytes = 8 * n;
    const x = new Float64Array(n);
    const cache = new PipelineCache(64, 3 * bytes);
    cache.set('a', out(x, n));
    expect(cache.bytes).toBe(2 * bytes);
    cache.set('b', out(x, n)); // shares x: one more y only
    expect(cache.bytes).toBe(3 * bytes);
    expect(cache.size).toBe(2);
    cache.set('c', out(x, n)); // 4 × bytes > budget: 'a' goes
    expect(cache.get('a')).toBeUndefined();
    expect(cache.get('b')).toBeDefined();
    expect(cache.bytes).toBe(3 * bytes);
    const big = new PipelineCache(64, 10);
    big.set('only', out(x, n));
    expect(big.size).toBe(1); // the newest stays even over budget
    big.clear();
    expect(big.bytes).toBe(0);
  });
});
