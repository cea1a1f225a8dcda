import { describe, expect, it } from 'vitest';
// The invented demo's own generator (scripts/make-demo.mjs): the same run, drift, peaks and spike with the noise of another seed.
// @ts-expect-error a plain script without type declarations
import { makeDemo } from '../../../scripts/make-demo.mjs';
import { readFileSync } from 'node:fs';
import { defaultPeakOptions, detectPeaks } from '../../../src/core/measure/peak-table.ts';
import type { Peak } from '../../../src/core/measure/peak-types.ts';
import { noiseRms } from '../../../src/core/measure/noise-estimators.ts';
import { movingAverage } from '../../../src/core/steps/moving-average.ts';

interface TruePeak { label: string; centre: number; sigma: number; height: number; area: number; trueSn: number }
interface Demo { x: number[]; files: { y: number[] }[]; truth: { peaks: TruePeak[]; x: { step: number }; drift: { c0: number; c1: number; c2: number } } }
// The shoulder's perpendicular-drop share of the noiseless pair (SciPy; test/reference/make_demo_shoulder.py).
const drop = JSON.parse(readFileSync(new URL('../../reference/demo-shoulder.json', import.meta.url), 'utf8')) as {
  shoulder_drop_relative_error: number; valley_level_over_shoulder_height: number;
};

const SEEDS = 200;

/**
 * Per true peak, the mean relative area error over the seeds where a peak was found within max(2 samples, σ)
 * of its centre, with the count. σ for S/N from the quiet stretch after the last peak (RMS about a line), so
 * the check is of the peak measures, not of the noise estimate.
 */
function meanAreaErrors(smooth: (y: Float64Array) => Float64Array, correlation?: number[]) {
  const sums = new Map<string, { found: number; err: number; peak: TruePeak; rows: Peak[]; tables: Peak[][] }>();
  for (let seed = 1; seed <= SEEDS; seed++) {
    const d = makeDemo(seed) as Demo;
    const x = Float64Array.from(d.x);
    // The files carry 4 decimals; so does this.
    const y = smooth(Float64Array.from(d.files[0].y, (v) => Number(v.toFixed(4))));
    const noise = noiseRms(x, y, 10.2, 12);
    if (!noise.ok) throw new Error(noise.message);
    const peaks = detectPeaks(x, y, { ...defaultPeakOptions(noise.sigma, d.truth.x.step), noiseCorrelation: correlation });
    for (const t of d.truth.peaks) {
      const s = sums.get(t.label) ?? { found: 0, err: 0, peak: t, rows: [], tables: [] };
      sums.set(t.label, s);
      s.tables.push(peaks);
      const near = peaks.filter((p) => Math.abs(p.x - t.centre) <= Math.max(2 * d.truth.x.step, t.sigma));
      if (!near.length) continue;
      const p = near.reduce((a, b) => (Math.abs(b.x - t.centre) < Math.abs(a.x - t.centre) ? b : a));
      s.found++;
      s.err += p.area / t.area - 1;
      s.rows.push(p);
    }
  }
  return [...sums.values()].map((s) => ({ ...s, mean: s.err / s.found }));
}

describe(`the demo generator over ${SEEDS} seeds: mean area against the truth (demo-truth.json areas, √(2π)·H·σ)`, () => {
  it('raw trace: within 3 % for every peak at S/N ≥ 10', () => {
    for (const r of meanAreaErrors((y) => y)) {
      if (r.peak.trueSn < 10) continue;
      expect(r.found, r.peak.label).toBe(SEEDS);
      expect(Math.abs(r.mean), r.peak.label).toBeLessThan(0.03);
    }
  }, 120_000);

  it('noiseless demo: the shoulder\'s perpendicular-drop area is the analytic drop-line share of the pair (+3.0 %, SciPy) within 0.5 %', () => {
    const d = makeDemo(1) as Demo;
    const x = Float64Array.from(d.x);
    const { c0, c1, c2 } = d.truth.drift;
    const y = Float64Array.from(d.x, (t) => c0 + c1 * t + c2 * t * t + d.truth.peaks.reduce((v, p) => v + p.height * Math.exp(-0.5 * ((t - p.centre) / p.sigma) ** 2), 0));
    const t = d.truth.peaks.find((p) => p.label === 'shoulder')!;
    const p = detectPeaks(x, y, defaultPeakOptions(0.05, d.truth.x.step)).find((q) => Math.abs(q.x - t.centre) < t.sigma)!;
    expect(p.split).toBe('perpendicular-drop');
    expect(Math.abs(p.area / t.area - 1 - drop.shoulder_drop_relative_error)).toBeLessThan(0.005);
  });

  it('raw trace, the S/N 4.4 shoulder: mean area of every find within 10 % of the truth (the issue\'s check below S/N 10)', () => {
    const r = meanAreaErrors((y) => y).find((q) => q.peak.label === 'shoulder')!;
    const main = r.tables.map((tb) => tb.find((p) => Math.abs(p.x - 6) < 0.05)!);
    const mainTrue = 3 * 0.1 * Math.sqrt(2 * Math.PI); // demo-truth.json: height 3, σ 0.1
    const mean = (a: number[]) => a.reduce((v, e) => v + e, 0) / a.length;
    const plain = r.rows.filter((p) => !p.marks.includes('thinly-sampled')).map((p) => p.area / r.peak.area - 1);
    const thin = r.rows.filter((p) => p.marks.includes('thinly-sampled')).map((p) => p.area / r.peak.area - 1);
    const missing = r.tables.filter((tb) => !tb.some((p) => Math.abs(p.x - r.peak.centre) <= Math.max(2 * 0.01, r.peak.sigma)));
    const mainWhenMissing = missing.map((tb) => tb.find((p) => Math.abs(p.x - 6) < 0.05)!.area / (mainTrue + r.peak.area) - 1);
    const what = `found ${r.found}/${SEEDS}, mean ${(100 * r.mean).toFixed(1)} %; not thin ${plain.length} at ${(100 * mean(plain)).toFixed(1)} %, thin ${thin.length} at ${(100 * mean(thin)).toFixed(1)} %; main peak when the shoulder is not listed ${(100 * mean(mainWhenMissing)).toFixed(1)} % of both`;
    expect(main.every((p) => p !== undefined), what).toBe(true);
    // The valley to the main peak is 62 % of the shoulder's height (make_demo_shoulder.py), 1.75 noise σ deep: the
    // shoulder's own SciPy prominence on the raw samples passes the smallest prominence (2σ) in under half the seeds
    // (measured 86 of 200). Where it is not listed the main peak's bounds take it in: its area then holds both,
    // within 3 % (measured −0.5 %).
    expect(r.found, what).toBeGreaterThan(0.3 * SEEDS);
    expect(Math.abs(mean(mainWhenMissing)), what).toBeLessThan(0.03);
    // The check: the mean over every find within 10 % of the truth. Measured −4.7 % over 86 finds (78 not
    // marked thinly sampled at −1.8 %, 8 thin at −33.6 %), since the bounds walk takes its half-widths from the
    // crossings of a 3-point average (rule 2b in peak-bounds.ts); before that rule −17.8 % over 90 (66 at −5.1 %,
    // 24 thin noise fragments of the top at −52.5 %), which this fails.
    expect(Math.abs(r.mean), what).toBeLessThan(0.1);
    // Finds not marked thinly sampled: within 10 % of the truth and of the noiseless drop-line share (+3.0 %,
    // make_demo_shoulder.py); most finds are not thin.
    expect(plain.length, what).toBeGreaterThan(0.6 * r.found);
    expect(Math.abs(mean(plain)), what).toBeLessThan(0.1);
    expect(Math.abs((1 + mean(plain)) / (1 + drop.shoulder_drop_relative_error) - 1), what).toBeLessThan(0.1);
  }, 120_000);

  it('every row of every seed, raw and after a 3-point average: area above its own line positive; each true peak at S/N ≥ 10 listed once', () => {
    // Before the same-top rule seed 67 listed the S/N 60 main peak twice (two maxima 4 samples apart on its top, area
    // −66 % in one row), and 44 rows over these 400 tables had a negative area (noise bumps below their group's line).
    for (const [smooth, correlation] of [[(y: Float64Array) => y, undefined], [(y: Float64Array) => movingAverage(y, 3), [1, 2 / 3, 1 / 3]]] as const) {
      for (let seed = 1; seed <= SEEDS; seed++) {
        const d = makeDemo(seed) as Demo;
        const x = Float64Array.from(d.x);
        const y = smooth(Float64Array.from(d.files[0].y, (v) => Number(v.toFixed(4))));
        const noise = noiseRms(x, y, 10.2, 12);
        if (!noise.ok) throw new Error(noise.message);
        const peaks = detectPeaks(x, y, { ...defaultPeakOptions(noise.sigma, d.truth.x.step), noiseCorrelation: correlation ? [...correlation] : undefined });
        for (const p of peaks) expect(p.area, `seed ${seed} x ${p.x}`).toBeGreaterThan(0);
        // Listed once: one row within max(2 samples, σ) of its centre (as the area check finds it), besides narrow
        // noise bumps riding on its top (rule 6a: their own rows, noted as riding on it).
        for (const t of d.truth.peaks.filter((q) => q.trueSn >= 10)) {
          const own = peaks.filter((p) => Math.abs(p.x - t.centre) <= Math.max(2 * d.truth.x.step, t.sigma) && !/^Rides on/.test(p.note ?? ''));
          expect(own.length, `seed ${seed} ${t.label}`).toBe(1);
        }
      }
    }
  }, 120_000);

  it('after a 3-point average (noise correlation ρ₁ = 2/3, ρ₂ = 1/3 given): within 3 % at S/N ≥ 10 and within 10 % below (the shoulder: measured +0.0 % over 157 finds)', () => {
    for (const r of meanAreaErrors((y) => movingAverage(y, 3), [1, 2 / 3, 1 / 3])) {
      expect(Math.abs(r.mean), r.peak.label).toBeLessThan(r.peak.trueSn >= 10 ? 0.03 : 0.1);
    }
  }, 120_000);
});
