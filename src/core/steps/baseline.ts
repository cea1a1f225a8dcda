/**
 * Baseline correction: estimate the slowly varying background under the
 * peaks and subtract it.
 */
import type { StepDefinition, StepOutput } from './types.ts';
import { whittaker } from '../numeric/banded.ts';
import { formatNumber } from './checks.ts';

export { whittaker } from '../numeric/banded.ts';

export type BaselineMethod = 'asls' | 'arpls' | 'polynomial';

export interface BaselineParams extends Record<string, string | number | [number, number][]> {
  method: BaselineMethod;
  /** Whittaker smoothness λ (dimensionless, per point). */
  lambda: number;
  /** AsLS asymmetry p: weight of points above the baseline (ratio). */
  p: number;
  /** Most reweighting passes (AsLS, arPLS). */
  maxIter: number;
  /** Polynomial order 0..5. */
  order: number;
  /** x-ranges (x-units) the user marks as pure baseline (polynomial). */
  ranges: [number, number][];
}

/** Result of an iterative baseline fit. */
export interface IterativeBaseline {
  /** The fitted baseline (new array). */
  baseline: Float64Array;
  /** Number of Whittaker solves made. */
  iterations: number;
  /** True when the weights stopped changing (AsLS) or changed less than the tolerance (arPLS). */
  converged: boolean;
  /** Final weights. */
  weights: Float64Array;
}

function checkLambda(lambda: number): void {
  if (!Number.isFinite(lambda) || lambda <= 0) throw new RangeError(`λ must be a positive number, not ${lambda}.`);
}
function checkMaxIter(maxIter: number): void {
  if (!Number.isInteger(maxIter) || maxIter < 1) throw new RangeError(`The iteration limit must be a whole number ≥ 1, not ${maxIter}.`);
}

/**
 * Asymmetric least squares baseline (Eilers & Boelens 2005, "Baseline
 * correction with asymmetric least squares smoothing", Leiden University
 * Medical Centre report): a Whittaker smooth (d = 2) with weight p for points
 * above the current fit and 1 − p for points on or below it, starting from
 * equal weights; refit until the weights stop changing or maxIter solves.
 * λ is per point, so it assumes evenly spaced x.
 * @param y signal (not changed), at least 3 points
 * @param lambda smoothness, usually 1e2..1e9
 * @param p asymmetry, 0 < p < 0.5, usually 0.001..0.1
 * @param maxIter most solves (≥ 1), e.g. 20
 */
export function baselineAsls(y: Float64Array, lambda: number, p: number, maxIter: number): IterativeBaseline {
  checkLambda(lambda);
  if (!Number.isFinite(p) || p <= 0 || p >= 0.5) throw new RangeError(`The asymmetry p must be between 0 and 0.5, not ${p}.`);
  checkMaxIter(maxIter);
  const n = y.length;
  const w = new Float64Array(n).fill(1);
  let z: Float64Array = new Float64Array(n);
  for (let it = 1; it <= maxIter; it++) {
    z = whittaker(y, lambda, 2, w);
    let changed = 0;
    for (let i = 0; i < n; i++) {
      const wi = y[i] > z[i] ? p : 1 - p;
      if (wi !== w[i]) { w[i] = wi; changed++; }
    }
    if (changed === 0) return { baseline: z, iterations: it, converged: true, weights: w };
  }
  return { baseline: z, iterations: maxIter, converged: false, weights: w };
}

/**
 * arPLS weight for a residual d = y − z (Baek, Park, Ahn & Choo 2015, Analyst
 * 140:250; the update rule from memory): 1 / (1 + exp(2(d − (2s − m))/s)),
 * m and s the mean and SD of the negative residuals.
 */
export function arplsWeight(d: number, m: number, s: number): number {
  const e = (2 * (d - (2 * s - m))) / s;
  // exp overflows to Infinity for far-above points: their weight is then exactly 0.
  return 1 / (1 + Math.exp(e));
}

/**
 * Asymmetrically reweighted penalised least squares baseline (Baek et al.
 * 2015, Analyst 140:250): Whittaker smooth (d = 2) reweighted with
 * {@link arplsWeight}, where m, s are the mean and population SD of the
 * negative residuals; stops when ‖w_new − w‖/‖w‖ < tol or after maxIter solves.
 * @param y signal (not changed), at least 3 points
 * @param lambda smoothness, usually 1e2..1e9
 * @param maxIter most solves (≥ 1)
 * @param tol relative weight change that ends the iteration, default 1e-3
 */
export function baselineArpls(y: Float64Array, lambda: number, maxIter: number, tol = 1e-3): IterativeBaseline {
  checkLambda(lambda);
  checkMaxIter(maxIter);
  if (!Number.isFinite(tol) || tol <= 0) throw new RangeError(`The tolerance must be a positive number, not ${tol}.`);
  const n = y.length;
  let w: Float64Array = new Float64Array(n).fill(1);
  let z: Float64Array = new Float64Array(n);
  for (let it = 1; it <= maxIter; it++) {
    z = whittaker(y, lambda, 2, w);
    let count = 0, sum = 0;
    for (let i = 0; i < n; i++) { const d = y[i] - z[i]; if (d < 0) { count++; sum += d; } }
    if (count < 2) return { baseline: z, iterations: it, converged: true, weights: w };
    const m = sum / count;
    let ss = 0;
    for (let i = 0; i < n; i++) { const d = y[i] - z[i]; if (d < 0) ss += (d - m) * (d - m); }
    const s = Math.sqrt(ss / count);
    // All negative residuals equal: the rule is undefined, and the fit already lies on the data.
    if (!(s > 0)) return { baseline: z, iterations: it, converged: true, weights: w };
    const wNew = new Float64Array(n);
    let num = 0, den = 0;
    for (let i = 0; i < n; i++) {
      wNew[i] = arplsWeight(y[i] - z[i], m, s);
      num += (wNew[i] - w[i]) ** 2;
      den += w[i] * w[i];
    }
    // Too few points left with weight: stop with the current fit rather than an ill-posed one.
    let positive = 0;
    for (let i = 0; i < n; i++) if (wNew[i] > 0) positive++;
    if (positive < 2) return { baseline: z, iterations: it, converged: false, weights: w };
    const done = Math.sqrt(num / den) < tol;
    w = wNew;
    if (done) return { baseline: z, iterations: it, converged: true, weights: w };
  }
  return { baseline: z, iterations: maxIter, converged: false, weights: w };
}

/** Indices of the points whose x lies in any of the ranges (ends included; each range may be given either way round). */
export function pointsInRanges(x: Float64Array, ranges: readonly (readonly [number, number])[]): number[] {
  const idx: number[] = [];
  for (let i = 0; i < x.length; i++) {
    for (const [a, b] of ranges) {
      if (x[i] >= Math.min(a, b) && x[i] <= Math.max(a, b)) { idx.push(i); break; }
    }
  }
  return idx;
}

/**
 * Least-squares polynomial baseline fitted only to the points inside the
 * marked x-ranges and evaluated at every x (outside the ranges it is
 * interpolated or extrapolated by the polynomial). x is centred and scaled
 * to [−1, 1] over the fitted points and the system is solved by Householder
 * QR (Golub & Van Loan §5.3), so orders up to 5 stay well conditioned.
 * Works on unevenly spaced x.
 * @param x x-units, ascending; not changed
 * @param y signal; not changed
 * @param ranges [from, to] pairs in x-units
 * @param order polynomial order 0..5
 * @throws RangeError when fewer than order + 1 points fall in the ranges
 */
export function baselinePolynomial(x: Float64Array, y: Float64Array, ranges: readonly (readonly [number, number])[], order: number): Float64Array {
  if (!Number.isInteger(order) || order < 0 || order > 5) throw new RangeError(`The polynomial order must be a whole number from 0 to 5, not ${order}.`);
  if (x.length !== y.length) throw new RangeError(`x has ${x.length} values but y has ${y.length}.`);
  const idx = pointsInRanges(x, ranges);
  const k = order + 1;
  if (idx.length < k) throw new RangeError(`Only ${idx.length} point(s) lie in the marked baseline ranges; a polynomial of order ${order} needs at least ${k}.`);
  const lo = x[idx[0]], hi = x[idx[idx.length - 1]];
  const centre = 0.5 * (lo + hi);
  const half = hi > lo ? 0.5 * (hi - lo) : 1;
  const m = idx.length;
  // Column-major Vandermonde A (m × k) and right-hand side b.
  const a = new Float64Array(m * k);
  const b = new Float64Array(m);
  for (let r = 0; r < m; r++) {
    const u = (x[idx[r]] - centre) / half;
    let pow = 1;
    for (let c = 0; c < k; c++) { a[c * m + r] = pow; pow *= u; }
    b[r] = y[idx[r]];
  }
  // Householder QR applied to A and b together.
  for (let c = 0; c < k; c++) {
    let norm = 0;
    for (let r = c; r < m; r++) norm += a[c * m + r] ** 2;
    norm = Math.sqrt(norm);
    if (norm === 0) continue;
    const alpha = a[c * m + c] > 0 ? -norm : norm;
    const v = new Float64Array(m);
    v[c] = a[c * m + c] - alpha;
    for (let r = c + 1; r < m; r++) v[r] = a[c * m + r];
    let vv = 0;
    for (let r = c; r < m; r++) vv += v[r] * v[r];
    if (vv === 0) continue;
    for (let cc = c; cc < k; cc++) {
      let dot = 0;
      for (let r = c; r < m; r++) dot += v[r] * a[cc * m + r];
      const f = (2 * dot) / vv;
      for (let r = c; r < m; r++) a[cc * m + r] -= f * v[r];
    }
    let dot = 0;
    for (let r = c; r < m; r++) dot += v[r] * b[r];
    const f = (2 * dot) / vv;
    for (let r = c; r < m; r++) b[r] -= f * v[r];
  }
  const coef = new Float64Array(k);
  for (let c = k - 1; c >= 0; c--) {
    let v = b[c];
    for (let cc = c + 1; cc < k; cc++) v -= a[cc * m + c] * coef[cc];
    const diag = a[c * m + c];
    if (Math.abs(diag) < 1e-12 * Math.abs(a[0])) throw new RangeError(`The marked ranges hold too few distinct x values for a polynomial of order ${order}; mark wider ranges or lower the order.`);
    coef[c] = v / diag;
  }
  const out = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) {
    const u = (x[i] - centre) / half;
    let v = 0;
    for (let c = k - 1; c >= 0; c--) v = v * u + coef[c];
    out[i] = v;
  }
  return out;
}

const METHODS: readonly BaselineMethod[] = ['asls', 'arpls', 'polynomial'];

function isRange(r: unknown): r is [number, number] {
  return Array.isArray(r) && r.length === 2 && Number.isFinite(r[0]) && Number.isFinite(r[1]);
}

export const baselineStep: StepDefinition<BaselineParams> = {
  id: 'baseline',
  label: 'Correct baseline',
  summary:
    'Estimates the slow background under the peaks and subtracts it: either a smooth curve that the peaks cannot pull up (AsLS, arPLS) or a polynomial through x-ranges you mark as pure baseline. ' +
    'It helps when drift or a sloping background would bias peak heights and areas. ' +
    'A broad peak or a hump wider than the baseline\'s smoothness (small λ, high order) is taken for background and removed, and the curve can sag into the noise floor so small peaks lose height.',
  params: [
    {
      key: 'method', label: 'Method', kind: 'choice', unit: 'none',
      choices: [
        { value: 'asls', label: 'Asymmetric least squares (AsLS)' },
        { value: 'arpls', label: 'Asymmetrically reweighted (arPLS)' },
        { value: 'polynomial', label: 'Polynomial through marked ranges' },
      ],
    },
    {
      key: 'lambda', label: 'Stiffness λ', kind: 'number', unit: 'none', min: 1e2, max: 1e9, log: true,
      help: 'Larger λ gives a stiffer, straighter baseline. It counts per point, so the same λ is stiffer in x-units on a coarser grid.',
    },
    {
      key: 'p', label: 'Asymmetry p', kind: 'number', unit: 'ratio', min: 0.001, max: 0.1, log: true,
      help: 'Weight given to points above the baseline (1 − p below). Smaller p keeps the baseline further under the peaks. AsLS only.',
    },
    { key: 'maxIter', label: 'Most passes', kind: 'int', unit: 'count', min: 1, max: 100, help: 'The fit is repeated with new weights until they settle or this many passes are made.' },
    { key: 'order', label: 'Polynomial order', kind: 'int', unit: 'count', min: 0, max: 5, help: '0 = constant, 1 = straight line, up to 5. Polynomial method only.' },
    { key: 'ranges', label: 'Baseline ranges', kind: 'ranges', unit: 'x-units', help: 'Stretches of x with no peaks; the polynomial is fitted to these points only.' },
  ],
  defaults: { method: 'asls', lambda: 1e5, p: 0.01, maxIter: 20, order: 1, ranges: [] },
  needsEvenSpacing: true,
  validate(params, input) {
    const method = params.method;
    if (!METHODS.includes(method)) return `Unknown method "${String(method)}"; choose AsLS, arPLS or polynomial.`;
    if (method === 'polynomial') {
      const order = params.order;
      if (typeof order !== 'number' || !Number.isInteger(order) || order < 0 || order > 5) return `The polynomial order must be a whole number from 0 to 5, not ${String(order)}.`;
      const ranges = params.ranges;
      if (!Array.isArray(ranges) || ranges.length === 0) return 'No baseline ranges are marked: mark at least one stretch of x that holds no peak.';
      for (const r of ranges) if (!isRange(r)) return 'A baseline range is not a pair of numbers; mark it again.';
      const count = pointsInRanges(input.x, ranges).length;
      if (count === 0) return 'No point of the trace lies in the marked baseline ranges; mark ranges inside the trace.';
      if (count < order + 1) return `Only ${count} point(s) lie in the marked baseline ranges; a polynomial of order ${order} needs at least ${order + 1}. Mark wider ranges or lower the order.`;
      return null;
    }
    const { lambda, maxIter, p } = params;
    if (typeof lambda !== 'number' || !Number.isFinite(lambda)) return 'λ is not a number; give a value from 100 to 1e9.';
    if (lambda < 1e2 || lambda > 1e9) return `λ must be from 100 to 1e9, not ${formatNumber(lambda)}.`;
    if (typeof maxIter !== 'number' || !Number.isInteger(maxIter) || maxIter < 1 || maxIter > 100) return `The number of passes must be a whole number from 1 to 100, not ${String(maxIter)}.`;
    if (method === 'asls') {
      if (typeof p !== 'number' || !Number.isFinite(p)) return 'The asymmetry p is not a number; give a value from 0.001 to 0.1.';
      if (p < 0.001 || p > 0.1) return `The asymmetry p must be from 0.001 to 0.1, not ${formatNumber(p)}.`;
    }
    return null;
  },
  apply(input, params): StepOutput {
    const { x, y } = input;
    const notes: string[] = [];
    let baseline: Float64Array;
    const figures: Record<string, number> = {};
    if (params.method === 'polynomial') {
      baseline = baselinePolynomial(x, y, params.ranges, params.order);
      const idx = pointsInRanges(x, params.ranges);
      figures.points = idx.length;
      notes.push(`Fitted a polynomial of order ${params.order} to ${idx.length} points in ${params.ranges.length} marked range(s) and subtracted it.`);
      const lo = x[idx[0]], hi = x[idx[idx.length - 1]];
      if (lo > x[0] || hi < x[x.length - 1]) {
        notes.push(`Outside x = ${formatNumber(lo)} to ${formatNumber(hi)} the baseline is extrapolated from the marked ranges; check it there.`);
      }
    } else {
      const fit = params.method === 'asls'
        ? baselineAsls(y, params.lambda, params.p, params.maxIter)
        : baselineArpls(y, params.lambda, params.maxIter);
      baseline = fit.baseline;
      figures.iterations = fit.iterations;
      const name = params.method === 'asls' ? 'AsLS' : 'arPLS';
      notes.push(
        fit.converged
          ? `${name} baseline (λ = ${formatNumber(params.lambda)}) settled after ${fit.iterations} pass${fit.iterations === 1 ? '' : 'es'} and was subtracted.`
          : `${name} baseline (λ = ${formatNumber(params.lambda)}) had not settled after ${fit.iterations} passes (weights still changing); it was subtracted as it stood. Allow more passes or raise λ.`,
      );
    }
    const out = new Float64Array(y.length);
    for (let i = 0; i < y.length; i++) out[i] = y[i] - baseline[i];
    return { x, y: out, baseline, notes, figures };
  },
};
