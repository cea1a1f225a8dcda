/**
 * Weighted least-squares calibration curves: response against amount, as a
 * straight line, a line through the origin, or a quadratic (with or without
 * an intercept), unweighted or with weights 1/x or 1/x² (x the amount).
 *
 * Model: yᵢ = f(xᵢ) + eᵢ with independent normal errors of variance σ²/wᵢ.
 * The weights are normalised so that they sum to n (Miller & Miller,
 * Statistics and Chemometrics for Analytical Chemistry, 6th ed. 2010, §5.10);
 * the residual standard deviation s = √(Σ wᵢ rᵢ² / (n − p)) is then the
 * standard deviation of one response of average weight, and the response
 * standard deviation at amount x is s/√w(x). Coefficients, their standard
 * errors (s·√diag((XᵀWX)⁻¹)) and the residual standard deviation are the
 * textbook weighted least-squares results (Draper & Smith, Applied
 * Regression Analysis, 3rd ed. 1998, ch. 9); unweighted fits are the
 * special case w = 1, and reproduce NIST StRD "Norris" to 1e-12 (tests).
 *
 * Numerics: the amounts are first mapped to u = (x − c)/h (c the middle of
 * the amount range and h its half-width; c = 0 for curves through the
 * origin), the weighted design matrix in u is solved by Householder QR
 * (Golub & Van Loan, Matrix Computations, 4th ed., §5.3), and the
 * coefficients and covariance are carried back to powers of x exactly by
 * the binomial theorem. Inverse prediction works in u, where nothing cancels.
 *
 * R² is reported as a figure only: 1 − Σwr²/Σw(y − ȳ_w)² for curves with an
 * intercept; for curves through the origin the uncentred 1 − Σwr²/Σwy² (the
 * form R's lm reports for models without intercept). It never chooses a
 * model (see {@link chooseCurve}).
 */
import { fSurvival, studentTSurvival } from '../numeric/distributions.ts';

/** Straight line or quadratic in the amount. */
export type CurveKind = 'line' | 'quadratic';
/** Weights on each standard: none, 1/x, or 1/x² (x the standard's amount). */
export type Weighting = 'none' | '1/x' | '1/x2';
/** The name of a coefficient: intercept (x⁰), slope (x¹), quadratic (x²). */
export type TermName = 'intercept' | 'slope' | 'quadratic';

export const WEIGHTINGS: readonly Weighting[] = ['none', '1/x', '1/x2'];

/** The curve to fit. */
export interface CurveModel {
  readonly kind: CurveKind;
  /** True: no intercept (the curve passes through amount 0, response 0). */
  readonly throughOrigin: boolean;
  readonly weighting: Weighting;
}

/** A fitted calibration curve (all amounts and responses in the units of the input). */
export interface CurveFit {
  readonly model: CurveModel;
  /** Number of standards used. */
  readonly n: number;
  /** Number of coefficients p. */
  readonly parameters: number;
  /** Residual degrees of freedom n − p. */
  readonly df: number;
  /** Names of the coefficients, in the order of {@link coefficients}. */
  readonly terms: readonly TermName[];
  /** Powers of x of the coefficients (0 intercept, 1 slope, 2 quadratic). */
  readonly powers: readonly number[];
  /** Coefficients of the curve in powers of the amount: response = Σ coefficients[k]·x^powers[k]. */
  readonly coefficients: readonly number[];
  /** Standard errors of the coefficients (s·√diag((XᵀWX)⁻¹)). */
  readonly standardErrors: readonly number[];
  /** Covariance matrix of the coefficients, s²(XᵀWX)⁻¹, in the order of {@link terms}. */
  readonly covariance: readonly (readonly number[])[];
  /** Residual standard deviation s = √(Σwᵢrᵢ²/(n − p)), response units, for a response of weight 1. */
  readonly residualSd: number;
  /** Σ wᵢ rᵢ². */
  readonly weightedResidualSumOfSquares: number;
  /** R², as a figure only. */
  readonly rSquared: number;
  /** 'centred' (curves with intercept) or 'uncentred' (through the origin). */
  readonly rSquaredKind: 'centred' | 'uncentred';
  /** The data, in input order. */
  readonly amounts: readonly number[];
  readonly responses: readonly number[];
  /** Normalised weights (they sum to n). */
  readonly weights: readonly number[];
  readonly fitted: readonly number[];
  readonly residuals: readonly number[];
  /** Smallest and largest amount among the standards: the calibrated range. */
  readonly range: { readonly low: number; readonly high: number };
  /**
   * w(x) = x^(−k) / weightScale for k = 0, 1, 2 (none, 1/x, 1/x²): the weight a response at amount x
   * would have on the scale of the fit; weightScale is the mean of xᵢ^(−k) over the standards.
   */
  readonly weightScale: number;
  /** The same curve in the scaled amount u = (x − centre)/scale, for accurate evaluation and inversion. */
  readonly scaled: {
    readonly centre: number;
    readonly scale: number;
    readonly coefficients: readonly number[];
    /** (UᵀWU)⁻¹ in u, not multiplied by s². */
    readonly unscaledCovariance: readonly (readonly number[])[];
  };
}

export type FitOutcome = { ok: true; fit: CurveFit } | { ok: false; problem: string };

/** Power of the amount in the weight 1/x^k. */
export function weightPower(weighting: Weighting): number {
  return weighting === 'none' ? 0 : weighting === '1/x' ? 1 : 2;
}

/** The coefficient powers of a model: [0, 1], [1], [0, 1, 2] or [1, 2]. */
export function modelPowers(kind: CurveKind, throughOrigin: boolean): number[] {
  const top = kind === 'line' ? 1 : 2;
  const out: number[] = [];
  for (let k = throughOrigin ? 1 : 0; k <= top; k++) out.push(k);
  return out;
}

const TERM_OF_POWER: readonly TermName[] = ['intercept', 'slope', 'quadratic'];

/** The model in words, e.g. "straight line through the origin, weights 1/x²". */
export function modelInWords(model: CurveModel): string {
  const curve = model.kind === 'line' ? 'straight line' : 'quadratic';
  const origin = model.throughOrigin ? ' through the origin' : '';
  const weights = model.weighting === 'none' ? 'unweighted' : `weights ${model.weighting === '1/x' ? '1/x' : '1/x²'}`;
  return `${curve}${origin}, ${weights}`;
}

/** Binomial coefficient for small arguments. */
function binomial(n: number, k: number): number {
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return r;
}

/**
 * Householder QR least squares of A·g ≈ b (A n×p, column-major copies made here).
 * Returns the solution and R⁻¹ (upper triangular), or null when a column is
 * (numerically) a combination of the others.
 */
function householderLeastSquares(a: number[][], b: number[]): { solution: number[]; rInverse: number[][] } | null {
  const n = b.length, p = a.length;
  const cols = a.map((c) => c.slice());
  const rhs = b.slice();
  const colNorms = cols.map((c) => Math.hypot(...c));
  for (let k = 0; k < p; k++) {
    let norm = 0;
    for (let i = k; i < n; i++) norm = Math.hypot(norm, cols[k][i]);
    if (norm === 0 || norm <= 1e-12 * colNorms[k]) return null;
    const alpha = cols[k][k] > 0 ? -norm : norm;
    const v = new Array<number>(n).fill(0);
    v[k] = cols[k][k] - alpha;
    for (let i = k + 1; i < n; i++) v[i] = cols[k][i];
    let vv = 0;
    for (let i = k; i < n; i++) vv += v[i] * v[i];
    const reflect = (col: number[]) => {
      let dot = 0;
      for (let i = k; i < n; i++) dot += v[i] * col[i];
      const f = (2 * dot) / vv;
      for (let i = k; i < n; i++) col[i] -= f * v[i];
    };
    for (let j = k; j < p; j++) reflect(cols[j]);
    reflect(rhs);
    cols[k][k] = alpha;
    for (let i = k + 1; i < n; i++) cols[k][i] = 0;
  }
  // R[i][j] = cols[j][i] for i ≤ j.
  const solution = new Array<number>(p).fill(0);
  for (let i = p - 1; i >= 0; i--) {
    let s = rhs[i];
    for (let j = i + 1; j < p; j++) s -= cols[j][i] * solution[j];
    solution[i] = s / cols[i][i];
  }
  const rInverse = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  for (let j = 0; j < p; j++) {
    rInverse[j][j] = 1 / cols[j][j];
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let k = i + 1; k <= j; k++) s += cols[k][i] * rInverse[k][j];
      rInverse[i][j] = -s / cols[i][i];
    }
  }
  return { solution, rInverse };
}

/** Number of distinct values. */
function distinctCount(values: readonly number[]): number {
  return new Set(values).size;
}

/**
 * Fit a calibration curve by weighted least squares (see the module comment).
 *
 * @param amounts known amounts of the standards (finite; > 0 for weighted fits)
 * @param responses their responses (finite), same length
 * @returns the fit, or a problem in words when the standards cannot carry this
 *   model: too few standards (n must exceed the number of coefficients, so a
 *   residual standard deviation exists), too few distinct amounts, or an
 *   amount of zero or below with 1/x or 1/x² weights.
 */
export function fitCurve(amounts: readonly number[], responses: readonly number[], model: CurveModel): FitOutcome {
  const n = amounts.length;
  if (responses.length !== n) throw new RangeError('Amounts and responses must have the same length.');
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(amounts[i]) || !Number.isFinite(responses[i])) {
      return { ok: false, problem: `Standard ${i + 1} has an amount or response that is not a finite number.` };
    }
  }
  const powers = modelPowers(model.kind, model.throughOrigin);
  const p = powers.length;
  const curve = modelInWords({ ...model, weighting: 'none' }).replace(', unweighted', '');
  if (n <= p) {
    return { ok: false, problem: `A ${curve} has ${p} coefficient${p > 1 ? 's' : ''} and needs at least ${p + 1} standards (so that the scatter about it can be measured); there ${n === 1 ? 'is' : 'are'} ${n}.` };
  }
  const distinct = distinctCount(amounts);
  // p coefficients need p different amounts (through the origin: p different non-zero amounts).
  const levelsNeeded = p;
  const nonZeroDistinct = distinctCount(amounts.filter((a) => a !== 0));
  if ((model.throughOrigin ? nonZeroDistinct : distinct) < levelsNeeded) {
    return { ok: false, problem: `A ${curve} needs standards at ${levelsNeeded} or more different ${model.throughOrigin ? 'non-zero ' : ''}amounts; there ${distinct === 1 ? 'is' : 'are'} ${model.throughOrigin ? nonZeroDistinct : distinct}.` };
  }
  const k = weightPower(model.weighting);
  if (k > 0) {
    const bad = amounts.findIndex((a) => !(a > 0));
    if (bad >= 0) {
      return { ok: false, problem: `Weights ${model.weighting === '1/x' ? '1/x' : '1/x²'} need every standard's amount above zero; standard ${bad + 1} has ${amounts[bad]}. Leave that standard out or fit unweighted.` };
    }
  }
  const raw = amounts.map((a) => (k === 0 ? 1 : Math.pow(a, -k)));
  const weightScale = raw.reduce((s, v) => s + v, 0) / n;
  const weights = raw.map((v) => v / weightScale);

  let low = Infinity, high = -Infinity;
  for (const a of amounts) { if (a < low) low = a; if (a > high) high = a; }
  const centre = model.throughOrigin ? 0 : 0.5 * (low + high);
  const scale = model.throughOrigin ? Math.max(Math.abs(low), Math.abs(high)) : 0.5 * (high - low);
  const u = amounts.map((a) => (a - centre) / scale);

  const sw = weights.map(Math.sqrt);
  const columns = powers.map((pw) => u.map((ui, i) => sw[i] * Math.pow(ui, pw)));
  const solved = householderLeastSquares(columns, responses.map((y, i) => sw[i] * y));
  if (!solved) return { ok: false, problem: `The standards' amounts cannot determine a ${curve}: the fit is singular.` };
  const gamma = solved.solution;
  const ri = solved.rInverse;
  const covU = Array.from({ length: p }, (_, i) => Array.from({ length: p }, (_, j) => {
    let s = 0;
    for (let m = 0; m < p; m++) s += ri[i][m] * ri[j][m];
    return s;
  }));

  const fitted = u.map((ui) => powers.reduce((s, pw, j) => s + gamma[j] * Math.pow(ui, pw), 0));
  const residuals = responses.map((y, i) => y - fitted[i]);
  let rss = 0;
  for (let i = 0; i < n; i++) rss += weights[i] * residuals[i] * residuals[i];
  const df = n - p;
  const s2 = rss / df;

  // Back to powers of x: coefficient of x^pj is Σ_k γ_k · C(pk, pj)·(−c)^(pk−pj) / h^pk.
  const T = powers.map((pj) => powers.map((pk) => (pk < pj ? 0 : (binomial(pk, pj) * Math.pow(-centre, pk - pj)) / Math.pow(scale, pk))));
  const coefficients = T.map((row) => row.reduce((s, t, kk) => s + t * gamma[kk], 0));
  const covariance = T.map((rowI) => T.map((rowJ) => {
    let s = 0;
    for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) s += rowI[a] * covU[a][b] * rowJ[b];
    return s * s2;
  }));
  const standardErrors = covariance.map((row, i) => Math.sqrt(row[i]));

  let tss = 0;
  if (model.throughOrigin) {
    for (let i = 0; i < n; i++) tss += weights[i] * responses[i] * responses[i];
  } else {
    const ybar = responses.reduce((s, y, i) => s + weights[i] * y, 0) / n;
    for (let i = 0; i < n; i++) tss += weights[i] * (responses[i] - ybar) ** 2;
  }
  const rSquared = tss > 0 ? 1 - rss / tss : NaN;

  return {
    ok: true,
    fit: {
      model: { ...model },
      n,
      parameters: p,
      df,
      terms: powers.map((pw) => TERM_OF_POWER[pw]),
      powers,
      coefficients,
      standardErrors,
      covariance,
      residualSd: Math.sqrt(s2),
      weightedResidualSumOfSquares: rss,
      rSquared,
      rSquaredKind: model.throughOrigin ? 'uncentred' : 'centred',
      amounts: amounts.slice(),
      responses: responses.slice(),
      weights,
      fitted,
      residuals,
      range: { low, high },
      weightScale,
      scaled: { centre, scale, coefficients: gamma, unscaledCovariance: covU },
    },
  };
}

/** The curve's coefficients in powers of u = (x − centre)/scale, as a dense ascending polynomial. */
export function scaledCurvePolynomial(fit: CurveFit): number[] {
  const out = [0, 0, 0];
  fit.powers.forEach((pw, j) => { out[pw] = fit.scaled.coefficients[j]; });
  return out;
}

/** Fitted response at amount x. */
export function curveValue(fit: CurveFit, x: number): number {
  const u = (x - fit.scaled.centre) / fit.scaled.scale;
  return fit.powers.reduce((s, pw, j) => s + fit.scaled.coefficients[j] * Math.pow(u, pw), 0);
}

/** Slope d(response)/d(amount) of the fitted curve at amount x. */
export function curveSlope(fit: CurveFit, x: number): number {
  const u = (x - fit.scaled.centre) / fit.scaled.scale;
  let d = 0;
  fit.powers.forEach((pw, j) => { if (pw > 0) d += pw * fit.scaled.coefficients[j] * Math.pow(u, pw - 1); });
  return d / fit.scaled.scale;
}

/** Weight of a response at amount x on the fit's scale (1 for unweighted fits); NaN for x ≤ 0 when weighted. */
export function weightAt(fit: CurveFit, x: number): number {
  const k = weightPower(fit.model.weighting);
  if (k === 0) return 1;
  return x > 0 ? Math.pow(x, -k) / fit.weightScale : NaN;
}

/** Standard deviation of one response at amount x under the fitted variance model: s/√w(x). */
export function responseSdAt(fit: CurveFit, x: number): number {
  return fit.residualSd / Math.sqrt(weightAt(fit, x));
}

/** Lack-of-fit F-test (Draper & Smith 1998, §2.1 "Lack of fit and pure error"), weighted sums of squares. */
export interface LackOfFitTest {
  /** Σ over amount levels of Σ wᵢ(yᵢ − ȳ_level)²: scatter of replicates about their own level's mean. */
  readonly pureErrorSumOfSquares: number;
  readonly pureErrorDf: number;
  /** Residual sum of squares minus pure error. */
  readonly lackOfFitSumOfSquares: number;
  readonly lackOfFitDf: number;
  /** F = (SS_lof/df_lof)/(SS_pe/df_pe). */
  readonly f: number;
  /** P(F > f) under the hypothesis that the curve fits (F with df_lof, df_pe degrees of freedom). */
  readonly pValue: number;
}

/**
 * Lack-of-fit test of a fitted curve against the scatter of its replicate
 * standards (standards with exactly the same amount form one level).
 * Needs replicates (df_pe = n − levels ≥ 1) and more levels than
 * coefficients (df_lof = levels − p ≥ 1); otherwise returns a sentence
 * saying which is missing. With weights the level's mean is weighted; as the
 * weights depend on the amount only, it is the plain mean.
 */
export function lackOfFitTest(fit: CurveFit): { ok: true; test: LackOfFitTest } | { ok: false; reason: string } {
  const levels = new Map<number, number[]>();
  fit.amounts.forEach((a, i) => {
    const list = levels.get(a);
    if (list) list.push(i); else levels.set(a, [i]);
  });
  const pureErrorDf = fit.n - levels.size;
  const lackOfFitDf = levels.size - fit.parameters;
  if (pureErrorDf < 1) return { ok: false, reason: 'no standard is repeated at the same amount, so there is no pure error to test against' };
  if (lackOfFitDf < 1) return { ok: false, reason: `${levels.size} amount levels leave nothing to test for a curve with ${fit.parameters} coefficients` };
  let ssPe = 0;
  for (const idx of levels.values()) {
    let sw = 0, swy = 0;
    for (const i of idx) { sw += fit.weights[i]; swy += fit.weights[i] * fit.responses[i]; }
    const mean = swy / sw;
    for (const i of idx) ssPe += fit.weights[i] * (fit.responses[i] - mean) ** 2;
  }
  const ssLof = Math.max(0, fit.weightedResidualSumOfSquares - ssPe);
  const f = ssPe > 0 ? (ssLof / lackOfFitDf) / (ssPe / pureErrorDf) : ssLof > 0 ? Infinity : NaN;
  const pValue = Number.isNaN(f) ? NaN : fSurvival(f, lackOfFitDf, pureErrorDf);
  return { ok: true, test: { pureErrorSumOfSquares: ssPe, pureErrorDf, lackOfFitSumOfSquares: ssLof, lackOfFitDf, f, pValue } };
}

/** t-test of the quadratic coefficient of a fitted quadratic: is the curvature distinguishable from zero? */
export interface CurvatureTest {
  /** t = c / SE(c), with df = n − p. */
  readonly t: number;
  readonly df: number;
  /** Two-sided P(|T| > |t|). */
  readonly pValue: number;
  /**
   * The same test as the F of Mandel's test (ISO 8466-2; Mandel 1964, The Statistical
   * Analysis of Experimental Data): ((n−p₁)s₁² − (n−p₂)s₂²)/s₂² = t², the extra sum of
   * squares of the quadratic term over the quadratic's residual variance.
   */
  readonly mandelF: number;
}

/** The t-test of the quadratic coefficient of a quadratic fit (Draper & Smith 1998, §3.3 / ch. 6 on the extra sum of squares). */
export function curvatureTest(quadratic: CurveFit): CurvatureTest {
  const j = quadratic.terms.indexOf('quadratic');
  if (j < 0) throw new RangeError('curvatureTest needs a quadratic fit.');
  const se = quadratic.standardErrors[j];
  const t = se > 0 ? quadratic.coefficients[j] / se : quadratic.coefficients[j] === 0 ? 0 : Infinity * Math.sign(quadratic.coefficients[j]);
  return { t, df: quadratic.df, pValue: Number.isFinite(t) ? 2 * studentTSurvival(Math.abs(t), quadratic.df) : 0, mandelF: t * t };
}

/** How the curve was chosen, with the numbers behind the choice. */
export interface CurveChoice {
  /** 'user': the model was fixed in the settings; 'lack-of-fit' / 'curvature-t-test': chosen by that test; 'untestable': the line was kept because no test was possible. */
  readonly rule: 'user' | 'lack-of-fit' | 'curvature-t-test' | 'untestable';
  /** Significance level of the test. */
  readonly alpha: number;
  readonly chosen: CurveKind;
  /** Lack-of-fit test of the straight line (when replicates allow it). */
  readonly lineLackOfFit: LackOfFitTest | null;
  /** Lack-of-fit test of the quadratic (when replicates allow it). */
  readonly quadraticLackOfFit: LackOfFitTest | null;
  /** t-test of the quadratic term (when the quadratic could be fitted). */
  readonly curvature: CurvatureTest | null;
  /** The decision in one or two sentences, with the statistics. */
  readonly sentence: string;
}

const fmt = (v: number, digits = 3) => (Number.isFinite(v) ? (Math.abs(v) >= 1e-3 || v === 0 ? Number(v.toPrecision(digits)).toString() : v.toExponential(digits - 1)) : String(v));

/**
 * Choose between the straight line and the quadratic (both with or both
 * without intercept, same weights), never by R²:
 * 1. where replicate standards exist and there are more amount levels than
 *    the line has coefficients, by the lack-of-fit F-test of the straight
 *    line (Draper & Smith 1998, §2.1): the quadratic is taken when the line's
 *    lack of fit is significant at `alpha`;
 * 2. otherwise by the t-test of the quadratic coefficient (Draper & Smith
 *    1998, §3.3 and the extra-sum-of-squares principle of ch. 6; its square
 *    is Mandel's F, the linearity test of ISO 8466-1/-2, from memory): the
 *    quadratic is taken when its curvature is significant at `alpha`;
 * 3. when neither test is possible (too few standards or levels), the line is
 *    kept and the sentence says curvature could not be tested.
 * With `fixed` set, that model is used; the tests are still computed and reported.
 *
 * @param alpha significance level, default 0.05 (common practice)
 */
export function chooseCurve(
  amounts: readonly number[],
  responses: readonly number[],
  options: { throughOrigin: boolean; weighting: Weighting; alpha?: number; fixed?: CurveKind },
): { ok: true; fit: CurveFit; choice: CurveChoice; alternative: CurveFit | null } | { ok: false; problem: string } {
  const alpha = options.alpha ?? 0.05;
  if (!(alpha > 0 && alpha < 1)) throw new RangeError(`The significance level must lie between 0 and 1, not ${alpha}.`);
  const line = fitCurve(amounts, responses, { kind: 'line', throughOrigin: options.throughOrigin, weighting: options.weighting });
  const quad = fitCurve(amounts, responses, { kind: 'quadratic', throughOrigin: options.throughOrigin, weighting: options.weighting });
  const lineLof = line.ok ? lackOfFitTest(line.fit) : null;
  const quadLof = quad.ok ? lackOfFitTest(quad.fit) : null;
  const curvature = quad.ok ? curvatureTest(quad.fit) : null;
  const lineLackOfFit = lineLof && lineLof.ok ? lineLof.test : null;
  const quadraticLackOfFit = quadLof && quadLof.ok ? quadLof.test : null;

  const lofWords = (t: LackOfFitTest) => `F = ${fmt(t.f)} with ${t.lackOfFitDf} and ${t.pureErrorDf} degrees of freedom, p = ${fmt(t.pValue)}`;
  const curvWords = (c: CurvatureTest) => `t = ${fmt(c.t)} with ${c.df} degrees of freedom, p = ${fmt(c.pValue)}`;

  if (options.fixed) {
    const chosen = options.fixed === 'line' ? line : quad;
    if (!chosen.ok) return { ok: false, problem: chosen.problem };
    const parts = [`The ${options.fixed === 'line' ? 'straight line' : 'quadratic'} was set in the settings; no test chose it.`];
    if (lineLackOfFit) parts.push(`For information: lack of fit of the straight line ${lofWords(lineLackOfFit)}.`);
    if (curvature) parts.push(`Curvature of the quadratic ${curvWords(curvature)}.`);
    return {
      ok: true,
      fit: chosen.fit,
      alternative: options.fixed === 'line' ? (quad.ok ? quad.fit : null) : (line.ok ? line.fit : null),
      choice: { rule: 'user', alpha, chosen: options.fixed, lineLackOfFit, quadraticLackOfFit, curvature, sentence: parts.join(' ') },
    };
  }
  if (!line.ok) return { ok: false, problem: line.problem };

  if (lineLackOfFit && quad.ok) {
    const significant = lineLackOfFit.pValue < alpha;
    const sentence = significant
      ? `Lack-of-fit F-test of the straight line against the replicate standards: ${lofWords(lineLackOfFit)} < ${alpha}; the line does not fit within the replicates' scatter, so the quadratic is used.` +
        (quadraticLackOfFit && quadraticLackOfFit.pValue < alpha ? ` The quadratic also fails the test (${lofWords(quadraticLackOfFit)}): consider a narrower range.` : '')
      : `Lack-of-fit F-test of the straight line against the replicate standards: ${lofWords(lineLackOfFit)} ≥ ${alpha}; the line fits within the replicates' scatter and is kept.`;
    return {
      ok: true,
      fit: significant ? quad.fit : line.fit,
      alternative: significant ? line.fit : quad.fit,
      choice: { rule: 'lack-of-fit', alpha, chosen: significant ? 'quadratic' : 'line', lineLackOfFit, quadraticLackOfFit, curvature, sentence },
    };
  }
  if (curvature && quad.ok) {
    const significant = curvature.pValue < alpha;
    const why = lineLof && !lineLof.ok ? `No lack-of-fit test (${lineLof.reason}). ` : '';
    const sentence = `${why}t-test of the quadratic term: ${curvWords(curvature)} ${significant ? '<' : '≥'} ${alpha}; ` +
      (significant ? 'the curvature is significant, so the quadratic is used.' : 'no significant curvature, so the straight line is kept.');
    return {
      ok: true,
      fit: significant ? quad.fit : line.fit,
      alternative: significant ? line.fit : quad.fit,
      choice: { rule: 'curvature-t-test', alpha, chosen: significant ? 'quadratic' : 'line', lineLackOfFit, quadraticLackOfFit, curvature, sentence },
    };
  }
  const reason = quad.ok ? '' : ` (${quad.problem.replace(/\.$/, '')})`;
  return {
    ok: true,
    fit: line.fit,
    alternative: null,
    choice: {
      rule: 'untestable', alpha, chosen: 'line', lineLackOfFit, quadraticLackOfFit, curvature,
      sentence: `Curvature could not be tested${reason}; the straight line is used without a check of its shape.`,
    },
  };
}
