// Traces the fit was not designed around: a long region under a strong curved drift, a band wider
// than the region, correlated (AR(1)) noise on the raw trace. Seeded noise (src/core/numeric/random.ts).
import { describe, expect, it } from 'vitest';
import { comparePeakCounts, supportedPeakCount } from '../../../../src/core/measure/fit/count.ts';
import { fitRegion } from '../../../../src/core/measure/fit/region.ts';
import { SHAPES } from '../../../../src/core/measure/fit/shapes.ts';
import { makeRng } from '../../../../src/core/numeric/random.ts';

describe('robustness', () => {
  it('20 000 points under a quadratic drift 20× the peak height: both peaks found, left to right, within 5 SE', () => {
    const rng = makeRng(31);
    const n = 20000;
    const x = Float64Array.from({ length: n }, (_, i) => i * 5e-4);
    const y = x.map((v) => 0.5 + 0.3 * v + 0.2 * v * v);
    SHAPES.gaussian.evaluate(x, [4, 1, 0.5], 0, y, null, 0);
    SHAPES.gaussian.evaluate(x, [4.6, 0.4, 0.4], 0, y, null, 0);
    for (let i = 0; i < n; i++) y[i] += 0.05 * rng.normal();
    const out = fitRegion(x, y, { from: 0, to: 10, peaks: 2, baseline: 'quadratic' });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const [a, b] = out.fit.peaks;
    expect(Math.abs(a.position.value - 4)).toBeLessThan(5 * a.position.se);
    expect(Math.abs(b.position.value - 4.6)).toBeLessThan(5 * b.position.se);
    expect(Math.abs(a.height.value - 1)).toBeLessThan(5 * a.height.se);
    expect(out.fit.assumptions.every((q) => q.held !== false)).toBe(true);
  });

  it('a band wider than the region: one component, flagged as pinned at the largest width', () => {
    const rng = makeRng(32);
    const x = Float64Array.from({ length: 400 }, (_, i) => i * 0.01);
    const y = new Float64Array(400);
    SHAPES.gaussian.evaluate(x, [2, 1, 10], 0, y, null, 0);
    for (let i = 0; i < 400; i++) y[i] += 0.01 * rng.normal();
    const out = supportedPeakCount(x, y, { from: 0, to: 4 });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.result.count).toBe(1);
    const bounds = out.result.fit.assumptions.find((q) => q.name === 'inside bounds');
    expect(bounds?.held).toBe(false);
    expect(bounds?.detail).toMatch(/fwhm \(upper bound\)/);
  });

  it('AR(1) noise (φ = 0.8) under one Gaussian: an extra peak in at most 10 of 50 (measured 5; plain BIC would: 49 of 50)', () => {
    const rng = makeRng(33);
    const n = 500;
    const x = Float64Array.from({ length: n }, (_, i) => 3 + i * 0.01);
    let wrong = 0;
    let wrongPlain = 0;
    for (let r = 0; r < 50; r++) {
      const y = x.map(() => 0.2);
      SHAPES.gaussian.evaluate(x, [5.5, 1, 0.2355], 0, y, null, 0);
      let e = 0;
      for (let i = 0; i < n; i++) {
        e = 0.8 * e + 0.02 * rng.normal();
        y[i] += e;
      }
      const out = comparePeakCounts(x, y, { from: 3, to: 8, peaks: 1 });
      expect(out.ok).toBe(true);
      if (!out.ok) return;
      if (out.comparison.supported) wrong++;
      if (out.comparison.deltaBicPlain < 0 && out.comparison.problems.length === 0) wrongPlain++;
    }
    expect(wrong).toBeLessThanOrEqual(10);
    expect(wrongPlain).toBeGreaterThanOrEqual(40);
  });
});
