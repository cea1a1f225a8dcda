import { correlatedNoise, expectedNoiseBumps } from '../../../src/core/measure/noise-bumps.ts';
import { defaultPeakOptions, detectPeaks } from '../../../src/core/measure/peak-table.ts';

/**
 * Noise-only traces with the defaults. What is measured: in each realisation of seeded white noise (σ = 1, known),
 * the rows at or above S/N 3 (H/σ, each height against its own local baseline) against the count the page shows
 * for that length; whether any row is flagged quantifiable; and the largest S/N of any row. The shown count is
 * itself checked against an independent Python simulation in noise-bumps.test.ts.
 */
export function noiseOnly(n: number, R: number, seed: number): { mean: number; shown: number; quantifiable: number; largest: number } {
  const shown = expectedNoiseBumps(n, 1, defaultPeakOptions(1, 1)).aboveDetection;
  const x = Float64Array.from({ length: n }, (_, i) => i);
  let total = 0, largest = 0, quantifiable = 0;
  for (let r = 0; r < R; r++) {
    const y = correlatedNoise(n, undefined, seed + r);
    for (const p of detectPeaks(x, y, defaultPeakOptions(1, 1))) {
      if ((p.snr ?? 0) >= 3) total++;
      if (p.flag === 'quantifiable') quantifiable++;
      largest = Math.max(largest, p.snr ?? 0);
    }
  }
  return { mean: total / R, shown, quantifiable, largest };
}
