// Does each processing still support the same number of peaks (src/core/measure/fit/processing.ts)?
// BIC (Schwarz 1978) with n/τ effective points for correlated noise; cases moved from fit-count.test.ts. Seeded noise
// (src/core/numeric/random.ts); region of 500 points, Gaussians of σ = 0.1 (FWHM 0.2355).
import { describe, expect, it } from 'vitest';
import { peakCountAcrossProcessing } from '../../../../src/core/measure/fit/processing.ts';
import { SHOULDER, trace, x } from './shoulder-fixture.ts';
import { movingAverage } from '../../../../src/core/steps/moving-average.ts';


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
