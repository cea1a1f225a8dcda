/**
 * The benchmark's seeded synthetic trace (test/bench/run.ts), in a module of
 * its own so the peak-table digests (test/core/measure/peak-table-digests.ts)
 * measure the very trace the bench times.
 */
import { makeRng } from '../../src/core/numeric/random.ts';

export interface BenchTrace { x: Float64Array; y: Float64Array; sigma: number; peaks: number }

/** Base seed; each size uses seed + n so the traces are independent but fixed. */
export const SEED = 20260801;
/** White-noise SD of the synthetic trace (y-units). */
export const NOISE_SD = 0.05;

/**
 * Gaussian peaks (one per 4000 points, widths σ 4–64 points, heights 0.15–10
 * skewed towards small ones so some sit near the detection limit) on a
 * slow drift (offset, slope and one and a half sine periods), plus white
 * noise of SD 0.05. x in minutes at 0.001 min per point.
 */
export function makeBenchTrace(n: number, seed = SEED + n): BenchTrace {
  const rng = makeRng(seed);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = i * 0.001;
    y[i] = 0.5 + 0.2 * (i / n) + 0.3 * Math.sin((3 * Math.PI * i) / n);
  }
  const peaks = Math.max(5, Math.round(n / 4000));
  for (let k = 0; k < peaks; k++) {
    const c = rng.uniform() * n;
    const s = 4 + 60 * rng.uniform();
    const h = 0.15 + 10 * rng.uniform() ** 3;
    const lo = Math.max(0, Math.floor(c - 6 * s)), hi = Math.min(n - 1, Math.ceil(c + 6 * s));
    for (let i = lo; i <= hi; i++) y[i] += h * Math.exp(-0.5 * ((i - c) / s) ** 2);
  }
  for (let i = 0; i < n; i++) y[i] += NOISE_SD * rng.normal();
  return { x, y, sigma: NOISE_SD, peaks };
}
