// Seeded noise, 200 realisations per case (seeded generator, src/core/numeric/random.ts).
// Truth: Gaussians of σ = 0.1 min (FWHM 0.2355) sampled every 0.01 min over 5 min (500 points)
// on a sloped line. S/N here is height / noise SD (the RMS form, H/σ; REFERENCES.md).
// Measured with these seeds (Node 20): two peaks chosen in 200 of 200; mean area bias main peak +0.03 %,
// shoulder (S/N 10) +0.24 % (its standard error of the mean is about 0.3 %, so no bias is resolved);
// single Gaussian at S/N 10 +0.001 %; area SD / RMS of the reported SEs 0.95, 1.02 and 1.07;
// second peak wrongly chosen for the S/N 100 Gaussian in 2 of 200.
import { describe, expect, it } from 'vitest';
import { comparePeakCounts } from '../../../../src/core/measure/fit/count.ts';
import { fitRegion } from '../../../../src/core/measure/fit/region.ts';
import { FWHM_PER_SIGMA, GAUSS_AREA, SHAPES } from '../../../../src/core/measure/fit/shapes.ts';
import { makeRng } from '../../../../src/core/numeric/random.ts';

const N = 500;
const x = Float64Array.from({ length: N }, (_, i) => 3 + i * 0.01);
const W = 0.1 * FWHM_PER_SIGMA;
const R = 200;

function clean(peaks: [number, number][]): Float64Array {
  const y = x.map((v) => 0.2 + 0.05 * (v - 3));
  for (const [c, h] of peaks) SHAPES.gaussian.evaluate(x, [c, h, W], 0, y, null, 0);
  return y;
}

function stats(values: number[]) {
  const mean = values.reduce((s, v) => s + v, 0) / values.length;
  const sd = Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (values.length - 1));
  return { mean, sd };
}
const rms = (v: number[]) => Math.sqrt(v.reduce((s, e) => s + e * e, 0) / v.length);

// Shoulder: main peak height 1 at 5.2, shoulder 0.3 at Rs 0.8 (Δt = 0.8 · 4σ = 0.32 min for equal σ,
// the baseline-width form, equal to the half-height form with the exact √(2 ln 2); REFERENCES.md).
const SHOULDER = clean([
  [5.2, 1],
  [5.52, 0.3],
]);
const SHOULDER_NOISE = 0.03; // shoulder S/N = 10

describe('Monte Carlo, 200 seeded realisations', () => {
  it('shoulder of S/N 10 at Rs 0.8: two peaks chosen (BIC) in ≥ 90 %; areas unbiased within 2 %; SEs match the spread within 20 %', () => {
    const rng = makeRng(1801);
    let two = 0;
    const areas: number[][] = [[], []];
    const ses: number[][] = [[], []];
    for (let r = 0; r < R; r++) {
      const y = SHOULDER.map((v) => v + SHOULDER_NOISE * rng.normal());
      // No starting peaks: the single peak is found in the region and the second grown from the residual.
      const out = comparePeakCounts(x, y, { from: 3, to: 8, peaks: 1 });
      expect(out.ok).toBe(true);
      if (!out.ok) return;
      if (out.comparison.supported) two++;
      out.comparison.larger.peaks.forEach((p, k) => {
        areas[k].push(p.area.value);
        ses[k].push(p.area.se);
      });
    }
    expect(two).toBeGreaterThanOrEqual(0.9 * R);
    const truth = [1 * W * GAUSS_AREA, 0.3 * W * GAUSS_AREA];
    for (let k = 0; k < 2; k++) {
      const s = stats(areas[k]);
      expect(Math.abs(s.mean / truth[k] - 1)).toBeLessThan(0.02);
      expect(Math.abs(s.sd / rms(ses[k]) - 1)).toBeLessThan(0.2);
    }
  });

  it('single Gaussian at S/N 10: area unbiased within 2 %, SE matches the spread within 20 %', () => {
    const rng = makeRng(1802);
    const y0 = clean([[5.5, 1]]);
    const areas: number[] = [];
    const ses: number[] = [];
    for (let r = 0; r < R; r++) {
      const y = y0.map((v) => v + 0.1 * rng.normal());
      const out = fitRegion(x, y, { from: 3, to: 8, peaks: 1 });
      expect(out.ok).toBe(true);
      if (!out.ok) return;
      areas.push(out.fit.peaks[0].area.value);
      ses.push(out.fit.peaks[0].area.se);
    }
    const s = stats(areas);
    expect(Math.abs(s.mean / (W * GAUSS_AREA) - 1)).toBeLessThan(0.02);
    expect(Math.abs(s.sd / rms(ses) - 1)).toBeLessThan(0.2);
  });

  it('single Gaussian at S/N 100: a second peak wrongly chosen in at most 10 of 200', () => {
    const rng = makeRng(1803);
    const y0 = clean([[5.5, 1]]);
    let wrong = 0;
    for (let r = 0; r < R; r++) {
      const y = y0.map((v) => v + 0.01 * rng.normal());
      const out = comparePeakCounts(x, y, { from: 3, to: 8, peaks: 1 });
      expect(out.ok).toBe(true);
      if (out.ok && out.comparison.supported) wrong++;
    }
    expect(wrong).toBeLessThanOrEqual(10);
  });
});
