/**
 * Long traces nobody designed the peak detector for (drifting baselines,
 * bands over the whole range, AR(1) correlated noise), shared by the merged
 * candidate pass test and the peak-table digests.
 */
import { makeRng } from '../../../src/core/numeric/random.ts';

/** Long traces nobody designed for this: drift, broad bands, correlated noise. */
export function longTrace(n: number, seed: number, kind: 'drift' | 'bands' | 'ar1'): Float64Array {
  const rng = makeRng(seed);
  const y = new Float64Array(n);
  let e = 0;
  for (let i = 0; i < n; i++) {
    const t = i / n;
    y[i] = kind === 'drift' ? 2 * t + 0.8 * Math.sin(9 * t) + 3 * t * t : kind === 'bands' ? 1.5 * Math.exp(-0.5 * ((t - 0.5) / 0.3) ** 2) : 0.2 * t;
    e = kind === 'ar1' ? 0.9 * e + 0.05 * rng.normal() : 0.05 * rng.normal();
    y[i] += e;
  }
  for (let k = 0; k < n / 2000; k++) {
    const c = rng.uniform() * n, s = 2 + 80 * rng.uniform(), h = 0.1 + 4 * rng.uniform() ** 2;
    for (let i = Math.max(0, Math.floor(c - 6 * s)); i <= Math.min(n - 1, Math.ceil(c + 6 * s)); i++) y[i] += h * Math.exp(-0.5 * ((i - c) / s) ** 2);
  }
  return y;
}
