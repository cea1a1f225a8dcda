/**
 * The ways short-kernel filters of evenly spaced samples extend the data
 * past its ends, that SciPy's `ndimage` names
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
