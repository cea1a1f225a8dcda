/**
 * The median of a set of values by selection (Hoare's quickselect, Hoare 1961,
 * Comm. ACM 4:321, "Algorithm 65: Find"; citation from memory), O(n) on average instead of the
 * O(n log n) of a full sort. Same value as sorting and taking the middle (or
 * the mean of the two middle values for an even count): selection only finds
 * which of the values is the middle one.
 */

/**
 * Scale that turns a median absolute deviation into σ for normal data:
 * 1/Φ⁻¹(3/4) = 1.4826 to 4 decimals (Rousseeuw and Croux 1993, J. Am. Stat.
 * Assoc. 88:1273; citation from memory). The one definition in the project.
 */
export const MAD_TO_SIGMA = 1.4826;

/**
 * k-th smallest (0-based) of a[lo, hi], reordering that part so that
 * a[lo, k) ≤ a[k] ≤ a(k, hi]. Median-of-three pivots; should the partitions
 * stay lopsided (more than 2·log2(n) + 8 rounds, which sorted, constant or
 * organ-pipe data does not cause with these pivots but a crafted input could),
 * the rest is sorted instead, so the time stays O(n log n) at worst.
 */
function selectInPlace(a: Float64Array, k: number): number {
  let lo = 0, hi = a.length - 1;
  let rounds = 2 * Math.ceil(Math.log2(a.length + 1)) + 8;
  while (hi > lo) {
    if (rounds-- === 0) {
      a.subarray(lo, hi + 1).sort();
      return a[k];
    }
    const mid = (lo + hi) >>> 1;
    let p = a[mid];
    const l = a[lo], h = a[hi];
    if ((l <= p && p <= h) || (h <= p && p <= l)) { /* p is the median of the three */ } else if ((p <= l && l <= h) || (h <= l && l <= p)) p = l; else p = h;
    let i = lo, j = hi;
    while (i <= j) {
      while (a[i] < p) i++;
      while (a[j] > p) j--;
      if (i <= j) { const t = a[i]; a[i] = a[j]; a[j] = t; i++; j--; }
    }
    if (k <= j) hi = j; else if (k >= i) lo = i; else return a[k];
  }
  return a[k];
}

/**
 * Median of a scratch array, reordering it (for arrays the caller made and
 * no longer needs in order). Odd count: the middle value; even count: the
 * mean of the two middle values. NaN for an empty array.
 */
export function medianInPlace(a: Float64Array): number {
  const n = a.length;
  if (n === 0) return NaN;
  const hi = selectInPlace(a, n >> 1);
  if (n % 2 === 1) return hi;
  // After selecting n/2 every value left of it is ≤ it; the other middle value is their maximum.
  let lo = -Infinity;
  for (let i = 0; i < n >> 1; i++) if (a[i] > lo) lo = a[i];
  return 0.5 * (lo + hi);
}

/**
 * Median of `values` (not changed): the middle value of the sorted values, or
 * the mean of the two middle ones for an even count; NaN for none. Values must
 * not be NaN (a NaN has no place in the order).
 */
export function medianOf(values: ArrayLike<number>): number {
  if (values.length >= BUCKET_MIN && values instanceof Float64Array) {
    const m = medianByBuckets(values);
    if (m !== undefined) return m;
  }
  return medianInPlace(Float64Array.from(values));
}

/** From this many values on, {@link medianOf} counts them into buckets instead of copying and selecting. */
export const BUCKET_MIN = 1 << 15;
const BUCKETS = 4096;

/**
 * The median of a long array without copying it (issue 16: the residual's
 * runs test at 10⁶ points): one pass for the range, one counting the values
 * into {@link BUCKETS} equal-width buckets of that range, then the values of
 * the bucket that holds the middle rank (about n/4096 of them for smooth
 * data) are gathered and selected. A value's bucket,
 * ⌊(v − min)·B/(max − min)⌋, never decreases as v grows (each operation
 * rounds monotonically), so every value of a lower bucket is ≤ every value of
 * a higher one, and the k-th value overall is the (k − below)-th of its
 * bucket: the same value as sorting. Undefined (the caller then selects on a
 * copy) when the range is not finite (NaN, ±Infinity), or when the middle
 * bucket holds more than a quarter of the values (data piled on a few
 * values), where gathering would cost as much as the copy.
 */
function medianByBuckets(a: Float64Array): number | undefined {
  const n = a.length;
  const range = new Float64Array([Infinity, -Infinity]);
  for (let from = 0; from < n; from += PASS_CHUNK) if (!rangeChunk(a, from, Math.min(n, from + PASS_CHUNK), range)) return undefined;
  const min = range[0], max = range[1];
  if (!(min <= max) || !Number.isFinite(min) || !Number.isFinite(max)) return undefined;
  if (min === max) return min;
  const scale = BUCKETS / (max - min);
  if (!Number.isFinite(scale)) return undefined;
  const last = BUCKETS - 1;
  const counts = new Int32Array(BUCKETS);
  for (let from = 0; from < n; from += PASS_CHUNK) countChunk(a, from, Math.min(n, from + PASS_CHUNK), min, scale, last, counts);
  const hiRank = n >> 1;
  let below = 0, hiBucket = 0;
  while (below + counts[hiBucket] <= hiRank) below += counts[hiBucket++];
  const size = counts[hiBucket];
  if (size > n >> 2) return undefined;
  const part = new Float64Array(size);
  let m = 0;
  for (let from = 0; from < n; from += PASS_CHUNK) m = gatherChunk(a, from, Math.min(n, from + PASS_CHUNK), min, scale, last, hiBucket, part, m);
  const r = hiRank - below;
  const hi = selectInPlace(part, r);
  if (n % 2 === 1) return hi;
  // The other middle value: the largest below it in the bucket, or else the largest value of the buckets below.
  let lo = -Infinity;
  if (r > 0) {
    for (let i = 0; i < r; i++) if (part[i] > lo) lo = part[i];
  } else {
    for (let i = 0; i < n; i++) {
      const v = a[i];
      let b = ((v - min) * scale) | 0;
      if (b > last) b = last;
      if (b < hiBucket && v > lo) lo = v;
    }
  }
  return 0.5 * (lo + hi);
}

/**
 * Values handed to each call of a one-pass kernel over a long array (issue 16). A loop run once per slider
 * move, inside a function called once per move, is compiled by the engine while it runs (on-stack
 * replacement) and, in the analysis worker, again on every move, its later loops starting without type
 * feedback; while that compilation waits for a core the loop runs unoptimised. Called for one chunk at a
 * time, the kernel is called often enough to be compiled as a whole and kept. Each pass goes through the
 * values in the same order as one loop would, so results are the same bit for bit.
 */
export const PASS_CHUNK = 1 << 14;

/** Widen range[0] (min) and range[1] (max) by a[from, to); false at a NaN (range then unspecified). */
function rangeChunk(a: Float64Array, from: number, to: number, range: Float64Array): boolean {
  let min = range[0], max = range[1];
  for (let i = from; i < to; i++) {
    const v = a[i];
    if (v < min) min = v;
    if (v > max) max = v;
    if (v !== v) return false;
  }
  range[0] = min;
  range[1] = max;
  return true;
}

/** Count a[from, to) into the buckets ⌊(v − min)·scale⌋, the top one taking what rounds past it. */
function countChunk(a: Float64Array, from: number, to: number, min: number, scale: number, last: number, counts: Int32Array): void {
  for (let i = from; i < to; i++) {
    const b = ((a[i] - min) * scale) | 0;
    counts[b > last ? last : b]++;
  }
}

/** Copy the values of a[from, to) in bucket `bucket` to part[m …]; returns the new m. */
function gatherChunk(a: Float64Array, from: number, to: number, min: number, scale: number, last: number, bucket: number, part: Float64Array, m: number): number {
  for (let i = from; i < to; i++) {
    const v = a[i];
    let b = ((v - min) * scale) | 0;
    if (b > last) b = last;
    if (b === bucket) part[m++] = v;
  }
  return m;
}

/**
 * Median and median absolute deviation (about the median) of values[0, count),
 * reordering that part of the scratch array; NaN for none.
 */
export function medianMadInPlace(values: Float64Array, count = values.length): { median: number; mad: number } {
  if (count === 0) return { median: NaN, mad: NaN };
  const a = values.subarray(0, count);
  const med = medianInPlace(a);
  for (let i = 0; i < count; i++) a[i] = Math.abs(a[i] - med);
  return { median: med, mad: medianInPlace(a) };
}

/**
 * The project's one robust noise estimate from differences: σ of white noise
 * from the differences d = Σ c_k y[i+k] of a trace, as
 * {@link MAD_TO_SIGMA} × MAD(d) / √Σc² (the MAD scale of Rousseeuw and Croux
 * 1993; dividing by √Σc² undoes the growth of the noise's variance by the
 * stencil). The scratch array holds the differences and is reordered.
 * @param stencilNorm √Σc² of the stencil (√2 for first differences)
 */
export function robustSigmaOfDifferences(d: Float64Array, stencilNorm: number, count = d.length): number {
  return (MAD_TO_SIGMA * medianMadInPlace(d, count).mad) / stencilNorm;
}
