/**
 * Damped least squares (Levenberg 1944, Q. Appl. Math. 2:164; Marquardt 1963,
 * J. SIAM 11:431) with an analytic Jacobian and box bounds, for the small
 * dense problems of region fitting (up to a few hundred thousand residuals,
 * at most about twenty parameters).
 *
 * * Damping is scaled by the running maximum of diag(JᵀJ), as in MINPACK
 *   (Moré 1978, Lecture Notes in Mathematics 630:105), so the result does not
 *   depend on the parameters' units.
 * * The damping factor is updated from the gain ratio as in Nielsen 1999
 *   (IMM-REP-1999-05, Technical University of Denmark; also Madsen, Nielsen
 *   & Tingleff 2004, "Methods for non-linear least squares problems", 3.2).
 * * Bounds: a parameter on a bound whose gradient points outward is held
 *   for that iteration; every trial point is projected back into the box,
 *   and the gain ratio uses the projected step (a projected
 *   Levenberg–Marquardt in the manner of Kanzow, Yamashita & Fukushima 2004,
 *   J. Comput. Appl. Math. 172:375).
 * * Stops when the scaled step is below `xtol` relative to the scaled
 *   parameters, the relative decrease of the sum of squares is below `ftol`,
 *   or the scaled gradient is below `gtol` (the three MINPACK tests).
 */

export interface LmProblem {
  /** The data the model is fitted to (length n). */
  data: Float64Array;
  /** Number of parameters p. */
  nParams: number;
  /**
   * Write the model at `params` into `model` (length n); when `jac` is given,
   * also ∂model/∂params into it, column-major (column j at jac[j·n … j·n + n − 1]).
   */
  evaluate(params: Float64Array, model: Float64Array, jac: Float64Array | null): void;
  lower: Float64Array;
  upper: Float64Array;
}

export interface LmOptions {
  /** Largest number of Jacobian evaluations (outer iterations). Default 200. */
  maxIterations?: number;
  /** Relative scaled step below which the fit has converged. Default 1e-10. */
  xtol?: number;
  /** Relative decrease of the sum of squares below which it has converged. Default 1e-15. */
  ftol?: number;
  /** Largest cosine between residual and any Jacobian column at convergence. Default 1e-12. */
  gtol?: number;
  /** Checked once per iteration; when it returns true the fit stops with reason 'cancelled'. */
  isCancelled?: () => boolean;
}

export type LmStopReason = 'step' | 'sum-of-squares' | 'gradient' | 'iterations' | 'no-decrease' | 'cancelled' | 'not-finite';

export interface LmResult {
  params: Float64Array;
  /** Model at the solution (length n). */
  model: Float64Array;
  /** data − model. */
  residual: Float64Array;
  /** Jacobian of the model at the solution, column-major n × p. */
  jacobian: Float64Array;
  /** Sum of squared residuals. */
  ssr: number;
  iterations: number;
  evaluations: number;
  /** True when one of the three convergence tests passed. */
  converged: boolean;
  stopReason: LmStopReason;
  /** Per parameter: on its lower bound (−1), upper bound (+1) or inside (0). */
  atBound: Int8Array;
}

/** JᵀJ (p × p, row-major) for column-major J. */
function gram(jac: Float64Array, n: number, p: number, a: Float64Array): void {
  for (let i = 0; i < p; i++) {
    const ci = i * n;
    for (let j = 0; j <= i; j++) {
      const cj = j * n;
      let t = 0;
      for (let k = 0; k < n; k++) t += jac[ci + k] * jac[cj + k];
      a[i * p + j] = t;
      a[j * p + i] = t;
    }
  }
}

/** JᵀJ and Jᵀr for column-major J. */
function normalEquations(jac: Float64Array, r: Float64Array, n: number, p: number, a: Float64Array, g: Float64Array): void {
  gram(jac, n, p, a);
  for (let i = 0; i < p; i++) {
    let s = 0;
    for (let k = 0; k < n; k++) s += jac[i * n + k] * r[k];
    g[i] = s;
  }
}

/**
 * In-place Cholesky factor (lower) of a symmetric m × m row-major matrix.
 * Returns false when the matrix is not numerically positive definite.
 */
export function choleskyInPlace(m: number, a: Float64Array): boolean {
  for (let j = 0; j < m; j++) {
    let d = a[j * m + j];
    for (let k = 0; k < j; k++) d -= a[j * m + k] * a[j * m + k];
    if (!(d > 0) || !Number.isFinite(d)) return false;
    const l = Math.sqrt(d);
    a[j * m + j] = l;
    for (let i = j + 1; i < m; i++) {
      let s = a[i * m + j];
      for (let k = 0; k < j; k++) s -= a[i * m + k] * a[j * m + k];
      a[i * m + j] = s / l;
    }
  }
  return true;
}

/** Solve L Lᵀ x = b in place (b becomes x) with the factor from {@link choleskyInPlace}. */
export function choleskySolve(m: number, l: Float64Array, b: Float64Array): void {
  for (let i = 0; i < m; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i * m + k] * b[k];
    b[i] = s / l[i * m + i];
  }
  for (let i = m - 1; i >= 0; i--) {
    let s = b[i];
    for (let k = i + 1; k < m; k++) s -= l[k * m + i] * b[k];
    b[i] = s / l[i * m + i];
  }
}

function sumSquares(data: Float64Array, model: Float64Array, r: Float64Array): number {
  let s = 0;
  for (let k = 0; k < data.length; k++) {
    const d = data[k] - model[k];
    r[k] = d;
    s += d * d;
  }
  return s;
}

/**
 * Fit `problem` from `start` (projected into the bounds first).
 * Never changes `start` or the problem's arrays.
 * @throws RangeError when the start or bounds are malformed (a bug in the caller, not user input).
 */
export function levenbergMarquardt(problem: LmProblem, start: ArrayLike<number>, options: LmOptions = {}): LmResult {
  const n = problem.data.length;
  const p = problem.nParams;
  if (start.length !== p || problem.lower.length !== p || problem.upper.length !== p) {
    throw new RangeError(`The fit has ${p} parameters but the start or bounds have a different length.`);
  }
  const maxIterations = options.maxIterations ?? 200;
  const xtol = options.xtol ?? 1e-10;
  const ftol = options.ftol ?? 1e-15;
  const gtol = options.gtol ?? 1e-12;
  const { lower, upper } = problem;

  const params = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    if (!(lower[j] <= upper[j])) throw new RangeError(`Bounds of parameter ${j} are empty (${lower[j]} > ${upper[j]}).`);
    params[j] = Math.min(upper[j], Math.max(lower[j], start[j]));
  }
  let model = new Float64Array(n);
  const jac = new Float64Array(n * p);
  let r = new Float64Array(n);
  let trialModel = new Float64Array(n);
  let trialR = new Float64Array(n);
  const trial = new Float64Array(p);
  const a = new Float64Array(p * p);
  const g = new Float64Array(p);
  const diag = new Float64Array(p);
  const step = new Float64Array(p);
  const m = new Float64Array(p * p);
  const free: number[] = [];

  problem.evaluate(params, model, jac);
  let ssr = sumSquares(problem.data, model, r);
  let evaluations = 1;
  let iterations = 0;
  let lambda = 1e-3;
  let nu = 2;
  let stopReason: LmStopReason = 'iterations';
  let converged = false;

  if (!Number.isFinite(ssr)) stopReason = 'not-finite';
  else {
    outer: while (iterations < maxIterations) {
      if (options.isCancelled?.()) {
        stopReason = 'cancelled';
        break;
      }
      iterations++;
      normalEquations(jac, r, n, p, a, g);
      free.length = 0;
      let gradCos = 0;
      for (let j = 0; j < p; j++) {
        diag[j] = Math.max(diag[j], a[j * p + j]);
        const held = (params[j] <= lower[j] && g[j] < 0) || (params[j] >= upper[j] && g[j] > 0);
        if (!held) {
          free.push(j);
          const norm = Math.sqrt(a[j * p + j] * ssr);
          if (norm > 0) gradCos = Math.max(gradCos, Math.abs(g[j]) / norm);
        }
      }
      if (free.length === 0 || gradCos <= gtol) {
        stopReason = 'gradient';
        converged = true;
        break;
      }
      const f = free.length;
      for (;;) {
        for (let u = 0; u < f; u++) {
          for (let v = 0; v < f; v++) m[u * f + v] = a[free[u] * p + free[v]];
          m[u * f + u] += lambda * (diag[free[u]] > 0 ? diag[free[u]] : 1);
          step[u] = g[free[u]];
        }
        if (!choleskyInPlace(f, m)) {
          lambda *= nu;
          nu *= 2;
          if (lambda > 1e16) {
            stopReason = 'no-decrease';
            break outer;
          }
          continue;
        }
        choleskySolve(f, m, step);
        trial.set(params);
        for (let u = 0; u < f; u++) {
          const j = free[u];
          trial[j] = Math.min(upper[j], Math.max(lower[j], params[j] + step[u]));
        }
        // Predicted decrease of the linearised sum of squares for the projected step: 2δᵀg − δᵀAδ.
        let pred = 0;
        let stepNorm = 0;
        let paramNorm = 0;
        for (let i = 0; i < p; i++) {
          const di = trial[i] - params[i];
          if (di === 0) continue;
          let adi = 0;
          for (let j = 0; j < p; j++) adi += a[i * p + j] * (trial[j] - params[j]);
          pred += 2 * di * g[i] - di * adi;
          stepNorm += diag[i] * di * di;
        }
        for (let i = 0; i < p; i++) paramNorm += diag[i] * params[i] * params[i];
        if (stepNorm === 0) {
          stopReason = 'step';
          converged = true;
          break outer;
        }
        problem.evaluate(trial, trialModel, null);
        evaluations++;
        const trialSsr = sumSquares(problem.data, trialModel, trialR);
        const actual = ssr - trialSsr;
        const rho = pred > 0 && Number.isFinite(trialSsr) ? actual / pred : -1;
        if (rho > 0) {
          params.set(trial);
          [model, trialModel] = [trialModel, model];
          [r, trialR] = [trialR, r];
          const previous = ssr;
          ssr = trialSsr;
          lambda *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
          nu = 2;
          problem.evaluate(params, model, jac);
          evaluations++;
          if (stepNorm <= xtol * xtol * paramNorm) {
            stopReason = 'step';
            converged = true;
            break outer;
          }
          if (actual <= ftol * previous && pred <= ftol * previous && rho <= 2) {
            stopReason = 'sum-of-squares';
            converged = true;
            break outer;
          }
          if (ssr === 0) {
            stopReason = 'sum-of-squares';
            converged = true;
            break outer;
          }
          break;
        }
        // A rejected step this small means no representable point is better.
        if (stepNorm <= (xtol * xtol * paramNorm) / 1e4 || (pred > 0 && pred <= 1e-30 * ssr)) {
          stopReason = 'step';
          converged = true;
          break outer;
        }
        lambda *= nu;
        nu *= 2;
        if (lambda > 1e16) {
          stopReason = 'no-decrease';
          break outer;
        }
      }
    }
  }
  const atBound = new Int8Array(p);
  for (let j = 0; j < p; j++) atBound[j] = params[j] <= lower[j] ? -1 : params[j] >= upper[j] ? 1 : 0;
  return { params, model, residual: r, jacobian: jac, ssr, iterations, evaluations, converged, stopReason, atBound };
}

export interface Covariance {
  /** p × p row-major, s²·(JᵀJ)⁻¹ with s² = ssr/(n − p); null when JᵀJ is singular. */
  matrix: Float64Array | null;
  /** Reciprocal condition estimate of the equilibrated JᵀJ (squared ratio of Cholesky pivots). */
  reciprocalCondition: number;
  /** Residual variance s² used for the scaling. */
  residualVariance: number;
}

/**
 * Parameter covariance s²·(JᵀJ)⁻¹ with s² = ssr/(n − p), the estimate
 * `scipy.optimize.curve_fit` returns with `absolute_sigma=False`. JᵀJ is
 * equilibrated to unit diagonal before the Cholesky inverse; a reciprocal
 * condition below 1e-14 is reported as singular (parameters not separable).
 */
export function covarianceFromJacobian(jac: Float64Array, n: number, p: number, ssr: number): Covariance {
  const residualVariance = n > p ? ssr / (n - p) : NaN;
  const a = new Float64Array(p * p);
  gram(jac, n, p, a);
  const scale = new Float64Array(p);
  for (let j = 0; j < p; j++) scale[j] = a[j * p + j] > 0 ? 1 / Math.sqrt(a[j * p + j]) : 0;
  if (scale.some((s) => s === 0)) return { matrix: null, reciprocalCondition: 0, residualVariance };
  const b = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) b[i * p + j] = a[i * p + j] * scale[i] * scale[j];
  if (!choleskyInPlace(p, b)) return { matrix: null, reciprocalCondition: 0, residualVariance };
  let lo = Infinity;
  let hi = 0;
  for (let j = 0; j < p; j++) {
    lo = Math.min(lo, b[j * p + j]);
    hi = Math.max(hi, b[j * p + j]);
  }
  const reciprocalCondition = (lo / hi) ** 2;
  if (reciprocalCondition < 1e-14) return { matrix: null, reciprocalCondition, residualVariance };
  const matrix = new Float64Array(p * p);
  const col = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    col.fill(0);
    col[j] = 1;
    choleskySolve(p, b, col);
    for (let i = 0; i < p; i++) matrix[i * p + j] = col[i] * scale[i] * scale[j] * residualVariance;
  }
  return { matrix, reciprocalCondition, residualVariance };
}
