/**
 * Detection and quantitation limits in amount from a calibration curve:
 *
 *     DL = 3.3 σ / S,   QL = 10 σ / S
 *
 * (ICH Q2(R1) §6.3 and §7.3, "based on the standard deviation of the
 * response and the slope"; kept in Q2(R2), 2023), S the slope of the
 * calibration curve and σ, at the user's choice, the residual standard
 * deviation of the regression line or the standard deviation of its
 * y-intercept. ICH speaks of the standard deviation of y-intercepts of
 * several regression lines; the standard error of the one fitted intercept
 * stands in for it here, and the result says so.
 *
 * What is our own reading, stated in every result:
 * * weighted fits: the residual SD refers to a response of weight 1; the σ
 *   used is the response SD at the lowest standard, s/√w(x_low), where a
 *   limit is meant to sit;
 * * quadratic fits: S is the slope of the curve at the lowest standard
 *   (ICH writes the formula for a straight line).
 */
import { curveSlope, responseSdAt } from './regression.ts';
import type { CurveFit } from './regression.ts';
import type { LimitSigma } from './settings.ts';

export interface AmountLimits {
  readonly sigmaSource: LimitSigma;
  /** σ in response units. */
  readonly sigma: number;
  /** S, response units per amount unit. */
  readonly slope: number;
  /** The amount at which S was taken (the lowest standard for a quadratic; null for a straight line, where it is the same everywhere). */
  readonly slopeAt: number | null;
  /** 3.3 σ/|S| and 10 σ/|S|, amount units. */
  readonly detection: number;
  readonly quantitation: number;
  /** How they were made, with the source. */
  readonly method: string;
  readonly notes: readonly string[];
}

/** DL and QL factors of ICH Q2(R1). */
export const DL_FACTOR = 3.3;
export const QL_FACTOR = 10;

/**
 * The limits in amount of a fitted calibration (see the module comment).
 * @returns the limits, or a problem when σ cannot be had (no intercept in a
 *   curve through the origin) or the slope is zero.
 */
export function amountLimits(fit: CurveFit, sigmaSource: LimitSigma): { ok: true; limits: AmountLimits } | { ok: false; problem: string } {
  const notes: string[] = [];
  const xLow = fit.range.low;
  let sigma: number;
  if (sigmaSource === 'intercept') {
    const j = fit.terms.indexOf('intercept');
    if (j < 0) return { ok: false, problem: 'A curve through the origin has no intercept, so σ cannot be the intercept\'s standard deviation; choose the residual standard deviation.' };
    sigma = fit.standardErrors[j];
    notes.push('σ is the standard error of the fitted intercept, standing in for the SD of the intercepts of several lines that ICH Q2 names.');
  } else if (fit.model.weighting === 'none') {
    sigma = fit.residualSd;
  } else {
    sigma = responseSdAt(fit, xLow);
    notes.push(`Weighted fit: σ is the response SD at the lowest standard (${xLow}), s/√w(x), not the residual SD of a weight-1 response.`);
  }
  const quadratic = fit.model.kind === 'quadratic';
  const slope = curveSlope(fit, xLow);
  if (quadratic) notes.push(`Quadratic curve: S is its slope at the lowest standard (${xLow}); ICH Q2 writes the formula for a straight line.`);
  if (!(Math.abs(slope) > 0) || !Number.isFinite(slope)) return { ok: false, problem: 'The calibration slope is zero, so no limit in amount exists.' };
  if (slope < 0) notes.push('The response falls with the amount (negative slope); the limits use its size.');
  const words = sigmaSource === 'intercept' ? 'the SD of the intercept' : 'the residual SD';
  return {
    ok: true,
    limits: {
      sigmaSource,
      sigma,
      slope,
      slopeAt: quadratic ? xLow : null,
      detection: (DL_FACTOR * sigma) / Math.abs(slope),
      quantitation: (QL_FACTOR * sigma) / Math.abs(slope),
      method: `DL = 3.3 σ/S and QL = 10 σ/S (ICH Q2(R1)), σ from ${words}, S the calibration slope.`,
      notes,
    },
  };
}
