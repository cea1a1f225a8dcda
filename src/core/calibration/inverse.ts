/**
 * Inverse prediction: the amount in a sample from its response, read off a
 * fitted calibration curve, with a confidence interval.
 *
 * The interval reported first ("interval") is the set of amounts x for
 * which the measured response ȳ₀ (mean of m replicate responses) is
 * consistent with the curve at the given confidence:
 *
 *     (ȳ₀ − f̂(x))² ≤ t² · s² · ( 1/(m·w(x)) + φ(x)ᵀ(XᵀWX)⁻¹φ(x) ),
 *
 * t the two-sided Student quantile with the fit's n − p degrees of freedom,
 * φ(x) the powers of x in the model, w(x) the weight a response at x has.
 * For the unweighted straight line this is Fieller's interval as given by
 * Draper & Smith (Applied Regression Analysis, 3rd ed. 1998, §3.2, "Inverse
 * regression (straight line case)"): x̄ + [(ȳ₀ − ȳ)/b ± (t s/b)·√((ȳ₀ − ȳ)²/(b²Sxx)
 * + (1 − g)(1/m + 1/n))]/(1 − g), g = t²s²/(b²Sxx). The same inversion of
 * the prediction band carries over unchanged to weights (the response at x
 * has variance σ²/w(x), with w the fit's own variance function evaluated at
 * the unknown x) and to the quadratic; since ȳ₀ − f̂(x) at the true amount is
 * normal with that variance and independent of s², the interval's coverage is
 * exact when the model holds (checked by simulation in the tests). Its ends
 * are the roots of a polynomial of degree ≤ 4 in x. When the slope is too
 * uncertain (for the line: g ≥ 1) the set is unbounded or splits into
 * pieces; the result then says so and gives the hull of the set, which
 * covers at least as often as the exact set. Only amounts on the branch of
 * the curve that holds the standards are considered (a quadratic turns back
 * beyond its turning point and would meet the response again there), and
 * with 1/x or 1/x² weights only amounts ≥ 0 (the weights give no scatter
 * below zero).
 *
 * Alongside, "standardError" is the usual first-order (delta-method)
 * standard deviation of the estimated amount,
 *     s_x₀ = s·√(1/(m·w(x̂)) + φ(x̂)ᵀ(XᵀWX)⁻¹φ(x̂)) / |f̂′(x̂)|,
 * which for the unweighted line is Miller & Miller's eq. 5.9 / ISO 8466-1's
 * s_x₀ (Statistics and Chemometrics for Analytical Chemistry, 6th ed. 2010,
 * §5.6: (s/b)√(1/m + 1/n + (ȳ₀ − ȳ)²/(b²Σ(xᵢ − x̄)²))) and for the weighted line
 * their eq. 5.16 with w₀ = w(x̂); "symmetricInterval" is x̂ ± t·s_x₀. The
 * two intervals agree when g is small; the first is the one to show.
 */
import { studentTQuantile } from '../numeric/distributions.ts';
import {
  polynomialAdd,
  polynomialMultiply,
  polynomialScale,
  polynomialShiftedPower,
  polynomialSignChangeRoots,
  polynomialValue,
} from '../numeric/polynomial.ts';
import { curveSlope, scaledCurvePolynomial, weightPower } from './regression.ts';
import type { CurveFit } from './regression.ts';

/** An interval end beyond this many calibrated-range widths from the range is reported as unbounded. */
export const FAR_RANGES = 1000;

/** One end of a confidence interval: null when the interval is unbounded on that side. */
export interface AmountInterval {
  /** Lower end (amount units), or null when there is none. */
  readonly low: number | null;
  /** Upper end, or null when there is none. */
  readonly high: number | null;
  /** Confidence level, e.g. 0.95. */
  readonly level: number;
}

/** An amount read off a calibration curve. */
export interface AmountEstimate {
  /** The amount where the curve meets the response, or null when it never does. */
  readonly amount: number | null;
  /** The measured response (mean of {@link replicates} responses). */
  readonly response: number;
  readonly replicates: number;
  /** Inverse-prediction interval (see the module comment), or null when it cannot be given. */
  readonly interval: AmountInterval | null;
  /** First-order standard deviation of the amount, s_x₀, or null. */
  readonly standardError: number | null;
  /** x̂ ± t·s_x₀, or null. */
  readonly symmetricInterval: AmountInterval | null;
  /** The t quantile used and its degrees of freedom. */
  readonly t: number;
  readonly df: number;
  /** How the interval was made, in words, with its source. */
  readonly method: string;
  /** Sentences about anything the user should know (unbounded ends, two solutions, limits held at zero). */
  readonly notes: readonly string[];
}

export const INTERVAL_METHOD =
  'Inverse-prediction interval: the amounts at which the response lies within the calibration\'s prediction band ' +
  '(Fieller\'s interval, Draper & Smith, Applied Regression Analysis, 3rd ed. 1998, §3.2; weights and quadratic handled by the same inversion), ' +
  't with the fit\'s residual degrees of freedom.';

/**
 * The amount and its confidence interval for a measured response.
 *
 * @param fit a fitted curve (see fitCurve)
 * @param response the sample's response (mean of `replicates` measurements), same units as the fit's responses
 * @param options replicates m (default 1), confidence level (default 0.95)
 * @throws RangeError for a non-finite response, m < 1 or a level outside (0, 1)
 */
export function predictAmount(fit: CurveFit, response: number, options: { replicates?: number; confidence?: number } = {}): AmountEstimate {
  const m = options.replicates ?? 1;
  const level = options.confidence ?? 0.95;
  if (!Number.isFinite(response)) throw new RangeError(`The response must be a finite number, not ${response}.`);
  if (!(Number.isInteger(m) && m >= 1)) throw new RangeError(`The number of replicate responses must be a whole number ≥ 1, not ${m}.`);
  if (!(level > 0 && level < 1)) throw new RangeError(`The confidence level must lie between 0 and 1, not ${level}.`);
  const df = fit.df;
  const t = studentTQuantile(0.5 + level / 2, df);
  const { centre, scale } = fit.scaled;
  const toX = (u: number) => centre + scale * u;
  const notes: string[] = [];
  const base = { response, replicates: m, t, df, method: INTERVAL_METHOD };

  // Point estimate: the root of f̂(u) − ȳ₀ on the branch that holds the calibrated range.
  const curve = scaledCurvePolynomial(fit);
  const shifted = curve.slice();
  shifted[0] -= response;
  const uLow = (fit.range.low - centre) / scale, uHigh = (fit.range.high - centre) / scale;
  const uMid = 0.5 * (uLow + uHigh);
  let uHat: number | null;
  // The monotone branch of the curve that holds the standards: the whole line for a straight
  // line, one side of the turning point for a quadratic that turns outside the calibrated range.
  let branchLow = -Infinity, branchHigh = Infinity;
  let vertexU: number | null = null;
  if (shifted[2] === 0) {
    uHat = shifted[1] !== 0 ? -shifted[0] / shifted[1] : null;
  } else {
    const roots = polynomialSignChangeRoots(shifted);
    const vertex = -curve[1] / (2 * curve[2]);
    if (!(vertex > uLow && vertex < uHigh)) {
      vertexU = vertex;
      if (uMid > vertex) branchLow = vertex; else branchHigh = vertex;
    }
    if (roots.length === 0) {
      uHat = null;
    } else if (vertex > uLow && vertex < uHigh) {
      // The curve turns inside the calibrated range: two amounts give this response.
      const inRange = roots.filter((r) => r >= uLow && r <= uHigh);
      const pick = (inRange.length ? inRange : roots).reduce((a, b) => (Math.abs(a - uMid) <= Math.abs(b - uMid) ? a : b));
      uHat = pick;
      notes.push(`The quadratic turns inside the calibrated range (at amount ${toX(vertex).toPrecision(4)}), so ${roots.length} amounts give this response; the one nearest the middle of the range is shown.`);
    } else {
      const side = Math.sign(uMid - vertex);
      const onBranch = roots.filter((r) => Math.sign(r - vertex) === side);
      uHat = onBranch.length ? onBranch[0] : null;
    }
  }
  if (uHat === null) {
    return {
      ...base, amount: null, interval: null, standardError: null, symmetricInterval: null,
      notes: [...notes, 'The calibration curve never reaches this response on the branch that holds the standards; no amount can be read off.'],
    };
  }
  const amount = toX(uHat);

  const k = weightPower(fit.model.weighting);
  if (k > 0 && !(amount > 0)) {
    return {
      ...base, amount, interval: null, standardError: null, symmetricInterval: null,
      notes: [...notes, `The weighting ${fit.model.weighting === '1/x' ? '1/x' : '1/x²'} gives no response scatter at amounts of zero or below, so no interval can be given for ${amount.toPrecision(4)}.`],
    };
  }

  // Variance polynomial in u (divided by s²): 1/(m·w(x)) + φᵀCφ.
  const cov = fit.scaled.unscaledCovariance;
  let fitVariance: number[] = [0];
  fit.powers.forEach((pi, i) => fit.powers.forEach((pj, j) => {
    const term = new Array<number>(pi + pj + 1).fill(0);
    term[pi + pj] = cov[i][j];
    fitVariance = polynomialAdd(fitVariance, term);
  }));
  const sampleVariance = polynomialScale(polynomialShiftedPower(centre, scale, k), fit.weightScale / m);
  const variance = polynomialAdd(fitVariance, sampleVariance);
  const s2 = fit.residualSd * fit.residualSd;

  const slope = curveSlope(fit, amount);
  const varianceAtHat = s2 * polynomialValue(variance, uHat);
  const standardError = slope !== 0 ? Math.sqrt(varianceAtHat) / Math.abs(slope) : null;
  const symmetricInterval = standardError !== null ? { low: amount - t * standardError, high: amount + t * standardError, level } : null;

  if (s2 === 0) {
    notes.push('The standards lie exactly on the curve (residual SD 0), so the interval has no width; real measurements never do this.');
    return { ...base, amount, interval: { low: amount, high: amount, level }, standardError, symmetricInterval, notes };
  }

  // h(u) = (ȳ₀ − f̂(u))² − t²s²·variance(u) ≤ 0 on the confidence set.
  const h = polynomialAdd(polynomialMultiply(shifted, shifted), polynomialScale(variance, -t * t * s2));
  const domainLow = k > 0 ? Math.max(branchLow, -centre / scale) : branchLow;
  const set = negativeSet(h, domainLow, branchHigh);
  if (set.pieces === 0) {
    // h(û) = −t²s²·variance(û) < 0 in exact arithmetic; only a degenerate fit gets here.
    return { ...base, amount, interval: null, standardError, symmetricInterval, notes: [...notes, 'The interval could not be computed for this fit (its variance vanishes at the estimate).'] };
  }
  const width = uHigh - uLow;
  const far = (u: number) => u < uLow - FAR_RANGES * width || u > uHigh + FAR_RANGES * width;
  let low = set.low === null || far(set.low) ? null : toX(set.low);
  const high = set.high === null || far(set.high) ? null : toX(set.high);
  if (set.lowAtEdge && k > 0 && domainLow === -centre / scale) {
    low = 0;
    notes.push('The lower end is held at zero: the weighting gives no response scatter at amounts below zero.');
  }
  if (vertexU !== null && ((set.lowAtEdge && domainLow === vertexU) || (set.highAtEdge && branchHigh === vertexU))) {
    notes.push(`The interval reaches the curve's turning point (amount ${toX(vertexU).toPrecision(4)}) and is cut there: beyond it the quadratic turns back.`);
  }
  if (set.pieces > 1) {
    notes.push(`At ${level * 100} % confidence the amounts consistent with this response do not form one interval; the interval shown spans all of them.`);
  }
  if (low === null || high === null) {
    notes.push(`The ${level * 100} % interval is unbounded ${low === null && high === null ? 'on both sides' : low === null ? 'below' : 'above'}: the calibration cannot tell this response from ${low === null && high === null ? 'any amount' : low === null ? 'much smaller amounts' : 'much larger amounts'} (the slope is too uncertain, or the response scatter too large, for this confidence).`);
  }
  return { ...base, amount, interval: { low, high, level }, standardError, symmetricInterval, notes };
}

/**
 * Where a polynomial is ≤ 0 on the domain [edgeLow, edgeHigh] (either may be
 * infinite): the ends of the hull of that set (null for an end at infinity),
 * how many separate pieces it has, and whether it reaches each finite edge.
 */
function negativeSet(h: readonly number[], edgeLow: number, edgeHigh: number): { low: number | null; high: number | null; pieces: number; lowAtEdge: boolean; highAtEdge: boolean } {
  const roots = polynomialSignChangeRoots(h).filter((r) => r > edgeLow && r < edgeHigh);
  const edges = [edgeLow, ...roots, edgeHigh];
  let low: number | null = null, high: number | null = null, pieces = 0, lowAtEdge = false, highAtEdge = false;
  for (let i = 0; i + 1 < edges.length; i++) {
    const a = edges[i], b = edges[i + 1];
    const probe = Number.isFinite(a) && Number.isFinite(b) ? 0.5 * (a + b)
      : Number.isFinite(a) ? a + Math.max(1, Math.abs(a))
        : Number.isFinite(b) ? b - Math.max(1, Math.abs(b)) : 0;
    if (polynomialValue(h, probe) > 0) continue;
    pieces++;
    if (pieces === 1) {
      low = Number.isFinite(a) ? a : null;
      lowAtEdge = i === 0 && Number.isFinite(edgeLow);
    }
    high = Number.isFinite(b) ? b : null;
    highAtEdge = i + 2 === edges.length && Number.isFinite(edgeHigh);
  }
  return { low, high, pieces, lowAtEdge, highAtEdge };
}
