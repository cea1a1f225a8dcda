// Peak-count choice (BIC, Schwarz 1978) (src/core/measure/fit/count.ts); the across-processing
// helper is tested in processing.test.ts, the correlation time in region.test.ts. Seeded noise
// (src/core/numeric/random.ts); region of 500 points, Gaussians of σ = 0.1 (FWHM 0.2355).
import { describe, expect, it } from 'vitest';
import { comparePeakCounts, supportedPeakCount } from '../../../../src/core/measure/fit/count.ts';
import { N, SHOULDER, trace, x } from './shoulder-fixture.ts';



describe('k versus k + 1 peaks', () => {
  it('a clear shoulder: two peaks supported, with the criterion named and F / AIC as figures', () => {
    const out = comparePeakCounts(x, trace(SHOULDER, 0.03, 5), { from: 3, to: 8, peaks: 1 });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const c = out.comparison;
    expect(c.supported).toBe(true);
    expect(c.chosenCount).toBe(2);
    expect(c.criterion).toMatch(/^BIC/);
    expect(c.statement).toMatch(/The data support 2 peaks rather than 1/);
    expect(c.deltaBic).toBeLessThan(0);
    expect(c.fStatistic.df1).toBe(3);
    expect(c.fStatistic.df2).toBe(N - 8);
    expect(c.fStatistic.value).toBeGreaterThan(10);
    expect(c.larger.curves.residual.length).toBe(N);
    expect(c.smaller.curves.residual.length).toBe(N);
    expect(c.larger.peaks.map((p) => p.position.value)).toEqual([expect.closeTo(5.2, 1), expect.closeTo(5.52, 1)]);
  });
  it('a lone Gaussian: the extra peak is said plainly to be not supported', () => {
    const out = comparePeakCounts(x, trace([[5.5, 1]], 0.02, 6), { from: 3, to: 8, peaks: 1 });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.comparison.supported).toBe(false);
    expect(out.comparison.chosenCount).toBe(1);
    expect(out.comparison.statement).toMatch(/^The extra peak is not supported/);
  });
  it('a single-sample spike beside a peak is not a peak: the minimum width keeps it out', () => {
    const y = trace([[5.5, 1]], 0.01, 7);
    y[150] += 0.5;
    const out = comparePeakCounts(x, y, { from: 3, to: 8, peaks: 1 });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const c = out.comparison;
    // Either BIC rejects the extra component or it is pinned at the minimum width; in both cases not supported.
    expect(c.supported).toBe(false);
  });
  it('forward choice finds three separated peaks and stops', () => {
    const y = trace(
      [
        [4.0, 1],
        [5.5, 0.6],
        [7.0, 0.8],
      ],
      0.02,
      8,
    );
    const out = supportedPeakCount(x, y, { from: 3, to: 8 });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.result.count).toBe(3);
    expect(out.result.comparisons.length).toBe(3);
    expect(out.result.comparisons[2].supported).toBe(false);
  });
});


describe('every fit says how it was made', () => {
  it('the method names the solver, baseline, region and where the starting peaks came from', () => {
    const out = comparePeakCounts(x, trace(SHOULDER, 0.03, 11), { from: 3, to: 8, peaks: 1 });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.comparison.smaller.method).toMatch(/Levenberg–Marquardt.*straight local baseline.*500 points.*Starting peaks: 1 at maxima found in the region/);
    expect(out.comparison.larger.method).toMatch(/Starting peaks: 1 from the 1-peak fit; 1 added at the best of \d residual maxima\./);
  });
});
