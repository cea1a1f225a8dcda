// Shared by count.test.ts and processing.test.ts: a region of 500 points on a sloped line, Gaussians of
// σ = 0.1 (FWHM 0.2355), seeded noise (src/core/numeric/random.ts).
import { FWHM_PER_SIGMA, SHAPES } from '../../../../src/core/measure/fit/shapes.ts';
import { makeRng } from '../../../../src/core/numeric/random.ts';

export const N = 500;
export const x = Float64Array.from({ length: N }, (_, i) => 3 + i * 0.01);
export const W = 0.1 * FWHM_PER_SIGMA;

/** Gaussians [centre, height] of FWHM W on the line 0.2 + 0.05 (x − 3), plus white noise of SD `noise`. */
export function trace(peaks: [number, number][], noise: number, seed: number): Float64Array {
  const rng = makeRng(seed);
  const y = x.map((v) => 0.2 + 0.05 * (v - 3));
  for (const [c, h] of peaks) SHAPES.gaussian.evaluate(x, [c, h, W], 0, y, null, 0);
  return y.map((v) => v + noise * rng.normal());
}

/** A main peak and a shoulder at 30 % of its height, 0.32 away (1.36 FWHM). */
export const SHOULDER: [number, number][] = [
  [5.2, 1],
  [5.52, 0.3],
];
