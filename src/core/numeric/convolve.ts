/**
 * Short-kernel filtering of evenly spaced samples, with the ways of
 * extending the data past its ends that SciPy's `ndimage` names
 * (SciPy reference guide, scipy.ndimage "mode" parameter):
 *
 *  - 'reflect'  d c b a | a b c d | d c b a   (edge sample repeated)
 *  - 'mirror'   d c b   | a b c d |   c b a   (edge sample not repeated)
 *  - 'nearest'  a a a a | a b c d | d d d d
 *  - 'wrap'     a b c d | a b c d | a b c d
 *  - 'constant' k k k k | a b c d | k k k k   (k = cval, default 0)
 */

/** How samples beyond either end are made up. */
export type PadMode = 'reflect' | 'mirror' | 'nearest' | 'wrap' | 'constant';

/**
 * Index into [0, n) that the padding mode assigns to the virtual index j
 * (any integer, possibly far outside), or -1 for 'constant' outside.
 * Windows longer than the data reflect several times, as SciPy does.
 * @param j virtual sample index.
 * @param n number of real samples (≥ 1).
 */
export function padIndex(j: number, n: number, mode: PadMode): number {
  if (j >= 0 && j < n) return j;
  switch (mode) {
    case 'constant':
      return -1;
    case 'nearest':
      return j < 0 ? 0 : n - 1;
    case 'wrap':
      return ((j % n) + n) % n;
    case 'reflect': {
      const period = 2 * n;
      const m = ((j % period) + period) % period;
      return m < n ? m : period - 1 - m;
    }
    case 'mirror': {
      if (n === 1) return 0;
      const period = 2 * n - 2;
      const m = ((j % period) + period) % period;
      return m < n ? m : period - m;
    }
  }
}

/**
 * Correlate y with a short kernel: out[i] = Σₖ c[k]·y[i + k − centre], the
 * samples beyond the ends supplied by `mode`. `centre` defaults to
 * floor(len/2), the middle of an odd kernel. This is SciPy's
 * `ndimage.correlate1d` (and `convolve1d` with the kernel reversed).
 * Cost O(n·len); the interior loop does no index checks.
 * @param y samples (not changed).
 * @param c kernel, applied in dot order (c[0] meets the leftmost sample).
 * @param mode padding, default 'reflect'.
 * @param cval value used beyond the ends for 'constant', default 0.
 * @param centre kernel index that lines up with out[i], default floor(len/2).
 * @throws RangeError when y or c is empty.
 */
export function correlate(
  y: Float64Array,
  c: Float64Array,
  mode: PadMode = 'reflect',
  cval = 0,
  centre = Math.floor(c.length / 2),
): Float64Array {
  const n = y.length;
  const w = c.length;
  if (n === 0) throw new RangeError('There are no samples to filter.');
  if (w === 0) throw new RangeError('The filter kernel is empty.');
  const out = new Float64Array(n);
  const lo = centre;
  const hi = n - (w - centre);
  for (let i = Math.max(lo, 0); i <= hi; i++) {
    let s = 0;
    const base = i - centre;
    for (let k = 0; k < w; k++) s += c[k] * y[base + k];
    out[i] = s;
  }
  // Edges: samples the kernel reaches beyond either end come from the padding rule.
  for (let i = 0; i < n; i++) {
    if (i >= lo && i <= hi) {
      i = hi;
      continue;
    }
    let s = 0;
    const base = i - centre;
    for (let k = 0; k < w; k++) {
      const j = padIndex(base + k, n, mode);
      s += c[k] * (j < 0 ? cval : y[j]);
    }
    out[i] = s;
  }
  return out;
}
