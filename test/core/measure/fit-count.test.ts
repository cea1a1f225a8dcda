// Peak-count choice (BIC, Schwarz 1978) and the across-processing helper. Seeded noise
// (src/core/numeric/random.ts); region of 500 points, Gaussians of σ = 0.1 (FWHM 0.2355).
import { describe, expect, it } from 'vitest';
import { comparePeakCounts, supportedPeakCount } from '../../../src/core/measure/fit/count.ts';
import { peakCountAcrossProcessing } from '../../../src/core/measure/fit/processing.ts';
import { correlationTime } from '../../../src/core/measure/fit/region.ts';
import { FWHM_PER_SIGMA, SHAPES } from '../../../src/core/measure/fit/shapes.ts';
import { makeRng, normalArray } from '../../../src/core/numeric/random.ts';
import { movingAverage } from '../../../src/core/steps/moving-average.ts';

const N = 500;
const x = Float64Array.from({ length: N }, (_, i) => 3 + i * 0.01);
const W = 0.1 * FWHM_PER_SIGMA;

function trace(peaks: [number, number][], noise: number, seed: number): Float64Array {
  const rng = makeRng(seed);
  const y = x.map((v) => 0.2 + 0.05 * (v - 3));
  for (const [c, h] of peaks) SHAPES.gaussian.evaluate(x, [c, h, W], 0, y, null, 0);
  return y.map((v) => v + noise * rng.normal());
}
const SHOULDER: [number, number][] = [
  [5.2, 1],
  [5.52, 0.3],
];

describe('correlation time of residuals (Geyer 1992 initial positive sequence)', () => {
  it('white noise ≈ 1; a k-point moving average of white noise ≈ k (τ = (Σc)²/Σc²)', () => {
    const e = normalArray(42, 20000);
    expect(correlationTime(e)).toBeLessThan(1.2);
    for (const k of [5, 15]) expect(correlationTime(movingAverage(e, k)) / k).toBeGreaterThan(0.8);
    for (const k of [5, 15]) expect(correlationTime(movingAverage(e, k)) / k).toBeLessThan(1.2);
  });
});

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

describe('does each processing still support the same number of peaks?', () => {
  it('plain BIC on a 7-point average over-counts; with n/τ it keeps the raw count (20 seeds)', () => {
    let sameRaw = 0;
    let sameAvg = 0;
    let plainWouldAdd = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const y = trace(SHOULDER, 0.03, 100 + seed);
      const r = peakCountAcrossProcessing(x, [{ label: 'raw', y }, { label: '7-point average', y: movingAverage(y, 7), noiseCorrelationTime: 7 }], {
        from: 3,
        to: 8,
      });
      if (r.rows[0].count === 2) sameRaw++;
      if (r.rows[1].count === 2) sameAvg++;
      // The step that stopped the count: would the plain BIC (all n points independent) have gone on?
      const last = r.rows[1].result?.comparisons.at(-1);
      if (last && !last.supported && last.deltaBicPlain < 0) plainWouldAdd++;
    }
    // Measured with these seeds: 19/20 keep 2 peaks with n/τ; the plain BIC would add a third in 20/20.
    expect(plainWouldAdd).toBeGreaterThanOrEqual(10);
    expect(sameRaw).toBe(20);
    expect(sameAvg).toBeGreaterThanOrEqual(18);
  });
  it('a version that lost the shoulder is named in the ledger sentence', () => {
    const y = trace(SHOULDER, 0.03, 9);
    // Stand-in for a processing that erased the shoulder: the same noise, the shoulder left out.
    const lost = trace([SHOULDER[0]], 0.03, 9);
    const r = peakCountAcrossProcessing(x, [{ label: 'raw', y }, { label: 'shoulder-erasing step', y: lost }], { from: 3, to: 8 });
    expect(r.referenceCount).toBe(2);
    expect(r.rows[1].count).toBe(1);
    expect(r.fewer).toEqual(['shoulder-erasing step']);
    expect(r.rows[1].statement).toBe('2 peaks supported by the fit on raw, not after shoulder-erasing step (1).');
    expect(r.summary).toBe('2 peaks supported by the fit on raw, not after shoulder-erasing step (1).');
  });
  it('a version on another grid, or one that cannot be fitted, gets a message, not an exception', () => {
    const y = trace(SHOULDER, 0.03, 10);
    const r = peakCountAcrossProcessing(x, [{ label: 'raw', y }, { label: 'resampled', y: y.slice(0, 250) }], { from: 3, to: 8 });
    expect(r.rows[1].count).toBeNull();
    expect(r.rows[1].statement).toMatch(/not on the same x grid/);
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
