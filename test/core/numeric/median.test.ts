// src/core/numeric/median.ts: the project's one median, MAD scale and robust
// noise estimate from differences.
import { describe, expect, it } from 'vitest';
import { MAD_TO_SIGMA, medianInPlace, medianMadInPlace, medianOf, robustSigmaOfDifferences } from '../../../src/core/numeric/median.ts';
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
});
