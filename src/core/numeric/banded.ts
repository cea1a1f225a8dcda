/**
 * Symmetric banded linear systems and the Whittaker smoother built on them.
 *
 * A symmetric matrix with half-bandwidth m is stored as m + 1 diagonals:
 * `bands[k][i] = A[i][i + k]` for k = 0..m and i = 0..n − k − 1
 * (bands[0] is the main diagonal). Solving costs O(n·m²) time and O(n·m)
 * memory, so the pentadiagonal Whittaker system (m = 2) is O(n).
 */

/** An LDLᵀ factorisation of a symmetric banded matrix (see {@link factorBandedSymmetric}). */
export interface BandedFactor {
  readonly n: number;
  /** Half-bandwidth m. */
  readonly m: number;
  /** D, the pivots. */
  readonly diag: Float64Array;
  /** low[q][i] = L[i][i − q] for q = 1..m (low[0] unused). */
  readonly low: readonly Float64Array[];
}

function checkBands(bands: readonly Float64Array[], n: number): number {
  const m = bands.length - 1;
  if (m < 0) throw new RangeError('The banded matrix needs at least its main diagonal.');
  if (n === 0) throw new RangeError('The system is empty.');
  for (let k = 0; k <= m; k++) {
    if (bands[k].length < Math.max(0, n - k)) throw new RangeError(`Diagonal ${k} has ${bands[k].length} values; it needs ${n - k}.`);
  }
  return m;
}

/**
 * LDLᵀ factorisation of a symmetric positive definite banded matrix (band
 * Cholesky without square roots: Golub & Van Loan, Matrix Computations,
 * 4th ed., §4.3). The pentadiagonal case (m = 2) has its own unrolled loop.
 * @param bands m + 1 diagonals, bands[k][i] = A[i][i + k]; not changed
 * @param n order of the matrix
 * @throws RangeError when a pivot is not positive (A is not positive definite:
 *   for the Whittaker system, too few points carry weight)
 */
export function factorBandedSymmetric(bands: readonly Float64Array[], n: number): BandedFactor {
  const m = checkBands(bands, n);
  const diag = new Float64Array(n);
  const low: Float64Array[] = [];
  for (let q = 0; q <= m; q++) low.push(new Float64Array(q === 0 ? 0 : n));
  const a0 = bands[0];
  let scale = 0;
  for (let i = 0; i < n; i++) scale = Math.max(scale, Math.abs(a0[i]));
  // Relative test: a pivot lost to rounding is as fatal as a negative one.
  const tiny = scale * 1e-15;
  const fail = (i: number, di: number): never => {
    throw new RangeError(`The system is not positive definite (pivot ${di} at row ${i + 1}); check the weights: enough points must carry weight.`);
  };
  if (m === 2) {
    const a1 = bands[1], a2 = bands[2], l1 = low[1], l2 = low[2];
    for (let i = 0; i < n; i++) {
      let di = a0[i];
      if (i >= 2) {
        const v = a2[i - 2] / diag[i - 2];
        l2[i] = v;
        di -= v * v * diag[i - 2];
      }
      if (i >= 1) {
        let v = a1[i - 1];
        if (i >= 2) v -= l2[i] * diag[i - 2] * l1[i - 1];
        v /= diag[i - 1];
        l1[i] = v;
        di -= v * v * diag[i - 1];
      }
      if (!(di > tiny)) fail(i, di);
      diag[i] = di;
    }
    return { n, m, diag, low };
  }
  for (let i = 0; i < n; i++) {
    const jStart = Math.max(0, i - m);
    let di = a0[i];
    for (let j = jStart; j < i; j++) {
      // A[i][j] with j < i lives in diagonal i − j at row j.
      let v = bands[i - j][j];
      for (let k = jStart; k < j; k++) v -= low[i - k][i] * diag[k] * low[j - k][j];
      const lij = v / diag[j];
      low[i - j][i] = lij;
      di -= lij * lij * diag[j];
    }
    if (!(di > tiny)) fail(i, di);
    diag[i] = di;
  }
  return { n, m, diag, low };
}

/** Solve L·D·Lᵀ x = b with a factor from {@link factorBandedSymmetric}; b is not changed. */
export function solveFactored(f: BandedFactor, b: Float64Array): Float64Array {
  const { n, m, diag, low } = f;
  if (b.length !== n) throw new RangeError(`The right-hand side has ${b.length} values; the system has ${n}.`);
  const x = Float64Array.from(b);
  for (let i = 1; i < n; i++) {
    let v = x[i];
    for (let q = 1; q <= m && q <= i; q++) v -= low[q][i] * x[i - q];
    x[i] = v;
  }
  for (let i = 0; i < n; i++) x[i] /= diag[i];
  for (let i = n - 2; i >= 0; i--) {
    let v = x[i];
    for (let q = 1; q <= m && i + q < n; q++) v -= low[q][i + q] * x[i + q];
    x[i] = v;
  }
  return x;
}

/**
 * Solve A·x = b for a symmetric positive definite banded A by LDLᵀ
 * factorisation ({@link factorBandedSymmetric}). Neither argument is changed.
 * O(n·m²) time.
 * @param bands m + 1 diagonals, bands[k][i] = A[i][i + k]; bands[k] must have length ≥ n − k
 * @param b right-hand side, length n
 * @returns x, a new array of length n
 * @throws RangeError when the shapes disagree or A is not positive definite
 */
export function solveBandedSymmetric(bands: readonly Float64Array[], b: Float64Array): Float64Array {
  return solveFactored(factorBandedSymmetric(bands, b.length), b);
}

/** Coefficients of the d-th difference, e.g. d = 2 → [1, −2, 1]. */
export function differenceCoefficients(d: number): Float64Array {
  let c = Float64Array.of(1);
  for (let k = 0; k < d; k++) {
    const next = new Float64Array(c.length + 1);
    for (let j = 0; j < c.length; j++) { next[j + 1] += c[j]; next[j] -= c[j]; }
    c = next;
  }
  return c;
}

/**
 * The d + 1 diagonals of DᵀD, D the (n − d) × n matrix of d-th differences.
 * @param n number of points (> d)
 * @param d difference order, 1..4
 */
export function differencePenaltyBands(n: number, d: number): Float64Array[] {
  if (!Number.isInteger(d) || d < 1 || d > 4) throw new RangeError(`The difference order must be 1, 2, 3 or 4, not ${d}.`);
  if (!Number.isInteger(n) || n <= d) throw new RangeError(`A difference penalty of order ${d} needs more than ${d} points; there are ${n}.`);
  const c = differenceCoefficients(d);
  const bands: Float64Array[] = [];
  for (let k = 0; k <= d; k++) bands.push(new Float64Array(n - k));
  // Row r of D touches points r..r+d; add its outer product cᵀc into the bands.
  for (let r = 0; r < n - d; r++) {
    for (let a = 0; a <= d; a++) {
      for (let b = a; b <= d; b++) bands[b - a][r + a] += c[a] * c[b];
    }
  }
  return bands;
}

/**
 * Whittaker smoother (Whittaker 1923; Eilers 2003, Anal. Chem. 75:3631):
 * z minimises Σ wᵢ(yᵢ − zᵢ)² + λ Σ (Δᵈz)², i.e. solves (W + λDᵀD) z = W y.
 * λ is per point spacing (x is not used: the method assumes evenly spaced points).
 * With W = I the sum of y is kept; polynomials of degree < d pass unchanged.
 * @param y signal (not changed)
 * @param lambda smoothness λ ≥ 0 (dimensionless; 0 returns y where weights are positive)
 * @param d difference order, default 2 (1..4)
 * @param w optional weights ≥ 0, default all 1; at least d points must have positive weight
 * @returns the smooth z, a new array
 * @throws RangeError on bad arguments (message says which)
 */
export function whittaker(y: Float64Array, lambda: number, d = 2, w?: Float64Array): Float64Array {
  const n = y.length;
  if (!Number.isFinite(lambda) || lambda < 0) throw new RangeError(`λ must be a finite number ≥ 0, not ${lambda}.`);
  if (w && w.length !== n) throw new RangeError(`There are ${w.length} weights for ${n} points; give one weight per point.`);
  let positive = 0;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(y[i])) throw new RangeError(`The signal is not a finite number at point ${i + 1} (${y[i]}).`);
    const wi = w ? w[i] : 1;
    if (!(wi >= 0) || !Number.isFinite(wi)) throw new RangeError(`Weight ${i + 1} is ${wi}; weights must be finite and ≥ 0.`);
    if (wi > 0) positive++;
  }
  if (positive < d) throw new RangeError(`Only ${positive} point(s) carry weight; the Whittaker smoother of order ${d} needs at least ${d}.`);
  // The penalty ignores polynomials of degree < d, so for d ≤ 2 the weighted least-squares
  // line (or mean) is taken out first and added back: the solve then only sees the
  // remainder, and the rounding error that grows with λ scales with the remainder, not y.
  const trend = d <= 2 ? weightedTrend(y, w, d) : new Float64Array(n);
  const bands = differencePenaltyBands(n, d);
  for (const band of bands) for (let i = 0; i < band.length; i++) band[i] *= lambda;
  const rhs = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const wi = w ? w[i] : 1;
    bands[0][i] += wi;
    rhs[i] = wi * (y[i] - trend[i]);
  }
  const z = solveBandedSymmetric(bands, rhs);
  for (let i = 0; i < n; i++) z[i] += trend[i];
  return z;
}

/** Weighted least-squares mean (d = 1) or line (d = 2) over the point index, evaluated at every point. */
function weightedTrend(y: Float64Array, w: Float64Array | undefined, d: number): Float64Array {
  const n = y.length;
  let sw = 0, sx = 0, sy = 0;
  for (let i = 0; i < n; i++) {
    const wi = w ? w[i] : 1;
    sw += wi; sx += wi * i; sy += wi * y[i];
  }
  const mx = sx / sw, my = sy / sw;
  let slope = 0;
  if (d === 2) {
    let sxx = 0, sxy = 0;
    for (let i = 0; i < n; i++) {
      const wi = w ? w[i] : 1;
      sxx += wi * (i - mx) * (i - mx); sxy += wi * (i - mx) * (y[i] - my);
    }
    slope = sxx > 0 ? sxy / sxx : 0;
  }
  const t = new Float64Array(n);
  for (let i = 0; i < n; i++) t[i] = my + slope * (i - mx);
  return t;
}
