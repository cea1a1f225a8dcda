/**
 * Fit one region of a trace with a sum of 1–4 peak shapes on a straight or
 * quadratic local baseline, by damped least squares (./lm.ts) with analytic
 * derivatives (./shapes.ts).
 *
 * The model is
 *   y(x) = b₀ + b₁·t + b₂·t² + Σₖ shapeₖ(x),   t = (x − centre)/halfSpan ∈ [−1, 1],
 * the baseline written in the region's centred and scaled x so its
 * coefficients stay comparable in size to the peaks' (b₂ only for 'quadratic').
 *
 * Standard errors come from the covariance s²·(JᵀJ)⁻¹, s² = SSR/(n − p), the
 * same estimate as SciPy's `optimize.curve_fit` (absolute_sigma=False);
 * figures derived from the parameters (FWHM and area, and for the EMG also
 * apex and height) get theirs by the delta method, gᵀCg with g the gradient
 * of the figure (e.g. Bevington & Robinson 2003, Data Reduction and Error
 * Analysis, 3rd ed., 3.2). They assume independent errors of one variance;
 * the result says whether the residuals looked independent.
 */
import { medianOf as median } from '../../numeric/median.ts';
import { covarianceFromJacobian, levenbergMarquardt } from './lm.ts';
import type { LmOptions, LmStopReason } from './lm.ts';
import { FIGURE_NAMES, SHAPES } from './shapes.ts';
import type { FigureName, ShapeBoundsInput, ShapeKind, ShapeModel } from './shapes.ts';

export type BaselineKind = 'line' | 'quadratic';

/** A rough peak to start from: apex position (x-units), height above the local baseline, FWHM (x-units). */
export interface PeakStart {
  position: number;
  height: number;
  fwhm: number;
}

export interface RegionFitOptions {
  /** Region start and end, x-units, both included. */
  from: number;
  to: number;
  /** Number of peak shapes, 1–4. Default: the number of `starts`, or 1. */
  peaks?: number;
  /** One shape for every peak, or one per peak in order of position (left to right). Default 'gaussian'. */
  shape?: ShapeKind | readonly ShapeKind[];
  /** Local baseline under the peaks. Default 'line'. */
  baseline?: BaselineKind;
  /** Starting peaks (e.g. from peak detection); missing ones are found in the region. */
  starts?: readonly PeakStart[];
  /**
   * Smallest FWHM any component may take, x-units. Default: 3 × the median
   * sample spacing in the region (our choice: narrower is a spike, not a peak).
   */
  minFwhm?: number;
  /**
   * The noise's correlation time τ in points when it is known from the processing (for white
   * noise through a linear filter with weights c: τ = (Σc)² / Σc², e.g. k for a k-point moving
   * average). When given it replaces the estimate from the residuals in the peak-count decision.
   */
  noiseCorrelationTime?: number;
  /** Solver settings (iterations, tolerances, cancellation). */
  solver?: LmOptions;
}

/** A value with its standard error (NaN when the covariance is not available). */
export interface Estimate {
  value: number;
  se: number;
}

export interface FittedPeak {
  shape: ShapeKind;
  /** Apex position (x-units), height above the local baseline, FWHM (x-units), area (signal × x-units). */
  position: Estimate;
  height: Estimate;
  fwhm: Estimate;
  area: Estimate;
  /** The shape's own parameters (e.g. eta for pseudo-Voigt; mu, sigma, tau for the EMG). */
  parameters: { name: string; value: number; se: number; atBound: 'lower' | 'upper' | null }[];
}

/** A check on an assumption of the fit or of its standard errors. */
export interface AssumptionCheck {
  name: string;
  /** true: held; false: did not hold; null: could not be checked. */
  held: boolean | null;
  detail: string;
}

export interface RegionFit {
  /** The region as asked and as used (sample indices into the input, both included). */
  region: { from: number; to: number; startIndex: number; endIndex: number };
  shapes: ShapeKind[];
  baselineKind: BaselineKind;
  minFwhm: number;
  peaks: FittedPeak[];
  /** Baseline b₀ + b₁t (+ b₂t²) with t = (x − centre)/halfSpan. */
  baseline: { centre: number; halfSpan: number; coefficients: Estimate[] };
  /** All parameters in model order with names like "peak 2 fwhm", "baseline b1". */
  parameterNames: string[];
  parameters: Float64Array;
  /** p × p row-major, or null when the parameters cannot be separated (singular JᵀJ). */
  covariance: Float64Array | null;
  /** Correlation between the areas of peaks i and j (k × k row-major); NaN without covariance. */
  areaCorrelation: Float64Array;
  /** The region's x and y (copies), the fitted total, the baseline, each peak alone, and y − fitted. */
  curves: { x: Float64Array; y: Float64Array; fitted: Float64Array; baseline: Float64Array; components: Float64Array[]; residual: Float64Array };
  n: number;
  /** Number of fitted parameters (peaks and baseline; the noise variance not counted). */
  p: number;
  ssr: number;
  residualSd: number;
  /** Gaussian log-likelihood at the maximum-likelihood variance SSR/n. */
  logLikelihood: number;
  /** −2 ln L + 2(p + 1) (Akaike 1974, IEEE Trans. Autom. Control 19:716); the variance counted as a parameter. */
  aic: number;
  /** −2 ln L + (p + 1) ln n (Schwarz 1978, Ann. Statist. 6:461). */
  bic: number;
  /** Σ(eᵢ − eᵢ₋₁)² / Σeᵢ² (Durbin & Watson 1950, Biometrika 37:409); about 2 for independent residuals. */
  durbinWatson: number;
  /** Lag-1 autocorrelation of the residuals. */
  residualLag1: number;
  /**
   * Integrated autocorrelation time τ of the residuals ({@link correlationTime}); n/τ is the
   * effective number of independent points. About 1 on a raw trace with white noise, about k
   * after a k-point moving average.
   */
  correlationTime: number;
  converged: boolean;
  stopReason: LmStopReason;
  iterations: number;
  evaluations: number;
  assumptions: AssumptionCheck[];
  /** How the fit was made, including where its starting peaks came from, for the page and every export. */
  method: string;
}

export type RegionFitOutcome = { ok: true; fit: RegionFit } | { ok: false; message: string };

export const MAX_PEAKS = 4;

interface Layout {
  shapes: ShapeModel[];
  offsets: number[];
  baselineOffset: number;
  nBaseline: number;
  p: number;
}

function layoutFor(shapes: readonly ShapeKind[], baseline: BaselineKind): Layout {
  const models = shapes.map((s) => SHAPES[s]);
  const offsets: number[] = [];
  let o = 0;
  for (const m of models) {
    offsets.push(o);
    o += m.paramNames.length;
  }
  const nBaseline = baseline === 'quadratic' ? 3 : 2;
  return { shapes: models, offsets, baselineOffset: o, nBaseline, p: o + nBaseline };
}

/** Model (and Jacobian) of the layout at `params` over `x` with scaled abscissa `t`. */
function evaluateModel(layout: Layout, x: Float64Array, t: Float64Array, params: ArrayLike<number>, out: Float64Array, jac: Float64Array | null): void {
  const n = x.length;
  const b = layout.baselineOffset;
  for (let i = 0; i < n; i++) {
    let v = params[b] + params[b + 1] * t[i];
    if (layout.nBaseline === 3) v += params[b + 2] * t[i] * t[i];
    out[i] = v;
  }
  if (jac) {
    for (let i = 0; i < n; i++) {
      jac[b * n + i] = 1;
      jac[(b + 1) * n + i] = t[i];
      if (layout.nBaseline === 3) jac[(b + 2) * n + i] = t[i] * t[i];
    }
  }
  layout.shapes.forEach((m, k) => m.evaluate(x, params, layout.offsets[k], out, jac, layout.offsets[k]));
}

/** Running mean over an odd window, shrinking at the ends (only for finding starting values). */
function smoothForStarts(y: Float64Array, window: number): Float64Array {
  const half = window >> 1;
  const out = new Float64Array(y.length);
  for (let i = 0; i < y.length; i++) {
    const lo = Math.max(0, i - half);
    const hi = Math.min(y.length - 1, i + half);
    let s = 0;
    for (let j = lo; j <= hi; j++) s += y[j];
    out[i] = s / (hi - lo + 1);
  }
  return out;
}

/** FWHM of the bump at index i of d (walk out to half height, stop where d rises again). */
function bumpWidth(x: Float64Array, d: Float64Array, i: number): number {
  const half = d[i] / 2;
  let l = i;
  while (l > 0 && d[l - 1] > half && d[l - 1] <= d[l]) l--;
  let r = i;
  while (r < d.length - 1 && d[r + 1] > half && d[r + 1] <= d[r]) r++;
  const lx = l > 0 && d[l - 1] <= half ? x[l - 1] + ((half - d[l - 1]) / (d[l] - d[l - 1])) * (x[l] - x[l - 1]) : x[l];
  const rx = r < d.length - 1 && d[r + 1] <= half ? x[r] + ((d[r] - half) / (d[r] - d[r + 1])) * (x[r + 1] - x[r]) : x[r];
  return rx - lx;
}

/**
 * Candidate peaks in `d` (data minus a rough baseline): local maxima of a
 * lightly smoothed copy, highest first, each with its height and FWHM.
 */
function candidatePeaks(x: Float64Array, d: Float64Array, minFwhm: number, spacing: number): PeakStart[] {
  const window = Math.max(1, 2 * Math.floor(minFwhm / spacing / 2) + 1);
  const s = smoothForStarts(d, window);
  const found: PeakStart[] = [];
  for (let i = 1; i < s.length - 1; i++) {
    if (s[i] > 0 && s[i] > s[i - 1] && s[i] >= s[i + 1]) {
      found.push({ position: x[i], height: s[i], fwhm: Math.max(1.5 * minFwhm, bumpWidth(x, s, i)) });
    }
  }
  return found.sort((a, b) => b.height - a.height);
}

/** Least-squares polynomial c₀ + c₁t (+ c₂t²) of `values` over t, q = 2 or 3 terms (normal equations; t ∈ [−1, 1] keeps them well conditioned). */
function polyFitT(t: Float64Array, values: ArrayLike<number>, q: number): number[] {
  const a = new Float64Array(q * q);
  const b = new Float64Array(q);
  for (let i = 0; i < t.length; i++) {
    const basis = [1, t[i], t[i] * t[i]];
    for (let u = 0; u < q; u++) {
      b[u] += basis[u] * values[i];
      for (let v = 0; v < q; v++) a[u * q + v] += basis[u] * basis[v];
    }
  }
  for (let c = 0; c < q; c++) {
    for (let r = c + 1; r < q; r++) {
      const f = a[r * q + c] / a[c * q + c];
      for (let v = c; v < q; v++) a[r * q + v] -= f * a[c * q + v];
      b[r] -= f * b[c];
    }
  }
  const out = new Array<number>(q).fill(0);
  for (let c = q - 1; c >= 0; c--) {
    let sum = b[c];
    for (let v = c + 1; v < q; v++) sum -= a[c * q + v] * out[v];
    out[c] = sum / a[c * q + c];
  }
  return out;
}

/**
 * Rough baseline for starting values only: the modified polynomial fit of
 * Lieber & Mahadevan-Jansen 2003 (Appl. Spectrosc. 57:1363): fit the
 * polynomial, clip the data to it from above, refit, 30 times. It follows a
 * drifting baseline under the peaks where a line through the end points would not.
 */
function roughBaseline(t: Float64Array, y: Float64Array, q: number): Float64Array {
  const work = Float64Array.from(y);
  const z = new Float64Array(y.length);
  for (let it = 0; it < 30; it++) {
    const c = polyFitT(t, work, q);
    for (let i = 0; i < y.length; i++) {
      z[i] = c[0] + c[1] * t[i] + (q === 3 ? c[2] * t[i] * t[i] : 0);
      if (work[i] > z[i]) work[i] = z[i];
    }
  }
  return z;
}

interface Prepared {
  x: Float64Array;
  y: Float64Array;
  t: Float64Array;
  startIndex: number;
  endIndex: number;
  centre: number;
  halfSpan: number;
  spacing: number;
  minFwhm: number;
  bounds: ShapeBoundsInput;
}

function prepare(x: Float64Array, y: Float64Array, options: RegionFitOptions): Prepared | string {
  if (x.length !== y.length) return `x and y have different lengths (${x.length} and ${y.length}).`;
  const { from, to } = options;
  if (!Number.isFinite(from) || !Number.isFinite(to) || !(to > from)) return `The region must run from a smaller to a larger x (got ${from} to ${to}).`;
  let startIndex = 0;
  while (startIndex < x.length && x[startIndex] < from) startIndex++;
  let endIndex = x.length - 1;
  while (endIndex >= 0 && x[endIndex] > to) endIndex--;
  const n = endIndex - startIndex + 1;
  if (n < 8) return `The region ${from} to ${to} holds ${Math.max(0, n)} points; a fit needs at least 8. Widen the region.`;
  const rx = x.slice(startIndex, endIndex + 1);
  const ry = y.slice(startIndex, endIndex + 1);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(rx[i]) || !Number.isFinite(ry[i])) return `Point ${startIndex + i + 1} of the region is not a finite number; the fit cannot use it.`;
    if (i > 0 && !(rx[i] > rx[i - 1])) return `x must increase through the region (point ${startIndex + i + 1} does not).`;
  }
  const gaps: number[] = [];
  for (let i = 1; i < n; i++) gaps.push(rx[i] - rx[i - 1]);
  const spacing = median(gaps);
  const minFwhm = options.minFwhm ?? 3 * spacing;
  if (!(minFwhm > 0)) return `The minimum width must be a positive number of x-units (got ${minFwhm}).`;
  const span = rx[n - 1] - rx[0];
  if (!(minFwhm < span)) return `The minimum width (${minFwhm}) is not smaller than the region (${span}); widen the region or lower the minimum width.`;
  const centre = 0.5 * (rx[0] + rx[n - 1]);
  const halfSpan = 0.5 * span;
  const t = rx.map((v) => (v - centre) / halfSpan);
  return { x: rx, y: ry, t, startIndex, endIndex, centre, halfSpan, spacing, minFwhm, bounds: { from: rx[0], to: rx[n - 1], minFwhm, maxFwhm: span } };
}

function shapeList(options: RegionFitOptions, k: number): ShapeKind[] | string {
  const s = options.shape ?? 'gaussian';
  if (typeof s === 'string') {
    if (!(s in SHAPES)) return `Unknown peak shape "${s}"; use gaussian, lorentzian, pseudo-voigt or emg.`;
    return Array.from({ length: k }, () => s);
  }
  if (s.length < k) return `${k} peaks asked for but only ${s.length} shapes given.`;
  for (const v of s) if (!(v in SHAPES)) return `Unknown peak shape "${v}"; use gaussian, lorentzian, pseudo-voigt or emg.`;
  return s.slice(0, k);
}

/** Least-squares line (or quadratic) of y − Σ peaks over t: starting baseline coefficients. */
function baselineStart(prep: Prepared, layout: Layout, peakParams: number[]): number[] {
  const rest = Float64Array.from(prep.y);
  const peaksOnly = new Float64Array(prep.x.length);
  layout.shapes.forEach((m, k) => m.evaluate(prep.x, peakParams, layout.offsets[k], peaksOnly, null, 0));
  for (let i = 0; i < rest.length; i++) rest[i] -= peaksOnly[i];
  return polyFitT(prep.t, rest, layout.nBaseline);
}

function runFit(prep: Prepared, shapes: ShapeKind[], baseline: BaselineKind, starts: PeakStart[], solver: LmOptions | undefined) {
  const layout = layoutFor(shapes, baseline);
  const lower = new Float64Array(layout.p).fill(-Infinity);
  const upper = new Float64Array(layout.p).fill(Infinity);
  const start: number[] = [];
  layout.shapes.forEach((m, k) => {
    const s = starts[k];
    const clampW = Math.min(prep.bounds.maxFwhm * 0.9, Math.max(prep.minFwhm * 1.2, s.fwhm));
    const clampC = Math.min(prep.bounds.to, Math.max(prep.bounds.from, s.position));
    start.push(...m.start(clampC, Math.max(s.height, 0), clampW));
    lower.set(m.lower(prep.bounds), layout.offsets[k]);
    upper.set(m.upper(prep.bounds), layout.offsets[k]);
  });
  start.push(...baselineStart(prep, layout, start));
  const result = levenbergMarquardt(
    { data: prep.y, nParams: layout.p, lower, upper, evaluate: (params, out, jac) => evaluateModel(layout, prep.x, prep.t, params, out, jac) },
    start,
    solver,
  );
  // Peaks of one shape may swap places during the fit; report them left to right.
  if (shapes.every((k) => k === shapes[0]) && shapes.length > 1) {
    const m = layout.shapes[0];
    const w = m.paramNames.length;
    const order = shapes.map((_, k) => k).sort((a, b) => m.figures(result.params, layout.offsets[a]).position - m.figures(result.params, layout.offsets[b]).position);
    if (order.some((k, i) => k !== i)) {
      const params = Float64Array.from(result.params);
      const atBound = Int8Array.from(result.atBound);
      order.forEach((from, to) => {
        params.set(result.params.subarray(from * w, from * w + w), to * w);
        atBound.set(result.atBound.subarray(from * w, from * w + w), to * w);
      });
      evaluateModel(layout, prep.x, prep.t, params, result.model, result.jacobian);
      result.params = params;
      result.atBound = atBound;
    }
  }
  return { layout, result };
}

function lag1(e: Float64Array): { dw: number; r1: number } {
  let num = 0;
  let den = 0;
  let cross = 0;
  let mean = 0;
  for (let i = 0; i < e.length; i++) mean += e[i] / e.length;
  let c0 = 0;
  for (let i = 0; i < e.length; i++) {
    den += e[i] * e[i];
    c0 += (e[i] - mean) ** 2;
    if (i > 0) {
      num += (e[i] - e[i - 1]) ** 2;
      cross += (e[i] - mean) * (e[i - 1] - mean);
    }
  }
  return { dw: den > 0 ? num / den : NaN, r1: c0 > 0 ? cross / c0 : NaN };
}

/**
 * Integrated autocorrelation time τ = 1 + 2 Σ ρ_l of the residuals by Geyer's
 * initial positive (and monotone) sequence (Geyer 1992, Statist. Sci. 7:473):
 * pair sums Γ_m = ρ_2m + ρ_2m+1 are added while positive and non-increasing.
 * Lags up to min(n/4, 500). White noise gives τ ≈ 1; a k-point moving average
 * of white noise gives τ = k. Clamped to at least 1; n/τ is the effective
 * number of independent points.
 */
export function correlationTime(e: Float64Array): number {
  const n = e.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += e[i] / n;
  const maxLag = Math.min(Math.floor(n / 4), 500);
  const acov = (l: number) => {
    let s = 0;
    for (let i = l; i < n; i++) s += (e[i] - mean) * (e[i - l] - mean);
    return s / n;
  };
  const c0 = acov(0);
  if (!(c0 > 0)) return 1;
  let sum = 0;
  let previous = Infinity;
  for (let m = 0; 2 * m + 1 <= maxLag; m++) {
    let gamma = (acov(2 * m) + acov(2 * m + 1)) / c0;
    if (!(gamma > 0)) break;
    gamma = Math.min(gamma, previous);
    sum += gamma;
    previous = gamma;
  }
  return Math.max(1, 2 * sum - 1);
}

function quadForm(g: number[], cov: Float64Array, p: number, offA: number, hA: number[], offB: number): number {
  let s = 0;
  for (let i = 0; i < g.length; i++) for (let j = 0; j < hA.length; j++) s += g[i] * cov[(offA + i) * p + offB + j] * hA[j];
  return s;
}

function assemble(prep: Prepared, shapes: ShapeKind[], baselineKind: BaselineKind, fitted: Fitted): RegionFit {
  const { layout, result } = fitted;
  const n = prep.x.length;
  const p = layout.p;
  const cov = covarianceFromJacobian(result.jacobian, n, p, result.ssr);
  const params = result.params;
  const se = (j: number) => (cov.matrix ? Math.sqrt(Math.max(0, cov.matrix[j * p + j])) : NaN);
  const names: string[] = [];
  const gradients: number[][][] = [];
  const peaks: FittedPeak[] = layout.shapes.map((m, k) => {
    const o = layout.offsets[k];
    m.paramNames.forEach((name) => names.push(`peak ${k + 1} ${name}`));
    const figs = m.figures(params, o);
    const grad = m.figureGradient(params, o);
    gradients.push(grad);
    const est = (r: number, name: FigureName): Estimate => ({
      value: figs[name],
      se: cov.matrix ? Math.sqrt(Math.max(0, quadForm(grad[r], cov.matrix, p, o, grad[r], o))) : NaN,
    });
    return {
      shape: m.kind,
      position: est(0, 'position'),
      height: est(1, 'height'),
      fwhm: est(2, 'fwhm'),
      area: est(3, 'area'),
      parameters: m.paramNames.map((name, j) => ({
        name,
        value: params[o + j],
        se: se(o + j),
        atBound: result.atBound[o + j] < 0 ? 'lower' : result.atBound[o + j] > 0 ? 'upper' : null,
      })),
    };
  });
  const bNames = ['b0', 'b1', 'b2'].slice(0, layout.nBaseline);
  bNames.forEach((b) => names.push(`baseline ${b}`));
  const k = peaks.length;
  const areaCorrelation = new Float64Array(k * k).fill(NaN);
  if (cov.matrix) {
    const areaRow = FIGURE_NAMES.indexOf('area');
    for (let i = 0; i < k; i++) {
      areaCorrelation[i * k + i] = 1;
      for (let j = i + 1; j < k; j++) {
        const c = quadForm(gradients[i][areaRow], cov.matrix, p, layout.offsets[i], gradients[j][areaRow], layout.offsets[j]);
        areaCorrelation[i * k + j] = areaCorrelation[j * k + i] = c / (peaks[i].area.se * peaks[j].area.se);
      }
    }
  }
  const baselineCurve = new Float64Array(n);
  const components = layout.shapes.map((m, kk) => {
    const c = new Float64Array(n);
    m.evaluate(prep.x, params, layout.offsets[kk], c, null, 0);
    return c;
  });
  for (let i = 0; i < n; i++) {
    const b = layout.baselineOffset;
    baselineCurve[i] = params[b] + params[b + 1] * prep.t[i] + (layout.nBaseline === 3 ? params[b + 2] * prep.t[i] * prep.t[i] : 0);
  }
  const ssr = result.ssr;
  const logLikelihood = -0.5 * n * (Math.log((2 * Math.PI * ssr) / n) + 1);
  const { dw, r1 } = lag1(result.residual);
  const tau = correlationTime(result.residual);
  const r1Limit = 1.96 / Math.sqrt(n);
  const assumptions: AssumptionCheck[] = [];
  assumptions.push({
    name: 'converged',
    held: result.converged,
    detail: result.converged
      ? `The solver converged (${result.stopReason} test) after ${result.iterations} iterations.`
      : `The solver stopped without converging (${result.stopReason}) after ${result.iterations} iterations; treat every figure as provisional.`,
  });
  const boundNames: string[] = [];
  layout.shapes.forEach((m, kk) =>
    m.paramNames.forEach((name, j) => {
      const o = layout.offsets[kk] + j;
      if (result.atBound[o] !== 0) boundNames.push(`peak ${kk + 1} ${name} (${result.atBound[o] < 0 ? 'lower' : 'upper'} bound)`);
    }),
  );
  assumptions.push({
    name: 'inside bounds',
    held: boundNames.length === 0,
    detail:
      boundNames.length === 0
        ? 'No parameter sits on a bound.'
        : `On a bound: ${boundNames.join(', ')}. Standard errors there are not meaningful, and the component may stand in for noise or baseline.`,
  });
  assumptions.push({
    name: 'covariance available',
    held: cov.matrix !== null,
    detail: cov.matrix
      ? `Standard errors from s²·(JᵀJ)⁻¹ (reciprocal condition ${cov.reciprocalCondition.toExponential(1)}).`
      : 'The parameters cannot be told apart (JᵀJ singular); no standard errors.',
  });
  assumptions.push({
    name: 'independent residuals',
    held: Number.isFinite(r1) ? Math.abs(r1) <= r1Limit : null,
    detail: Number.isFinite(r1)
      ? `Lag-1 autocorrelation of the residuals ${r1.toFixed(3)} (limit ±${r1Limit.toFixed(3)} = 1.96/√n, Bartlett 1946; Durbin–Watson ${dw.toFixed(2)}). ` +
        (Math.abs(r1) <= r1Limit
          ? 'Consistent with independent errors.'
          : `Correlated residuals (a smoothed trace, or a model that misses part of the signal; correlation time τ = ${tau.toFixed(1)} points): ` +
            `standard errors are too small, by about √τ = ${Math.sqrt(tau).toFixed(2)}×, and the plain information criteria favour extra peaks.`)
      : 'No residual to test.',
  });
  const shapeWords = Array.from(new Set(layout.shapes.map((m) => m.label))).join(' / ');
  const method =
    `Least-squares fit (Levenberg–Marquardt, analytic derivatives) of ${k} ${shapeWords} peak${k > 1 ? 's' : ''} on a ${baselineKind === 'line' ? 'straight' : 'quadratic'} local baseline ` +
    `over x = ${prep.x[0]} to ${prep.x[n - 1]} (${n} points); standard errors from the covariance scaled by the residual variance; minimum component FWHM ${prep.minFwhm.toPrecision(3)}. ${fitted.startNote}`;
  return {
    region: { from: prep.bounds.from, to: prep.bounds.to, startIndex: prep.startIndex, endIndex: prep.endIndex },
    shapes,
    baselineKind,
    minFwhm: prep.minFwhm,
    peaks,
    baseline: { centre: prep.centre, halfSpan: prep.halfSpan, coefficients: bNames.map((_, j) => ({ value: params[layout.baselineOffset + j], se: se(layout.baselineOffset + j) })) },
    parameterNames: names,
    parameters: params,
    covariance: cov.matrix,
    areaCorrelation,
    curves: { x: prep.x, y: prep.y, fitted: result.model, baseline: baselineCurve, components, residual: result.residual },
    n,
    p,
    ssr,
    residualSd: Math.sqrt(cov.residualVariance),
    logLikelihood,
    aic: -2 * logLikelihood + 2 * (p + 1),
    bic: -2 * logLikelihood + (p + 1) * Math.log(n),
    durbinWatson: dw,
    residualLag1: r1,
    correlationTime: tau,
    converged: result.converged,
    stopReason: result.stopReason,
    iterations: result.iterations,
    evaluations: result.evaluations,
    assumptions,
    method,
  };
}

/** Candidate places for one more peak: maxima of the smoothed residual of a fit, highest first. */
function extraPeakCandidates(prep: Prepared, fit: { residual: Float64Array; widths: number[] }, count: number): PeakStart[] {
  const narrowest = Math.min(...fit.widths);
  const window = Math.max(1, 2 * Math.floor((0.5 * narrowest) / prep.spacing / 2) + 1);
  const s = smoothForStarts(fit.residual, window);
  const found: PeakStart[] = [];
  for (let i = 1; i < s.length - 1; i++) {
    if (s[i] > 0 && s[i] > s[i - 1] && s[i] >= s[i + 1]) found.push({ position: prep.x[i], height: s[i], fwhm: Math.max(1.2 * prep.minFwhm, 0.7 * narrowest) });
  }
  return found.sort((a, b) => b.height - a.height).slice(0, count);
}

/** A fit with the starts it began from and, in words, where those starts came from. */
type Fitted = ReturnType<typeof runFit> & { starts: PeakStart[]; startNote: string };

function widthsOf(f: Fitted): number[] {
  return f.layout.shapes.map((m, k) => m.figures(f.result.params, f.layout.offsets[k]).fwhm);
}

function startsOf(f: Fitted): PeakStart[] {
  return f.layout.shapes.map((m, k) => {
    const g = m.figures(f.result.params, f.layout.offsets[k]);
    return { position: g.position, height: g.height, fwhm: g.fwhm };
  });
}

/** Better of two fits: converged first, then the smaller sum of squares. */
function better(a: Fitted | null, b: Fitted): Fitted {
  if (!a) return b;
  if (a.result.converged !== b.result.converged) return a.result.converged ? a : b;
  return b.result.ssr < a.result.ssr ? b : a;
}

/**
 * Grow a fit from the given starts to k peaks: fit what is known, then add
 * one peak at a time at the highest maxima of the smoothed residual (up to
 * three candidate places each, keeping the smallest sum of squares).
 */
function fitWithCount(
  prep: Prepared,
  shapes: ShapeKind[],
  baseline: BaselineKind,
  known: PeakStart[],
  k: number,
  solver: LmOptions | undefined,
  knownFrom = 'the given peaks',
): Fitted {
  // The k highest known peaks, then in order of position.
  let starts = known
    .slice()
    .sort((a, b) => b.height - a.height)
    .slice(0, k)
    .sort((a, b) => a.position - b.position);
  const notes: string[] = [];
  if (starts.length > 0) notes.push(`${starts.length} from ${knownFrom}`);
  else {
    const rough = roughBaseline(prep.t, prep.y, baseline === 'quadratic' ? 3 : 2);
    const d = prep.y.map((v, i) => v - rough[i]);
    starts = candidatePeaks(prep.x, d, prep.minFwhm, prep.spacing).slice(0, k);
    if (starts.length > 0) notes.push(`${starts.length} at maxima found in the region above a rough baseline`);
    else {
      notes.push('1 at the highest point above a rough baseline (the region has no local maximum)');
      let im = 0;
      for (let i = 1; i < d.length; i++) if (d[i] > d[im]) im = i;
      starts = [{ position: prep.x[im], height: Math.max(d[im], 0), fwhm: Math.max(1.5 * prep.minFwhm, 0.2 * prep.bounds.maxFwhm) }];
    }
  }
  let current: Fitted = { ...runFit(prep, shapes.slice(0, starts.length), baseline, starts, solver), starts, startNote: '' };
  while (current.starts.length < k) {
    const base = startsOf(current);
    const candidates = extraPeakCandidates(prep, { residual: current.result.residual, widths: widthsOf(current) }, 3);
    notes.push(candidates.length > 0 ? `1 added at the best of ${candidates.length} residual maxima` : "1 added on the largest peak's trailing flank (no positive residual left)");
    if (candidates.length === 0) {
      // Nothing positive left in the residual: split the largest peak's flank.
      const big = base.reduce((a, b) => (b.height > a.height ? b : a));
      candidates.push({ position: big.position + 0.5 * big.fwhm, height: 0.3 * big.height, fwhm: Math.max(1.2 * prep.minFwhm, 0.7 * big.fwhm) });
    }
    let best: Fitted | null = null;
    for (const c of candidates) {
      const next = [...base, c].sort((a, b) => a.position - b.position);
      best = better(best, { ...runFit(prep, shapes.slice(0, next.length), baseline, next, solver), starts: next, startNote: '' });
    }
    current = best as Fitted;
  }
  return { ...current, startNote: `Starting peaks: ${notes.join('; ')}.` };
}

/**
 * Fit a region of (x, y) with `peaks` shapes on a local baseline.
 * Starting peaks come from `options.starts` (the k highest when more are given) and the rest
 * from the region itself. Never changes its inputs.
 * Returns `{ ok: false, message }` for input the user can fix (too few
 * points, a region outside the data, a bad width or shape).
 */
export function fitRegion(x: Float64Array, y: Float64Array, options: RegionFitOptions): RegionFitOutcome {
  const prep = prepare(x, y, options);
  if (typeof prep === 'string') return { ok: false, message: prep };
  const k = options.peaks ?? Math.max(1, options.starts?.length ?? 1);
  if (!(Number.isInteger(k) && k >= 1 && k <= MAX_PEAKS)) return { ok: false, message: `A region fit holds 1 to ${MAX_PEAKS} peaks (asked for ${k}).` };
  const shapes = shapeList(options, k);
  if (typeof shapes === 'string') return { ok: false, message: shapes };
  const baseline = options.baseline ?? 'line';
  const p = layoutFor(shapes, baseline).p;
  if (prep.x.length < p + 3) return { ok: false, message: `The region holds ${prep.x.length} points, too few for ${p} parameters; widen it or fit fewer peaks.` };
  const known = (options.starts ?? []).filter((s) => Number.isFinite(s.position) && Number.isFinite(s.height) && Number.isFinite(s.fwhm));
  const f = fitWithCount(prep, shapes, baseline, known, k, options.solver);
  return { ok: true, fit: assemble(prep, shapes, baseline, f) };
}

/** @internal for ./count.ts: fit k and k + 1 from shared preparation. */
export const internals = { prepare, shapeList, layoutFor, runFit, fitWithCount, better, assemble, startsOf };
export type { Fitted, Prepared };
