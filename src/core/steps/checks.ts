/**
 * Checks that several processing steps share, in one wording: a window of
 * points, and evenly spaced x. A step imports them from here, never from a
 * sibling step.
 */
import { isEvenlySpaced } from '../numeric/interpolate.ts';

/**
 * Explain what is wrong with an odd window of points for data of length n,
 * or null when it is usable. Shared by the window-based smoothing steps.
 * @param window proposed window (points).
 * @param n number of points in the data.
 * @param max largest window the step accepts.
 * @param min smallest window the step accepts (default 3).
 */
export function checkOddWindow(window: number, n: number, max: number, min = 3): string | null {
  if (typeof window !== 'number' || Number.isNaN(window)) return 'The window is not a number; enter an odd whole number of points such as 5.';
  if (!Number.isFinite(window)) return 'The window must be a finite odd whole number of points.';
  if (!Number.isInteger(window)) return `The window must be a whole number of points, not ${window}.`;
  if (window < min) return `The window must be at least ${min} points (got ${window}).`;
  if (window > max) return `The window may be at most ${max} points (got ${window}).`;
  if (window % 2 === 0) return `The window must be an odd number of points so it is centred; try ${window + 1} or ${window - 1}.`;
  if (window > n) return `The window (${window} points) is larger than the trace (${n} points); choose at most ${n % 2 === 1 ? n : n - 1}.`;
  return null;
}

/**
 * A sentence naming the resample step when x is not evenly spaced (within
 * 0.1 % of the mean step), or null when it is. The pipeline asks it once
 * before every step whose definition sets `needsEvenSpacing`, for the
 * sample and for the blank and scans that follow it.
 */
export function unevenSpacingProblem(x: Float64Array, stepLabel: string): string | null {
  if (isEvenlySpaced(x)) return null;
  return `${stepLabel} assumes evenly spaced x, but the spacing of this trace varies; add the "Resample to even spacing" step before it.`;
}
