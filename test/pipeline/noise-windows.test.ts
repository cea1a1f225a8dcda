import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { featureMask, noiseQuietWindows } from '../../src/core/noise-windows.ts';
import { noiseRobust } from '../../src/core/noise.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { movingAverage } from '../../src/core/steps/moving-average.ts';
import { savitzkyGolay, savgolCoefficients } from '../../src/core/numeric/savgol.ts';
import { loadFile } from '../../src/core/io/load.ts';

function noisyWithPeaks(n: number, seed: number) {
  const rng = makeRng(seed);
  const x = new Float64Array(n), y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = i * 0.01;
    y[i] = 0.5 + 0.001 * i + rng.normal();
    for (const c of [2000, 6000, 10000, 14000, 18000]) y[i] += 40 * Math.exp(-0.5 * ((i - c) / 30) ** 2);
  }
  y[5000] += 60; // a spike
  return { x, y };
}

describe('noiseQuietWindows', () => {
  it('recovers σ of white noise on a sloped baseline with peaks and a spike (σ = 1)', () => {
    const { x, y } = noisyWithPeaks(20000, 11);
    const r = noiseQuietWindows(x, y, featureMask(x, y));
    expect(r.ok).toBe(true);
    // ~45 peak-free windows of 400 points: each SD has relative SE ≈ 1/√(2·398) ≈ 3.5 %; their median is within about 1 %.
    if (r.ok) expect(Math.abs(r.sigma - 1)).toBeLessThan(0.03);
  });

  it('after an 11-point moving average it gives σ/√11 (variance of a mean of k independent values, σ²/k) where point-to-point differences understate it', () => {
    const { x, y } = noisyWithPeaks(20000, 12);
    const smooth = movingAverage(y, 11, 'shrink');
    const truth = 1 / Math.sqrt(11);
    const w = noiseQuietWindows(x, smooth, featureMask(x, y));
    const d = noiseRobust(smooth);
    expect(w.ok && d.ok).toBe(true);
    if (!w.ok || !d.ok) return;
    expect(Math.abs(w.sigma / truth - 1)).toBeLessThan(0.08);
    expect(d.sigma).toBeLessThan(0.5 * truth);
  });

  it('on the demo trace: raw σ and Savitzky–Golay 11/2 σ agree with the truth file and √Σc² (REFERENCES.md: 0.4555)', () => {
    const r = loadFile(new Uint8Array(readFileSync('public/demo/demo-sample.csv')), 'demo-sample.csv');
    const truth = JSON.parse(readFileSync('public/demo/demo-truth.json', 'utf8'));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const { x, y } = r.traces[0];
    const mask = featureMask(x, y);
    const raw = noiseQuietWindows(x, y, mask);
    const sg = noiseQuietWindows(x, savitzkyGolay(y, 11, 2, {}), mask);
    const gain = Math.sqrt(savgolCoefficients(11, 2).reduce((s, c) => s + c * c, 0));
    expect(gain).toBeCloseTo(0.4555, 4);
    expect(raw.ok && sg.ok).toBe(true);
    if (!raw.ok || !sg.ok) return;
    // 1200 points in ~30-point windows: the median of ~20 window SDs has a relative SE of roughly 5 %; 15 % is three of those.
    expect(Math.abs(raw.sigma / truth.noiseSd - 1)).toBeLessThan(0.15);
    expect(Math.abs(sg.sigma / (truth.noiseSd * gain) - 1)).toBeLessThan(0.2);
  });

  it('asks for a quiet range when too few peak-free windows remain', () => {
    const x = Float64Array.from({ length: 40 }, (_, i) => i);
    const r = noiseQuietWindows(x, x.map(Math.sin), undefined, 30);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/quiet range/);
  });
});
