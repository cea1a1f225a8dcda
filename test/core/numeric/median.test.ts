// src/core/numeric/median.ts: the project's one median, MAD scale and robust
// noise estimate from differences.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { BUCKET_MIN, MAD_TO_SIGMA, medianInPlace, medianMadInPlace, medianOf, robustSigmaOfDifferences } from '../../../src/core/numeric/median.ts';
import { normalArray } from '../../../src/core/numeric/random.ts';

describe('median', () => {
  it('is the middle value, or the mean of the two middle ones (worked by hand)', () => {
    expect(medianOf([5, 1, 4, 2, 3])).toBe(3);
    expect(medianOf([4, 1, 3, 2])).toBe(2.5);
    expect(medianOf([])).toBeNaN();
  });

  it('equals sorting and taking the middle on sorted, reversed, constant and random data', () => {
    const cases = [
      Float64Array.from({ length: 1001 }, (_, i) => i),
      Float64Array.from({ length: 1000 }, (_, i) => 1000 - i),
      new Float64Array(999).fill(7),
      normalArray(11, 10_001),
      normalArray(12, 10_000),
    ];
    for (const c of cases) {
      const s = Float64Array.from(c).sort();
      const h = s.length >> 1;
      const expected = s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
      const before = Array.from(c);
      expect(medianOf(c)).toBe(expected);
      expect(Array.from(c)).toEqual(before);
      expect(medianInPlace(Float64Array.from(c))).toBe(expected);
    }
  });

  it('median and MAD of [1, 2, 3, 4, 100]: 3 and 1 (worked by hand: deviations 2, 1, 0, 1, 97)', () => {
    expect(medianMadInPlace(Float64Array.of(1, 2, 3, 4, 100))).toEqual({ median: 3, mad: 1 });
    // Only the first `count` values count.
    expect(medianMadInPlace(Float64Array.of(1, 2, 3, 4, 100), 3)).toEqual({ median: 2, mad: 1 });
  });

  it('MAD_TO_SIGMA is 1/Φ⁻¹(3/4) to 4 decimals (Φ⁻¹(3/4) = 0.6744897501960817, scipy.stats.norm.ppf(0.75))', () => {
    expect(MAD_TO_SIGMA).toBeCloseTo(1 / 0.6744897501960817, 4);
  });

  it('the robust σ from first differences of seeded white noise of σ = 2 is within 2 % (10⁵ points), and one outlier in a hundred barely moves it', () => {
    const y = normalArray(2026, 100_000).map((v) => 2 * v);
    const d = new Float64Array(y.length - 1);
    for (let i = 0; i < d.length; i++) d[i] = y[i + 1] - y[i];
    const spiked = Float64Array.from(y);
    for (let i = 0; i < spiked.length; i += 100) spiked[i] += 1000;
    const ds = new Float64Array(y.length - 1);
    for (let i = 0; i < ds.length; i++) ds[i] = spiked[i + 1] - spiked[i];
    const clean = robustSigmaOfDifferences(d, Math.SQRT2);
    expect(Math.abs(clean / 2 - 1)).toBeLessThan(0.02);
    // Two differences in a hundred are hit: the MAD moves by a few per cent, the RMS by a factor of ~140.
    expect(Math.abs(robustSigmaOfDifferences(ds, Math.SQRT2) / clean - 1)).toBeLessThan(0.05);
  });

  // Long arrays are counted into buckets (medianByBuckets) instead of copied and selected: the value must still be
  // the one sorting gives, whatever the distribution.
  const sortMedian = (c: Float64Array) => {
    const s = Float64Array.from(c).sort();
    const h = s.length >> 1;
    return s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
  };

  it('on long arrays (counted into buckets) equals sorting and taking the middle: normal, outliers, ties, piles, huge and tiny ranges, odd and even counts', () => {
    const n = BUCKET_MIN;
    const normal = normalArray(31, n + 1);
    const cases: Float64Array[] = [
      normal, normal.subarray(0, n),
      normalArray(32, 1_000_000),
      // One huge outlier: nearly every value in one bucket, which then holds more than a quarter (the copy path).
      Float64Array.from(normal, (v, i) => (i === 7 ? 1e12 : v)),
      // Rounded to 3 decimals: many ties within and across buckets.
      Float64Array.from(normal, (v) => Math.round(v * 1000) / 1000),
      // Two piles: the middle falls between them (the other middle value in a lower bucket).
      Float64Array.from({ length: n }, (_, i) => (i % 2 ? 5 : -3)),
      Float64Array.from({ length: n + 2 }, (_, i) => (i < (n + 2) / 2 ? i * 1e-3 : 1e6 + i)),
      // Ranges that overflow or underflow the scale.
      Float64Array.from(normal, (v) => v * 1e307),
      Float64Array.from(normal, (v) => v * 1e-310),
      Float64Array.from({ length: n }, (_, i) => (i === 0 ? -Infinity : i)),
      new Float64Array(n).fill(-2.5),
    ];
    for (const c of cases) {
      const before = Float64Array.from(c);
      expect(medianOf(c)).toBe(sortMedian(c));
      expect(c).toEqual(before);
    }
  });

  it('on long arrays equals the sorted middle for arbitrary finite values (fast-check)', () => {
    fc.assert(fc.property(
      fc.integer({ min: 0, max: 2 }), fc.integer({ min: 1, max: 2 ** 31 - 1 }), fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: 0, max: 300 }),
      (extra, seed, shift, distinct) => {
        const base = normalArray(seed, BUCKET_MIN + extra);
        // Either smooth data or only `distinct` different values (piles), shifted.
        const c = Float64Array.from(base, (v) => (distinct > 0 ? Math.round(v * distinct) / distinct : v) + shift);
        expect(medianOf(c)).toBe(sortMedian(c));
      },
    ), { numRuns: 40 });
  });
});

