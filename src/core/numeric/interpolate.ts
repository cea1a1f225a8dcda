import { xUnits, type XUnits } from '../units.ts';

/**
 * Linear interpolation of (xs, ys) at the points xq. xs must be strictly
 * ascending. Points of xq outside [xs[0], xs[n-1]] get NaN: callers decide
 * whether that is an error (blank subtraction refuses non-overlap).
 * O(n + m) when xq is ascending; falls back to binary search otherwise.
 */
export function interpolateLinear(xs: Float64Array, ys: Float64Array, xq: Float64Array): Float64Array {
  const n = xs.length;
  const out = new Float64Array(xq.length);
  let j = 0;
  for (let i = 0; i < xq.length; i++) {
    const q = xq[i];
    if (!(q >= xs[0] && q <= xs[n - 1])) { out[i] = NaN; continue; }
    if (i > 0 && q < xq[i - 1]) j = 0;
    while (j < n - 2 && xs[j + 1] < q) j++;
    const x0 = xs[j], x1 = xs[j + 1];
    const t = x1 === x0 ? 0 : (q - x0) / (x1 - x0);
    out[i] = ys[j] + t * (ys[j + 1] - ys[j]);
  }
  return out;
}

/** True when x is evenly spaced within a relative tolerance of the mean step. */
export function isEvenlySpaced(x: Float64Array, relTol = 1e-3): boolean {
  const n = x.length;
  if (n < 3) return true;
  const step = (x[n - 1] - x[0]) / (n - 1);
  // Time stamps printed with few digits jitter by rounding; 0.1 % of a step is tolerated.
  const tol = Math.abs(step) * relTol;
  for (let i = 1; i < n; i++) if (Math.abs(x[i] - x[i - 1] - step) > tol) return false;
  return true;
}

/** Mean spacing of x (x-units per point). */
export function meanStep(x: Float64Array): XUnits {
  return xUnits((x[x.length - 1] - x[0]) / (x.length - 1));
}

/**
 * The one grid check: true when both arrays have the same length and every
 * value is exactly equal (two traces on the same x; also used for y).
 */
export function sameGrid(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}
