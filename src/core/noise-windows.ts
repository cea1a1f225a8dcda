/**
 * Automatic noise estimate that stays honest after smoothing.
 *
 * The difference-based robust estimate (noise.ts, noiseRobust) assumes the
 * noise is white; after any smoothing, neighbouring points are correlated,
 * their differences shrink, and σ comes out several times too small, which
 * would inflate every S/N. This estimate instead:
 *
 * 1. finds the features on the RAW trace (peak candidates whose prominence
 *    and height above the line joining its bases are both at least 6 × the
 *    difference-based σ of the raw trace (noise alone hardly ever is), each masked
 *    over its half-height crossings widened by two half-height widths on
 *    each side; candidates wider than n/20 points count as baseline wander, and single points more than 6 σ from their 7-point median);
 * 2. cuts the trace being measured into windows of W points, keeps the
 *    windows that touch no masked point, and takes in each the standard
 *    deviation about a least-squares straight line (noiseRms);
 * 3. reports the median over those quiet windows.
 *
 * Correlated noise is measured as it is, within each window. The recipe
 * (mask the features, then take local SDs about a line) is common practice;
 * the thresholds are ours and stated above.
 */
import { lineFit, noiseRobust, type NoiseResult } from './noise.ts';
import { defaultPeakOptions, detectPeaks } from './measure/peak-table.ts';
import { slidingMedian } from './numeric/sliding-median.ts';
import { lowerBound } from './numeric/decimate.ts';

/** Default window: n/40 points, kept between 50 and 400 (long enough that a line fit takes little from smoothed noise). */
export function defaultNoiseWindow(n: number): number {
  return Math.max(50, Math.min(400, Math.floor(n / 40)));
}

/**
 * Mark the points of a raw trace that belong to features (peaks, spikes),
 * so noise is measured elsewhere. Returns 1 for masked points.
 */
export function featureMask(x: Float64Array, yRaw: Float64Array): Uint8Array {
  const n = x.length;
  const mask = new Uint8Array(n);
  const r = noiseRobust(yRaw);
  if (!r.ok || !(r.sigma > 0) || !Number.isFinite(r.sigma)) return mask;
  const sigma = r.sigma;
  const dx = (x[n - 1] - x[0]) / (n - 1);
  const opts = { ...defaultPeakOptions(sigma, dx), minProminence: 6 * sigma, minSnr: 0, minWidth: 0 };
  for (const sign of [1, -1]) {
    const peaks = detectPeaks(x, yRaw, { ...opts, negative: sign < 0 });
    for (const p of peaks) {
      // A "peak" wider than a twentieth of the trace is baseline wander (on a sloping baseline its bases lie far apart), not a feature.
      if (p.fwhmPoints > n / 20) continue;
      // Noise alone rarely stands 6 σ above the line joining its bases; requiring it keeps noise wiggles unmasked.
      if (Math.abs(p.height) < 6 * sigma) continue;
      const w = Math.max(p.rightHalf - p.leftHalf, dx);
      const a = lowerBound(x, p.leftHalf - 2 * w);
      const b = lowerBound(x, p.rightHalf + 2 * w);
      mask.fill(1, a, Math.min(n, b + 1));
    }
  }
  const med = slidingMedian(yRaw, Math.min(7, n % 2 ? n : n - 1), 'nearest');
  for (let i = 0; i < n; i++) if (Math.abs(yRaw[i] - med[i]) > 6 * sigma) mask.fill(1, Math.max(0, i - 3), Math.min(n, i + 4));
  return mask;
}

/**
 * Median, over the windows of `windowPoints` points that touch no masked
 * point, of the SD about a straight line in each window (n − 2 degrees of
 * freedom), corrected for correlated noise. `mask` must have the length of
 * x (use {@link featureMask} on the raw trace, mapped to this grid); without
 * a mask every window counts.
 *
 * Why the correction: after smoothing, neighbouring noise values are
 * correlated, and a line fitted to a short window follows part of the
 * noise, so the SD about it comes out low (about 17 % low for a
 * Savitzky–Golay 11/2 trace in 30-point windows, measured on seeded white
 * noise). For stationary noise with autocorrelation ρ, the expected residual
 * sum of squares about a least-squares fit with hat matrix H is
 * σ²·(w − tr(H·R)), R the correlation matrix (standard regression algebra;
 * white noise gives tr(H·R) = 2, the usual n − 2). ρ is estimated from the
 * pooled residuals of the quiet windows, lags kept while they stand above
 * the 2/√N noise floor, and the SD is scaled by √((w − 2)/(w − tr(H·R))).
 * The correction is partial (ρ from residuals is itself depressed): on
 * seeded white noise smoothed by an 11-point moving average, 50-point
 * windows still read about 20 % low, 80-point windows about 12 % low.
 * Where S/N matters, mark a long quiet range (RMS about a line).
 * @returns σ in y-units, or a problem when fewer than three quiet windows remain.
 */
export function noiseQuietWindows(x: Float64Array, y: Float64Array, mask?: Uint8Array, windowPoints = defaultNoiseWindow(x.length)): NoiseResult {
  const n = x.length;
  const w = Math.max(5, Math.floor(windowPoints));
  const count = Math.floor(n / w);
  const sds: number[] = [];
  const residuals: Float64Array[] = [];
  for (let k = 0; k < count; k++) {
    const a = k * w, b = a + w - 1;
    if (mask) {
      let hit = false;
      for (let i = a; i <= b; i++) if (mask[i]) { hit = true; break; }
      if (hit) continue;
    }
    const e = lineResiduals(x, y, a, b);
    let ss = 0;
    for (let i = 0; i < w; i++) ss += e[i] * e[i];
    const sd = Math.sqrt(ss / (w - 2));
    if (Number.isFinite(sd)) { sds.push(sd); residuals.push(e); }
  }
  if (sds.length < 3) {
    return { ok: false, message: `Only ${sds.length} stretch(es) of ${w} points are free of peaks, too few for an automatic noise estimate; mark a quiet range instead.` };
  }
  sds.sort((p, q) => p - q);
  const m = sds.length;
  const median = m % 2 ? sds[(m - 1) / 2] : (sds[m / 2 - 1] + sds[m / 2]) / 2;
  const rho = pooledAutocorrelation(residuals, w);
  const factor = Math.sqrt((w - 2) / Math.max(1, w - traceHatTimesCorrelation(w, rho)));
  const sigma = median * factor;
  const lags = rho.length - 1;
  return {
    ok: true, sigma, measure: 'sd', points: m * w, method: 'median-of-quiet-window-sd', correlation: Array.from(rho),
    description: `Median, over ${m} peak-free windows of ${w} points (of ${count}), of the standard deviation about a straight line fitted in each window; peaks and spikes were located on the raw trace and left out.${lags > 0 ? ` The noise is correlated over ${lags} point(s) (as after smoothing), so the figure was scaled by ${factor.toFixed(3)} for what the line fit absorbs.` : ''} Valid after smoothing, unlike point-to-point differences.`,
  };
}

/** Residuals about the least-squares line through samples a..b (noise.ts lineFit). */
function lineResiduals(x: Float64Array, y: Float64Array, a: number, b: number): Float64Array {
  const { slope, intercept, xm } = lineFit(x, y, a, b);
  const e = new Float64Array(b - a + 1);
  for (let i = a; i <= b; i++) e[i - a] = y[i] - (intercept + slope * (x[i] - xm));
  return e;
}

/**
 * Autocorrelation ρ(0..K) pooled over windows, K the last lag before three
 * lags in a row fall inside the ±2/√N band of white noise (N pooled points).
 */
function pooledAutocorrelation(windows: Float64Array[], w: number): Float64Array {
  let den = 0, total = 0;
  for (const e of windows) { for (let i = 0; i < w; i++) den += e[i] * e[i]; total += w; }
  if (!(den > 0)) return Float64Array.of(1);
  const floor = 2 / Math.sqrt(total);
  const out: number[] = [1];
  let quiet = 0;
  for (let k = 1; k < w - 2 && quiet < 3; k++) {
    let num = 0;
    for (const e of windows) for (let i = 0; i + k < w; i++) num += e[i] * e[i + k];
    const r = num / den;
    out.push(r);
    quiet = Math.abs(r) < floor ? quiet + 1 : 0;
  }
  out.length -= Math.min(quiet, out.length - 1);
  return Float64Array.from(out);
}

/** tr(H·R) for a straight-line fit over w equally spaced points, R Toeplitz with ρ(0..K), zero beyond. */
function traceHatTimesCorrelation(w: number, rho: Float64Array): number {
  const c = (w - 1) / 2;
  let suu = 0;
  for (let i = 0; i < w; i++) suu += (i - c) * (i - c);
  let tr = 0;
  for (let i = 0; i < w; i++) {
    for (let d = -(rho.length - 1); d < rho.length; d++) {
      const j = i + d;
      if (j < 0 || j >= w) continue;
      tr += (1 / w + ((i - c) * (j - c)) / suu) * rho[Math.abs(d)];
    }
  }
  return tr;
}
