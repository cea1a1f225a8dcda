/**
 * Isolated peaks of many widths in white noise, for peak-broad.test.ts: a
 * Gaussian or an exponentially modified Gaussian (emg.ts) of known area on a
 * flat baseline, white noise of σ = 1 from the project's seeded generator,
 * optionally a centred 3- or 5-point moving average, measured with the
 * default options and the noise the average leaves (σ/√L, autocorrelation
 * of the L-point box: 1 − k/L, the standard result for a moving average of
 * white noise).
 *
 * True area: A (the density has area 1, so the peak has area A; for a
 * Gaussian of height h, A = h·σ·√(2π), analytic; a moving average keeps the
 * area). True height: the largest value of the noiseless curve (after the
 * same average), found on a grid of σ/200 around the apex.
 */
import { defaultPeakOptions, detectPeaks } from '../../../src/core/measure/peak-table.ts';
import type { Peak } from '../../../src/core/measure/peak-types.ts';
import { normalArray } from '../../../src/core/numeric/random.ts';
import { emgPdf } from './emg.ts';

export interface BroadCase {
  /** Gaussian σ in samples. */
  sigma: number;
  /** τ/σ (0: a Gaussian). */
  tauRatio: number;
  /** Height over the raw noise σ (1). */
  snr: number;
  /** Moving-average length (1: none). */
  average: 1 | 3 | 5;
}

export interface BroadResult {
  seeds: number;
  found: number;
  /** Mean of (measured / true − 1) over the seeds where the peak was found. */
  height: number;
  area: number;
  /** Rows in the table within the peak's ±4σ (+ its tail). */
  rows: number;
}

/** Noiseless value at t: A × density, after the centred L-point average. */
function curve(t: number, mu: number, k: BroadCase, A: number): number {
  const h = (k.average - 1) / 2;
  let v = 0;
  for (let d = -h; d <= h; d++) v += emgPdf(t + d, mu, k.sigma, k.tauRatio * k.sigma);
  return (A * v) / k.average;
}

function centredAverage(y: Float64Array, L: number): Float64Array {
  if (L === 1) return y;
  const h = (L - 1) / 2, n = y.length, out = new Float64Array(n);
  for (let i = 0; i < n; i++) { let v = 0; for (let d = -h; d <= h; d++) v += y[Math.min(n - 1, Math.max(0, i + d))]; out[i] = v / L; }
  return out;
}

export function runBroadCase(k: BroadCase, seeds: number, seed0 = 1): BroadResult {
  const { sigma, tauRatio } = k;
  const tau = tauRatio * sigma;
  const n = Math.round(24 * sigma + 12 * tau + 2000);
  const mu = Math.round(1000 + 10 * sigma);
  // Scale so that the raw (unaveraged) noiseless peak has height snr.
  let peak = 0, tPeak = mu;
  for (let t = mu - sigma; t <= mu + 2 * sigma + 2 * tau; t += sigma / 200) { const v = emgPdf(t, mu, sigma, tau); if (v > peak) { peak = v; tPeak = t; } }
  const A = k.snr / peak;
  let trueH = 0;
  for (let t = tPeak - 2 * sigma; t <= tPeak + 2 * sigma; t += sigma / 200) trueH = Math.max(trueH, curve(t, mu, k, A));
  const clean = new Float64Array(n);
  for (let i = 0; i < n; i++) clean[i] = emgPdf(i, mu, sigma, tau) * A;
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const L = k.average;
  const rho = Array.from({ length: L }, (_, j) => 1 - j / L);
  const opts = { ...defaultPeakOptions(1 / Math.sqrt(L), 1), ...(L > 1 ? { noiseCorrelation: rho } : {}) };
  const fwhm = 2.3548 * sigma + 1.5 * tau;
  let found = 0, hs = 0, as = 0, rows = 0;
  for (let r = 0; r < seeds; r++) {
    const e = normalArray(seed0 + 7919 * r + 31 * sigma + 3 * L + Math.round(100 * tauRatio) + k.snr, n);
    const raw = Float64Array.from(clean, (v, i) => v + e[i]);
    const y = centredAverage(raw, L);
    const peaks = detectPeaks(x, y, opts);
    const near = peaks.filter((p) => p.x > mu - 4 * sigma && p.x < mu + 4 * sigma + 6 * tau);
    rows += near.length;
    let best: Peak | null = null;
    for (const p of near) if (Math.abs(p.x - tPeak) <= fwhm / 2 && p.height > trueH / 2 && (!best || p.height > best.height)) best = p;
    if (!best) continue;
    found++;
    hs += best.height / trueH - 1;
    as += best.area / A - 1;
  }
  return { seeds, found, height: found ? hs / found : NaN, area: found ? as / found : NaN, rows: rows / seeds };
}
