/**
 * Peak detection and the measured peak table.
 *
 * The primitives (local maxima, prominences, widths, the distance rule)
 * reproduce SciPy's `scipy.signal` definitions exactly (find_peaks,
 * peak_prominences, peak_widths; SciPy 1.17), indices and floating-point
 * results alike, so a reviewer can check any number with SciPy. The
 * detector builds the table a chemist defends on top of them: heights above
 * a local baseline, half-height widths, areas, and S/N by a stated
 * definition against the detection and quantitation limits.
 *
 * All passes are O(n) over typed arrays; objects are made only for the
 * peaks that end up in the table.
 */
import { indexRange, noiseRangeAround } from './noise.ts';
import { sigmaAt, type SigmaProfile } from './measure/noise-profile.ts';

/** How a peak's S/N is defined. */
export type SnrDefinition = 'rms' | 'pharmacopoeial' | 'region';

/** Where a peak stands against the limits; 'not-measured' when its S/N could not be computed. */
export type PeakFlag = 'below-detection' | 'detectable' | 'quantifiable' | 'not-measured';

/** Output of {@link peakProminences}, one entry per peak (SciPy's prominence_data). */
export interface ProminenceData {
  /** y-units. */
  readonly prominences: Float64Array;
  /** Sample indices of the bases. */
  readonly leftBases: Int32Array;
  readonly rightBases: Int32Array;
}

/** Output of {@link peakWidths}, one entry per peak (SciPy's widths, width_heights, left_ips, right_ips). */
export interface WidthData {
  /** Widths in samples (fractional). */
  readonly widths: Float64Array;
  /** The y at which each width was measured: y[peak] − relHeight × prominence. */
  readonly widthHeights: Float64Array;
  /** Interpolated crossing positions in fractional sample indices. */
  readonly leftIps: Float64Array;
  readonly rightIps: Float64Array;
}

/** Noise range h for the pharmacopoeial S/N, with where it was measured. */
export interface PharmacopoeialNoise {
  /** Range max − min in y-units. */
  readonly h: number;
  readonly points: number;
  /** 'blank' when measured on a blank run; 'trace itself' is a deviation from the texts, labelled so. */
  readonly source: 'blank' | 'trace itself';
  /** Window actually used (x-units). For the trace itself, the outer ends of the two stretches. */
  readonly from: number;
  readonly to: number;
  /** True when the window was cut by an end of the trace. */
  readonly clipped: boolean;
}

/** Detection thresholds and S/N settings. Every number states its unit. */
export interface PeakOptions {
  /** Smallest prominence kept, y-units. */
  minProminence: number;
  /** Smallest S/N kept (by the definition in use). Peaks whose S/N cannot be measured are kept. */
  minSnr: number;
  /** Smallest half-height width kept, x-units. */
  minWidth: number;
  /** Smallest apex-to-apex distance, x-units; the higher peak wins (SciPy's distance rule). 0 = off. */
  minSeparation: number;
  /** The σ (y-units) used for the RMS S/N = H/σ. */
  noiseSigma: number;
  /** σ along the trace (measure/noise-profile.ts); when given, a peak's H/σ uses the σ at its apex instead of noiseSigma. */
  noiseProfile?: SigmaProfile;
  /** Which S/N the `snr` column and the flags use. */
  snrDefinition: SnrDefinition;
  /** Width of the pharmacopoeial noise window in half-height widths (current texts: at least 5). */
  pharmacopoeialMultiplier: number;
  /** Trace on which h is measured; omitted = the trace itself (labelled so). */
  pharmacopoeialNoise?: { x: Float64Array; y: Float64Array; fromBlank: boolean };
  /** Detect troughs (absorbance dips): detection runs on −y, heights and areas come back negative. */
  negative?: boolean;
  /** Also compute the region S/N (mean over SD between the bounds) when it is not the definition in use. */
  regionSnr?: boolean;
  /** S/N limits: detection (3; some labs accept 2) and quantitation (10), ICH Q2(R1). */
  limits: { detection: number; quantitation: number };
}

/** One row of the peak table. x-units unless stated; heights and areas in y-units (× x-units for area). */
export interface Peak {
  /** Sample index of the apex. */
  readonly index: number;
  /**
   * Apex position: vertex of the parabola through the three top samples (actual x values);
   * for peaks wider than 6 samples at half height, of a least-squares parabola over ±FWHM/3.
   */
  readonly x: number;
  /** y at the apex sample (the data, not the parabola). */
  readonly y: number;
  /**
   * Apex level above the local baseline, evaluated at the apex x; negative for troughs.
   * Apex level: least-squares parabola through the samples within ±FWHM/6 (at least the
   * three top points). Baseline: straight line through the prominence bases, each base's
   * level averaged with the FWHM/2 samples beyond it so noise minima do not lower it
   * (by at most 3σ, and not at all where a neighbouring peak's flank rises beyond the base).
   */
  readonly height: number;
  /** SciPy prominence (always ≥ 0, on −y for troughs). */
  readonly prominence: number;
  /** Prominence bases: sample indices and x. */
  readonly leftBase: number;
  readonly rightBase: number;
  readonly leftBaseX: number;
  readonly rightBaseX: number;
  /** Width at half prominence, x-units (crossings linearly interpolated). */
  readonly fwhm: number;
  /** The same width in samples. */
  readonly fwhmPoints: number;
  /** x of the half-height crossings. */
  readonly leftHalf: number;
  readonly rightHalf: number;
  /** Integration bounds: sample indices and x (see {@link detectPeaks}). */
  readonly startIndex: number;
  readonly endIndex: number;
  readonly start: number;
  readonly end: number;
  /** Area between the bounds above the straight line joining their levels (averaged as for height; trapezoid rule); negative for troughs. */
  readonly area: number;
  /** |height| / noiseSigma. */
  readonly snrRms: number;
  /** 2|H|/h, or null when h could not be measured. */
  readonly snrPharma: number | null;
  readonly pharmaNoise: PharmacopoeialNoise | null;
  /** Mean over SD of the samples between the bounds, when asked for. */
  readonly snrRegion: number | null;
  /** The S/N of the definition in use. */
  readonly snr: number | null;
  readonly snrDefinition: SnrDefinition;
  readonly flag: PeakFlag;
  readonly origin: 'detected' | 'added-by-user';
  /** Set when the user removed this detected peak; it stays in the table so exports show the decision. */
  readonly removedByUser?: boolean;
  /** A sentence about something the user should know about this peak's measures. */
  readonly note?: string;
}

/** Peaks the user added (by clicking) or removed, kept as x positions so they survive reprocessing. */
export interface PeakDecisions {
  /** x positions (x-units) where the user added a peak. */
  readonly added: readonly number[];
  /** x positions (x-units) of detected peaks the user removed. */
  readonly removed: readonly number[];
}

// ---------------------------------------------------------------------------
// Scratch arrays

/**
 * Temporaries of the detector, reused between calls: detection is
 * synchronous, so one set serves every call and the collector has less to
 * free. Only arrays up to SCRATCH_KEEP entries are kept (traces up to about
 * 5·10⁵ points, at most some 6 MB); longer ones are made for the call only,
 * since at 10⁶ points keeping them would pin about 20 MB for good.
 * Nothing returned to a caller is ever a scratch array.
 */
const SCRATCH_KEEP = 1 << 18;
const scratchPool = new Map<string, Float64Array | Int32Array>();

function scratchF64(name: string, length: number): Float64Array {
  if (length > SCRATCH_KEEP) return new Float64Array(length);
  const a = scratchPool.get(name);
  if (a instanceof Float64Array && a.length >= length) return a.subarray(0, length);
  const b = new Float64Array(Math.max(length, 1024));
  scratchPool.set(name, b);
  return b.subarray(0, length);
}

function scratchI32(name: string, length: number): Int32Array {
  if (length > SCRATCH_KEEP) return new Int32Array(length);
  const a = scratchPool.get(name);
  if (a instanceof Int32Array && a.length >= length) return a.subarray(0, length);
  const b = new Int32Array(Math.max(length, 1024));
  scratchPool.set(name, b);
  return b.subarray(0, length);
}

// ---------------------------------------------------------------------------
// SciPy-compatible primitives

/**
 * Indices of local maxima: samples strictly higher than both neighbours; on
 * a flat top (equal samples with lower samples either side) the middle
 * index, rounded down. The first and last samples are never maxima.
 * Same definition and result as SciPy `_local_maxima_1d` (used by
 * `find_peaks`). O(n).
 * @returns ascending sample indices.
 */
export function findLocalMaxima(y: ArrayLike<number>): Int32Array {
  return localMaxima(y).slice();
}

/** {@link findLocalMaxima} as a view on a larger array (no copy; `scratch` true: a reused one), for internal use. */
function localMaxima(y: ArrayLike<number>, scratch = false): Int32Array {
  const n = y.length;
  const len = Math.max(0, (n >> 1) + 1);
  const out = scratch ? scratchI32('maxima', len) : new Int32Array(len);
  let m = 0;
  let i = 1;
  const iMax = n - 1;
  while (i < iMax) {
    if (y[i - 1] < y[i]) {
      let ahead = i + 1;
      while (ahead < iMax && y[ahead] === y[i]) ahead++;
      if (y[ahead] < y[i]) {
        out[m++] = (i + ahead - 1) >> 1;
        i = ahead;
      }
    }
    i++;
  }
  return out.subarray(0, m);
}

function checkPeaks(n: number, peaks: ArrayLike<number>): void {
  for (let k = 0; k < peaks.length; k++) {
    const p = peaks[k];
    if (!Number.isInteger(p) || p < 0 || p >= n) {
      throw new RangeError(`Peak ${k + 1} is at index ${p}, which is not a sample of this trace (0 to ${n - 1}).`);
    }
  }
}

/** Prominence of one peak by walking out from it (SciPy `_peak_prominences` loop body). */
function prominenceWalk(y: ArrayLike<number>, peak: number, iMin: number, iMax: number): [number, number, number] {
  const v = y[peak];
  let i = peak;
  let lb = peak, leftMin = v;
  while (iMin <= i && y[i] <= v) {
    if (y[i] < leftMin) { leftMin = y[i]; lb = i; }
    i--;
  }
  i = peak;
  let rb = peak, rightMin = v;
  while (i <= iMax && y[i] <= v) {
    if (y[i] < rightMin) { rightMin = y[i]; rb = i; }
    i++;
  }
  return [v - Math.max(leftMin, rightMin), lb, rb];
}

/**
 * All prominences in two O(n) sweeps. A stack holds samples with strictly
 * decreasing values (each one's nearest strictly higher sample on the
 * scanned side is the entry below it) together with the minimum of the
 * stretch it covers; popping merges those minima. Ties prefer the sample
 * nearest the peak, as SciPy's walk does, so results are identical to the
 * walk while avoiding its long walks from tall peaks.
 */
function prominenceSweep(y: ArrayLike<number>, peaks: ArrayLike<number>, out: { p: Float64Array; l: Int32Array; r: Int32Array }): void {
  const n = y.length;
  const m = peaks.length;
  let sorted = true;
  for (let k = 1; k < m; k++) if (peaks[k] < peaks[k - 1]) { sorted = false; break; }
  const order = new Int32Array(m);
  for (let k = 0; k < m; k++) order[k] = k;
  if (!sorted) order.sort((a, b) => peaks[a] - peaks[b] || a - b);
  const stack = new Int32Array(n);
  const segMin = new Float64Array(n);
  const segArg = new Int32Array(n);
  const leftMin = new Float64Array(m);

  let top = -1, q = 0;
  for (let i = 0; i < n && q < m; i++) {
    const v = y[i];
    let mn = v, arg = i;
    while (top >= 0 && y[stack[top]] <= v) {
      if (segMin[top] < mn) { mn = segMin[top]; arg = segArg[top]; }
      top--;
    }
    while (q < m && peaks[order[q]] === i) { leftMin[order[q]] = mn; out.l[order[q]] = arg; q++; }
    top++; stack[top] = i; segMin[top] = mn; segArg[top] = arg;
  }

  top = -1; q = m - 1;
  for (let i = n - 1; i >= 0 && q >= 0; i--) {
    const v = y[i];
    let mn = v, arg = i;
    while (top >= 0 && y[stack[top]] <= v) {
      if (segMin[top] < mn) { mn = segMin[top]; arg = segArg[top]; }
      top--;
    }
    while (q >= 0 && peaks[order[q]] === i) {
      const k = order[q];
      out.r[k] = arg;
      out.p[k] = v - Math.max(leftMin[k], mn);
      q--;
    }
    top++; stack[top] = i; segMin[top] = mn; segArg[top] = arg;
  }
}

/**
 * Prominences of every local maximum at once, on the chain of maxima and
 * the valleys between them (about n/3 entries instead of n). Between two
 * consecutive maxima no sample is higher than the higher of the two, and
 * the valley's lowest sample is passed before any sample higher than the
 * nearer maximum, so a walk from a peak meets exactly the valleys of the
 * maxima it passes: the stack sweep over the chain gives the same bases and
 * prominences as the sample-by-sample walk. `maxima` must be
 * {@link findLocalMaxima}(y).
 */
function prominencesOfMaxima(y: ArrayLike<number>, maxima: Int32Array, scratch = false): ProminenceData {
  const n = y.length, m = maxima.length;
  const p = scratch ? scratchF64('prom', m) : new Float64Array(m);
  const l = scratch ? scratchI32('leftBase', m) : new Int32Array(m);
  const r = scratch ? scratchI32('rightBase', m) : new Int32Array(m);
  if (m === 0) return { prominences: p, leftBases: l, rightBases: r };
  // Valley k lies between maximum k − 1 and maximum k (valley 0 and valley m touch the ends).
  // For walks going left the nearest lowest sample is the last one; going right, the first.
  // The left sweep finds each valley as it goes and keeps what the right sweep needs.
  const vMin = scratchF64('valleyMin', m + 1), vFirst = scratchI32('valleyFirst', m + 1);
  const stVal = scratchF64('stackValue', m), stMin = scratchF64('stackMin', m), stArg = scratchI32('stackArg', m);
  let top = -1;
  for (let k = 0; k <= m; k++) {
    const a = k === 0 ? 0 : maxima[k - 1] + 1;
    const b = k === m ? n - 1 : maxima[k] - 1;
    let vm = Infinity, first = -1, last = -1;
    for (let i = a; i <= b; i++) {
      const v = y[i];
      if (v < vm) { vm = v; first = i; last = i; } else if (v === vm) last = i;
    }
    vMin[k] = vm; vFirst[k] = first;
    if (k === m) break;
    const pk = maxima[k], v = y[pk];
    let mn = v, arg = pk;
    if (vm < mn) { mn = vm; arg = last; }
    while (top >= 0 && stVal[top] <= v) {
      if (stMin[top] < mn) { mn = stMin[top]; arg = stArg[top]; }
      top--;
    }
    p[k] = mn; l[k] = arg; // p holds the left minimum until the right sweep
    top++; stVal[top] = v; stMin[top] = mn; stArg[top] = arg;
  }
  top = -1;
  for (let k = m - 1; k >= 0; k--) {
    const pk = maxima[k], v = y[pk];
    let mn = v, arg = pk;
    if (vMin[k + 1] < mn) { mn = vMin[k + 1]; arg = vFirst[k + 1]; }
    while (top >= 0 && stVal[top] <= v) {
      if (stMin[top] < mn) { mn = stMin[top]; arg = stArg[top]; }
      top--;
    }
    r[k] = arg; p[k] = v - Math.max(p[k], mn);
    top++; stVal[top] = v; stMin[top] = mn; stArg[top] = arg;
  }
  return { prominences: p, leftBases: l, rightBases: r };
}

function sameIndices(a: ArrayLike<number>, b: Int32Array): boolean {
  if (a.length !== b.length) return false;
  for (let k = 0; k < b.length; k++) if (a[k] !== b[k]) return false;
  return true;
}

/**
 * Prominence of each peak and its bases, exactly as SciPy
 * `signal.peak_prominences(y, peaks, wlen)`: from the peak go left and
 * right until a strictly higher sample or the window edge; each side's base
 * is the lowest sample passed (the one nearest the peak on ties);
 * prominence = y[peak] − the higher of the two base values.
 * @param peaks sample indices (any order; need not be maxima — a sample
 *   with a higher neighbour gets prominence 0).
 * @param wlen optional window in samples (> 1, rounded up; SciPy rule): the
 *   search is limited to peak ± floor(wlen/2).
 * @throws RangeError when a peak index is not a sample, or wlen ≤ 1.
 */
export function peakProminences(y: ArrayLike<number>, peaks: ArrayLike<number>, wlen?: number): ProminenceData {
  const n = y.length;
  checkPeaks(n, peaks);
  const m = peaks.length;
  const p = new Float64Array(m), l = new Int32Array(m), r = new Int32Array(m);
  let half = -1;
  if (wlen !== undefined) {
    if (!(wlen > 1) || !Number.isFinite(wlen)) throw new RangeError(`The prominence window must be more than 1 sample; got ${wlen}.`);
    half = Math.floor(Math.ceil(wlen) / 2);
  }
  // The sweeps cost O(n) whatever the number of peaks; a few peaks are cheaper walked.
  if (half < 0 && m >= 32) {
    // Asked for every local maximum (the usual case): the faster chain sweep.
    const maxima = localMaxima(y);
    if (sameIndices(peaks, maxima)) return prominencesOfMaxima(y, maxima);
    prominenceSweep(y, peaks, { p, l, r });
  } else {
    for (let k = 0; k < m; k++) {
      const pk = peaks[k];
      const iMin = half < 0 ? 0 : Math.max(pk - half, 0);
      const iMax = half < 0 ? n - 1 : Math.min(pk + half, n - 1);
      const res = prominenceWalk(y, pk, iMin, iMax);
      p[k] = res[0]; l[k] = res[1]; r[k] = res[2];
    }
  }
  return { prominences: p, leftBases: l, rightBases: r };
}

/**
 * Width of each peak at y[peak] − relHeight × prominence, exactly as SciPy
 * `signal.peak_widths(y, peaks, rel_height, prominence_data)`: from the
 * peak walk out (not past the prominence bases) until the sample falls to
 * or below that height, then interpolate the crossing linearly between the
 * two samples. relHeight 0.5 gives the half-height width (FWHM for a peak
 * on a flat baseline), 1.0 the width at the higher base.
 * @returns widths and crossings in fractional samples.
 * @throws RangeError for a negative relHeight, or bases that do not bracket their peak.
 */
export function peakWidths(y: ArrayLike<number>, peaks: ArrayLike<number>, relHeight: number, prominenceData: ProminenceData): WidthData {
  const n = y.length;
  checkPeaks(n, peaks);
  if (!(relHeight >= 0)) throw new RangeError(`The relative height must be 0 or more; got ${relHeight}.`);
  const m = peaks.length;
  const { prominences, leftBases, rightBases } = prominenceData;
  if (prominences.length !== m || leftBases.length !== m || rightBases.length !== m) {
    throw new RangeError('The prominence data must have one entry per peak.');
  }
  for (let k = 0; k < m; k++) {
    const peak = peaks[k], iMin = leftBases[k], iMax = rightBases[k];
    if (!(iMin >= 0 && iMin <= peak && peak <= iMax && iMax < n)) {
      throw new RangeError(`The bases of peak ${k + 1} (${iMin}, ${iMax}) do not bracket it at ${peak}.`);
    }
  }
  const out = { widths: new Float64Array(m), widthHeights: new Float64Array(m), leftIps: new Float64Array(m), rightIps: new Float64Array(m) };
  widthsInto(y, peaks, relHeight, prominenceData, out);
  return out;
}

/** The measuring loop of {@link peakWidths}, into given arrays, on peaks already checked. */
function widthsInto(y: ArrayLike<number>, peaks: ArrayLike<number>, relHeight: number, prominenceData: ProminenceData, out: WidthData): void {
  const m = peaks.length;
  const { prominences, leftBases, rightBases } = prominenceData;
  const { widths, widthHeights: heights, leftIps: left, rightIps: right } = out;
  for (let k = 0; k < m; k++) {
    const peak = peaks[k], iMin = leftBases[k], iMax = rightBases[k];
    const h = y[peak] - prominences[k] * relHeight;
    heights[k] = h;
    let i = peak;
    while (iMin < i && h < y[i]) i--;
    let lip = i;
    if (y[i] < h) lip += (h - y[i]) / (y[i + 1] - y[i]);
    i = peak;
    while (i < iMax && h < y[i]) i++;
    let rip = i;
    if (y[i] < h) rip -= (h - y[i]) / (y[i - 1] - y[i]);
    left[k] = lip; right[k] = rip; widths[k] = rip - lip;
  }
}

/**
 * Keep-mask for the distance rule on any positions (sample indices or
 * x-units): visit peaks from the highest priority down and drop every
 * still-kept neighbour closer than `gap`. Equal priorities: the later peak
 * is visited first (a stable order; SciPy's unstable argsort leaves ties to
 * the sort implementation).
 */
function keepByGap(pos: ArrayLike<number>, priority: ArrayLike<number>, gap: number): Uint8Array {
  const m = pos.length;
  const keep = new Uint8Array(m).fill(1);
  const order = new Int32Array(m);
  for (let k = 0; k < m; k++) order[k] = k;
  order.sort((a, b) => priority[a] - priority[b] || a - b);
  for (let t = m - 1; t >= 0; t--) {
    const j = order[t];
    if (!keep[j]) continue;
    for (let k = j - 1; k >= 0 && pos[j] - pos[k] < gap; k--) keep[k] = 0;
    for (let k = j + 1; k < m && pos[k] - pos[j] < gap; k++) keep[k] = 0;
  }
  return keep;
}

/**
 * SciPy's minimum-distance rule (`find_peaks(distance=…)`,
 * `_select_by_peak_distance`): higher peaks first, each removes the
 * remaining peaks less than ceil(distance) samples away. Ties in height go
 * to the later peak (SciPy leaves them to NumPy's sort).
 * @param peaks ascending sample indices.
 * @param distance samples, ≥ 1.
 * @returns the kept peaks, ascending.
 * @throws RangeError when distance < 1 or peaks are not ascending samples.
 */
export function selectByDistance(peaks: ArrayLike<number>, y: ArrayLike<number>, distance: number): Int32Array {
  if (!(distance >= 1) || !Number.isFinite(distance)) throw new RangeError(`The minimum distance must be at least 1 sample; got ${distance}.`);
  checkPeaks(y.length, peaks);
  const m = peaks.length;
  for (let k = 1; k < m; k++) if (!(peaks[k] > peaks[k - 1])) throw new RangeError('Peaks must be in ascending order of index.');
  const pr = new Float64Array(m);
  for (let k = 0; k < m; k++) pr[k] = y[peaks[k]];
  const keep = keepByGap(peaks, pr, Math.ceil(distance));
  const out: number[] = [];
  for (let k = 0; k < m; k++) if (keep[k]) out.push(peaks[k]);
  return Int32Array.from(out);
}

// ---------------------------------------------------------------------------
// Measures

/** x at a fractional sample index, linear between samples. */
function xAt(x: Float64Array, f: number): number {
  const i = Math.floor(f);
  if (i >= x.length - 1) return x[x.length - 1];
  if (i < 0) return x[0];
  return x[i] + (f - i) * (x[i + 1] - x[i]);
}

/** Vertex of the parabola through the three samples around i (actual x values); the sample x when flat or at an end. */
function apexParabola(x: Float64Array, s: Float64Array, i: number): number {
  if (i <= 0 || i >= x.length - 1) return x[i];
  const x0 = x[i - 1], x1 = x[i], x2 = x[i + 1];
  const d1 = (s[i] - s[i - 1]) / (x1 - x0);
  const d2 = (s[i + 1] - s[i]) / (x2 - x1);
  const a = (d2 - d1) / (x2 - x0);
  if (!(a < 0)) return x1;
  const v = (x0 + x1) / 2 - d1 / (2 * a);
  return Math.min(x2, Math.max(x0, v));
}

/**
 * Level of the trace at a base: the mean point (x and y) of the base sample
 * and the q samples beyond it (away from the peak). A base is the lowest
 * sample of a stretch, so on noisy data its own value sits a few σ low;
 * averaging with its outer neighbours removes most of that bias, and using
 * the mean x as well keeps a straight baseline exact. Two guards: the raise
 * is at most 3σ (about the expected depth of the lowest of a few hundred
 * normal samples); and when the farther half of those samples stands above
 * the nearer half by more than noise explains (2 standard errors), the base
 * is a valley with another peak's flank beyond it, and its own sample is
 * the level.
 */
function baseLevel(x: Float64Array, s: Float64Array, b: number, dir: -1 | 1, q: number, sigma: number): [number, number] {
  let sx = 0, sy = 0, cnt = 0;
  const h = q >> 1;
  let near = 0, far = 0, nNear = 0, nFar = 0;
  for (let j = 0; j <= q; j++) {
    const i = b + dir * j;
    if (i < 0 || i >= s.length) break;
    sx += x[i]; sy += s[i]; cnt++;
    if (j >= 1 && j <= h) { near += s[i]; nNear++; } else if (j > h) { far += s[i]; nFar++; }
  }
  if (nNear > 0 && nFar > 0 && far / nFar - near / nNear > 2 * sigma * Math.sqrt(1 / nNear + 1 / nFar)) return [x[b], s[b]];
  const mean = sy / cnt;
  const cap = s[b] + 3 * sigma;
  return mean > cap ? [x[b], cap] : [sx / cnt, mean];
}

/** The local baseline: straight line through the levels at two bases, evaluated at `at`. */
function baselineAt(x: Float64Array, s: Float64Array, b0: number, b1: number, q: number, sigma: number, at: number): number {
  const [x0, l0] = baseLevel(x, s, b0, -1, q, sigma);
  const [x1, l1] = baseLevel(x, s, b1, 1, q, sigma);
  return x1 === x0 ? (l0 + l1) / 2 : l0 + ((l1 - l0) * (at - x0)) / (x1 - x0);
}

/** Samples either side of a base averaged for its level: half the half-height width, in points. */
function baseHalfWindow(fwhmPoints: number): number {
  return Math.max(0, Math.round(fwhmPoints / 2));
}

/**
 * Least-squares c0 + c1 t + c2 t², t = (x − xc)/span, through samples
 * i0..i1. With a window [lo, hi] each sample is weighted by the part of its
 * cell (midpoint to midpoint) inside the window, so the fit sees the window
 * as a continuous stretch symmetric about its centre whatever the sampling.
 * Null when degenerate.
 */
function quadFit(x: Float64Array, s: Float64Array, i0: number, i1: number, xc: number, lo = -Infinity, hi = Infinity): { c0: number; c1: number; c2: number; span: number } | null {
  const span = Math.max(x[i1] - xc, xc - x[i0]);
  if (!(span > 0)) return null;
  const last = x.length - 1;
  let n = 0, t1 = 0, t2 = 0, t3 = 0, t4 = 0, y0 = 0, y1 = 0, y2 = 0;
  for (let k = i0; k <= i1; k++) {
    let wgt = 1;
    if (lo > -Infinity) {
      const a = k > 0 ? (x[k - 1] + x[k]) / 2 : x[k], b = k < last ? (x[k] + x[k + 1]) / 2 : x[k];
      wgt = Math.max(0, Math.min(b, hi) - Math.max(a, lo)) / (b - a || 1);
      if (wgt === 0) continue;
    }
    const t = (x[k] - xc) / span, tt = t * t, v = s[k] * wgt;
    n += wgt; t1 += wgt * t; t2 += wgt * tt; t3 += wgt * tt * t; t4 += wgt * tt * tt; y0 += v; y1 += v * t; y2 += v * tt;
  }
  const det = n * (t2 * t4 - t3 * t3) - t1 * (t1 * t4 - t3 * t2) + t2 * (t1 * t3 - t2 * t2);
  if (!(Math.abs(det) > 1e-12)) return null;
  const c0 = (y0 * (t2 * t4 - t3 * t3) - t1 * (y1 * t4 - t3 * y2) + t2 * (y1 * t3 - t2 * y2)) / det;
  const c1 = (n * (y1 * t4 - t3 * y2) - y0 * (t1 * t4 - t3 * t2) + t2 * (t1 * y2 - y1 * t2)) / det;
  const c2 = (n * (t2 * y2 - y1 * t3) - t1 * (t1 * y2 - y1 * t2) + y0 * (t1 * t3 - t2 * t2)) / det;
  return { c0, c1, c2, span };
}

/** Sample nearest to v, searching out from index i (v is close to x[i]). */
function nearestFrom(x: Float64Array, i: number, v: number): number {
  let k = i;
  while (k > 0 && Math.abs(x[k - 1] - v) < Math.abs(x[k] - v)) k--;
  while (k < x.length - 1 && Math.abs(x[k + 1] - v) < Math.abs(x[k] - v)) k++;
  return k;
}

/**
 * Apex position. On a narrow peak (half-height width under 6 samples) the
 * vertex of the parabola through the three top samples. On a broader peak
 * three samples of a flat noisy top let the noise choose the apex, so the
 * vertex of a least-squares parabola over a window of ±FWHM/3 centred on
 * the current estimate is used, samples weighted by how much of their cell
 * lies in the window, re-centred until it settles (at most 5 times). A
 * window symmetric about a symmetric peak's apex has its vertex there, so
 * the fixed point is unbiased for symmetric peaks.
 */
function apexPosition(x: Float64Array, s: Float64Array, i: number, fwhmPoints: number): number {
  const q = Math.floor(fwhmPoints / 3);
  const start = apexParabola(x, s, i);
  if (fwhmPoints < 6 || i <= 0 || i >= x.length - 1) return start;
  const half = (q * (x[i + 1] - x[i - 1])) / 2;
  const lim0 = x[Math.max(0, i - q)], lim1 = x[Math.min(x.length - 1, i + q)];
  let v = start;
  for (let iter = 0; iter < 5; iter++) {
    const lo = v - half, hi = v + half;
    let i0 = i, i1 = i;
    while (i0 > 0 && (x[i0 - 1] + x[i0]) / 2 > lo) i0--;
    while (i1 < x.length - 1 && (x[i1] + x[i1 + 1]) / 2 < hi) i1++;
    const f = quadFit(x, s, i0, i1, v, lo, hi);
    if (!f || !(f.c2 < 0)) return start;
    const nv = Math.min(lim1, Math.max(lim0, v - (f.c1 * f.span) / (2 * f.c2)));
    const moved = Math.abs(nv - v);
    v = nv;
    if (moved < 1e-9 * half) break;
  }
  return v;
}

/**
 * Level of the apex: a least-squares parabola through the samples within
 * ±max(1, floor(fwhmPoints/6)) of the sample nearest the refined apex,
 * evaluated there. With three samples it is the parabola through the three
 * top points; on a broad noisy peak it averages the noise instead of
 * keeping the highest noise excursion. Over ±FWHM/6 a Gaussian departs from
 * a parabola by under 0.03 % of its height.
 */
function apexLevel(x: Float64Array, s: Float64Array, i: number, fwhmPoints: number, at: number): number {
  const q = Math.max(1, Math.floor(fwhmPoints / 6));
  const c = q > 1 ? nearestFrom(x, i, at) : i;
  const i0 = Math.max(0, c - q), i1 = Math.min(s.length - 1, c + q);
  if (i1 - i0 < 2) return s[i];
  const f = quadFit(x, s, i0, i1, x[c]);
  if (!f) return s[i];
  const t = (at - x[c]) / f.span;
  return f.c0 + f.c1 * t + f.c2 * t * t;
}

/** Height of the apex level above the local baseline through the two bases' levels. */
function heightAbove(x: Float64Array, s: Float64Array, i: number, xApex: number, fwhmPoints: number, b0: number, b1: number, sigma: number): number {
  return apexLevel(x, s, i, fwhmPoints, xApex) - baselineAt(x, s, b0, b1, baseHalfWindow(fwhmPoints), sigma, xApex);
}

/** Trapezoid area of s over samples i0..i1 above the local baseline through the levels at i0 and i1. */
function areaAboveBaseline(x: Float64Array, s: Float64Array, i0: number, i1: number, q: number, sigma: number): number {
  let a = 0;
  for (let i = i0; i < i1; i++) a += 0.5 * (s[i] + s[i + 1]) * (x[i + 1] - x[i]);
  const [x0, l0] = baseLevel(x, s, i0, -1, q, sigma);
  const [x1, l1] = baseLevel(x, s, i1, 1, q, sigma);
  // Mean of the baseline at the two bounds = its value at their midpoint (it is a straight line).
  const mid = (x[i0] + x[i1]) / 2;
  const level = x1 === x0 ? (l0 + l1) / 2 : l0 + ((l1 - l0) * (mid - x0)) / (x1 - x0);
  return a - level * (x[i1] - x[i0]);
}

function snrFlag(snr: number | null, limits: PeakOptions['limits']): PeakFlag {
  if (snr === null || !Number.isFinite(snr)) return 'not-measured';
  if (snr < limits.detection) return 'below-detection';
  if (snr < limits.quantitation) return 'detectable';
  return 'quantifiable';
}

/** Distance beyond the apex, in half-height widths, where the trace-itself noise stretches begin. */
const TRACE_NOISE_GAP_FWHM = 1.5;

/**
 * The pharmacopoeial h for a peak at xApex with half-height width fwhm.
 * On a blank: range over a window multiplier × fwhm centred on the apex.
 * On the trace itself the centred window would hold the peak, so h is taken
 * from two stretches of (multiplier/2) × fwhm starting 1.5 fwhm either side
 * of the apex (beyond ±3.5σ of a Gaussian, where it has fallen below 0.3 %
 * of its height), as residuals about one straight line through both so the
 * baseline's slope across the gap is not counted as noise.
 */
function pharmacopoeialNoise(x: Float64Array, y: Float64Array, xApex: number, fwhm: number, opts: PeakOptions, hint: number): PharmacopoeialNoise | null {
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

function regionSnr(s: Float64Array, i0: number, i1: number): number | null {
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

/** What the measuring code needs about one peak before the table row is made. */
interface Candidate {
  index: number;
  prominence: number;
  leftBase: number;
  rightBase: number;
  leftIp: number;
  rightIp: number;
  startIndex: number;
  endIndex: number;
  origin: Peak['origin'];
  /** Height on the detection signal when already computed, else NaN. */
  height: number;
  /** Refined apex x when already computed, else NaN. */
  apex: number;
  note?: string;
}

/** The σ for a peak with its apex at sample i: the profile's there, else the single σ. */
function sigmaNear(o: PeakOptions, i: number): number {
  const s = o.noiseProfile ? sigmaAt(o.noiseProfile, i) : o.noiseSigma;
  return s > 0 ? s : o.noiseSigma;
}

function checkOptions(x: Float64Array, y: Float64Array, o: PeakOptions): void {
  if (x.length !== y.length) throw new RangeError(`x has ${x.length} values but y has ${y.length}; they must be the same length.`);
  if (x.length < 3) throw new RangeError(`The trace has ${x.length} point(s); peaks need at least 3.`);
  const nonneg: [string, number][] = [
    ['minimum prominence', o.minProminence], ['minimum S/N', o.minSnr], ['minimum width', o.minWidth], ['minimum separation', o.minSeparation],
  ];
  for (const [name, v] of nonneg) if (!(v >= 0) || !Number.isFinite(v)) throw new RangeError(`The ${name} must be a number of 0 or more; got ${v}.`);
  if (!(o.noiseSigma > 0) || !Number.isFinite(o.noiseSigma)) {
    throw new RangeError(`The noise σ must be a positive number; got ${o.noiseSigma}. Mark a quiet range or use the automatic estimate.`);
  }
  if (!(o.pharmacopoeialMultiplier > 0)) throw new RangeError(`The noise window multiplier must be positive; got ${o.pharmacopoeialMultiplier}.`);
  if (!(o.limits.detection > 0 && o.limits.quantitation > o.limits.detection)) {
    throw new RangeError(`The detection limit must be positive and below the quantitation limit; got ${o.limits.detection} and ${o.limits.quantitation}.`);
  }
  const b = o.pharmacopoeialNoise;
  if (b && (b.x.length !== b.y.length || b.x.length < 3)) throw new RangeError('The noise trace for the pharmacopoeial S/N must have equal x and y lengths and at least 3 points.');
}

function makePeak(x: Float64Array, y: Float64Array, s: Float64Array, sign: number, c: Candidate, o: PeakOptions): Peak {
  const i = c.index;
  const leftHalf = xAt(x, c.leftIp), rightHalf = xAt(x, c.rightIp);
  const fwhm = rightHalf - leftHalf;
  const fwhmPoints = c.rightIp - c.leftIp;
  const xApex = Number.isNaN(c.apex) ? apexPosition(x, s, i, fwhmPoints) : c.apex;
  const hs = Number.isNaN(c.height) ? heightAbove(x, s, i, xApex, fwhmPoints, c.leftBase, c.rightBase, o.noiseSigma) : c.height;
  const q = baseHalfWindow(fwhmPoints);
  const snrRms = Math.abs(hs) / sigmaNear(o, i);
  const pn = pharmacopoeialNoise(x, y, xApex, fwhm, o, i);
  const snrPharma = pn && pn.h > 0 ? (2 * Math.abs(hs)) / pn.h : null;
  const wantRegion = o.snrDefinition === 'region' || o.regionSnr === true;
  const snrRegionV = wantRegion ? regionSnr(s, c.startIndex, c.endIndex) : null;
  const snr = o.snrDefinition === 'rms' ? snrRms : o.snrDefinition === 'pharmacopoeial' ? snrPharma : snrRegionV;
  const peak: Peak = {
    index: i, x: xApex, y: y[i], height: sign * hs, prominence: c.prominence,
    leftBase: c.leftBase, rightBase: c.rightBase, leftBaseX: x[c.leftBase], rightBaseX: x[c.rightBase],
    fwhm, fwhmPoints, leftHalf, rightHalf,
    startIndex: c.startIndex, endIndex: c.endIndex, start: x[c.startIndex], end: x[c.endIndex],
    area: sign * areaAboveBaseline(x, s, c.startIndex, c.endIndex, q, o.noiseSigma),
    snrRms, snrPharma, pharmaNoise: pn, snrRegion: snrRegionV, snr, snrDefinition: o.snrDefinition,
    flag: snrFlag(snr, o.limits), origin: c.origin,
  };
  return c.note ? { ...peak, note: c.note } : peak;
}

/**
 * Integration bounds limited by the neighbouring peaks: each side runs from
 * the apex to the lowest sample between the prominence base and the
 * neighbouring peak (nearest the apex on ties). An isolated peak keeps its
 * prominence bases; a tall peak's bases, which can lie beyond smaller
 * neighbours, are cut at the valley so areas do not swallow those peaks.
 * `cands` must be sorted by index.
 */
function assignBounds(s: Float64Array, cands: Candidate[]): void {
  for (let k = 0; k < cands.length; k++) {
    const c = cands[k];
    const lo = k > 0 ? Math.max(c.leftBase, cands[k - 1].index) : c.leftBase;
    let b = c.index;
    for (let i = c.index - 1; i >= lo; i--) if (s[i] < s[b]) b = i;
    c.startIndex = b;
    const hi = k < cands.length - 1 ? Math.min(c.rightBase, cands[k + 1].index) : c.rightBase;
    b = c.index;
    for (let i = c.index + 1; i <= hi; i++) if (s[i] < s[b]) b = i;
    c.endIndex = b;
  }
}

function detectionSignal(y: Float64Array, negative: boolean | undefined): Float64Array {
  if (!negative) return y;
  const s = new Float64Array(y.length);
  for (let i = 0; i < y.length; i++) s[i] = -y[i];
  return s;
}

/**
 * Sensible starting thresholds for a trace whose noise σ is known.
 * * minProminence = 2σ: a rise less than 2σ above its bases is within the
 *   swing of ordinary noise wiggles (our choice; height ≥ prominence, so no
 *   candidate at S/N ≥ 2 is lost to it).
 * * minSnr = 2: the lenient detection limit some labs accept; candidates
 *   between 2 and the detection limit 3 stay in the table flagged
 *   'below-detection' rather than hidden.
 * * minWidth = 3 sample spacings: a half-height width under 3 points cannot
 *   be told from a spike or a single noisy sample (common practice: a peak
 *   should span several points).
 * * minSeparation = 0 (off); S/N by the RMS definition, limits 3 and 10
 *   (ICH Q2(R1)), pharmacopoeial window 5 × FWHM (USP <621>, Ph. Eur. 2.2.46).
 * @param noiseSigma y-units, > 0.
 * @param dx mean sample spacing in x-units (default 1).
 */
export function defaultPeakOptions(noiseSigma: number, dx = 1): PeakOptions {
  return {
    minProminence: 2 * noiseSigma,
    minSnr: 2,
    minWidth: 3 * Math.abs(dx),
    minSeparation: 0,
    noiseSigma,
    snrDefinition: 'rms',
    pharmacopoeialMultiplier: 5,
    limits: { detection: 3, quantitation: 10 },
  };
}

/**
 * Detect and measure peaks (troughs with `negative`) on a trace.
 *
 * Candidates are the local maxima ({@link findLocalMaxima}), filtered in this
 * order: prominence ≥ minProminence, S/N ≥ minSnr (definition in use; the
 * region definition needs the bounds, so for it this filter runs last),
 * half-height width ≥ minWidth (x-units), then the distance rule with
 * minSeparation (x-units; SciPy's rule, which SciPy itself applies before
 * prominence — here it comes last so noise wiggles cannot suppress a real
 * peak before they are themselves discarded).
 *
 * Per peak: apex refined by a parabola through the three top samples (a
 * least-squares parabola over ±FWHM/3 on peaks wider than 6 samples, where
 * three noisy samples would let the noise pick the apex); height of the
 * apex level above the line through the prominence bases' levels (each
 * averaged with the samples beyond it, so noise minima do not lower it, by
 * at most 3σ and not where a neighbouring peak's flank rises beyond the
 * base); FWHM at half
 * prominence (SciPy peak_widths, rel_height 0.5) converted to x by linear
 * interpolation; integration bounds from the apex to the lowest point
 * before the prominence base or the neighbouring peak, area above the line
 * through the bounds' levels by the trapezoid rule; S/N as H/σ, 2H/h (USP
 * <621>, Ph. Eur. 2.2.46; h over multiplier × FWHM centred on the apex of
 * the blank when given, else on the trace itself from two stretches
 * starting 1.5 FWHM either side of the apex, detrended, and labelled so)
 * and, when asked, region mean / SD. Candidates below the detection limit are kept
 * and flagged. Returns peaks in ascending x. Never changes x or y.
 * @throws RangeError for unequal lengths, fewer than 3 points, or
 *   thresholds that are negative or not numbers (message says which).
 */
export function detectPeaks(x: Float64Array, y: Float64Array, options: PeakOptions): Peak[] {
  checkOptions(x, y, options);
  const o = options;
  const sign = o.negative ? -1 : 1;
  const s = detectionSignal(y, o.negative);

  const maxima = localMaxima(s, true);
  const prom = prominencesOfMaxima(s, maxima, true);
  // Compact the candidates that pass the prominence test in place: these arrays are our own.
  const idx = maxima, pr = prom.prominences as Float64Array, lb = prom.leftBases as Int32Array, rb = prom.rightBases as Int32Array;
  let m = 0;
  for (let k = 0; k < maxima.length; k++) {
    if (pr[k] >= o.minProminence) {
      idx[m] = idx[k]; pr[m] = pr[k]; lb[m] = lb[k]; rb[m] = rb[k]; m++;
    }
  }
  const cIdx = idx.subarray(0, m);
  // Bases from the sweep always bracket their peak, so the checks of peakWidths are not needed here.
  const w: WidthData = { widths: scratchF64('widths', m), widthHeights: scratchF64('widthHeights', m), leftIps: scratchF64('leftIps', m), rightIps: scratchF64('rightIps', m) };
  widthsInto(s, cIdx, 0.5, { prominences: pr.subarray(0, m), leftBases: lb.subarray(0, m), rightBases: rb.subarray(0, m) }, w);

  const keep = new Uint8Array(m);
  const heights = scratchF64('heights', m).fill(NaN), apexes = scratchF64('apexes', m).fill(NaN);
  const minSnrOnTheFly = o.snrDefinition !== 'region';
  for (let k = 0; k < m; k++) {
    const i = cIdx[k];
    // Width and S/N are independent tests on the same candidate, so the cheap one goes first;
    // the result is the same as filtering by S/N and then by width.
    const fwhm = xAt(x, w.rightIps[k]) - xAt(x, w.leftIps[k]);
    if (o.minWidth > 0 && fwhm < o.minWidth) continue;
    if (minSnrOnTheFly && o.minSnr > 0) {
      const xApex = apexPosition(x, s, i, w.widths[k]);
      const hs = heightAbove(x, s, i, xApex, w.widths[k], lb[k], rb[k], o.noiseSigma);
      heights[k] = hs; apexes[k] = xApex;
      let snr: number | null;
      if (o.snrDefinition === 'rms') snr = Math.abs(hs) / sigmaNear(o, i);
      else {
        const pn = pharmacopoeialNoise(x, y, xApex, fwhm, o, i);
        snr = pn && pn.h > 0 ? (2 * Math.abs(hs)) / pn.h : null;
      }
      if (snr !== null && snr < o.minSnr) continue;
    }
    keep[k] = 1;
  }
  if (o.minSeparation > 0) {
    const ks: number[] = [];
    for (let k = 0; k < m; k++) if (keep[k]) ks.push(k);
    const pos = new Float64Array(ks.length), pri = new Float64Array(ks.length);
    for (let t = 0; t < ks.length; t++) { pos[t] = x[cIdx[ks[t]]]; pri[t] = s[cIdx[ks[t]]]; }
    const kept = keepByGap(pos, pri, o.minSeparation);
    for (let t = 0; t < ks.length; t++) if (!kept[t]) keep[ks[t]] = 0;
  }

  let cands: Candidate[] = [];
  for (let k = 0; k < m; k++) {
    if (!keep[k]) continue;
    cands.push({
      index: cIdx[k], prominence: pr[k], leftBase: lb[k], rightBase: rb[k],
      leftIp: w.leftIps[k], rightIp: w.rightIps[k], startIndex: lb[k], endIndex: rb[k], origin: 'detected', height: heights[k], apex: apexes[k],
    });
  }
  assignBounds(s, cands);
  if (!minSnrOnTheFly && o.minSnr > 0) {
    cands = cands.filter((c) => {
      const r = regionSnr(s, c.startIndex, c.endIndex);
      return r === null || r >= o.minSnr;
    });
    assignBounds(s, cands);
  }
  return cands.map((c) => makePeak(x, y, s, sign, c, o));
}

function candidateAt(s: Float64Array, index: number, origin: Peak['origin']): Candidate {
  const [p, l, r] = prominenceWalk(s, index, 0, s.length - 1);
  const pd: ProminenceData = { prominences: Float64Array.of(p), leftBases: Int32Array.of(l), rightBases: Int32Array.of(r) };
  const w = peakWidths(s, [index], 0.5, pd);
  const c: Candidate = {
    index, prominence: p, leftBase: l, rightBase: r, leftIp: w.leftIps[0], rightIp: w.rightIps[0],
    startIndex: l, endIndex: r, origin, height: NaN, apex: NaN,
  };
  if (!(p > 0)) c.note = 'Not a local maximum here (a neighbouring sample is as high or higher): prominence, height, width and area are 0.';
  return c;
}

/**
 * Measure a peak the user placed by hand at sample `index`, with the same
 * measures as {@link detectPeaks} and origin 'added-by-user'. The index is
 * used as given (snapping a click to an apex is the caller's choice); at a
 * sample that is not a local maximum the prominence is 0 and a note says
 * so. The integration bounds stop at the peaks detection finds with the
 * same options, as in the table. O(n).
 * @throws RangeError when index is not a sample, or the options are invalid.
 */
export function measurePeakAt(x: Float64Array, y: Float64Array, index: number, options: PeakOptions): Peak {
  checkOptions(x, y, options);
  checkPeaks(x.length, [index]);
  const s = detectionSignal(y, options.negative);
  const c = candidateAt(s, index, 'added-by-user');
  const set: Candidate[] = detectPeaks(x, y, options).filter((p) => p.index !== index).map((p) => ({ ...c, index: p.index, leftBase: p.leftBase, rightBase: p.rightBase }));
  set.push(c);
  set.sort((a, b) => a.index - b.index);
  assignBounds(s, set);
  return makePeak(x, y, s, options.negative ? -1 : 1, c, options);
}

function nearestIndex(x: Float64Array, v: number): number {
  const [i] = indexRange(x, v, Infinity);
  if (i >= x.length) return x.length - 1;
  if (i === 0) return 0;
  return v - x[i - 1] <= x[i] - v ? i - 1 : i;
}

/**
 * Apply the user's decisions to a detected peak table. A detected peak
 * within half its FWHM (at least half a sample spacing) of a removed x is
 * kept in the list marked `removedByUser: true`, so exports show the
 * decision. Each added x becomes a peak measured at the nearest sample
 * (origin 'added-by-user'), unless a kept peak already sits there. The
 * integration bounds of all kept peaks are then recomputed with the new
 * neighbours. Returns a new array in ascending x; the inputs are unchanged.
 */
export function applyPeakDecisions(peaks: readonly Peak[], decisions: PeakDecisions, x: Float64Array, y: Float64Array, options: PeakOptions): Peak[] {
  checkOptions(x, y, options);
  const s = detectionSignal(y, options.negative);
  const sign = options.negative ? -1 : 1;
  const removed: Peak[] = [];
  const kept: Candidate[] = [];
  for (const p of peaks) {
    if (p.removedByUser) { removed.push(p); continue; }
    const step = x[Math.min(p.index + 1, x.length - 1)] - x[Math.max(p.index - 1, 0)];
    const tol = Math.max(p.fwhm / 2, step / 4);
    if (decisions.removed.some((r) => Math.abs(r - p.x) <= tol)) { removed.push({ ...p, removedByUser: true }); continue; }
    const w = peakWidths(s, [p.index], 0.5, { prominences: Float64Array.of(p.prominence), leftBases: Int32Array.of(p.leftBase), rightBases: Int32Array.of(p.rightBase) });
    kept.push({
      index: p.index, prominence: p.prominence, leftBase: p.leftBase, rightBase: p.rightBase,
      leftIp: w.leftIps[0], rightIp: w.rightIps[0], startIndex: p.startIndex, endIndex: p.endIndex, origin: p.origin, height: NaN, apex: NaN, note: p.note,
    });
  }
  for (const a of decisions.added) {
    if (!Number.isFinite(a)) continue;
    const i = nearestIndex(x, a);
    if (kept.some((c) => c.index === i)) continue;
    kept.push(candidateAt(s, i, 'added-by-user'));
  }
  kept.sort((a, b) => a.index - b.index);
  assignBounds(s, kept);
  const out = kept.map((c) => makePeak(x, y, s, sign, c, options)).concat(removed);
  out.sort((a, b) => a.x - b.x);
  return out;
}
