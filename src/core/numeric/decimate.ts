/**
 * Screen decimation: keep the minimum and maximum of each pixel column so a
 * million points draw like a thousand without hiding a spike or a peak top.
 *
 * For the visible index range split into `columns` buckets, each bucket
 * contributes its min and max in their original order. The first and last
 * visible points, and one neighbour outside each end (so lines run to the
 * plot edge), are always kept. When the range holds no more than
 * 2 × columns points it is returned whole.
 */
export interface Decimated {
  x: Float64Array;
  y: Float64Array;
  /** True when points were dropped. */
  thinned: boolean;
}

/** Index of the first x ≥ value (x ascending). */
export function lowerBound(x: Float64Array, value: number): number {
  let lo = 0, hi = x.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (x[mid] < value) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/**
 * Min/max-per-column decimation of (x, y) between xFrom and xTo (x-units;
 * pass -Infinity/Infinity for all) into at most about 2·columns + 4 points.
 */
export function decimateMinMax(
  x: Float64Array, y: Float64Array, xFrom: number, xTo: number, columns: number,
): Decimated {
  const n = x.length;
  if (n === 0) return { x: new Float64Array(0), y: new Float64Array(0), thinned: false };
  const cols = Math.max(1, Math.floor(columns));
  let start = Math.max(0, lowerBound(x, xFrom) - 1);
  let end = Math.min(n - 1, lowerBound(x, xTo));
  if (end < start) { start = 0; end = n - 1; }
  const count = end - start + 1;
  if (count <= 2 * cols) {
    return { x: x.slice(start, end + 1), y: y.slice(start, end + 1), thinned: false };
  }
  const ox = new Float64Array(2 * cols + 4);
  const oy = new Float64Array(2 * cols + 4);
  let m = 0;
  const push = (i: number) => {
    if (m > 0 && ox[m - 1] === x[i] && oy[m - 1] === y[i]) return;
    ox[m] = x[i]; oy[m] = y[i]; m++;
  };
  push(start);
  const inner0 = start + 1, inner1 = end - 1;
  const span = inner1 - inner0 + 1;
  for (let c = 0; c < cols; c++) {
    const a = inner0 + Math.floor((c * span) / cols);
    const b = inner0 + Math.floor(((c + 1) * span) / cols) - 1;
    if (b < a) continue;
    let iMin = a, iMax = a;
    for (let i = a + 1; i <= b; i++) {
      const v = y[i];
      if (v < y[iMin]) iMin = i;
      if (v > y[iMax]) iMax = i;
    }
    if (iMin < iMax) { push(iMin); push(iMax); } else if (iMax < iMin) { push(iMax); push(iMin); } else push(iMin);
  }
  push(end);
  return { x: ox.slice(0, m), y: oy.slice(0, m), thinned: true };
}

/**
 * Two series on one x grid thinned together for a small figure: the first
 * point kept as it is, the rest split into `groups` runs of consecutive
 * points, each run giving the points where either series has its minimum or
 * maximum (up to four, in x order), so both keep every extreme of every run
 * and still share one x array. Returned whole when it would not shrink.
 */
export function thinTogether(x: Float64Array, a: Float64Array, b: Float64Array, groups: number): { x: Float64Array; a: Float64Array; b: Float64Array; thinned: boolean } {
  const n = x.length;
  const g = Math.max(1, Math.floor(groups));
  if (n <= 1 + 4 * g) return { x, a, b, thinned: false };
  const keep: number[] = [0];
  const span = n - 1;
  for (let c = 0; c < g; c++) {
    const from = 1 + Math.floor((c * span) / g), to = Math.floor(((c + 1) * span) / g); // inclusive
    if (to < from) continue;
    let aMin = from, aMax = from, bMin = from, bMax = from;
    for (let i = from + 1; i <= to; i++) {
      if (a[i] < a[aMin]) aMin = i;
      if (a[i] > a[aMax]) aMax = i;
      if (b[i] < b[bMin]) bMin = i;
      if (b[i] > b[bMax]) bMax = i;
    }
    for (const i of [...new Set([aMin, aMax, bMin, bMax])].sort((p, q) => p - q)) keep.push(i);
  }
  const pick = (v: Float64Array) => Float64Array.from(keep, (i) => v[i]);
  return { x: pick(x), a: pick(a), b: pick(b), thinned: true };
}
