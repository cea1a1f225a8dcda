import { describe, expect, it } from 'vitest';
import { noiseWindowsMedian } from '../../src/core/noise-windows.ts';
import { noiseRobust } from '../../src/core/noise.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { movingAverage } from '../../src/core/steps/moving-average.ts';

function noisyWithPeaks(n: number, seed: number) {
  const rng = makeRng(seed);
  const x = new Float64Array(n), y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = i * 0.01;
    y[i] = 0.5 + 0.001 * i + rng.normal();
    // five peaks of height 40σ, σ = 30 points: they occupy well under half the windows
    for (const c of [2000, 6000, 10000, 14000, 18000]) y[i] += 40 * Math.exp(-0.5 * ((i - c) / 30) ** 2);
  }
  return { x, y };
}

describe('noiseWindowsMedian', () => {
  it('recovers σ of white noise on a sloped baseline with peaks (σ = 1)', () => {
    const { x, y } = noisyWithPeaks(20000, 11);
    const r = noiseWindowsMedian(x, y);
    expect(r.ok).toBe(true);
    // 50 windows of 400 points: each SD has relative SE ≈ 1/√(2·398) ≈ 3.5 %; the median of 50 is tighter.
    if (r.ok) expect(Math.abs(r.sigma - 1)).toBeLessThan(0.05);
  });

  it('after an 11-point moving average it gives σ/√11 (variance of a mean of k independent values, σ²/k) while point-to-point differences understate it', () => {
    const { x, y } = noisyWithPeaks(20000, 12);
    const smooth = movingAverage(y, 11, 'shrink');
    const truth = 1 / Math.sqrt(11);
    const w = noiseWindowsMedian(x, smooth);
    const d = noiseRobust(smooth);
    expect(w.ok && d.ok).toBe(true);
    if (!w.ok || !d.ok) return;
    // Correlation over 11 points leaves ~36 independent values per 400-point window; the line fit takes a little out. 10 % is several SEs.
    expect(Math.abs(w.sigma / truth - 1)).toBeLessThan(0.1);
    // The white-noise assumption fails here: differences of neighbouring averages share 10 of 11 points.
    expect(d.sigma).toBeLessThan(0.5 * truth);
  });

  it('asks for a quiet range when the trace is too short for three windows', () => {
    const x = Float64Array.from({ length: 40 }, (_, i) => i);
    const r = noiseWindowsMedian(x, x.map(Math.sin), 30);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/quiet range/);
  });
});
