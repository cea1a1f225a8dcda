/**
 * Local polynomial smoothing that chooses, window by window, between a
 * straight line and a quadratic with an F-test on the extra term.
 */
import { meanStep } from '../numeric/interpolate.ts';
import { fCdf } from '../numeric/distributions.ts';
import { checkOddWindow } from './checks.ts';
import type { Signal, StepDefinition, StepOutput } from './types.ts';

/** Largest window the step accepts, in points. */
export const LOCAL_ORDER_MAX_WINDOW = 1001;

/**
 * Quantile of the F distribution: the f with P(F ≤ f) = p ({@link fCdf}, the
 * project's one F distribution), found by doubling an upper bracket and
 * then bisecting to full double precision.
 * @param p probability in (0, 1). @param d1, d2 degrees of freedom (> 0).
 * @throws RangeError for p outside (0, 1) or non-positive degrees of freedom.
 */
export function fDistributionQuantile(p: number, d1: number, d2: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`The probability must lie strictly between 0 and 1 (got ${p}).`);
  if (!(d1 > 0 && d2 > 0)) throw new RangeError(`Degrees of freedom must be positive (got ${d1}, ${d2}).`);
  let lo = 0;
  let hi = 1;
  while (fCdf(hi, d1, d2) < p && hi < 1e300) {
    lo = hi;
    hi *= 2;
  }
  for (let it = 0; it < 2000; it++) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    if (fCdf(mid, d1, d2) < p) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * Local least-squares smoothing with the polynomial order chosen per window.
 * For every window of `window` points (odd, ≥ 5) a straight line and a
 * quadratic are fitted (orthogonal polynomials 1, t, t² − h(h+1)/3 in the
 * sample offset t); the quadratic is kept only when its extra term passes the
 * F-test F = (RSS₁ − RSS₂) / (RSS₂/(w − 3)) > F₁,w−3(1 − α) (the usual
 * extra-sum-of-squares test for nested linear models, e.g. Draper & Smith,
 * Applied Regression Analysis). The output is the chosen fit at the window
 * centre. The first and last half-window of points take the first (last)
 * window's chosen fit evaluated at their positions. O(n·window).
 * When the quadratic term is zero to rounding (RSS₁ − RSS₂ ≤ 1e-20 of the
 * total sum of squares) the line is kept.
 * @param y evenly spaced samples (not changed).
 * @param window odd number of points, 5 ≤ window ≤ n.
 * @param alpha significance level of the test, 0 < α < 1 (default 0.05).
 * @returns smoothed y and the chosen order (1 or 2) per point.
 * @throws RangeError for a bad window or α.
 */
export function localOrderSmooth(y: Float64Array, window: number, alpha = 0.05): { y: Float64Array; order: Float64Array } {
  if (!Number.isInteger(window) || window < 5 || window % 2 === 0) {
    throw new RangeError(`The window must be an odd whole number of points, at least 5 (got ${window}).`);
  }
  const n = y.length;
  if (window > n) throw new RangeError(`The window (${window} points) is longer than the data (${n} points).`);
  if (!(alpha > 0 && alpha < 1)) throw new RangeError(`The significance level must lie between 0 and 1 (got ${alpha}).`);
  const h = (window - 1) / 2;
  const crit = fDistributionQuantile(1 - alpha, 1, window - 3);
  const p2c = (h * (h + 1)) / 3;
  let n1 = 0;
  let n2 = 0;
  for (let t = -h; t <= h; t++) {
    n1 += t * t;
    n2 += (t * t - p2c) ** 2;
  }
  const out = new Float64Array(n);
  const order = new Float64Array(n);

  // Fit the window centred on sample i; returns [b0, b1, b2, chosen order].
  const fit = (i: number): [number, number, number, number] => {
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    for (let t = -h; t <= h; t++) {
      const v = y[i + t];
      s0 += v;
      s1 += t * v;
      s2 += (t * t - p2c) * v;
    }
    const b0 = s0 / window;
    const b1 = s1 / n1;
    const b2 = s2 / n2;
    let rss2 = 0;
    let sst = 0;
    for (let t = -h; t <= h; t++) {
      const r = y[i + t] - b0;
      sst += r * r;
      const r2 = r - b1 * t - b2 * (t * t - p2c);
      rss2 += r2 * r2;
    }
    const extra = b2 * b2 * n2;
    const chosen = extra > 1e-20 * sst && extra > (crit * rss2) / (window - 3) ? 2 : 1;
    return [b0, b1, b2, chosen];
  };

  for (let i = h; i <= n - 1 - h; i++) {
    const [b0, , b2, k] = fit(i);
    out[i] = k === 2 ? b0 - b2 * p2c : b0;
    order[i] = k;
  }
  // Edge loop: the outer half-windows use the end windows' chosen fits at their own offsets.
  for (const [centre, sign] of [[h, -1], [n - 1 - h, 1]] as const) {
    const [b0, b1, b2, k] = fit(centre);
    for (let t = 1; t <= h; t++) {
      const off = sign * t;
      out[centre + off] = b0 + b1 * off + (k === 2 ? b2 * (off * off - p2c) : 0);
      order[centre + off] = k;
    }
  }
  return { y: out, order };
}

export type LocalOrderParams = {
  /** Odd number of points in each local fit. */
  window: number;
  /** Significance level of the F-test for keeping the quadratic term. */
  alpha: number;
};

/** The line-or-quadratic local smoothing step. */
export const localOrderStep: StepDefinition<LocalOrderParams> = {
  id: 'local-order',
  label: 'Smooth, keeping peak tops (local line or quadratic)',
  summary:
    'Fits both a straight line and a quadratic to the window around each point and keeps the quadratic only where an F-test says its curvature is real at the chosen level (default 5 %), then takes the fitted value at the centre. ' +
    'Flat and sloping stretches get the stronger smoothing of a line while peak tops keep the quadratic, so peaks are flattened less than by a line fit alone. ' +
    'Where the test is not convinced (small or narrow peaks in noise) the line is used and the feature is flattened, and about α of the windows on pure noise still pick the quadratic by chance.',
  params: [
    {
      key: 'window', label: 'Window', kind: 'int', unit: 'points', min: 5, max: LOCAL_ORDER_MAX_WINDOW, step: 2, odd: true,
      help: 'Odd number of points in each local fit (at least 5, so the test has degrees of freedom left).',
    },
    {
      key: 'alpha', label: 'Test level α', kind: 'number', unit: 'ratio', min: 0.0001, max: 0.5, log: true,
      help: 'Chance of keeping the quadratic where the true curve is a straight line; smaller values keep the line more often. 0.05 is common practice.',
    },
  ],
  defaults: { window: 11, alpha: 0.05 },
  needsEvenSpacing: true,
  validate(params, input) {
    const w = checkOddWindow(params.window, input.y.length, LOCAL_ORDER_MAX_WINDOW, 5);
    if (w) return w;
    const a = params.alpha;
    if (typeof a !== 'number' || Number.isNaN(a)) return 'The test level is not a number; enter a value such as 0.05.';
    if (!(a >= 0.0001 && a <= 0.5)) return `The test level must lie between 0.0001 and 0.5 (got ${a}).`;
    return null;
  },
  apply(input: Signal, params): StepOutput {
    const r = localOrderSmooth(input.y, params.window, params.alpha);
    let quad = 0;
    for (const k of r.order) if (k === 2) quad++;
    const n = input.y.length;
    const crit = fDistributionQuantile(1 - params.alpha, 1, params.window - 3);
    const notes = [
      `Straight line kept at ${n - quad} point(s), quadratic at ${quad} point(s) (F-test at α = ${params.alpha}, critical F(1, ${params.window - 3}) = ${crit.toPrecision(4)}).`,
      `Window ${params.window} points = ${(meanStep(input.x) * (params.window - 1)).toPrecision(4)} x-units.`,
    ];
    return { x: Float64Array.from(input.x), y: r.y, notes, extra: { order: r.order }, figures: { pointsLine: n - quad, pointsQuadratic: quad } };
  },
};
