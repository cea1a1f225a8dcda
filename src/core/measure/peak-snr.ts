/**
 * S/N measures of a peak and the noise they use: σ at a sample (with the
 * floor that rules needing σ take when σ is 0), the spread of a box
 * average of correlated noise, the RMS form H/σ, the pharmacopoeial form
 * 2H/h (USP <621>, Ph. Eur. 2.2.46), the region form mean/SD, and the flag
 * against the detection and quantitation limits (ICH Q2(R1)).
 */
import { indexRange, noiseRangeAround } from './noise-estimators.ts';
import { SIGMA_FLOOR_OF_SPAN, type PeakFlag, type PeakOptions, type PharmacopoeialNoise } from './peak-types.ts';
import { sigmaAt as sigmaOfProfile } from './noise-profile.ts';

/** The noise a peak's measures use, for one trace and one set of options. */
export interface NoiseModel {
  /** σ at sample i (y-units; 0 when the noise is 0). */
  sigmaAt(i: number): number;
  /** σ at sample i, never below {@link NoiseModel.floor}: what rules that need σ (bounds, base levels) use. */
  ruleSigmaAt(i: number): number;
  /** {@link SIGMA_FLOOR_OF_SPAN} × (max − min of the detection signal); Number.MIN_VALUE on a constant trace. */
  readonly floor: number;
  /** SD of the mean of L consecutive noise samples, as a fraction of σ. */
  boxFactor(L: number): number;
}

/**
 * The noise model of {@link PeakOptions} on the detection signal s.
 * σ at a sample: the profile's there (`noiseProfile`) where given and
 * positive, else `noiseSigma`. Box factor: for autocorrelation ρ (lags 0..K, zero beyond;
 * white when not given) the variance of an L-point mean is
 * (σ²/L²) Σ_{|k|<L} (L − |k|) ρ_k (standard result for stationary noise),
 * so the factor is √ of that over σ²; 1/√L for white noise.
 */
export function noiseModel(s: Float64Array, o: PeakOptions): NoiseModel {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < s.length; i++) { const v = s[i]; if (v < lo) lo = v; if (v > hi) hi = v; }
  const span = hi - lo;
  const floor = span > 0 && Number.isFinite(span) ? SIGMA_FLOOR_OF_SPAN * span : Number.MIN_VALUE;
  const profile = o.noiseProfile;
  const base = o.noiseSigma;
  const sigmaAt = profile === undefined
    ? () => base
    : (i: number) => {
      const v = sigmaOfProfile(profile, i);
      return v > 0 && Number.isFinite(v) ? v : base;
    };
  const rho = o.noiseCorrelation;
  const cache = new Map<number, number>();
  const boxFactor = (L: number): number => {
    if (L <= 1) return 1;
    if (!rho || rho.length < 2) return 1 / Math.sqrt(L);
    let f = cache.get(L);
    if (f === undefined) {
      let v = L;
      for (let k = 1; k < Math.min(L, rho.length); k++) v += 2 * (L - k) * rho[k];
      f = Math.sqrt(Math.max(v, 1) / (L * L));
      cache.set(L, f);
    }
    return f;
  };
  return { sigmaAt, ruleSigmaAt: (i) => Math.max(sigmaAt(i), floor), floor, boxFactor };
}

/** Flag from an S/N and the limits; 'not-measured' when the S/N is null or not finite. */
export function snrFlag(snr: number | null, limits: PeakOptions['limits']): PeakFlag {
  if (snr === null || !Number.isFinite(snr)) return 'not-measured';
  if (snr < limits.detection) return 'below-detection';
  if (snr < limits.quantitation) return 'detectable';
  return 'quantifiable';
}

/** RMS S/N = |H|/σ; null when σ is 0 (no noise: S/N is not measured). */
export function snrRms(height: number, sigma: number): number | null {
  return sigma > 0 ? Math.abs(height) / sigma : null;
}

/** Distance beyond the apex, in half-height widths, where the trace-itself noise stretches begin. */
const TRACE_NOISE_GAP_FWHM = 1.5;

/**
 * The pharmacopoeial h for a peak at xApex with half-height width fwhm
 * (its own width, measured against its local baseline).
 * On a blank: range over a window multiplier × fwhm centred on the apex.
 * On the trace itself the centred window would hold the peak, so h is taken
 * from two stretches of (multiplier/2) × fwhm starting 1.5 fwhm either side
 * of the apex (beyond ±3.5σ of a Gaussian, where it has fallen below 0.3 %
 * of its height), as residuals about one straight line through both so the
 * baseline's slope across the gap is not counted as noise.
 * @param hint sample index of the apex on x (speeds up the search on the trace itself).
 */
export function pharmacopoeialNoise(x: Float64Array, y: Float64Array, xApex: number, fwhm: number, opts: PeakOptions, hint: number): PharmacopoeialNoise | null {
  const width = opts.pharmacopoeialMultiplier * fwhm;
  if (!(width > 0) || !Number.isFinite(width)) return null;
  const blank = opts.pharmacopoeialNoise;
  if (blank && blank.fromBlank) {
    const r = noiseRangeAround(blank.x, blank.y, xApex, width);
    if (!r.ok) return null;
    return { h: r.sigma, points: r.points, source: 'blank', from: r.from ?? xApex, to: r.to ?? xApex, clipped: r.clipped ?? false };
  }
  const tx = blank ? blank.x : x, ty = blank ? blank.y : y;
  const n = tx.length;
  const gap = TRACE_NOISE_GAP_FWHM * fwhm;
  const lo = xApex - gap - width / 2, hi = xApex + gap + width / 2;
  // The stretches lie a few widths from the apex: walk out to them rather than search the whole trace.
  let c = blank ? indexRange(tx, xApex, xApex)[0] : hint;
  if (c >= n) c = n - 1;
  let a1 = c;
  while (a1 >= 0 && tx[a1] > xApex - gap) a1--;
  let a0 = a1;
  while (a0 - 1 >= 0 && tx[a0 - 1] >= lo) a0--;
  if (a1 < 0 || tx[a0] < lo) a0 = a1 + 1;
  let b0 = c;
  while (b0 < n && tx[b0] < xApex + gap) b0++;
  let b1 = b0;
  while (b1 + 1 < n && tx[b1 + 1] <= hi) b1++;
  if (b0 >= n || tx[b1] > hi) b1 = b0 - 1;
  const na = Math.max(0, a1 - a0 + 1), nb = Math.max(0, b1 - b0 + 1);
  const cnt = na + nb;
  if (cnt < 3) return null;
  let sx = 0, sy = 0;
  for (let i = a0; i <= a1; i++) { sx += tx[i]; sy += ty[i]; }
  for (let i = b0; i <= b1; i++) { sx += tx[i]; sy += ty[i]; }
  const xm = sx / cnt, ym = sy / cnt;
  let sxx = 0, sxy = 0;
  for (let i = a0; i <= a1; i++) { const d = tx[i] - xm; sxx += d * d; sxy += d * (ty[i] - ym); }
  for (let i = b0; i <= b1; i++) { const d = tx[i] - xm; sxx += d * d; sxy += d * (ty[i] - ym); }
  const slope = sxx > 0 ? sxy / sxx : 0;
  let mn = Infinity, mx = -Infinity;
  for (let i = a0; i <= a1; i++) { const e = ty[i] - ym - slope * (tx[i] - xm); if (e < mn) mn = e; if (e > mx) mx = e; }
  for (let i = b0; i <= b1; i++) { const e = ty[i] - ym - slope * (tx[i] - xm); if (e < mn) mn = e; if (e > mx) mx = e; }
  return {
    h: mx - mn, points: cnt, source: 'trace itself',
    from: na > 0 ? tx[a0] : tx[b0], to: nb > 0 ? tx[b1] : tx[a1],
    clipped: lo < tx[0] || hi > tx[n - 1],
  };
}

/** Region S/N: mean over SD (n − 1) of the samples i0..i1 of s; null with fewer than 3 samples or SD 0. */
export function regionSnr(s: Float64Array, i0: number, i1: number): number | null {
  const n = i1 - i0 + 1;
  if (n < 3) return null;
  let sum = 0;
  for (let i = i0; i <= i1; i++) sum += s[i];
  const mean = sum / n;
  let ss = 0;
  for (let i = i0; i <= i1; i++) { const d = s[i] - mean; ss += d * d; }
  const sd = Math.sqrt(ss / (n - 1));
  return sd > 0 ? mean / sd : null;
}

