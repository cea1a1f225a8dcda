/**
 * How many peaks does a region hold? Fit k and k + 1 shapes and let the
 * Bayesian information criterion decide (Schwarz 1978, Ann. Statist. 6:461):
 * the larger model is supported when its BIC is lower and none of its
 * components sits on a bound (zero height, the minimum width, as wide as
 * the region, or on the region's edge).
 *
 * Why not the F-test: the extra peak's position is not defined under the
 * smaller model, so the F statistic does not follow its F distribution and
 * its nominal level does not hold (the regularity conditions fail; Hansen
 * 1996, Econometrica 64:413, on parameters unidentified under the null).
 * The F statistic and AIC are returned as figures only.
 *
 * Both criteria assume independent errors of one variance. On a smoothed
 * trace the residuals are correlated and the plain BIC favours extra peaks
 * (measured: a 5-point average of a two-peak region "supported" four). So
 * the decision uses the BIC with the effective number of independent points
 * n_eff = n/τ, τ the integrated autocorrelation time of the larger model's
 * residuals (Geyer 1992; see region.ts `correlationTime`):
 *   BIC_eff = n_eff·[ln(2π·SSR/n) + 1] + (p + 1)·ln n_eff,
 * the Gaussian log-likelihood scaled to n_eff independent points. On a raw
 * trace with white noise τ ≈ 1 and this is the ordinary BIC. The scaling is
 * an approximation (exact only when the noise is white noise passed through
 * a filter much narrower than the peaks); the result names it and gives τ.
 */
import { internals, MAX_PEAKS } from './region.ts';
import type { Fitted, RegionFit, RegionFitOptions } from './region.ts';

export interface CountComparison {
  /** The criterion that decided, in words (names n_eff and τ). */
  criterion: string;
  smaller: RegionFit;
  larger: RegionFit;
  /** τ of the larger model's residuals and n/τ, the effective number of independent points. */
  correlationTime: number;
  effectivePoints: number;
  /** BIC_eff(larger) − BIC_eff(smaller): negative favours the larger model. This decides. */
  deltaBic: number;
  /** larger.bic − smaller.bic with all n points counted as independent (a figure only). */
  deltaBicPlain: number;
  /** larger.aic − smaller.aic (a figure only, not used to decide). */
  deltaAic: number;
  /**
   * F = ((SSR_k − SSR_k+1)/(p_k+1 − p_k)) / (SSR_k+1/(n − p_k+1)), a figure only:
   * its nominal level does not hold for an added peak.
   */
  fStatistic: { value: number; df1: number; df2: number };
  /** True when the data support the extra peak. */
  supported: boolean;
  /** The count the data support: smaller or larger. */
  chosenCount: number;
  /** Why the larger model is not supported even where its BIC is lower. */
  problems: string[];
  /** One plain sentence for the page and the report. */
  statement: string;
}

export type CountOutcome = { ok: true; comparison: CountComparison } | { ok: false; message: string };

const fmt = (v: number) => (Math.abs(v) >= 100 ? v.toFixed(0) : v.toPrecision(3));
const peaksWord = (k: number) => `${k} peak${k === 1 ? '' : 's'}`;

/** Components of a fit on a bound that a real peak would not sit on. */
function componentProblems(fit: RegionFit): string[] {
  const out: string[] = [];
  fit.peaks.forEach((peak, i) => {
    for (const q of peak.parameters) {
      if (!q.atBound) continue;
      const label = `peak ${i + 1}`;
      if (q.name === 'height' || q.name === 'area') out.push(`${label} has shrunk to zero`);
      else if (q.name === 'fwhm' || q.name === 'sigma') {
        out.push(q.atBound === 'lower' ? `${label} reached the minimum width (${fit.minFwhm.toPrecision(3)} FWHM)` : `${label} is as wide as the region, so it stands in for baseline`);
      } else if (q.name === 'position' || q.name === 'mu') out.push(`${label} sits on the region's edge`);
      // eta at 0 or 1 (pure Gaussian or Lorentzian) and tau at its floor (a Gaussian) are real shapes.
    }
  });
  if (!fit.converged) out.push(`the fit with ${peaksWord(fit.peaks.length)} did not converge (${fit.stopReason})`);
  if (!fit.covariance) out.push('its peaks cannot be told apart (singular covariance)');
  return out;
}

/**
 * Compare two fitted models of the same region; k = smaller.peaks.length.
 * @param knownCorrelationTime the noise's τ from the processing, when known; else the
 *   larger model's residual estimate is used.
 */
export function compareFits(smaller: RegionFit, larger: RegionFit, knownCorrelationTime?: number): CountComparison {
  const k = smaller.peaks.length;
  const n = larger.n;
  const known = knownCorrelationTime !== undefined && Number.isFinite(knownCorrelationTime) && knownCorrelationTime >= 1;
  const tau = known ? (knownCorrelationTime as number) : larger.correlationTime;
  const nEff = n / tau;
  const bicEff = (f: RegionFit) => nEff * (Math.log((2 * Math.PI * f.ssr) / n) + 1) + (f.p + 1) * Math.log(nEff);
  const deltaBic = bicEff(larger) - bicEff(smaller);
  const deltaBicPlain = larger.bic - smaller.bic;
  const deltaAic = larger.aic - smaller.aic;
  const source = known ? 'τ known from the processing' : 'τ from the residuals';
  const criterion =
    tau > 1.5
      ? `BIC with n/τ = ${n}/${tau.toFixed(1)} = ${nEff.toFixed(0)} effective points (correlated noise, ${source})`
      : `BIC (correlation time τ = ${tau.toFixed(2)}, ${source}; n/τ = ${nEff.toFixed(0)} effective points)`;
  const df1 = larger.p - smaller.p;
  const df2 = larger.n - larger.p;
  const fValue = (smaller.ssr - larger.ssr) / df1 / (larger.ssr / df2);
  const problems = componentProblems(larger);
  const supported = deltaBic < 0 && problems.length === 0;
  const chosenCount = supported ? k + 1 : k;
  let statement: string;
  if (supported) {
    statement = `The data support ${peaksWord(k + 1)} rather than ${k}: BIC is ${fmt(-deltaBic)} lower with the extra peak (criterion: ${criterion}; lower is better).`;
  } else if (deltaBic >= 0) {
    statement = `The extra peak is not supported: BIC is ${fmt(deltaBic)} higher with ${peaksWord(k + 1)} than with ${k} (criterion: ${criterion}).`;
  } else {
    statement = `The extra peak is not supported: BIC is ${fmt(-deltaBic)} lower with ${peaksWord(k + 1)} (criterion: ${criterion}), but ${problems.join('; ')}.`;
  }
  // The smaller model's residual is correlated whenever it misses a peak; only the larger model's residual tells.
  if (tau > 1.5) statement += ` The residuals are correlated even with ${peaksWord(k + 1)} (a smoothed trace, or a shape that does not fit), so the count is judged on ${nEff.toFixed(0)} effective points, an approximation.`;
  return {
    criterion,
    smaller,
    larger,
    correlationTime: tau,
    effectivePoints: nEff,
    deltaBic,
    deltaBicPlain,
    deltaAic,
    fStatistic: { value: fValue, df1, df2 },
    supported,
    chosenCount,
    problems,
    statement,
  };
}

/**
 * Fit the region with k and with k + 1 peaks and report which count the
 * data support. `options.peaks` is k (default 1). The k + 1 fit is the
 * better (smaller sum of squares) of: grown from the k fit at the highest
 * residual maxima, and, when k + 1 starts are given, started from them.
 * Never changes its inputs.
 */
export function comparePeakCounts(x: Float64Array, y: Float64Array, options: RegionFitOptions): CountOutcome {
  const k = options.peaks ?? 1;
  if (!(Number.isInteger(k) && k >= 1 && k < MAX_PEAKS)) return { ok: false, message: `Compare 1 to ${MAX_PEAKS - 1} peaks with one more (asked for ${k}).` };
  const prep = internals.prepare(x, y, options);
  if (typeof prep === 'string') return { ok: false, message: prep };
  const shapes = internals.shapeList(options, k + 1);
  if (typeof shapes === 'string') return { ok: false, message: shapes };
  const baseline = options.baseline ?? 'line';
  const p = internals.layoutFor(shapes, baseline).p;
  if (prep.x.length < p + 3) return { ok: false, message: `The region holds ${prep.x.length} points, too few for ${p} parameters; widen it or compare fewer peaks.` };
  const known = (options.starts ?? []).filter((s) => Number.isFinite(s.position) && Number.isFinite(s.height) && Number.isFinite(s.fwhm));
  const small = internals.fitWithCount(prep, shapes, baseline, known, k, options.solver);
  let large: Fitted = internals.fitWithCount(prep, shapes, baseline, internals.startsOf(small), k + 1, options.solver, `the ${k}-peak fit`);
  if (known.length >= k + 1) large = internals.better(large, internals.fitWithCount(prep, shapes, baseline, known, k + 1, options.solver));
  const smaller = internals.assemble(prep, shapes.slice(0, k), baseline, small);
  const larger = internals.assemble(prep, shapes, baseline, large);
  return { ok: true, comparison: compareFits(smaller, larger, options.noiseCorrelationTime) };
}

export interface SupportedCount {
  /** The number of peaks the data support (1 … maxPeaks). */
  count: number;
  /** The fit with that many peaks. */
  fit: RegionFit;
  /** Each step of the forward comparison: 1 vs 2, 2 vs 3, … up to the first unsupported step. */
  comparisons: CountComparison[];
  statement: string;
}

export type SupportedCountOutcome = { ok: true; result: SupportedCount } | { ok: false; message: string };

/**
 * Forward choice of the peak count: compare 1 with 2 peaks, and while the
 * extra peak is supported, 2 with 3, up to `maxPeaks` (default 4).
 * `options.peaks` is ignored; `options.starts` seed every step.
 */
export function supportedPeakCount(x: Float64Array, y: Float64Array, options: RegionFitOptions & { maxPeaks?: number }): SupportedCountOutcome {
  const maxPeaks = options.maxPeaks ?? MAX_PEAKS;
  if (!(Number.isInteger(maxPeaks) && maxPeaks >= 1 && maxPeaks <= MAX_PEAKS)) return { ok: false, message: `The largest count must be 1 to ${MAX_PEAKS} (got ${maxPeaks}).` };
  const comparisons: CountComparison[] = [];
  if (maxPeaks === 1) {
    const one = comparePeakCounts(x, y, { ...options, peaks: 1 });
    if (!one.ok) return one;
    return { ok: true, result: { count: 1, fit: one.comparison.smaller, comparisons: [], statement: 'One peak fitted; no larger count was asked for.' } };
  }
  let starts = options.starts ?? [];
  for (let k = 1; k < maxPeaks; k++) {
    const out = comparePeakCounts(x, y, { ...options, peaks: k, starts });
    if (!out.ok) return out;
    const c = out.comparison;
    comparisons.push(c);
    if (!c.supported) return { ok: true, result: { count: k, fit: c.smaller, comparisons, statement: c.statement } };
    // Seed the next step with what the larger fit found.
    starts = c.larger.peaks.map((q) => ({ position: q.position.value, height: q.height.value, fwhm: q.fwhm.value }));
  }
  const last = comparisons[comparisons.length - 1];
  return {
    ok: true,
    result: { count: maxPeaks, fit: last.larger, comparisons, statement: `${last.statement} ${maxPeaks} is the most this comparison tries.` },
  };
}
