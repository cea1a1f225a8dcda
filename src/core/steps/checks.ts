/**
 * Checks that several processing steps share, in one wording: a window of
 * points, evenly spaced x (asked by the pipeline), and whether a second
 * trace (blank, scan) covers the sample's x range. A step imports them from here, never from a
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

/** A number as a short string for messages (6 significant digits). */
export function formatNumber(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(6))) : String(v);
}

/**
 * Explain why a second trace (blank, scan) cannot be put on the target's x
 * grid without extrapolating, or return null when it covers the whole grid.
 * @param target the x grid that must be covered (ascending)
 * @param other the x grid of the trace to be interpolated (ascending)
 * @param what how to name the other trace in the message, e.g. "the blank"
 */
export function gridCoverageProblem(target: Float64Array, other: Float64Array, what: string): string | null {
  const s0 = target[0], s1 = target[target.length - 1];
  const b0 = other[0], b1 = other[other.length - 1];
  const ranges = `the sample runs from x = ${formatNumber(s0)} to ${formatNumber(s1)}, ${what} from ${formatNumber(b0)} to ${formatNumber(b1)}`;
  if (b1 < s0 || b0 > s1) return `The sample and ${what} do not overlap: ${ranges}. Load ${what} measured over the same range.`;
  const parts: string[] = [];
  if (b0 > s0) parts.push(`x = ${formatNumber(s0)} to ${formatNumber(b0)}`);
  if (b1 < s1) parts.push(`x = ${formatNumber(b1)} to ${formatNumber(s1)}`);
  if (parts.length > 0) {
    return `${capitalise(what)} does not cover the sample from ${parts.join(' and from ')} (${ranges}); values there would have to be invented by extrapolation, so the step refuses. Keep the common range with the "Keep an x-range (trim)" step before this one, or load ${what} that covers it.`;
  }
  return null;
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}
