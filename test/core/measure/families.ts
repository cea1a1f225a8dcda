/**
 * Seeded test traces for the noise checks (issue 14's families), each with
 * its true noise σ. Invented here; the random numbers come from the
 * project's seeded generator (src/core/numeric/random.ts).
 *
 * * flat: white Gaussian noise σ about 0.
 * * drift: the same plus a random walk with steps of SD 0.1 σ and a sine of
 *   amplitude 50 σ, 3 periods over the trace.
 * * bands: overlapping Gaussian bands with half-height widths of 2–20 % of the
 *   length and heights 20–200 σ, covering the whole range (no quiet stretch).
 * * narrow: Gaussian peaks of half-height width 2–8 points, heights 5–500 σ
 *   (log-uniform), one every 40 points plus an exponential gap of mean 20.
 * * ar1: AR(1) noise with φ = 0.5 and marginal SD σ (stationary start).
 */
import { makeRng, type Rng } from '../../../src/core/numeric/random.ts';

export type Family = 'flat' | 'drift' | 'bands' | 'narrow' | 'ar1';
export const FAMILIES: readonly Family[] = ['flat', 'drift', 'bands', 'narrow', 'ar1'];
export const FWHM_PER_SD = 2 * Math.sqrt(2 * Math.LN2);

/** Add a Gaussian of half-height width `fwhm` points and height h centred at c (points), within ±8 widths. */
export function addGaussian(y: Float64Array, c: number, fwhm: number, h: number): void {
  const s = fwhm / FWHM_PER_SD;
  const a = Math.max(0, Math.floor(c - 8 * fwhm)), b = Math.min(y.length - 1, Math.ceil(c + 8 * fwhm));
  for (let i = a; i <= b; i++) y[i] += h * Math.exp(-0.5 * ((i - c) / s) ** 2);
}

/** AR(1) noise, marginal SD sigma: e₀ ~ N(0, σ²), eᵢ = φeᵢ₋₁ + √(1 − φ²)·σ·wᵢ. */
export function ar1(rng: Rng, n: number, phi: number, sigma = 1): Float64Array {
  const e = new Float64Array(n);
  e[0] = sigma * rng.normal();
  const k = Math.sqrt(1 - phi * phi) * sigma;
  for (let i = 1; i < n; i++) e[i] = phi * e[i - 1] + k * rng.normal();
  return e;
}

/** The noiseless part of a family trace (the signal), and the noise, separately. */
export function familyParts(name: Family, n: number, seed: number, sigma = 1): { signal: Float64Array; noise: Float64Array } {
  const rng = makeRng(seed);
  const signal = new Float64Array(n);
  const noise = name === 'ar1' ? ar1(rng, n, 0.5, sigma) : new Float64Array(n).map(() => sigma * rng.normal());
  if (name === 'drift') {
    let w = 0;
    const phase = 2 * Math.PI * rng.uniform();
    for (let i = 0; i < n; i++) {
      w += 0.1 * sigma * rng.normal();
      signal[i] = w + 50 * sigma * Math.sin((2 * Math.PI * 3 * i) / n + phase);
    }
  } else if (name === 'bands') {
    let c = 0;
    while (c < n * 1.05) {
      const fw = (0.02 + 0.18 * rng.uniform()) * n;
      addGaussian(signal, c, fw, (20 + 180 * rng.uniform()) * sigma);
      c += fw * (0.4 + 0.5 * rng.uniform());
    }
  } else if (name === 'narrow') {
    let c = 5 + 35 * rng.uniform();
    while (c < n - 5) {
      const fw = 2 + 6 * rng.uniform();
      const h = Math.exp(Math.log(5) + (Math.log(500) - Math.log(5)) * rng.uniform()) * sigma;
      addGaussian(signal, c, fw, h);
      c += 40 - 20 * Math.log(1 - rng.uniform());
    }
  }
  return { signal, noise };
}

/** A family trace: signal + noise. */
export function familyTrace(name: Family, n: number, seed: number, sigma = 1): Float64Array {
  const { signal, noise } = familyParts(name, n, seed, sigma);
  for (let i = 0; i < n; i++) signal[i] += noise[i];
  return signal;
}
