/**
 * Noise estimators. Each says what it measured, on how many points, and
 * by which definition, so the S/N built on it can be defended.
 *
 * Two kinds of number come out: a standard deviation (σ, for S/N = H/σ)
 * and a range h = max − min (for the pharmacopoeial S/N = 2H/h). The field
 * `measure` says which one `sigma` holds.
 */

/** One assumption behind a noise figure and whether it held (null: could not be tested). */
export interface NoiseCheck {
  /** Stable short name, e.g. 'finest-scale', 'correlation', 'level'. */
  readonly id: string;
  readonly held: boolean | null;
  /** One sentence a reviewer can read. */
  readonly text: string;
}

/** A noise figure and how it was obtained. */
export interface NoiseEstimate {
  readonly ok: true;
  /** The noise number in y-units: a standard deviation, or a range h when `measure` is 'range'. */
  readonly sigma: number;
  /** 'sd' — `sigma` is a standard deviation; 'range' — `sigma` is max − min (h). */
  readonly measure: 'sd' | 'range';
  /** Points the estimate used. */
  readonly points: number;
  /** Short stable name of the method, e.g. 'rms-about-line'. */
  readonly method: string;
  /** One sentence a reviewer can read: what was computed, over what. */
  readonly description: string;
  /** The x-range actually used (x-units), when the method works on a range. */
  readonly from?: number;
  readonly to?: number;
  /** True when the requested window ran past an end of the trace and was cut. */
  readonly clipped?: boolean;
  /** The assumptions behind the figure and whether each held. */
  readonly checks?: readonly NoiseCheck[];
  /** False when a check failed or a fallback was used. */
  readonly assumptionsHeld?: boolean;
}

/** A noise request the user can fix (range too short, outside the data). */
export interface NoiseProblem {
  readonly ok: false;
  readonly message: string;
}

export type NoiseResult = NoiseEstimate | NoiseProblem;

const FEWEST_POINTS = 3;

function fmt(v: number): string {
  return Number.isInteger(v) ? String(v) : v.toPrecision(6).replace(/\.?0+$/, '');
}

function checkXY(x: Float64Array, y: Float64Array): string | null {
  if (x.length !== y.length) return `x has ${x.length} values but y has ${y.length}; they must be the same length.`;
  if (x.length < FEWEST_POINTS) return `The trace has ${x.length} point(s); noise needs at least ${FEWEST_POINTS}.`;
  return null;
}

/** First and last index (inclusive) with lo ≤ x ≤ hi, by binary search on ascending x; empty when first > last. */
export function indexRange(x: Float64Array, lo: number, hi: number): [number, number] {
  let a = 0, b = x.length;
  while (a < b) { const m = (a + b) >>> 1; if (x[m] < lo) a = m + 1; else b = m; }
  const first = a;
  a = first; b = x.length;
  while (a < b) { const m = (a + b) >>> 1; if (x[m] <= hi) a = m + 1; else b = m; }
  return [first, a - 1];
}

function rangeProblem(x: Float64Array, from: number, to: number, what: string): NoiseProblem | [number, number] {
  if (!Number.isFinite(from) || !Number.isFinite(to)) {
    return { ok: false, message: `The ${what} needs finite ends; got ${from} to ${to}.` };
  }
  const lo = Math.min(from, to), hi = Math.max(from, to);
  const n = x.length;
  if (hi < x[0] || lo > x[n - 1]) {
    return {
      ok: false,
      message: `The ${what} ${fmt(lo)} to ${fmt(hi)} lies outside the trace (${fmt(x[0])} to ${fmt(x[n - 1])}); choose a range inside it.`,
    };
  }
  const [i0, i1] = indexRange(x, lo, hi);
  const count = i1 - i0 + 1;
  if (count < FEWEST_POINTS) {
    return {
      ok: false,
      message: `The ${what} ${fmt(lo)} to ${fmt(hi)} holds ${Math.max(count, 0)} point(s); widen it to at least ${FEWEST_POINTS} points.`,
    };
  }
  return [i0, i1];
}

/**
 * Least-squares straight line through (x[i], y[i]) for i in [i0, i1];
 * x is centred on its mean first so long time axes lose no digits.
 */
export function lineFit(x: Float64Array, y: Float64Array, i0: number, i1: number): { slope: number; intercept: number; xm: number } {
  const n = i1 - i0 + 1;
  let sx = 0, sy = 0;
  for (let i = i0; i <= i1; i++) { sx += x[i]; sy += y[i]; }
  const xm = sx / n, ym = sy / n;
  let sxx = 0, sxy = 0;
  for (let i = i0; i <= i1; i++) { const dx = x[i] - xm; sxx += dx * dx; sxy += dx * (y[i] - ym); }
  const slope = sxx > 0 ? sxy / sxx : 0;
  return { slope, intercept: ym, xm };
}

/** The quiet range's sample indices and the straight line fitted through them, or the problem with the range. */
function quietRangeFit(x: Float64Array, y: Float64Array, from: number, to: number):
  { i0: number; i1: number; n: number; fit: ReturnType<typeof lineFit> } | NoiseProblem {
  const bad = checkXY(x, y);
  if (bad) return { ok: false, message: bad };
  const r = rangeProblem(x, from, to, 'quiet range');
  if (!Array.isArray(r)) return r;
  const [i0, i1] = r;
  return { i0, i1, n: i1 - i0 + 1, fit: lineFit(x, y, i0, i1) };
}

/**
 * RMS noise: the standard deviation of y about a least-squares straight
 * line over the x-range [from, to] (x-units, either order, ends included),
 * with n − 2 degrees of freedom (two fitted parameters). Fitting a line
 * first keeps a slow drift in the quiet range from counting as noise.
 * @returns σ in y-units with the points used, or a problem when the range
 *   holds fewer than 3 points or lies outside the data. A range that only
 *   partly overlaps the trace uses the overlap and reports it (from, to).
 */
export function noiseRms(x: Float64Array, y: Float64Array, from: number, to: number): NoiseResult {
  const q = quietRangeFit(x, y, from, to);
  if (!('i0' in q)) return q;
  const { i0, i1, n, fit: { slope, intercept, xm } } = q;
  let ss = 0;
  for (let i = i0; i <= i1; i++) { const e = y[i] - (intercept + slope * (x[i] - xm)); ss += e * e; }
  const sigma = Math.sqrt(ss / (n - 2));
  return {
    ok: true, sigma, measure: 'sd', points: n, method: 'rms-about-line',
    description: `Standard deviation about a fitted straight line over ${fmt(x[i0])} to ${fmt(x[i1])} (${n} points, n − 2 degrees of freedom).`,
    from: x[i0], to: x[i1],
  };
}

/**
 * Peak-to-peak noise: max − min of the residuals about a least-squares
 * straight line over [from, to] (x-units). Detrended, so a sloping quiet
 * range does not inflate the range. For Gaussian noise the expected range
 * over n points is d₂(n)·σ (Tippett 1925, Biometrika 17:364).
 * @returns the range h in y-units, or a problem (fewer than 3 points, outside the data).
 */
export function noisePeakToPeak(x: Float64Array, y: Float64Array, from: number, to: number): NoiseResult {
  const q = quietRangeFit(x, y, from, to);
  if (!('i0' in q)) return q;
  const { i0, i1, n, fit: { slope, intercept, xm } } = q;
  let lo = Infinity, hi = -Infinity;
  for (let i = i0; i <= i1; i++) {
    const e = y[i] - (intercept + slope * (x[i] - xm));
    if (e < lo) lo = e;
    if (e > hi) hi = e;
  }
  return {
    ok: true, sigma: hi - lo, measure: 'range', points: n, method: 'peak-to-peak-detrended',
    description: `Range (max − min) of the residuals about a fitted straight line over ${fmt(x[i0])} to ${fmt(x[i1])} (${n} points, detrended).`,
    from: x[i0], to: x[i1],
  };
}

/**
 * Pharmacopoeial noise range h: max − min of y (not detrended, as USP <621>
 * and Ph. Eur. 2.2.46 define it) over a window `width` x-units wide centred
 * at `centre`. Use it on a blank trace at the place where the peak would be
 * (the texts ask for a window of at least 5 × the peak's half-height width),
 * or on the trace itself, which is a deviation to be labelled as such.
 * A window running past an end of the trace is cut there and `clipped` is
 * true.
 * @returns h in y-units with the points used, or a problem (width not
 *   positive, fewer than 3 points, window outside the data).
 */
export function noiseRangeAround(x: Float64Array, y: Float64Array, centre: number, width: number): NoiseResult {
  const bad = checkXY(x, y);
  if (bad) return { ok: false, message: bad };
  if (!(width > 0) || !Number.isFinite(width) || !Number.isFinite(centre)) {
    return { ok: false, message: `The noise window needs a finite centre and a positive width; got centre ${centre}, width ${width}.` };
  }
  const lo = centre - width / 2, hi = centre + width / 2;
  const r = rangeProblem(x, lo, hi, 'noise window');
  if (!Array.isArray(r)) return r;
  const [i0, i1] = r;
  let a = Infinity, b = -Infinity;
  for (let i = i0; i <= i1; i++) { if (y[i] < a) a = y[i]; if (y[i] > b) b = y[i]; }
  const clipped = lo < x[0] || hi > x[x.length - 1];
  const n = i1 - i0 + 1;
  return {
    ok: true, sigma: b - a, measure: 'range', points: n, method: 'range-around',
    description: `Range (max − min, not detrended) over ${fmt(x[i0])} to ${fmt(x[i1])} (${n} points), a window of ${fmt(width)} centred at ${fmt(centre)}${clipped ? ', cut by the end of the trace' : ''}.`,
    from: x[i0], to: x[i1], clipped,
  };
}
