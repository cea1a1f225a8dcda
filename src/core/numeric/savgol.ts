/**
 * Savitzky–Golay least-squares polynomial filters (Savitzky & Golay 1964,
 * Anal. Chem. 36:1627; table corrections by Steinier, Termonia & Deltour
 * 1972, Anal. Chem. 44:1906). Edge modes follow SciPy's `savgol_filter`.
 */
import { padIndex } from './convolve.ts';
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
 * Interior points: correlation with {@link savgolCoefficients}, O(n·window),
 * the symmetric (even derivative) or antisymmetric (odd) weights folded so
 * each pair of samples at ±k takes one multiply.
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
  const half = (window - 1) / 2;
  const out = new Float64Array(n);
  // Centre weights are exactly symmetric for even derivatives and antisymmetric for odd ones;
  // the computed ones differ from that by rounding, so both halves are averaged into one.
  const sign = deriv % 2 === 1 ? -1 : 1;
  const fold = new Float64Array(half + 1);
  fold[0] = sign === 1 ? c[half] : 0;
  for (let k = 1; k <= half; k++) fold[k] = 0.5 * (c[half + k] + sign * c[half - k]);
  const lo = half;
  const hi = n - 1 - half;
  if (hi >= lo) {
    if (sign === 1) foldedEven(y, out, fold, lo, hi);
    else foldedOdd(y, out, fold, lo, hi);
  }
  if (mode !== 'interp') {
    paddedEdges(y, out, fold, sign, Math.min(lo, n), Math.max(hi + 1, lo), mode, opts.cval ?? 0);
    return out;
  }
  // Edge loop: each of the outer half-window points gets the end window's fit evaluated there.
  for (let p = 0; p < half; p++) {
    const ce = savgolCoefficients(window, order, deriv, p);
    let left = 0;
    let right = 0;
    const base = n - window;
    // The right end uses the mirrored position with reversed weights (same polynomial geometry).
    for (let k = 0; k < window; k++) {
      left += ce[k] * y[k];
      right += ce[k] * y[base + window - 1 - k];
    }
    out[p] = left / unit;
    out[n - 1 - p] = (sign * right) / unit;
  }
  return out;
}

/**
 * out[i] = f[0]·y[i] + Σₖ f[k]·(y[i−k] + y[i+k]) for lo ≤ i ≤ hi (all indices inside y).
 * Four outputs per pass share each weight and keep four independent sums.
 */
function foldedEven(y: Float64Array, out: Float64Array, f: Float64Array, lo: number, hi: number): void {
  const h = f.length - 1;
  const f0 = f[0];
  let i = lo;
  for (; i + 3 <= hi; i += 4) {
    // l0..l3 hold y[i+j−k] and r0..r3 hold y[i+j+k]: each step loads one new sample per side.
    let l0 = y[i], l1 = y[i + 1], l2 = y[i + 2];
    let r1 = l1, r2 = l2, r3 = y[i + 3];
    let s0 = f0 * l0, s1 = f0 * l1, s2 = f0 * l2, s3 = f0 * r3;
    for (let k = 1; k <= h; k++) {
      const l3 = l2; l2 = l1; l1 = l0; l0 = y[i - k];
      const r0 = r1; r1 = r2; r2 = r3; r3 = y[i + 3 + k];
      const fk = f[k];
      s0 += fk * (l0 + r0);
      s1 += fk * (l1 + r1);
      s2 += fk * (l2 + r2);
      s3 += fk * (l3 + r3);
    }
    out[i] = s0;
    out[i + 1] = s1;
    out[i + 2] = s2;
    out[i + 3] = s3;
  }
  for (; i <= hi; i++) {
    let s = f0 * y[i];
    for (let k = 1; k <= h; k++) s += f[k] * (y[i - k] + y[i + k]);
    out[i] = s;
  }
}

/** As {@link foldedEven} for antisymmetric weights: out[i] = Σₖ f[k]·(y[i+k] − y[i−k]). */
function foldedOdd(y: Float64Array, out: Float64Array, f: Float64Array, lo: number, hi: number): void {
  const h = f.length - 1;
  let i = lo;
  for (; i + 3 <= hi; i += 4) {
    let l0 = y[i], l1 = y[i + 1], l2 = y[i + 2];
    let r1 = l1, r2 = l2, r3 = y[i + 3];
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
    for (let k = 1; k <= h; k++) {
      const l3 = l2; l2 = l1; l1 = l0; l0 = y[i - k];
      const r0 = r1; r1 = r2; r2 = r3; r3 = y[i + 3 + k];
      const fk = f[k];
      s0 += fk * (r0 - l0);
      s1 += fk * (r1 - l1);
      s2 += fk * (r2 - l2);
      s3 += fk * (r3 - l3);
    }
    out[i] = s0;
    out[i + 1] = s1;
    out[i + 2] = s2;
    out[i + 3] = s3;
  }
  for (; i <= hi; i++) {
    let s = 0;
    for (let k = 1; k <= h; k++) s += f[k] * (y[i + k] - y[i - k]);
    out[i] = s;
  }
}

/**
 * The points whose window reaches past an end, i < lo or i ≥ hiEnd, with the
 * samples beyond the ends supplied by the padding rule (as SciPy's ndimage).
 */
function paddedEdges(
  y: Float64Array, out: Float64Array, f: Float64Array, sign: number,
  lo: number, hiEnd: number, mode: PadMode, cval: number,
): void {
  const n = y.length;
  const h = f.length - 1;
  const at = (j: number): number => {
    const k = padIndex(j, n, mode);
    return k < 0 ? cval : y[k];
  };
  const one = (i: number): void => {
    let s = f[0] * at(i);
    for (let k = 1; k <= h; k++) s += f[k] * (at(i + k) + sign * at(i - k));
    out[i] = s;
  };
  for (let i = 0; i < lo; i++) one(i);
  for (let i = Math.max(hiEnd, lo); i < n; i++) one(i);
}
