/**
 * Automatic noise estimate that stays honest after smoothing.
 *
 * The difference-based robust estimate (noise.ts, noiseRobust) assumes the
 * noise is white; after any smoothing, neighbouring points are correlated,
 * their differences shrink, and σ comes out several times too small, which
 * would inflate every S/N. This estimate instead cuts the trace into
 * windows of W points, takes the standard deviation about a straight line
 * in each (noiseRms), and reports the median over the windows. Windows that
 * hold a peak or a step have a larger SD and sit above the median, so as
 * long as fewer than half of the windows hold features the median is a
 * noise figure. Correlated noise is measured as it is, within the window.
 * (The median-of-local-SDs idea is common practice; the window choice is ours.)
 */
import { noiseRms, type NoiseResult } from './noise.ts';

/** Default window: n/20 points, kept between 30 and 400. */
export function defaultNoiseWindow(n: number): number {
  return Math.max(30, Math.min(400, Math.floor(n / 20)));
}

/**
 * Median over consecutive windows of `windowPoints` points of the SD about a
 * straight line in each window (n − 2 degrees of freedom).
 * @returns σ in y-units with the number of points and windows, or a
 *   problem when the trace is shorter than three windows.
 */
export function noiseWindowsMedian(x: Float64Array, y: Float64Array, windowPoints = defaultNoiseWindow(x.length)): NoiseResult {
  const n = x.length;
  const w = Math.max(5, Math.floor(windowPoints));
  const count = Math.floor(n / w);
  if (count < 3) {
    return { ok: false, message: `The trace has ${n} points, too few for three noise windows of ${w} points; mark a quiet range instead.` };
  }
  const sds = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    const r = noiseRms(x, y, x[k * w], x[k * w + w - 1]);
    sds[k] = r.ok ? r.sigma : NaN;
  }
  const sorted = Array.from(sds).filter(Number.isFinite).sort((a, b) => a - b);
  if (sorted.length < 3) return { ok: false, message: 'The noise windows could not be measured; mark a quiet range instead.' };
  const m = sorted.length;
  const sigma = m % 2 ? sorted[(m - 1) / 2] : (sorted[m / 2 - 1] + sorted[m / 2]) / 2;
  return {
    ok: true, sigma, measure: 'sd', points: count * w, method: 'median-of-window-sd',
    description: `Median, over ${count} windows of ${w} points, of the standard deviation about a straight line fitted in each window (windows holding peaks sit above the median). Valid after smoothing, unlike point-to-point differences.`,
  };
}
