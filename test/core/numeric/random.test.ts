import { describe, expect, it } from 'vitest';
import { makeRng } from '../../../src/core/numeric/random.ts';

describe('makeRng (mulberry32 + Box–Muller)', () => {
  it('is repeatable for a seed and differs between seeds', () => {
    const a = makeRng(42), b = makeRng(42), c = makeRng(43);
    const sa = Array.from({ length: 20 }, () => a.normal());
    expect(Array.from({ length: 20 }, () => b.normal())).toEqual(sa);
    expect(Array.from({ length: 20 }, () => c.normal())).not.toEqual(sa);
  });

  it('uniforms lie in [0, 1) with mean 1/2 and variance 1/12', () => {
    // Uniform(0, 1): mean 1/2, variance 1/12 (textbook). N = 1e5: SE of the mean 0.00091, of the variance ≈ 0.00024; 5 SE.
    const r = makeRng(7);
    const N = 100000;
    let s = 0, s2 = 0, lo = 1, hi = 0;
    for (let i = 0; i < N; i++) { const u = r.uniform(); s += u; s2 += u * u; lo = Math.min(lo, u); hi = Math.max(hi, u); }
    const mean = s / N;
    expect(lo).toBeGreaterThanOrEqual(0);
    expect(hi).toBeLessThan(1);
    expect(Math.abs(mean - 0.5)).toBeLessThan(5 * 0.00091);
    expect(Math.abs(s2 / N - mean * mean - 1 / 12)).toBeLessThan(5 * 0.00024);
  });

  it('normals have mean 0, SD 1 and the normal tail fraction beyond 1.96 (4.9996 %)', () => {
    // P(|Z| > 1.96) = 0.049996 (standard normal table). N = 1e5: SE of the mean 0.0032, of the SD 0.0022,
    // of the tail fraction √(0.05·0.95/N) = 0.00069; 5 SE each.
    const r = makeRng(8);
    const N = 100000;
    let s = 0, s2 = 0, tail = 0;
    for (let i = 0; i < N; i++) { const z = r.normal(); s += z; s2 += z * z; if (Math.abs(z) > 1.96) tail++; }
    const mean = s / N;
    expect(Math.abs(mean)).toBeLessThan(5 * 0.0032);
    expect(Math.abs(Math.sqrt(s2 / N - mean * mean) - 1)).toBeLessThan(5 * 0.0022);
    expect(Math.abs(tail / N - 0.049996)).toBeLessThan(5 * 0.00069);
  });

  it('refuses a seed that is not a finite number', () => {
    expect(() => makeRng(NaN)).toThrow(RangeError);
  });
});
