import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { defaultPeakOptions, detectPeaks, THIN_SAMPLING_POINTS } from '../../../src/core/measure/peak-table.ts';
import { normalArray } from '../../../src/core/numeric/random.ts';

/*
 * Issue 14: a raw Gaussian of σ = 3 samples at S/N 10 reads its height about 3 % high (peak-broad.test.ts allows
 * 4 % there). The source is the apex rule itself, not the baseline: the apex sample is the highest noisy sample on
 * the top, and the apex level is the parabola through it and its two neighbours. How large that is by the rule
 * alone, with the baseline known, comes from an independent NumPy simulation (test/reference/make_apex_bias.py,
 * 400,000 realisations; apex-bias.json): +6.4 % read at the three-point parabola's own vertex (our rule below 6
 * samples of half-height width), +0.7 % read at the least-squares apex position our rule uses from 6 samples on.
 * A noisy top that reads under 6 samples wide is one whose apex sample is high (the half-height level rises with
 * it), so the trace's own width picks the more biased reading in exactly the seeds where the noise is high.
 */
const ref = JSON.parse(readFileSync(new URL('../../reference/apex-bias.json', import.meta.url), 'utf8')) as {
  cases: { sigma_samples: number; snr: number; mean_relative_bias: number; mean_relative_bias_read_at_ls_position?: number }[];
};

function heights(sigma: number, snr: number, seeds: number) {
  const n = 2100, mu = 1030;
  const clean = Float64Array.from({ length: n }, (_, i) => snr * Math.exp(-0.5 * ((i - mu) / sigma) ** 2));
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const narrow: number[] = [], wide: number[] = [];
  let lineAtApex = 0;
  for (let r = 0; r < seeds; r++) {
    const e = normalArray(20261203 + 7919 * r, n);
    const y = Float64Array.from(clean, (v, i) => v + e[i]);
    const near = detectPeaks(x, y, defaultPeakOptions(1, 1)).filter((p) => Math.abs(p.x - mu) <= 1.1774 * sigma && p.height > snr / 2);
    if (!near.length) continue;
    const p = near.reduce((a, b) => (b.height > a.height ? b : a));
    (p.fwhmPoints < 6 ? narrow : wide).push(p.height / snr - 1);
    lineAtApex += p.baselineStart + ((p.baselineEnd - p.baselineStart) * (p.x - p.start)) / (p.end - p.start);
  }
  const all = narrow.concat(wide);
  const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
  return { found: all.length, all: mean(all), narrow: mean(narrow), narrowShare: narrow.length / all.length, wide: mean(wide), line: lineAtApex / all.length / snr };
}

describe('the apex level of a narrow noisy peak (σ = 3 samples, white noise, 400 seeds)', () => {
  const c10 = ref.cases.find((c) => c.sigma_samples === 3 && c.snr === 10)!;
  const c100 = ref.cases.find((c) => c.sigma_samples === 3 && c.snr === 100)!;

  it('S/N 10: the mean height bias lies between the rule\'s two readings (make_apex_bias.py) and below 4 %; the baseline is not its source', () => {
    const r = heights(3, 10, 400);
    const what = `found ${r.found}, mean ${(100 * r.all).toFixed(2)} %, under 6 samples wide ${(100 * r.narrowShare).toFixed(0)} % of seeds at ${(100 * r.narrow).toFixed(1)} %, the rest ${(100 * r.wide).toFixed(1)} %, line at the apex ${(100 * r.line).toFixed(2)} %`;
    // At S/N 10 a few seeds split or miss the top (measured 397 of 400).
    expect(r.found, what).toBeGreaterThanOrEqual(390);
    // Standard error of a 400-seed mean: about 0.5 % (height SD ≈ 10 % of the height at S/N 10).
    expect(r.all, what).toBeGreaterThan(c10.mean_relative_bias_read_at_ls_position! - 0.015);
    expect(r.all, what).toBeLessThan(c10.mean_relative_bias);
    expect(r.all, what).toBeLessThan(0.04);
    // Where the width reads under 6 samples the three-point vertex is read: at least its bias (the selection adds to it).
    expect(r.narrow, what).toBeGreaterThan(c10.mean_relative_bias);
    // The local baseline under the apex is not the source (true baseline 0): within 1 % of the height (measured
    // −0.36 %, which raises the height by as much).
    expect(Math.abs(r.line), what).toBeLessThan(0.01);
    // These peaks (FWHM 7.1 samples) are not marked thinly sampled; the mark starts below THIN_SAMPLING_POINTS.
    expect(THIN_SAMPLING_POINTS).toBe(5);
  });

  it('S/N 100: the bias is gone, as the simulation says (+0.03 % by the rule alone)', () => {
    const r = heights(3, 100, 100);
    expect(Math.abs(r.all - c100.mean_relative_bias)).toBeLessThan(0.003);
  });
});
