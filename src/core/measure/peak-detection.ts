/**
 * Peak detection primitives: local maxima, prominences, widths and the
 * minimum-distance rule.
 *
 * They reproduce SciPy's `scipy.signal` definitions exactly (find_peaks,
 * peak_prominences, peak_widths; SciPy 1.17), indices and floating-point
 * results alike, so a reviewer can check any candidate with SciPy. The
 * peak table (peak-table.ts) starts from them; the measures a chemist
 * defends (local baseline, own width, bounds, area) are in peak-bounds.ts.
 *
 * All passes are O(n) over typed arrays.
 */

import { PASS_CHUNK } from '../numeric/median.ts';

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

// ---------------------------------------------------------------------------
// Scratch arrays

/**
 * Temporaries of the detector, reused between calls: detection is
 * synchronous, so one set serves every call and the collector has less to
 * free. Only arrays up to SCRATCH_KEEP entries are kept (traces up to about
 * 5·10⁵ points: the merged candidate pass keeps eight arrays of up to 2¹⁸
 * entries, 12 MB reserved, of which only as many entries as the trace has
 * maxima, and the stack's depth, are ever written); longer ones are made for
 * the call only, since at 10⁶ points keeping them would pin about 20 MB for
 * good. Nothing returned to a caller is ever a scratch array.
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

/** {@link findLocalMaxima} as a view on a larger array (no copy), for internal use. */
function localMaxima(y: ArrayLike<number>): Int32Array {
  const n = y.length;
  const len = Math.max(0, (n >> 1) + 1);
  const out = new Int32Array(len);
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

export function checkPeaks(n: number, peaks: ArrayLike<number>): void {
  for (let k = 0; k < peaks.length; k++) {
    const p = peaks[k];
    if (!Number.isInteger(p) || p < 0 || p >= n) {
      throw new RangeError(`Peak ${k + 1} is at index ${p}, which is not a sample of this trace (0 to ${n - 1}).`);
    }
  }
}

/** Prominence of one peak by walking out from it (SciPy `_peak_prominences` loop body). */
export function prominenceWalk(y: ArrayLike<number>, peak: number, iMin: number, iMax: number): [number, number, number] {
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
function prominencesOfMaxima(y: ArrayLike<number>, maxima: Int32Array): ProminenceData {
  const n = y.length, m = maxima.length;
  const p = new Float64Array(m), l = new Int32Array(m), r = new Int32Array(m);
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

/** The local maxima whose prominence passes a threshold, as columns (see {@link prominentMaxima}). */
export interface ProminentMaxima {
  /** How many passed; every column holds exactly this many entries, in ascending index. */
  readonly count: number;
  readonly index: Int32Array;
  /** SciPy's prominence and bases (peak_prominences, no window). */
  readonly prominence: Float64Array;
  readonly leftBase: Int32Array;
  readonly rightBase: Int32Array;
  /** SciPy's width at half prominence, in samples (peak_widths, rel_height 0.5). */
  readonly halfWidth: Float64Array;
}

/**
 * The local maxima with prominence ≥ `minProminence`, their bases and their
 * widths at half prominence, in merged passes: one forward pass over the
 * samples finds each maximum ({@link localMaxima}'s loop), the lowest
 * samples of the valley just before it (read while still in cache) and its
 * left minimum (the left stack sweep of {@link prominencesOfMaxima}); one
 * backward sweep over the maxima gives the right minimum and the
 * prominence, and the candidates that pass are written straight into their
 * columns, widths measured as {@link widthsInto} does. The same operations
 * on the same numbers as those three functions and the threshold, so the
 * same indices and bit-identical values (property test in
 * `test/core/measure/peak-detection-merged.test.ts`). No array of every sample's size is made: the
 * per-maximum arrays are only written as far as there are maxima. The
 * columns returned are the caller's own.
 */
export function prominentMaxima(y: Float64Array, minProminence: number): ProminentMaxima {
  const n = y.length;
  const cap = Math.max(0, (n >> 1) + 1);
  const w: MaximaWork = {
    pk: scratchI32('pmIndex', cap), leftMin: scratchF64('pmLeftMin', cap), lBase: scratchI32('pmLeftBase', cap),
    // Valley k lies before maximum k; valley m after the last one.
    vMin: scratchF64('pmValleyMin', cap + 1), vFirst: scratchI32('pmValleyFirst', cap + 1),
    stVal: scratchF64('pmStackValue', cap), stMin: scratchF64('pmStackMin', cap), stArg: scratchI32('pmStackArg', cap),
    // m (maxima so far), top (of the stack), a (where the next valley starts), i (the next sample).
    state: new Int32Array([0, -1, 0, 1]),
  };
  // Each pass a chunk per call (PASS_CHUNK, median.ts: compiled whole and kept, not inside its loop on every move),
  // through the samples and the maxima in the order one loop takes them.
  const iMax = n - 1;
  while (w.state[3] < iMax) maximaChunk(y, Math.min(iMax, w.state[3] + PASS_CHUNK), w);
  const m = w.state[0];
  const { pk, leftMin, lBase, vMin, vFirst } = w;
  if (m > 0) {
    let vm = Infinity, first = -1;
    for (let j = w.state[2]; j < n; j++) { const v = y[j]; if (v < vm) { vm = v; first = j; } }
    vMin[m] = vm; vFirst[m] = first;
  }
  // Backward over the maxima: right minimum and prominence; the passing ones counted, then written in order.
  // The prominence of maximum k replaces its left minimum, its right base the first sample of valley k + 1
  // (read just before, never again).
  const back = new Int32Array([-1, 0]); // top of the stack, count passing
  for (let k = m - 1; k >= 0; k -= PASS_CHUNK) prominenceChunk(y, k, Math.max(-1, k - PASS_CHUNK), minProminence, w, back);
  const count = back[1];
  const prom = leftMin, rBase = vFirst;
  const out: ProminentMaxima = {
    count, index: new Int32Array(count), prominence: new Float64Array(count), leftBase: new Int32Array(count), rightBase: new Int32Array(count),
    halfWidth: new Float64Array(count),
  };
  let c = 0;
  for (let k = 0; k < m; k += PASS_CHUNK) c = passingChunk(y, k, Math.min(m, k + PASS_CHUNK), minProminence, pk, prom, lBase, rBase, out, c);
  return out;
}

/** The working arrays of {@link prominentMaxima} and its forward state. */
interface MaximaWork {
  pk: Int32Array; leftMin: Float64Array; lBase: Int32Array; vMin: Float64Array; vFirst: Int32Array;
  stVal: Float64Array; stMin: Float64Array; stArg: Int32Array; state: Int32Array;
}

/** The forward pass of {@link prominentMaxima} for samples i < iEnd: maxima, their valleys and left minima. */
function maximaChunk(y: Float64Array, iEnd: number, w: MaximaWork): void {
  const { pk, leftMin, lBase, vMin, vFirst, stVal, stMin, stArg, state } = w;
  let m = state[0], top = state[1], a = state[2], i = state[3];
  const iMax = y.length - 1;
  while (i < iEnd) {
    if (y[i - 1] < y[i]) {
      let ahead = i + 1;
      while (ahead < iMax && y[ahead] === y[i]) ahead++;
      if (y[ahead] < y[i]) {
        const p = (i + ahead - 1) >> 1;
        // The valley a … p − 1: lowest value, its first and last sample.
        let vm = Infinity, first = -1, last = -1;
        for (let j = a; j < p; j++) {
          const v = y[j];
          if (v < vm) { vm = v; first = j; last = j; } else if (v === vm) last = j;
        }
        vMin[m] = vm; vFirst[m] = first;
        const v = y[p];
        let mn = v, arg = p;
        if (vm < mn) { mn = vm; arg = last; }
        while (top >= 0 && stVal[top] <= v) {
          if (stMin[top] < mn) { mn = stMin[top]; arg = stArg[top]; }
          top--;
        }
        pk[m] = p; leftMin[m] = mn; lBase[m] = arg; m++;
        top++; stVal[top] = v; stMin[top] = mn; stArg[top] = arg;
        a = p + 1;
        i = ahead;
      }
    }
    i++;
  }
  state[0] = m; state[1] = top; state[2] = a; state[3] = i;
}

/** The backward pass of {@link prominentMaxima} over maxima kFrom down to kTo + 1 (back: stack top, count passing). */
function prominenceChunk(y: Float64Array, kFrom: number, kTo: number, minProminence: number, w: MaximaWork, back: Int32Array): void {
  const { pk, leftMin, vMin, vFirst, stVal, stMin, stArg } = w;
  const prom = leftMin, rBase = vFirst;
  let top = back[0], count = back[1];
  for (let k = kFrom; k > kTo; k--) {
    const p = pk[k], v = y[p];
    let mn = v, arg = p;
    if (vMin[k + 1] < mn) { mn = vMin[k + 1]; arg = vFirst[k + 1]; }
    while (top >= 0 && stVal[top] <= v) {
      if (stMin[top] < mn) { mn = stMin[top]; arg = stArg[top]; }
      top--;
    }
    rBase[k + 1] = arg;
    const pr = v - Math.max(leftMin[k], mn);
    prom[k] = pr;
    if (pr >= minProminence) count++;
    top++; stVal[top] = v; stMin[top] = mn; stArg[top] = arg;
  }
  back[0] = top; back[1] = count;
}

/** The passing maxima among k in [kFrom, kTo), written from out[c] with their half-prominence widths; returns the new c. */
function passingChunk(
  y: Float64Array, kFrom: number, kTo: number, minProminence: number,
  pk: Int32Array, prom: Float64Array, lBase: Int32Array, rBase: Int32Array, out: ProminentMaxima, c: number,
): number {
  const { index, prominence, leftBase, rightBase, halfWidth } = out;
  for (let k = kFrom; k < kTo; k++) {
    const pr = prom[k];
    if (!(pr >= minProminence)) continue;
    const p = pk[k], iMin = lBase[k], iMax2 = rBase[k + 1];
    index[c] = p; prominence[c] = pr; leftBase[c] = iMin; rightBase[c] = iMax2;
    // widthsInto's walk at relHeight 0.5.
    const h = y[p] - pr * 0.5;
    let j = p;
    while (iMin < j && h < y[j]) j--;
    let lip = j;
    if (y[j] < h) lip += (h - y[j]) / (y[j + 1] - y[j]);
    j = p;
    while (j < iMax2 && h < y[j]) j++;
    let rip = j;
    if (y[j] < h) rip -= (h - y[j]) / (y[j - 1] - y[j]);
    halfWidth[c] = rip - lip;
    c++;
  }
  return c;
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
export function widthsInto(y: ArrayLike<number>, peaks: ArrayLike<number>, relHeight: number, prominenceData: ProminenceData, out: WidthData): void {
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
export function keepByGap(pos: ArrayLike<number>, priority: ArrayLike<number>, gap: number): Uint8Array {
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
