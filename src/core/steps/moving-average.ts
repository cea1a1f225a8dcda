/**
 * Centred moving average (unweighted running mean over an odd window).
 */
import { padIndex } from '../numeric/convolve.ts';
import type { Signal, StepDefinition, StepOutput } from './types.ts';
import { checkOddWindow } from './checks.ts';

/**
 * What happens where the window runs past an end:
 *  - 'shrink': the window shrinks symmetrically, so point i from an end
 *    averages 2i + 1 points and the end points themselves are unchanged;
 *  - 'mirror': d c b | a b c d (SciPy ndimage 'mirror');
 *  - 'repeat': a a a | a b c d, the end value repeated (SciPy ndimage 'nearest');
 *  - 'reflect': d c b a | a b c d (SciPy ndimage 'reflect'); kernel only.
 */
export type MovingAverageEdge = 'shrink' | 'mirror' | 'repeat' | 'reflect';

/** Largest window the step accepts, in points. */
export const MOVING_AVERAGE_MAX_WINDOW = 100001;

/** Neumaier's compensated sum: keeps the rounding error of a long running sum bounded. */
class CompensatedSum {
  sum = 0;
  comp = 0;
  add(v: number): void {
    const t = this.sum + v;
    if (Math.abs(this.sum) >= Math.abs(v)) this.comp += this.sum - t + v;
    else this.comp += v - t + this.sum;
    this.sum = t;
  }
  value(): number {
    return this.sum + this.comp;
  }
  reset(): void {
    this.sum = 0;
    this.comp = 0;
  }
}

/**
 * Centred moving average over an odd window of points, O(n).
 * The running window sum is compensated (Neumaier 1974, Z. Angew. Math.
 * Mech. 54:39, at the shrinking ends; Knuth's TwoSum along the rest) and
 * recomputed from scratch every max(4096, 4·window) points, so its error
 * does not drift along 10⁷ points. The gain at
 * frequency f (cycles per sample) is sin(πNf)/(N·sin πf).
 * @param y samples (not changed).
 * @param window odd number of points ≥ 1 (1 returns a copy).
 * @param edge end handling, default 'shrink' (see {@link MovingAverageEdge}).
 * @throws RangeError for an even, non-integer or non-positive window, or empty y.
 */
export function movingAverage(y: Float64Array, window: number, edge: MovingAverageEdge = 'shrink'): Float64Array {
  if (!Number.isInteger(window) || window < 1 || window % 2 === 0) {
    throw new RangeError(`The window must be an odd whole number of points (got ${window}).`);
  }
  if (!['shrink', 'mirror', 'repeat', 'reflect'].includes(edge)) {
    throw new RangeError(`Unknown end handling "${String(edge)}"; choose shrink, mirror, repeat or reflect.`);
  }
  const n = y.length;
  if (n === 0) throw new RangeError('There are no samples to average.');
  const h = (window - 1) / 2;
  const out = new Float64Array(n);
  const acc = new CompensatedSum();
  if (edge === 'shrink') {
    if (n <= 2 * h) {
      // Every point is near an end: take the widest symmetric window that fits.
      for (let i = 0; i < n; i++) {
        const hi = Math.min(h, i, n - 1 - i);
        acc.reset();
        for (let j = i - hi; j <= i + hi; j++) acc.add(y[j]);
        out[i] = acc.value() / (2 * hi + 1);
      }
      return out;
    }
    // Edge loop: symmetric windows of 1, 3, 5, … points, grown two samples at a time from each end.
    const left = new CompensatedSum();
    const right = new CompensatedSum();
    for (let i = 0; i < h; i++) {
      if (i === 0) {
        left.add(y[0]);
        right.add(y[n - 1]);
      } else {
        left.add(y[2 * i - 1]);
        left.add(y[2 * i]);
        right.add(y[n - 2 * i]);
        right.add(y[n - 1 - 2 * i]);
      }
      out[i] = left.value() / (2 * i + 1);
      out[n - 1 - i] = right.value() / (2 * i + 1);
    }
    slide(y, out, h, h, n - 1 - h, 'nearest');
    return out;
  }
  const mode = edge === 'repeat' ? 'nearest' : edge;
  slide(y, out, h, 0, n - 1, mode);
  return out;
}


/**
 * Sliding window mean for out[first..last], padding by mode where the window
 * leaves the data. The running sum is compensated with Knuth's branch-free
 * TwoSum (Knuth, TAOCP vol. 2, §4.2.2) and summed afresh every
 * max(4096, 4·window) outputs, which bounds its drift at O(w/4) extra work per point at most.
 */
function slide(y: Float64Array, out: Float64Array, h: number, first: number, last: number, mode: 'nearest' | 'mirror' | 'reflect'): void {
  const n = y.length;
  const w = 2 * h + 1;
  const at = (j: number): number => (j >= 0 && j < n ? y[j] : y[padIndex(j, n, mode)]);
  // Outputs whose incoming and outgoing samples both lie inside the data: i − h − 1 ≥ 0 and i + h ≤ n − 1.
  const safeLo = h + 1;
  const safeHi = n - 1 - h;
  const every = Math.max(4096, 4 * w);
  for (let start = first; start <= last; start += every) {
    const stop = Math.min(last, start + every - 1);
    let s = 0;
    let c = 0;
    if (start - h >= 0 && start + h < n) {
      for (let j = start - h; j <= start + h; j++) {
        const v = y[j];
        const t = s + v;
        const b = t - s;
        c += (s - (t - b)) + (v - b);
        s = t;
      }
    } else {
      for (let j = start - h; j <= start + h; j++) {
        const v = at(j);
        const t = s + v;
        const b = t - s;
        c += (s - (t - b)) + (v - b);
        s = t;
      }
    }
    out[start] = (s + c) / w;
    // The padded stretches at either end, then the interior with no index checks. The three loops repeat
    // one step on purpose: a shared closure puts s and c in a context object and makes it 3–4 × slower, a module-level helper 1.6–2 × (DEVELOPERS.md, "Duplicates").
    const inLo = Math.max(start + 1, safeLo);
    const inHi = Math.min(stop, safeHi);
    let i = start + 1;
    for (; i <= stop && i < inLo; i++) {
      const a = at(i + h);
      let t = s + a;
      let b = t - s;
      c += (s - (t - b)) + (a - b);
      s = t;
      const d = -at(i - h - 1);
      t = s + d;
      b = t - s;
      c += (s - (t - b)) + (d - b);
      s = t;
      out[i] = (s + c) / w;
    }
    for (; i <= inHi; i++) {
      const a = y[i + h];
      let t = s + a;
      let b = t - s;
      c += (s - (t - b)) + (a - b);
      s = t;
      const d = -y[i - h - 1];
      t = s + d;
      b = t - s;
      c += (s - (t - b)) + (d - b);
      s = t;
      out[i] = (s + c) / w;
    }
    for (; i <= stop; i++) {
      const a = at(i + h);
      let t = s + a;
      let b = t - s;
      c += (s - (t - b)) + (a - b);
      s = t;
      const d = -at(i - h - 1);
      t = s + d;
      b = t - s;
      c += (s - (t - b)) + (d - b);
      s = t;
      out[i] = (s + c) / w;
    }
  }
}

export type MovingAverageParams = {
  /** Odd number of points averaged. */
  window: number;
  edge: 'shrink' | 'mirror' | 'repeat';
};

/** The moving-average step. */
export const movingAverageStep: StepDefinition<MovingAverageParams> = {
  id: 'moving-average',
  linear: true,
  label: 'Moving average',
  summary:
    'Replaces each point by the plain mean of the odd-sized window centred on it, which cuts random noise by about the square root of the window. ' +
    'It helps on noisy traces whose peaks are many points wide; by default the window shrinks near the ends so the end points are smoothed less. ' +
    'It flattens and widens every peak narrower than a few windows and can erase small narrow peaks and shoulders altogether.',
  params: [
    {
      key: 'window', label: 'Window', kind: 'int', unit: 'points', min: 3, max: MOVING_AVERAGE_MAX_WINDOW, step: 2, odd: true,
      help: 'Odd number of points averaged for each output point (3, 5, 7, …); must not exceed the number of points in the trace.',
    },
    {
      key: 'edge', label: 'At the ends', kind: 'choice', unit: 'none',
      choices: [
        { value: 'shrink', label: 'shrink the window (default)' },
        { value: 'mirror', label: 'mirror the data' },
        { value: 'repeat', label: 'repeat the end value' },
      ],
      help: 'Shrink: near an end the window narrows symmetrically so the first and last points stay as measured. Mirror: the data are reflected about the end point. Repeat: the end value is repeated.',
    },
  ],
  defaults: { window: 5, edge: 'shrink' },
  validate(params, input) {
    return checkOddWindow(params.window, input.y.length, MOVING_AVERAGE_MAX_WINDOW) ??
      (['shrink', 'mirror', 'repeat'].includes(params.edge) ? null : `Unknown end handling "${String(params.edge)}"; choose shrink, mirror or repeat.`);
  },
  apply(input: Signal, params): StepOutput {
    const y = movingAverage(input.y, params.window, params.edge);
    const notes = [`Averaged over ${params.window} points (noise SD expected to fall by a factor of about ${Math.sqrt(params.window).toFixed(2)}).`];
    if (params.edge === 'shrink') notes.push(`The first and last ${(params.window - 1) / 2} points were averaged over fewer points.`);
    return { x: Float64Array.from(input.x), y, notes };
  },
};
