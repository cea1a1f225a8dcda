/**
 * Savitzky–Golay least-squares polynomial filters (Savitzky & Golay 1964,
 * Anal. Chem. 36:1627; table corrections by Steinier, Termonia & Deltour
 * 1972, Anal. Chem. 44:1906). Edge modes follow SciPy's `savgol_filter`.
 */
import { correlate } from './convolve.ts';
import type { PadMode } from './convolve.ts';

/** Edge handling: 'interp' fits the end windows; the others pad as SciPy's ndimage does. */
export type SavgolMode = 'interp' | 'mirror' | 'nearest' | 'constant' | 'wrap';

export interface SavgolOptions {
  /** Derivative order 0, 1 or 2 (default 0 = smoothing). */
  deriv?: number;
  /** Sample spacing Δx in x-units (default 1); derivatives are divided by Δx^deriv. */
  delta?: number;
  /** Edge mode (default 'interp'). */
  mode?: SavgolMode;
  /** Value beyond the ends for mode 'constant' (default 0). */
  cval?: number;
}

function checkShape(window: number, order: number, deriv: number): void {
  if (!Number.isInteger(window) || window < 1) {
    throw new RangeError(`The window must be a whole number of points, at least 1 (got ${window}).`);
  }
  if (!Number.isInteger(order) || order < 0) {
    throw new RangeError(`The polynomial order must be a whole number ≥ 0 (got ${order}).`);
  }
  if (order >= window) {
    throw new RangeError(`The polynomial order (${order}) must be smaller than the window (${window} points).`);
  }
  if (!Number.isInteger(deriv) || deriv < 0) {
    throw new RangeError(`The derivative order must be a whole number ≥ 0 (got ${deriv}).`);
  }
}

/**
 * Least-squares polynomial filter weights. Fitting a polynomial of degree
 * `order` to `window` samples and taking its `deriv`-th derivative at sample
 * position `pos` is the dot product Σₖ c[k]·y[k] over the window.
 *
 * Weights are in dot (correlation) order: c[0] multiplies the leftmost
 * sample (SciPy's `savgol_coeffs(..., use='dot')`). Unit spacing: divide by
 * Δx^deriv for x-units. The fit uses local coordinates scaled into [−2, 2]
 * and a QR factorisation by modified Gram–Schmidt with one full
 * re-orthogonalisation, so the smoothing weights sum to 1 within a few
 * ulps even for window 101, order 6 (a normal-equation solve loses this).
 * When deriv > order the weights are all zero.
 * @param window number of points (≥ 1, need not be odd here).
 * @param order polynomial degree, 0 ≤ order < window.
 * @param deriv derivative order, default 0.
 * @param pos sample the estimate refers to, 0 ≤ pos < window; default the middle, floor(window/2).
 * @throws RangeError for shapes that cannot be fitted.
 */
export function savgolCoefficients(window: number, order: number, deriv = 0, pos = Math.floor(window / 2)): Float64Array {
  checkShape(window, order, deriv);
  if (!Number.isInteger(pos) || pos < 0 || pos >= window) {
    throw new RangeError(`The evaluation point must be a sample of the window, 0 to ${window - 1} (got ${pos}).`);
  }
  const w = window;
  const m = order + 1;
  const c = new Float64Array(w);
  if (deriv > order) return c;
  const scale = Math.max((w - 1) / 2, 1);
  // Columns q[j] of the local Vandermonde matrix t^j, t = (k − pos)/scale.
  const q: Float64Array[] = [];
  const r: Float64Array[] = Array.from({ length: m }, () => new Float64Array(m));
  for (let j = 0; j < m; j++) {
    const v = new Float64Array(w);
    for (let k = 0; k < w; k++) v[k] = ((k - pos) / scale) ** j;
    // Two passes of Gram–Schmidt: the second removes what rounding left behind.
    for (let pass = 0; pass < 2; pass++) {
      for (let i = 0; i < j; i++) {
        let d = 0;
        for (let k = 0; k < w; k++) d += q[i][k] * v[k];
        r[i][j] += d;
        for (let k = 0; k < w; k++) v[k] -= d * q[i][k];
      }
    }
    let norm = 0;
    for (let k = 0; k < w; k++) norm += v[k] * v[k];
    norm = Math.sqrt(norm);
    r[j][j] = norm;
    for (let k = 0; k < w; k++) v[k] /= norm;
    q.push(v);
  }
  // Coefficient a_d of the fit is e_dᵀ R⁻¹ Qᵀ y: solve Rᵀ z = e_d by forward substitution.
  const z = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let s = i === deriv ? 1 : 0;
    for (let k = 0; k < i; k++) s -= r[k][i] * z[k];
    z[i] = s / r[i][i];
  }
  let factor = 1;
  for (let i = 2; i <= deriv; i++) factor *= i;
  factor /= scale ** deriv;
  for (let k = 0; k < w; k++) {
    let s = 0;
    for (let i = 0; i < m; i++) s += q[i][k] * z[i];
    c[k] = s * factor;
  }
  return c;
}

/**
 * Savitzky–Golay smoothing or differentiation of evenly spaced samples.
 * Interior points: correlation with {@link savgolCoefficients}, O(n·window).
 * Edges by `mode`, matching SciPy 1.17 `savgol_filter`:
 *  - 'interp' (default): the polynomial fitted to the first (last) `window`
 *    points is evaluated at the outer window//2 points, so every polynomial
 *    of degree ≤ order passes unchanged, ends included. Needs n ≥ window.
 *  - 'mirror' | 'nearest' | 'constant' | 'wrap': the data are padded
 *    (see {@link padIndex}) and filtered with the centre weights.
 * @param y samples (not changed).
 * @param window odd number of points, ≥ 1.
 * @param order polynomial degree, < window.
 * @param opts derivative (default 0), spacing Δx (default 1), mode, cval.
 * @throws RangeError on an even window, order ≥ window, bad Δx, or 'interp' with fewer samples than the window.
 */
export function savitzkyGolay(y: Float64Array, window: number, order: number, opts: SavgolOptions = {}): Float64Array {
  const deriv = opts.deriv ?? 0;
  const delta = opts.delta ?? 1;
  const mode = opts.mode ?? 'interp';
  checkShape(window, order, deriv);
  if (window % 2 === 0) throw new RangeError(`The window must be an odd number of points (got ${window}).`);
  if (!(Number.isFinite(delta) && delta > 0)) throw new RangeError(`The sample spacing must be a positive number (got ${delta}).`);
  const n = y.length;
  if (n === 0) throw new RangeError('There are no samples to filter.');
  if (mode === 'interp' && window > n) {
    throw new RangeError(`The window (${window} points) is longer than the data (${n} points).`);
  }
  const c = savgolCoefficients(window, order, deriv);
  const unit = delta ** deriv;
  if (unit !== 1) for (let k = 0; k < c.length; k++) c[k] /= unit;
  const padMode: PadMode = mode === 'interp' ? 'constant' : mode;
  const out = correlate(y, c, padMode, opts.cval ?? 0);
  if (mode !== 'interp') return out;
  // Edge loop: each of the outer half-window points gets the end window's fit evaluated there.
  const half = (window - 1) / 2;
  for (let p = 0; p < half; p++) {
    const ce = savgolCoefficients(window, order, deriv, p);
    let left = 0;
    let right = 0;
    const base = n - window;
    // The right end uses the mirrored position with reversed weights (same polynomial geometry).
    const sign = deriv % 2 === 1 ? -1 : 1;
    for (let k = 0; k < window; k++) {
      left += ce[k] * y[k];
      right += ce[k] * y[base + window - 1 - k];
    }
    out[p] = left / unit;
    out[n - 1 - p] = (sign * right) / unit;
  }
  return out;
}
