/**
 * Running (sliding) median and the Hampel spike test built on it.
 *
 * The running median keeps the window sorted for windows up to 127 points
 * (finding the leaving and the entering value's places by counting
 * comparisons, which needs no branch the processor could mispredict) and as
 * two heaps around the median above that. At 10^6 points with a 25-point
 * window it runs at about SciPy's compiled median_filter speed or faster
 * (`npm run bench`, row running-median). The Hampel test keeps its own sorted
 * window, since it also needs the spread about the median.
 */
import { MAD_TO_SIGMA } from './median.ts';

/**
 * How the window is completed near the ends of the signal (a b c d are the
 * first samples):
 * - 'reflect'  d c b a | a b c d  (edge sample repeated; SciPy ndimage 'reflect')
 * - 'mirror'   d c b | a b c d    (edge sample not repeated; SciPy ndimage 'mirror')
 * - 'nearest'  a a a | a b c d
 * - 'constant' 0 0 0 | a b c d
 * - 'shrink'   no padding: the window is cut at the ends, so the first point's
 *              median is taken over its own sample and the h after it; an even
 *              count gives the mean of the two middle values.
 */
export type MedianEdge = 'reflect' | 'mirror' | 'nearest' | 'constant' | 'shrink';

const EDGES: readonly MedianEdge[] = ['reflect', 'mirror', 'nearest', 'constant', 'shrink'];

/** First index in s[from, to) whose value is >= v. */
function lowerBound(s: Float64Array, from: number, to: number, v: number): number {
  let lo = from, hi = to;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (s[mid] < v) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/** First index in s[from, to) whose value is > v. */
function upperBound(s: Float64Array, from: number, to: number, v: number): number {
  let lo = from, hi = to;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (s[mid] <= v) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/** Replace one occurrence of `out` by `inc` in the sorted s[0, len), keeping it sorted. */
function replaceSorted(s: Float64Array, len: number, out: number, inc: number): void {
  let m = lowerBound(s, 0, len, out);
  // Insertion-sort style: the shift loop doubles as the search, a predictable branch.
  if (inc > out) {
    while (m + 1 < len && s[m + 1] < inc) { s[m] = s[m + 1]; m++; }
  } else {
    while (m > 0 && s[m - 1] > inc) { s[m] = s[m - 1]; m--; }
  }
  s[m] = inc;
}

/** Insert v into the sorted s[0, len); the caller grows len by one. */
function insertSorted(s: Float64Array, len: number, v: number): void {
  const j = upperBound(s, 0, len, v);
  for (let m = len; m > j; m--) s[m] = s[m - 1];
  s[j] = v;
}

/** Remove one occurrence of v from the sorted s[0, len); the caller shrinks len by one. */
function removeSorted(s: Float64Array, len: number, v: number): void {
  const k = lowerBound(s, 0, len, v);
  for (let m = k; m < len - 1; m++) s[m] = s[m + 1];
}

function medianOfSorted(s: Float64Array, len: number): number {
  const h = len >> 1;
  return len & 1 ? s[h] : 0.5 * (s[h - 1] + s[h]);
}

/** Source index of padded position i (may be < 0 or >= n) for the padding edges. */
function padIndex(i: number, n: number, edge: MedianEdge): number {
  if (i >= 0 && i < n) return i;
  switch (edge) {
    case 'reflect': {
      const period = 2 * n;
      const m = ((i % period) + period) % period;
      return m < n ? m : period - 1 - m;
    }
    case 'mirror': {
      if (n === 1) return 0;
      const period = 2 * n - 2;
      const m = ((i % period) + period) % period;
      return m < n ? m : period - m;
    }
    case 'nearest':
      return i < 0 ? 0 : n - 1;
    default:
      return -1; // constant: the caller uses 0
  }
}

function checkSignal(y: Float64Array, what: string): void {
  if (y.length === 0) throw new RangeError(`The ${what} needs at least one point; the signal is empty.`);
  for (let i = 0; i < y.length; i++) {
    if (!Number.isFinite(y[i])) throw new RangeError(`The signal has a value that is not a finite number (${y[i]}) at point ${i + 1}; a median needs finite values.`);
  }
}

/**
 * Explain what is wrong with a median window size (points), or return null.
 * The window must be a positive odd whole number; for the padding edges it may
 * exceed the signal length (the padding rule is applied repeatedly, as SciPy does).
 */
export function checkMedianWindow(window: number): string | null {
  if (typeof window !== 'number' || Number.isNaN(window)) return 'The window is not a number; give an odd whole number of points, e.g. 5.';
  if (!Number.isFinite(window) || !Number.isInteger(window)) return `The window must be a whole number of points, not ${window}.`;
  if (window < 1) return `The window must be at least 1 point, not ${window}.`;
  if (window % 2 === 0) return `The window must be an odd number of points so it is centred on each point; ${window} is even (try ${window + 1}).`;
  return null;
}

/**
 * Windows up to this many points use the sorted window ({@link runSorted});
 * longer ones the two heaps ({@link runHeaps}). Measured at 10^6 points on the
 * bench trace: the sorted window is faster up to about 150 points, the heaps
 * beyond (the sorted window moves about w/3 values per point, the heaps about
 * log w).
 */
const SORTED_MAX_WINDOW = 127;

/**
 * Advance a sorted window: for each output i in [from, to) the value at padded
 * position i − h − 1 leaves, the one at i + h enters, and out[i] = s[h]. Padded
 * position j is read from src[j − base] (the signal itself, base 0, in the
 * interior; a short padded copy at the ends).
 *
 * `s` holds the window's w = 2h + 1 values in ascending order in s[0, w) and
 * +Infinity in s[w, P], P the smallest power of two ≥ max(8, w) (≤ 128; windows of
 * 9 to 31 points use {@link runSorted32} with P = 32). Both
 * places, where the leaving value sits and where the entering one belongs, are
 * found by counting comparisons (Number(a < b) adds without a branch the
 * processor could mispredict): 7 pivots of stride P/8, then 3 pivots of stride
 * P/32 and of P/128 where the window is that long, and one last comparison
 * when log2(P) is even. Only the values between the two places move by one.
 */
function runSorted(src: Float64Array, base: number, h: number, s: Float64Array, P: number, out: Float64Array, from: number, to: number): void {
  const dOff = h + 1 + base, vOff = h - base;
  const st1 = P >> 3, st2 = P >> 5, st3 = P >> 7;
  const sh1 = Math.log2(st1);
  const o1 = st1 - 1, o2 = 2 * st1 - 1, o3 = 3 * st1 - 1, o4 = 4 * st1 - 1, o5 = 5 * st1 - 1, o6 = 6 * st1 - 1, o7 = 7 * st1 - 1;
  const last = P === 16 || P === 64;
  for (let i = from; i < to; i++) {
    const d = src[i - dOff], v = src[i + vOff];
    let p = (Number(s[o1] < d) + Number(s[o2] < d) + Number(s[o3] < d) + Number(s[o4] < d)
      + Number(s[o5] < d) + Number(s[o6] < d) + Number(s[o7] < d)) << sh1;
    let q = (Number(s[o1] < v) + Number(s[o2] < v) + Number(s[o3] < v) + Number(s[o4] < v)
      + Number(s[o5] < v) + Number(s[o6] < v) + Number(s[o7] < v)) << sh1;
    if (st2 > 0) {
      let a = p + st2 - 1;
      p += st2 * (Number(s[a] < d) + Number(s[a + st2] < d) + Number(s[a + 2 * st2] < d));
      a = q + st2 - 1;
      q += st2 * (Number(s[a] < v) + Number(s[a + st2] < v) + Number(s[a + 2 * st2] < v));
      if (st3 > 0) {
        a = p + st3 - 1;
        p += st3 * (Number(s[a] < d) + Number(s[a + st3] < d) + Number(s[a + 2 * st3] < d));
        a = q + st3 - 1;
        q += st3 * (Number(s[a] < v) + Number(s[a + st3] < v) + Number(s[a + 2 * st3] < v));
      }
    }
    if (last) { p += Number(s[p] < d); q += Number(s[q] < v); }
    moveInto(s, p, q, v);
    out[i] = s[h];
  }
}

/**
 * {@link runSorted} for windows of 9 to 31 points (P = 32, the array padded
 * with +Infinity to 32 values): the same search with its pivots written out,
 * which keeps them out of registers, and the outputs split in two halves run
 * side by side, each with its own sorted window, so the processor can work on
 * one while the other waits on a load or a mispredicted loop end (together
 * about a quarter faster at 25 points than one chain with computed pivots).
 */
function runSorted32(src: Float64Array, base: number, h: number, s: Float64Array, out: Float64Array, from: number, to: number): void {
  const dOff = h + 1 + base, vOff = h - base;
  const len = (to - from) >> 1, mid = from + len;
  // The second half's window starts as the window of output mid − 1.
  const s2 = new Float64Array(33).fill(Infinity);
  s2.set(src.subarray(mid - 1 - h - base, mid + h - base));
  s2.subarray(0, 2 * h + 1).sort();
  for (let t = 0; t < len; t++) {
    const i = from + t, i2 = mid + t;
    const d = src[i - dOff], v = src[i + vOff];
    const d2 = src[i2 - dOff], v2 = src[i2 + vOff];
    let p = (Number(s[3] < d) + Number(s[7] < d) + Number(s[11] < d) + Number(s[15] < d)
      + Number(s[19] < d) + Number(s[23] < d) + Number(s[27] < d)) << 2;
    let q = (Number(s[3] < v) + Number(s[7] < v) + Number(s[11] < v) + Number(s[15] < v)
      + Number(s[19] < v) + Number(s[23] < v) + Number(s[27] < v)) << 2;
    let p2 = (Number(s2[3] < d2) + Number(s2[7] < d2) + Number(s2[11] < d2) + Number(s2[15] < d2)
      + Number(s2[19] < d2) + Number(s2[23] < d2) + Number(s2[27] < d2)) << 2;
    let q2 = (Number(s2[3] < v2) + Number(s2[7] < v2) + Number(s2[11] < v2) + Number(s2[15] < v2)
      + Number(s2[19] < v2) + Number(s2[23] < v2) + Number(s2[27] < v2)) << 2;
    p += Number(s[p] < d) + Number(s[p + 1] < d) + Number(s[p + 2] < d);
    q += Number(s[q] < v) + Number(s[q + 1] < v) + Number(s[q + 2] < v);
    p2 += Number(s2[p2] < d2) + Number(s2[p2 + 1] < d2) + Number(s2[p2 + 2] < d2);
    q2 += Number(s2[q2] < v2) + Number(s2[q2 + 1] < v2) + Number(s2[q2 + 2] < v2);
    moveInto(s, p, q, v);
    moveInto(s2, p2, q2, v2);
    out[i] = s[h];
    out[i2] = s2[h];
  }
  // An odd count leaves one output after the second half.
  if (mid + len < to) runSorted(src, base, h, s2, 32, out, mid + len, to);
  // Callers carry on from s: it must hold the window of the last output, which is the second half's.
  s.set(s2);
}

/**
 * In the sorted s, replace the value at place p (the one leaving) by v, where
 * q values of the window (the leaving one included) are below v: the values
 * between the two places move by one.
 */
function moveInto(s: Float64Array, p: number, q: number, v: number): void {
  const up = Number(q > p);
  q -= up;
  const dir = (up << 1) - 1;
  for (let k = p; k !== q; k += dir) s[k] = s[k + dir];
  s[q] = v;
}

/** {@link runSorted32} where the window array was made for it, else {@link runSorted}. */
function runSortedAny(src: Float64Array, base: number, h: number, s: Float64Array, P: number, out: Float64Array, from: number, to: number): void {
  if (P === 32) runSorted32(src, base, h, s, out, from, to);
  else runSorted(src, base, h, s, P, out, from, to);
}

/**
 * Running median with padding through the sorted window: the interior reads
 * the signal itself, the first and last h + 1 outputs read short padded copies
 * (so the hot loop never asks where the signal ends).
 */
function sortedPadded(y: Float64Array, w: number, at: (j: number) => number, out: Float64Array): void {
  const n = y.length, h = (w - 1) >> 1;
  const pad = (from: number, to: number): Float64Array => {
    const a = new Float64Array(to - from);
    for (let j = from; j < to; j++) a[j - from] = j >= 0 && j < n ? y[j] : at(j);
    return a;
  };
  const { s, P } = sortedWindow(pad(-h, h + 1), w);
  out[0] = s[h];
  const headEnd = Math.min(h + 1, n);
  if (headEnd > 1) runSortedAny(pad(-h, headEnd + h), -h, h, s, P, out, 1, headEnd);
  const tailStart = Math.max(headEnd, n - h);
  if (tailStart > headEnd) runSortedAny(y, 0, h, s, P, out, headEnd, tailStart);
  if (n > tailStart) runSortedAny(pad(tailStart - h - 1, n + h), tailStart - h - 1, h, s, P, out, tailStart, n);
}

/** A sorted window array for {@link runSorted}: the w values sorted, +Infinity up to P (32 for windows of 9 to 31 points, see {@link runSorted32}). */
function sortedWindow(values: Float64Array, w: number): { s: Float64Array; P: number } {
  let P = w > 8 && w < 32 ? 32 : 8;
  while (P < w) P <<= 1;
  const s = new Float64Array(P + 1).fill(Infinity);
  s.set(values.subarray(0, w));
  s.subarray(0, w).sort();
  return { s, P };
}

/**
 * Running median over the windows src[k, k + w) for k = 0 … count − 1, written
 * to out[outStart + k]. Two heaps around the median (a max-heap of the h values
 * below it and a min-heap of the h above, each value remembering its ring slot
 * so the one leaving is found at once), after the double-heap running median
 * of Härdle & Steiger (1995, Appl. Statist. 44:258; citation from memory). Per point, the entering
 * value takes the leaving one's place and moves up or down its heap, crossing
 * the median at most once.
 */
function runHeaps(src: Float64Array, w: number, out: Float64Array, outStart: number, count: number): void {
  const h = (w - 1) >> 1;
  // Heaps are 1-based: lv/ls (values and slots) below the median, uv/us above; pos[slot] = −k (lower), +k (upper), 0 (median).
  const lv = new Float64Array(h + 1), ls = new Int32Array(h + 1);
  const uv = new Float64Array(h + 1), us = new Int32Array(h + 1);
  const pos = new Int32Array(w);
  const order = Array.from({ length: w }, (_, j) => j);
  order.sort((a, b) => src[a] - src[b] || a - b);
  // Descending order is a valid max-heap, ascending a valid min-heap.
  for (let k = 1; k <= h; k++) {
    const lo = order[h - k], hi = order[h + k];
    lv[k] = src[lo]; ls[k] = lo; pos[lo] = -k;
    uv[k] = src[hi]; us[k] = hi; pos[hi] = k;
  }
  let mv = src[order[h]], ms = order[h];
  pos[ms] = 0;
  out[outStart] = mv;
  let slot = 0;
  for (let k0 = 1; k0 < count; k0++) {
    const v = src[k0 + w - 1];
    const p = pos[slot];
    let k: number, s: number, x: number;
    if (p === 0) {
      // The median itself leaves: the entering value takes its place unless it belongs in a heap.
      if (v < lv[1]) { x = v; mv = lv[1]; ms = ls[1]; pos[ms] = 0; k = 1; s = -1; }
      else if (h > 0 && v > uv[1]) { x = v; mv = uv[1]; ms = us[1]; pos[ms] = 0; k = 1; s = 1; }
      else { mv = v; ms = slot; k = 0; s = 0; x = v; }
    } else if (p < 0) {
      k = -p;
      if (v > lv[k]) {
        // Up the lower heap; past its top the value meets the median, and perhaps the upper heap.
        while (k > 1 && lv[k >> 1] < v) { const q = k >> 1; lv[k] = lv[q]; ls[k] = ls[q]; pos[ls[k]] = -k; k = q; }
        if (k === 1 && v > mv) {
          lv[1] = mv; ls[1] = ms; pos[ms] = -1;
          if (v > uv[1]) { mv = uv[1]; ms = us[1]; pos[ms] = 0; k = 1; s = 1; x = v; }
          else { mv = v; ms = slot; pos[slot] = 0; k = 0; s = 0; x = v; }
        } else { lv[k] = v; ls[k] = slot; pos[slot] = -k; k = 0; s = 0; x = v; }
      } else { s = -1; x = v; }
    } else {
      k = p;
      if (v < uv[k]) {
        while (k > 1 && uv[k >> 1] > v) { const q = k >> 1; uv[k] = uv[q]; us[k] = us[q]; pos[us[k]] = k; k = q; }
        if (k === 1 && v < mv) {
          uv[1] = mv; us[1] = ms; pos[ms] = 1;
          if (v < lv[1]) { mv = lv[1]; ms = ls[1]; pos[ms] = 0; k = 1; s = -1; x = v; }
          else { mv = v; ms = slot; pos[slot] = 0; k = 0; s = 0; x = v; }
        } else { uv[k] = v; us[k] = slot; pos[slot] = k; k = 0; s = 0; x = v; }
      } else { s = 1; x = v; }
    }
    // Sift x down from place k of the lower (s < 0) or upper (s > 0) heap.
    if (s < 0) {
      for (;;) {
        let c = k << 1;
        if (c > h) break;
        if (c < h && lv[c + 1] > lv[c]) c++;
        if (!(lv[c] > x)) break;
        lv[k] = lv[c]; ls[k] = ls[c]; pos[ls[k]] = -k; k = c;
      }
      lv[k] = x; ls[k] = slot; pos[slot] = -k;
    } else if (s > 0) {
      for (;;) {
        let c = k << 1;
        if (c > h) break;
        if (c < h && uv[c + 1] < uv[c]) c++;
        if (!(uv[c] < x)) break;
        uv[k] = uv[c]; us[k] = us[c]; pos[us[k]] = k; k = c;
      }
      uv[k] = x; us[k] = slot; pos[slot] = k;
    }
    out[outStart + k0] = mv;
    slot = slot + 1 === w ? 0 : slot + 1;
  }
}

/**
 * Running median of y over `window` points centred on each point.
 *
 * Matches SciPy `ndimage.median_filter(y, size=window, mode=edge, cval=0)` for
 * the modes 'reflect', 'mirror', 'nearest' and 'constant' (checked in
 * test/core/steps and test/core/numeric against SciPy 1.17.1, and against
 * sorting every window in test/core/properties.test.ts). The extra mode 'shrink'
 * cuts the window at the ends instead of padding (see {@link MedianEdge}).
 * Method: windows up to 127 points keep the window sorted (Tukey's running
 * median smoother, Tukey 1977, Exploratory Data Analysis) and find both places
 * that change by counting comparisons; longer windows use two heaps around the
 * median (Härdle & Steiger 1995, from memory). Either way each output is one of the window's
 * values, so the result is exact.
 * @param y signal (not changed)
 * @param window odd number of points, ≥ 1; 1 returns a copy
 * @param edge padding rule at the ends, default 'reflect' (SciPy's default)
 * @returns a new array of the same length
 * @throws RangeError on an empty signal, a non-finite value, or a bad window
 */
export function slidingMedian(y: Float64Array, window: number, edge: MedianEdge = 'reflect'): Float64Array {
  const problem = checkMedianWindow(window);
  if (problem) throw new RangeError(problem);
  if (!EDGES.includes(edge)) throw new RangeError(`Unknown edge rule "${String(edge)}"; use one of ${EDGES.join(', ')}.`);
  checkSignal(y, 'running median');
  const n = y.length;
  const h = (window - 1) >> 1;
  const out = new Float64Array(n);
  if (h === 0) { out.set(y); return out; }
  if (edge === 'shrink') {
    shrinkMedian(y, window, out);
    return out;
  }
  const at = (j: number): number => {
    const k = padIndex(j, n, edge);
    return k < 0 ? 0 : y[k];
  };
  if (window > SORTED_MAX_WINDOW) {
    // The padded signal, built once: the heaps then read plain array values.
    const src = new Float64Array(n + 2 * h);
    for (let j = 0; j < h; j++) { src[j] = at(j - h); src[n + h + j] = at(n + j); }
    src.set(y, h);
    runHeaps(src, window, out, 0, n);
    return out;
  }
  sortedPadded(y, window, at, out);
  return out;
}

/** The 'shrink' edge: windows cut at the ends (even counts average the two middle values); full windows as {@link slidingMedian}. */
function shrinkMedian(y: Float64Array, w: number, out: Float64Array): void {
  const n = y.length;
  const h = (w - 1) >> 1;
  if (n < w) {
    // No full window: grow and shrink a sorted array.
    const s = new Float64Array(n);
    let len = 0;
    for (let j = 0; j <= Math.min(h, n - 1); j++) insertSorted(s, len++, y[j]);
    for (let i = 0; i < n; i++) {
      out[i] = medianOfSorted(s, len);
      const enter = i + 1 + h, leave = i - h;
      if (enter < n && leave >= 0) replaceSorted(s, len, y[leave], y[enter]);
      else if (enter < n) insertSorted(s, len++, y[enter]);
      else if (leave >= 0) removeSorted(s, len--, y[leave]);
    }
    return;
  }
  // Head: the window grows from h + 1 values to w at i = h.
  const grow = new Float64Array(w);
  let len = 0;
  for (let j = 0; j <= h; j++) insertSorted(grow, len++, y[j]);
  for (let i = 0; i < h; i++) {
    out[i] = medianOfSorted(grow, len);
    insertSorted(grow, len++, y[i + 1 + h]);
  }
  // Full windows, i = h … n − 1 − h.
  if (w > SORTED_MAX_WINDOW) {
    runHeaps(y, w, out, h, n - 2 * h);
  } else {
    const { s, P } = sortedWindow(grow, w);
    out[h] = s[h];
    runSortedAny(y, 0, h, s, P, out, h + 1, n - h);
  }
  // Tail: the window shrinks from the last full one, y[n − w, n).
  const tail = Float64Array.from(y.subarray(n - w)).sort();
  len = w;
  for (let i = n - h; i < n; i++) {
    removeSorted(tail, len--, y[i - h - 1]);
    out[i] = medianOfSorted(tail, len);
  }
}

/** Result of {@link hampel}. */
export interface HampelResult {
  /** The signal with flagged points replaced by their window median (new array). */
  y: Float64Array;
  /** 0-based indices of the replaced points, ascending. */
  replaced: number[];
  /** Window median at every point. */
  median: Float64Array;
  /** Robust SD estimate 1.4826·MAD at every point. */
  sigma: Float64Array;
}

/** Median of the absolute deviations of sorted s[0, len) from med, in O(len) by merging both sides outward. */
function madOfSorted(s: Float64Array, len: number, med: number): number {
  let r = lowerBound(s, 0, len, med);
  let l = r - 1;
  const k = len >> 1;
  const needTwo = (len & 1) === 0;
  let prev = 0;
  for (let c = 0; c <= k; c++) {
    let d: number;
    if (l < 0) d = s[r++] - med;
    else if (r >= len) d = med - s[l--];
    else {
      const dl = med - s[l], dr = s[r] - med;
      if (dl <= dr) { d = dl; l--; } else { d = dr; r++; }
    }
    if (c === k) return needTwo ? 0.5 * (prev + d) : d;
    prev = d;
  }
  return prev;
}

/**
 * Hampel identifier (Hampel 1974, J. Am. Stat. Assoc. 69:383; as a running
 * filter, e.g. Pearson 2002, IEEE Trans. Control Syst. Technol. 10:1): for
 * each point take the median m and σ̂ = 1.4826·MAD of the 2·halfWidth + 1
 * original values around it; the point is a spike and is replaced by m when
 * |y − m| > t·σ̂. Decisions use the original values, never replaced ones.
 *
 * Edges: the window shrinks at the ends (it is cut, not padded), so the first
 * point is judged on itself and the halfWidth points after it. Padding would
 * copy edge values into the window and shrink σ̂ there.
 * Where more than half the window holds one value, σ̂ is 0 and any point that
 * differs from the median is replaced (the published rule, unchanged).
 * @param y signal (not changed)
 * @param halfWidth k, in points (≥ 1); the window is 2k + 1 points
 * @param t threshold in robust SDs (> 0), usually 3
 * @throws RangeError on bad arguments or non-finite values
 */
export function hampel(y: Float64Array, halfWidth: number, t: number): HampelResult {
  if (!Number.isInteger(halfWidth) || halfWidth < 1) throw new RangeError(`The half-width must be a whole number of points ≥ 1, not ${halfWidth}.`);
  if (!Number.isFinite(t) || t <= 0) throw new RangeError(`The threshold must be a positive number of robust SDs, not ${t}.`);
  checkSignal(y, 'Hampel test');
  const n = y.length;
  const h = halfWidth;
  const out = Float64Array.from(y);
  const median = new Float64Array(n);
  const sigma = new Float64Array(n);
  const replaced: number[] = [];
  const s = new Float64Array(Math.min(2 * h + 1, n));
  let len = 0;
  for (let j = 0; j <= Math.min(h, n - 1); j++) insertSorted(s, len++, y[j]);
  for (let i = 0; i < n; i++) {
    const m = medianOfSorted(s, len);
    const sd = MAD_TO_SIGMA * madOfSorted(s, len, m);
    median[i] = m;
    sigma[i] = sd;
    if (Math.abs(y[i] - m) > t * sd) {
      out[i] = m;
      replaced.push(i);
    }
    const enter = i + 1 + h, leave = i - h;
    if (enter < n && leave >= 0) replaceSorted(s, len, y[leave], y[enter]);
    else if (enter < n) insertSorted(s, len++, y[enter]);
    else if (leave >= 0) removeSorted(s, len--, y[leave]);
  }
  return { y: out, replaced, median, sigma };
}
