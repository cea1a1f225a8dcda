import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { correlatedNoise, expectedNoiseBumps, noiseBumpSentence } from '../../../src/core/measure/noise-bumps.ts';
import type { NoiseBumpCount } from '../../../src/core/measure/noise-bumps.ts';
import { findLocalMaxima } from '../../../src/core/measure/peak-detection.ts';
import { defaultPeakOptions } from '../../../src/core/measure/peak-table.ts';

/** Expected noise-only rows of this length at or above S/N u, read off the simulation's sorted S/N list. */
function expectedNoiseBumpsAbove(c: NoiseBumpCount, u: number): number {
  let k = 0;
  while (k < c.snrs.length && c.snrs[k] >= u) k++;
  return (k * c.points) / c.simulatedPoints;
}

// SciPy 1.17.1 values from test/reference/make_peak_shapes.py; the Python simulation of our stated rules from
// test/reference/noise_bumps.py (NumPy's generator, not ours).
const shapes = JSON.parse(readFileSync(new URL('../../reference/peak-shapes.json', import.meta.url), 'utf8')) as {
  independent_maxima_above_u_per_point: { u: number; rate: number }[];
};
const sim = JSON.parse(readFileSync(new URL('../../reference/noise-bumps.json', import.meta.url), 'utf8')) as {
  points: number; rows_at_or_above_3: number; rows_at_or_above_10: number; rate_at_or_above_3_per_point: number; largest_snr: number;
};

describe('the simulated noise itself', () => {
  it('white: local maxima above 3σ (over the mean) per 10⁶ points match n·∫φΦ² = 1,348 (REFERENCES.md; SciPy quad)', () => {
    const n = 1 << 21;
    const y = correlatedNoise(n, undefined, 12345);
    let count = 0;
    for (const i of findLocalMaxima(y)) if (y[i] > 3) count++;
    const expected = n * shapes.independent_maxima_above_u_per_point.find((r) => r.u === 3)!.rate;
    expect(Math.abs(expected / n * 1e6 - 1348)).toBeLessThan(1);
    // Poisson sampling error √expected ≈ 53; allow 4 of them.
    expect(Math.abs(count - expected)).toBeLessThan(4 * Math.sqrt(expected));
  });

  it('correlated: the sample autocorrelation follows the ρ asked for (AR(1)-like ρ_k = 0.5^k, and a 3-point average\'s 2/3, 1/3)', () => {
    for (const rho of [[1, 0.5, 0.25, 0.125, 0.0625, 0.03125, 0.015625], [1, 2 / 3, 1 / 3]]) {
      const n = 1 << 18;
      const y = correlatedNoise(n, rho, 99);
      let m = 0; for (const v of y) m += v; m /= n;
      let c0 = 0; for (const v of y) c0 += (v - m) ** 2;
      expect(Math.abs(c0 / n - 1)).toBeLessThan(0.02); // unit variance (SE ≈ √(2/n)·a few)
      for (let k = 1; k < rho.length; k++) {
        let ck = 0; for (let i = 0; i + k < n; i++) ck += (y[i] - m) * (y[i + k] - m);
        expect(Math.abs(ck / c0 - rho[k]), `lag ${k}`).toBeLessThan(0.01);
      }
    }
  });
});

describe('the expected count of noise-only rows (white noise, default thresholds)', () => {
  const c = expectedNoiseBumps(1e6, 1, defaultPeakOptions(1, 1));

  it('matches the independent Python simulation of the stated rules (test/reference/noise_bumps.py) within sampling error', () => {
    const ours = c.countedAboveDetection / c.simulatedPoints;
    const theirs = sim.rate_at_or_above_3_per_point;
    // Both are Poisson counts: SE of the difference of rates.
    const se = Math.sqrt(c.countedAboveDetection / c.simulatedPoints ** 2 + sim.rows_at_or_above_3 / sim.points ** 2);
    expect(Math.abs(ours - theirs)).toBeLessThan(4 * se);
    expect(sim.rows_at_or_above_10).toBe(0);
  });

  it('is far below the count of maxima over the mean (local heights, the smallest width, riders): ours is a different, stated definition', () => {
    // n·∫φΦ² counts maxima standing 3σ above the true mean; ours measures each bump above its own local baseline and
    // keeps only those at least 2.5 samples wide: about half as many here (both checked above).
    expect(c.aboveDetection).toBeLessThan(1348);
    expect(c.aboveDetection).toBeGreaterThan(200);
  });

  it('says so in words, with S/N 10 far out of reach', () => {
    expect(noiseBumpSentence(c)).toMatch(/^Pure noise of this length \(1,000,000 points\) would give about \d{3} bumps at or above S\/N 3, and far below one at or above S\/N 10 \(the largest of the simulated bumps reached S\/N [45]\.\d\)\.$/);
    expect(c.oneBumpSnr).not.toBeNull();
    expect(expectedNoiseBumpsAbove(c, c.oneBumpSnr as number)).toBeGreaterThan(0.5);
    expect(expectedNoiseBumpsAbove(c, c.oneBumpSnr as number)).toBeLessThan(2.5);
  });
});
