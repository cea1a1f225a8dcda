/**
 * Bounds and integration: each peak's local baseline, its own half-height
 * width, its apex, its integration bounds and its area, all measured near
 * the peak. Nothing here depends on how far away a higher sample lies (the
 * SciPy prominence bases can lie anywhere along a wandering baseline).
 *
 * The rules, as stated to the user (σ is the noise at the apex; where σ is
 * 0 the rules take the floor SIGMA_FLOOR_OF_SPAN × the trace's span):
 *
 * 1. First feet: from the apex walk outward on each side on a box average
 *    of B samples, keeping the lowest average passed; stop when one stands
 *    more than 3σ_B above it (σ_B the noise of a B-sample average), or
 *    after {@link WIDTH_LIMIT} × the half-prominence width. B = 1, 3, 5,
 *    9, 17, … (at most 3/4 of the half-prominence width, at least 3); where
 *    a walk ends where it starts, both walk again from the highest box
 *    average within half the half-prominence width of the apex: the B
 *    at which the height above the line through the two lowest averages,
 *    in units of σ_B, is largest, every B tried ({@link firstFeet}). The
 *    first baseline is that line.
 * 2. Own width: the half-height crossings of the trace above that line
 *    (linear interpolation between samples, not beyond the bounds), and the
 *    apex (position and level) from a parabola over the peak's own top
 *    ({@link apexPosition}, {@link apexLevel}).
 * 2b. Half-widths for the bounds walk: the half-height crossings of a
 *    3-point average of the trace, a copy used for nothing else (heights,
 *    reported widths and areas stay on the trace), at half the copy's own
 *    top, never inside the crossings of rule 2; a side where the copy rises
 *    above its top first, and a feature under {@link LOC_MIN_WIDTH} samples
 *    wide, keep those of rule 2 ({@link locCrossings}). On a top a few σ
 *    high one noisy sample ends a crossing on the trace; on the copy it
 *    does not.
 * 3. Bounds: a box average of B = 2r + 1 samples, r = ⌊FWHM/4⌋ (in
 *    samples, about half the half-height width; FWHM and half-widths here
 *    those of rule 2b), walks outward from the apex; the tests
 *    below start at the half-height crossing of that side. Its noise is
 *    σ_B = σ·(box factor; 1/√B for white noise). A side stops where
 *    * the average above the current baseline line rose more than 3σ_B
 *      above its lowest value so far ('valley', a neighbour's flank; 6σ_B
 *      once the walk is back at the baseline): the bound is at that lowest
 *      value;
 *    * two half-widths of that side (at least B samples) after the average
 *      first came within 3σ_B of the lower of
 *      that line and the hull line, the edge under the apex of the lower
 *      convex hull of the box averages within {@link WIDTH_LIMIT}
 *      half-widths either side, which never lies above the averaged trace
 *      (noise puts it 2–3 σ_B below the baseline) ('returned');
 *    * it is {@link WIDTH_LIMIT} half-widths (of that side) from the apex
 *      ('width-limit'), or the trace ends ('trace-end').
 * 4. Levels at the bounds: at a valley, the box average there; otherwise
 *    the mean point (x and y) of the max(B, 5) samples from the bound
 *    outward (straight baselines stay exact), unless their farther half
 *    stands above their nearer half by more than 2 standard errors (a
 *    neighbour's flank), then the box average at the bound. The baseline is
 *    the straight line through the two levels.
 * 5. Steps 2–4 repeat until the bounds stop moving (at most
 *    {@link MAX_PASSES} passes), then the width and apex are measured once
 *    more against the final line.
 * 6. Neighbours (peak-table.ts): two peaks whose bounds overlap, or whose
 *    valley bounds lie within a box length of each other, share the lowest
 *    point between their apexes, with two exceptions. A narrow peak (under
 *    half the width of a higher neighbour) whose apex lies within that
 *    neighbour's half-height width rides on it ({@link ridersOf}): it keeps
 *    its own local measures and moves nothing of the neighbour's. So does
 *    one on the neighbour's flank, within its bounds, when it is under a
 *    tenth of the neighbour's width and a shared valley would cut off more
 *    of the neighbour than the narrow peak holds (its own area is less than
 *    the neighbour's area from its near bound out to the neighbour's bound,
 *    less its own): a noise bump on a broad peak's flank; a neighbour of
 *    comparable width, or one in the far tail where little of the broad
 *    peak is left, still splits. Its area is then also inside the broad
 *    peak's (the row's note says so). And of
 *    two touching peaks, one whose box average rises less than the
 *    detection limit × σ_B above the valley is part of the other (a broad
 *    noisy top split in two) and is dropped; so is the one of smaller
 *    SciPy prominence where their fitted apexes lie within a quarter of the
 *    narrower one's half-height width of each other (two maxima of one top,
 *    both measuring the whole top) ({@link mergeShallow}). Where at least one of the two stands at or
 *    above the detection limit the split rule applies (perpendicular drop:
 *    one line under the group; valley to valley: each its own line); a
 *    valley between two peaks below the limit just stops both bounds.
 * 7. The width limit, last ({@link capBounds}): a bound further than
 *    {@link WIDTH_LIMIT} of the peak's final own half-widths (per side, of
 *    rule 2, not 2b)
 *    from the apex sample, as a shared valley can be, is pulled in to that
 *    distance; a peak with its own line gets it again from the new bounds;
 *    a member of a perpendicular-drop group with no area above the group's
 *    line gets its own valley-to-valley line (as one with no height does).
 *    peak-table.ts drops a detected peak whose area is not positive.
 *
 * Area: trapezoid rule of (trace − baseline line) between the bounds.
 */
import type { BoundKind, SplitRule } from './peak-types.ts';
import type { NoiseModel } from './peak-snr.ts';

/** Bounds lie at most this many of the peak's own half-height half-widths (per side) from the apex. */
export const WIDTH_LIMIT = 8;
/** Most passes of steps 2–4. */
const MAX_PASSES = 2;
/** Rise, in σ of the walk's values, that ends a walk at a valley. */
const VALLEY_RISE = 3;
/** Rise, in σ_B, that ends a walk at a valley once it is back at the baseline: a neighbour's flank, not noise. */
const VALLEY_RISE_AFTER_RETURN = 6;
/** A walk is back at the baseline within this many σ_B above the hull (which noise puts 2–3 σ_B low). */
const RETURN_ABOVE_HULL = 3;
/** Half-height half-widths (of that side) a bound lies beyond the point where the trace came back to the baseline. */
const RETURN_BEYOND = 2;
/** A feature narrower than this (samples, on the trace) keeps its raw crossings for the bounds walk (rule 2b). */
const LOC_MIN_WIDTH = 2;
/** A narrow peak on a neighbour's flank (outside its half-height width) rides on it only when this many times narrower. */
const FLANK_RIDER_NARROWER = 10;
/** Half-window of the apex-level fit: FWHM/6 samples, at least 1, at most this many. */
const APEX_HALF_WINDOW_MAX = 50;
/** Two touching maxima whose apexes lie within this share of the narrower one's own half-height width are one top (rule 6b). */
const SAME_TOP_SHARE = 0.25;
/** Samples averaged for a level beyond a bound, at least. */
const LEVEL_POINTS_MIN = 5;

/** A straight baseline y = y0 + slope·(x − x0) on the detection signal. */
export interface Line {
  readonly x0: number;
  readonly y0: number;
  readonly slope: number;
}

/** Line through two points; a horizontal line at their mean when the x coincide. */
/** Set a line in place to the one through two points (see {@link lineThrough}). */
function setLine(l: { x0: number; y0: number; slope: number }, xa: number, ya: number, xb: number, yb: number): void {
  if (xb === xa) { l.x0 = xa; l.y0 = (ya + yb) / 2; l.slope = 0; } else { l.x0 = xa; l.y0 = ya; l.slope = (yb - ya) / (xb - xa); }
}

export function lineThrough(xa: number, ya: number, xb: number, yb: number): Line {
  if (xb === xa) return { x0: xa, y0: (ya + yb) / 2, slope: 0 };
  return { x0: xa, y0: ya, slope: (yb - ya) / (xb - xa) };
}

export function lineAt(l: Line, x: number): number {
  return l.y0 + l.slope * (x - l.x0);
}

/** The trace and its noise, as the measures see them. */
export interface MeasureContext {
  readonly x: Float64Array;
  /** Detection signal: y, or −y for dips. */
  readonly s: Float64Array;
  readonly noise: NoiseModel;
  /** The detection signal lightly smoothed ({@link locatingCopy}): used only for the bounds walk's half-widths (rule 2b). */
  readonly loc: Float64Array;
}

/** One peak measured on its own (before neighbours share valleys). */
export interface LocalMeasure {
  index: number;
  /** Refined apex x. */
  xApex: number;
  /** Apex level above the line, on the detection signal. */
  height: number;
  /** Half-height crossings, fractional sample indices. */
  leftIp: number;
  rightIp: number;
  /** Half-height crossings located on the smoothed copy (rule 2b), fractional sample indices: the widths the bounds walk uses. */
  locL: number;
  locR: number;
  start: number;
  end: number;
  startKind: BoundKind;
  endKind: BoundKind;
  line: Line;
  /** Box half-width r (samples) the bounds used. */
  box: number;
  split: SplitRule | 'none';
  note?: string;
}

/** x at a fractional sample index, linear between samples. */
export function xAt(x: Float64Array, f: number): number {
  const i = Math.floor(f);
  if (i >= x.length - 1) return x[x.length - 1];
  if (i < 0) return x[0];
  return x[i] + (f - i) * (x[i + 1] - x[i]);
}

/** Mean of s over i − r … i + r, the ends repeated beyond the trace. */
function boxMean(s: Float64Array, i: number, r: number): number {
  const n = s.length;
  let sum = 0;
  for (let k = i - r; k <= i + r; k++) sum += s[k < 0 ? 0 : k >= n ? n - 1 : k];
  return sum / (2 * r + 1);
}

/**
 * Least-squares c0 + c1 t + c2 t², t = (x − xc)/span, through the samples
 * i0..i1 of s minus the line. With a window [lo, hi] each sample is weighted
 * by the part of its cell (midpoint to midpoint) inside the window, so the
 * fit sees the window as a continuous stretch symmetric about its centre
 * whatever the sampling. Null when degenerate.
 */
function quadFit(x: Float64Array, s: Float64Array, line: Line, i0: number, i1: number, xc: number, lo = -Infinity, hi = Infinity): { c0: number; c1: number; c2: number; span: number } | null {
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
    const t = (x[k] - xc) / span, tt = t * t, v = (s[k] - lineAt(line, x[k])) * wgt;
    n += wgt; t1 += wgt * t; t2 += wgt * tt; t3 += wgt * tt * t; t4 += wgt * tt * tt; y0 += v; y1 += v * t; y2 += v * tt;
  }
  const det = n * (t2 * t4 - t3 * t3) - t1 * (t1 * t4 - t3 * t2) + t2 * (t1 * t3 - t2 * t2);
  if (!(Math.abs(det) > 1e-12)) return null;
  const c0 = (y0 * (t2 * t4 - t3 * t3) - t1 * (y1 * t4 - t3 * y2) + t2 * (y1 * t3 - t2 * y2)) / det;
  const c1 = (n * (y1 * t4 - t3 * y2) - y0 * (t1 * t4 - t3 * t2) + t2 * (t1 * y2 - y1 * t2)) / det;
  const c2 = (n * (t2 * y2 - y1 * t3) - t1 * (t1 * y2 - y1 * t2) + y0 * (t1 * t3 - t2 * t2)) / det;
  return { c0, c1, c2, span };
}

/** Vertex of the parabola through the three samples around i above the line (actual x); the sample x when flat or at an end. */
function apexParabola(x: Float64Array, s: Float64Array, line: Line, i: number): number {
  if (i <= 0 || i >= x.length - 1) return x[i];
  const x0 = x[i - 1], x1 = x[i], x2 = x[i + 1];
  const v0 = s[i - 1] - lineAt(line, x0), v1 = s[i] - lineAt(line, x1), v2 = s[i + 1] - lineAt(line, x2);
  const d1 = (v1 - v0) / (x1 - x0);
  const d2 = (v2 - v1) / (x2 - x1);
  const a = (d2 - d1) / (x2 - x0);
  if (!(a < 0)) return x1;
  const v = (x0 + x1) / 2 - d1 / (2 * a);
  return Math.min(x2, Math.max(x0, v));
}

/**
 * Apex position above the baseline line. On a narrow peak (own half-height
 * width under 6 samples) the vertex of the parabola through the three top
 * samples. On a broader peak three samples of a flat noisy top let the
 * noise choose the apex, so the vertex of a least-squares parabola over a
 * window of ±FWHM/3 centred on the current estimate is used, samples
 * weighted by how much of their cell lies in the window, re-centred until
 * it settles (at most 5 times). A window symmetric about a symmetric peak's
 * apex has its vertex there, so the fixed point is unbiased for symmetric
 * peaks.
 */
export function apexPosition(x: Float64Array, s: Float64Array, line: Line, i: number, fwhmPoints: number): number {
  const q = Math.floor(fwhmPoints / 3);
  const start = apexParabola(x, s, line, i);
  if (fwhmPoints < 6 || i <= 0 || i >= x.length - 1) return start;
  const half = (q * (x[i + 1] - x[i - 1])) / 2;
  const lim0 = x[Math.max(0, i - q)], lim1 = x[Math.min(x.length - 1, i + q)];
  let v = start;
  for (let iter = 0; iter < 5; iter++) {
    const lo = v - half, hi = v + half;
    let i0 = i, i1 = i;
    while (i0 > 0 && (x[i0 - 1] + x[i0]) / 2 > lo) i0--;
    while (i1 < x.length - 1 && (x[i1] + x[i1 + 1]) / 2 < hi) i1++;
    const f = quadFit(x, s, line, i0, i1, v, lo, hi);
    if (!f || !(f.c2 < 0)) return start;
    const nv = Math.min(lim1, Math.max(lim0, v - (f.c1 * f.span) / (2 * f.c2)));
    const moved = Math.abs(nv - v);
    v = nv;
    if (moved < 1e-9 * half) break;
  }
  return v;
}

/** Sample nearest to v, searching out from index i (v is close to x[i]). */
function nearestFrom(x: Float64Array, i: number, v: number): number {
  let k = i;
  while (k > 0 && Math.abs(x[k - 1] - v) < Math.abs(x[k] - v)) k--;
  while (k < x.length - 1 && Math.abs(x[k + 1] - v) < Math.abs(x[k] - v)) k++;
  return k;
}

/**
 * Apex level above the line at x = at: a least-squares parabola through
 * the samples within ±q of the sample nearest `at`, q = ⌊fwhmPoints/6⌋
 * kept between 1 and {@link APEX_HALF_WINDOW_MAX}. With three samples it is
 * the parabola through the three top points; on a broad noisy peak it
 * averages the noise instead of keeping the highest excursion. Over ±FWHM/6
 * a Gaussian departs from a parabola by under 0.03 % of its height.
 */
export function apexLevel(x: Float64Array, s: Float64Array, line: Line, i: number, fwhmPoints: number, at: number): number {
  const q = Math.max(1, Math.min(APEX_HALF_WINDOW_MAX, Math.floor(fwhmPoints / 6)));
  if (q === 1 && i > 0 && i < s.length - 1) {
    // The parabola through the three top samples, in Newton's form.
    const x0 = x[i - 1], x1 = x[i], x2 = x[i + 1];
    const v0 = s[i - 1] - lineAt(line, x0), v1 = s[i] - lineAt(line, x1), v2 = s[i + 1] - lineAt(line, x2);
    const d1 = (v1 - v0) / (x1 - x0), d2 = (v2 - v1) / (x2 - x1), a = (d2 - d1) / (x2 - x0);
    return v1 + d1 * (at - x1) + a * (at - x0) * (at - x1);
  }
  const c = q > 1 ? nearestFrom(x, i, at) : i;
  const i0 = Math.max(0, c - q), i1 = Math.min(s.length - 1, c + q);
  const own = s[i] - lineAt(line, x[i]);
  if (i1 - i0 < 2) return own;
  const f = quadFit(x, s, line, i0, i1, x[c]);
  if (!f) return own;
  const t = (at - x[c]) / f.span;
  return f.c0 + f.c1 * t + f.c2 * t * t;
}

/**
 * Half-height crossings of s − line at `half` (above the line), walking out
 * from i and not past lo / hi; linear interpolation between the samples
 * either side of the crossing (SciPy's peak_widths rule on the detrended
 * trace). A side that never falls to `half` crosses at its bound.
 */
export function halfCrossings(x: Float64Array, s: Float64Array, line: Line, i: number, half: number, lo: number, hi: number): [number, number] {
  crossings(x, s, line, i, half, lo, hi);
  return [outs[0], outs[1]];
}

/*
 * The hot helpers below hand back two numbers through this array instead of a new array each call:
 * detection measures every candidate, some 10⁵ at 10⁶ points, and the garbage dominated the time. A typed
 * array, not two module variables: a fractional number written to a module variable is a new heap object
 * each time in Node 20's engine, written to a Float64Array it is not.
 */
const outs = new Float64Array(3);
let outKind: BoundKind = 'valley';

/** {@link halfCrossings} into outs[0] (left) and outs[1] (right). */
function crossings(x: Float64Array, s: Float64Array, line: Line, i: number, half: number, lo: number, hi: number): void {
  const y0 = line.y0, sl = line.slope, x0 = line.x0;
  let j = i;
  let dj = s[j] - (y0 + sl * (x[j] - x0));
  while (lo < j && half < dj) { j--; dj = s[j] - (y0 + sl * (x[j] - x0)); }
  let lip = j;
  if (dj < half && j < i) { const dn = s[j + 1] - (y0 + sl * (x[j + 1] - x0)); lip += (half - dj) / (dn - dj); }
  j = i;
  dj = s[j] - (y0 + sl * (x[j] - x0));
  while (j < hi && half < dj) { j++; dj = s[j] - (y0 + sl * (x[j] - x0)); }
  let rip = j;
  if (dj < half && j > i) { const dp = s[j - 1] - (y0 + sl * (x[j - 1] - x0)); rip -= (half - dj) / (dp - dj); }
  outs[0] = lip; outs[1] = rip;
}

/**
 * Rule 1 on one side at one scale: walking out from the apex on the box
 * average of half-width r, the lowest average passed before one rises more
 * than `rise` above it, within `cap` samples. Its index and level into
 * outs[0] and outs[1], the box average at i into outs[2].
 */
function footAtScale(s: Float64Array, i: number, dir: -1 | 1, r: number, rise: number, cap: number): void {
  const n = s.length, last = n - 1;
  const B = 2 * r + 1;
  let sum = 0;
  for (let k = i - r; k <= i + r; k++) sum += s[k < 0 ? 0 : k > last ? last : k];
  let min = sum / B, a = i;
  // The box average at the start: boxMean(s, i, r), the same sum in the same order.
  outs[2] = min;
  if (i - r - cap >= 0 && i + r + cap <= last) {
    // Every sample the walk can reach lies inside the trace: the same sums without the clamps and end tests.
    for (let j = i + dir, add = i + dir * (r + 1), drop = i - dir * r, k = 1; k <= cap; k++, j += dir, add += dir, drop += dir) {
      sum += s[add] - s[drop];
      const v = sum / B;
      if (v < min) { min = v; a = j; } else if (v > min + rise) break;
    }
    outs[0] = a; outs[1] = min;
    return;
  }
  for (let j = i, k = 1; k <= cap; k++) {
    const next = j + dir;
    if (next < 0 || next > last) break;
    const add = next + dir * r, drop = j - dir * r;
    sum += s[add < 0 ? 0 : add > last ? last : add] - s[drop < 0 ? 0 : drop > last ? last : drop];
    j = next;
    const v = sum / B;
    if (v < min) { min = v; a = j; } else if (v > min + rise) break;
  }
  outs[0] = a; outs[1] = min;
}

/** The sample within ±h of i where the box average (half-width r) is highest (the first of equals). */
function boxTop(s: Float64Array, i: number, r: number, h: number): number {
  const last = s.length - 1;
  const lo = Math.max(0, i - h), hi = Math.min(last, i + h);
  let sum = 0;
  for (let k = lo - r; k <= lo + r; k++) sum += s[k < 0 ? 0 : k > last ? last : k];
  let best = lo, v = sum;
  for (let j = lo + 1; j <= hi; j++) {
    const add = j + r, drop = j - r - 1;
    sum += s[add > last ? last : add] - s[drop < 0 ? 0 : drop];
    if (sum > v) { v = sum; best = j; }
  }
  return best;
}

/**
 * Rule 1: the first feet and their levels. A noisy top dips by 3σ often
 * enough that a walk on single samples stops on the peak's own top, so the
 * walk runs on box averages of B = 2r + 1 samples, r = 0, 1, 2, 4, 8, …
 * (B at most 3/4 of the half-prominence width: a box as wide as the peak
 * smooths away the valleys beside it), each with rise 3σ_B (where a walk
 * ends where it starts, both walk again from the highest box average
 * within half the half-prominence width of the apex: on a broad noisy top
 * the highest sample lies off the average's top, whose own slope ends the
 * walk at once); the scale kept is the one at which the
 * height above the feet's line, in units of σ_B, is largest (a
 * matched-filter choice: it grows with √B until the box starts to flatten
 * the peak). Every B is tried: on a broad noisy top z is high at B = 1 (a
 * noise spike), low at B = 5–9 (the walks stop at noise dips on the top)
 * and largest only near the peak's own width, so a scan that stopped once z
 * fell below its best missed broad peaks.
 */
export function firstFeet(c: MeasureContext, i: number, widthLimit: number, cap: number): { r: number; f0: number; l0: number; f1: number; l1: number } {
  feet(c, i, widthLimit, cap, c.noise.ruleSigmaAt(i));
  return { r: feetOut[0] | 0, f0: feetOut[1] | 0, l0: feetOut[2], f1: feetOut[3] | 0, l1: feetOut[4] };
}

/** {@link firstFeet}'s result (r, f0, l0, f1, l1), handed back through this array (no object per candidate). */
const feetOut = new Float64Array(5);

/** {@link firstFeet} into feetOut; sigma is noise.ruleSigmaAt(i). */
function feet(c: MeasureContext, i: number, widthLimit: number, cap: number, sigma: number): void {
  const { x, s, noise } = c;
  let bR = 0, bF0 = i, bL0 = s[i], bF1 = i, bL1 = s[i];
  let bestZ = -Infinity;
  for (let r = 0; ; r = r === 0 ? 1 : 2 * r) {
    const B = 2 * r + 1;
    if (r > 0 && B > Math.max(3, 0.75 * widthLimit)) break;
    const sb = sigma * noise.boxFactor(B);
    let top = i;
    footAtScale(s, top, -1, r, VALLEY_RISE * sb, cap);
    let f0 = outs[0] | 0, l0 = outs[1];
    footAtScale(s, top, 1, r, VALLEY_RISE * sb, cap);
    let f1 = outs[0] | 0, l1 = outs[1];
    if (r > 0 && (f0 === i || f1 === i)) {
      // A walk that ends where it starts: on a broad noisy top the highest sample lies off the top of the box
      // average, whose own slope there ends the walk at once. Walk again from the highest box average within
      // half the half-prominence width of the apex.
      top = boxTop(s, i, r, Math.ceil(widthLimit / 2));
      footAtScale(s, top, -1, r, VALLEY_RISE * sb, cap);
      f0 = outs[0] | 0; l0 = outs[1];
      footAtScale(s, top, 1, r, VALLEY_RISE * sb, cap);
      f1 = outs[0] | 0; l1 = outs[1];
    }
    // The walks just made started at top: the box average there is theirs (boxMean(s, top, r)).
    const atTop = outs[2];
    const base = x[f1] === x[f0] ? (l0 + l1) / 2 : l0 + ((l1 - l0) * (x[top] - x[f0])) / (x[f1] - x[f0]);
    const z = (atTop - base) / sb;
    if (z > bestZ) { bR = r; bF0 = f0; bL0 = l0; bF1 = f1; bL1 = l1; bestZ = z; }
  }
  feetOut[0] = bR; feetOut[1] = bF0; feetOut[2] = bL0; feetOut[3] = bF1; feetOut[4] = bL1;
}

/** Reused buffers and result of {@link hullUnder} (measuring is synchronous, so one set serves every call). */
let hullX = new Float64Array(256);
let hullY = new Float64Array(256);
const hullLine: { x0: number; y0: number; slope: number } = { x0: 0, y0: 0, slope: 0 };

/**
 * The lower convex hull of the box averages (half-width r) of samples
 * lo..hi, and its edge that spans x[i]: a straight line that nowhere lies
 * above the averaged trace between its two ends. Noise puts it 2–3 σ_B
 * below the baseline; on a noiseless straight baseline it is the baseline.
 * The line returned is reused by the next call (copy what you keep).
 */
export function hullUnder(c: MeasureContext, i: number, lo: number, hi: number, r: number): Line {
  const out = hullLine;
  const { x, s } = c;
  const n = s.length;
  const len = hi - lo + 1;
  if (hullX.length < len) { hullX = new Float64Array(len * 2); hullY = new Float64Array(len * 2); }
  const hx = hullX, hy = hullY;
  const B = 2 * r + 1, last = n - 1;
  let sum = 0;
  for (let k = lo - r; k <= lo + r; k++) sum += s[k < 0 ? 0 : k > last ? last : k];
  // One pass: each box average is made (running sum, the same additions in the same order as a separate pass)
  // and pushed on the monotone chain at once. 0 ≤ lo ≤ j ≤ hi ≤ last, so the sum's entering index is ≥ 1 and
  // its leaving index ≤ last. The chain keeps each vertex's x and average (no index to look them up by), and
  // its last vertex in (bx, by); the cross product is the same expression on the same numbers.
  let top = 0, bx = 0, by = 0;
  // Where every sample the sums reach lies inside the trace, the clamps are left out (the same sums).
  const inside = lo - r >= 0 && hi + 1 + r <= last;
  for (let j = lo; j <= hi; j++) {
    const gj = sum / B;
    const add = j + 1 + r, drop = j - r;
    sum += inside ? s[add] - s[drop] : s[add > last ? last : add] - s[drop < 0 ? 0 : drop];
    const xj = x[j];
    while (top >= 2) {
      const xa = hx[top - 2], ga = hy[top - 2];
      const cross = (bx - xa) * (gj - ga) - (by - ga) * (xj - xa);
      if (cross > 0) break;
      top--;
      bx = xa; by = ga;
    }
    hx[top] = xj; hy[top] = gj; top++;
    bx = xj; by = gj;
  }
  if (top === 1) { out.x0 = hx[0]; out.y0 = hy[0]; out.slope = 0; return out; }
  let k = 0;
  const xi = x[i];
  while (k < top - 2 && hx[k + 1] < xi) k++;
  setLine(out, hx[k], hy[k], hx[k + 1], hy[k + 1]);
  return out;
}

/**
 * Rule 3 on one side: the bound and why it lies there. Valleys are looked
 * for in the box average above `ref` (the current baseline); the return to
 * the baseline is measured against the lower of `ref` and `hull` (the hull
 * line under the peak, never above the averaged trace): a reference above
 * the trace would end a walk on the peak's own flank, and the hull alone,
 * anchored on a neighbour's flank, touches the tail of this peak on the
 * other side.
 */
function walkBound(c: MeasureContext, i: number, dir: -1 | 1, ref: Line, hull: Line, r: number, sigmaBox: number, cap: number, from: number, beyond: number): number {
  const { x, s } = c;
  const last = s.length - 1;
  const B = 2 * r + 1;
  const ry0 = ref.y0, rsl = ref.slope, rx0 = ref.x0, hy0 = hull.y0, hsl = hull.slope, hx0 = hull.x0;
  const rise = VALLEY_RISE * sigmaBox, riseAfter = VALLEY_RISE_AFTER_RETURN * sigmaBox, back = RETURN_ABOVE_HULL * sigmaBox;
  let j = i + dir;
  if (j < 0 || j > last) { outKind = 'trace-end'; return i; }
  let sum = 0;
  for (let k = j - r; k <= j + r; k++) sum += s[k < 0 ? 0 : k > last ? last : k];
  let min = Infinity, arg = j;
  let returned = -1;
  // Where every sample the sums can reach lies inside the trace, the clamps are left out (the same sums).
  const inside = i - cap - r >= 0 && i + cap + r <= last;
  for (;;) {
    const g = sum / B;
    const lr = ry0 + rsl * (x[j] - rx0);
    const v = g - lr;
    const dist = j > i ? j - i : i - j;
    // Inside the half-height width there is no valley to find (and on a slope the sample apex is not the top above the line).
    // Once back at the baseline only a rise far beyond noise (a neighbour's flank) ends the walk early: stopping at
    // a noise dip would put the level's stretch at a dip and lower the baseline. (The hull touches a valley, so a
    // valley between two peaks can count as back at the baseline.)
    if (dist < from) { /* keep walking */ } else if (v < min) { min = v; arg = j; } else if (v > min + (returned >= 0 ? riseAfter : rise)) { outKind = 'valley'; return arg; }
    if (returned < 0 && dist >= from) {
      const lh = hy0 + hsl * (x[j] - hx0);
      if (g - (lr < lh ? lr : lh) <= back) returned = j;
    }
    // Once back at the baseline the bound lies `beyond` further out.
    if (returned >= 0 && (j > returned ? j - returned : returned - j) >= beyond) { outKind = 'returned'; return j; }
    if (dist >= cap) { outKind = returned >= 0 ? 'returned' : 'width-limit'; return j; }
    const next = j + dir;
    if (next < 0 || next > last) { outKind = 'trace-end'; return j; }
    const add = next + dir * r, drop = j - dir * r;
    sum += inside ? s[add] - s[drop] : s[add < 0 ? 0 : add > last ? last : add] - s[drop < 0 ? 0 : drop > last ? last : drop];
    j = next;
  }
}

/** Rule 4: the level (mean point) that fixes the baseline at bound b on side dir. */
export function boundLevel(c: MeasureContext, b: number, dir: -1 | 1, kind: BoundKind, r: number, sigma: number): [number, number] {
  level(c, b, dir, kind, r, sigma);
  return [outs[0], outs[1]];
}

/** {@link boundLevel} into outs[0] (x) and outs[1] (level). */
function level(c: MeasureContext, b: number, dir: -1 | 1, kind: BoundKind, r: number, sigma: number): void {
  const { x, s } = c;
  const n = s.length;
  if (kind === 'valley' || kind === 'shared-valley') { outs[0] = x[b]; outs[1] = boxMean(s, b, r); return; }
  const want = Math.max(2 * r + 1, LEVEL_POINTS_MIN);
  let cnt = 0, sx = 0, sy = 0;
  const half = want >> 1;
  let near = 0, far = 0, nNear = 0, nFar = 0;
  for (let k = 0; k < want; k++) {
    const j = b + dir * k;
    if (j < 0 || j >= n) break;
    sx += x[j]; sy += s[j]; cnt++;
    if (k < half) { near += s[j]; nNear++; } else { far += s[j]; nFar++; }
  }
  if (cnt < 3 || far / nFar - near / nNear > 2 * sigma * Math.sqrt(1 / nNear + 1 / nFar)) { outs[0] = x[b]; outs[1] = boxMean(s, b, r); return; }
  outs[0] = sx / cnt; outs[1] = sy / cnt;
}

/**
 * Rule 2b: where the bounds walk starts and how far it looks (the half-widths of rule 3 and of the width
 * limit) come from the half-height crossings of a 3-point average of the trace ({@link locatingCopy}), a copy
 * used for nothing else: heights, reported widths and areas stay on the trace itself. On a top only a few σ
 * high (half height 2σ at S/N 4) one noisy sample below half height ends a crossing early, the half-width
 * and from it the box, the return test and the bounds close in on the top (the demo's S/N 4.4 shoulder read
 * −17.8 % area on the raw trace, −52 % in the quarter of its finds that measured 2.5–4 samples wide); the
 * average's noise is σ/√3 and one sample no longer ends it. The copy's crossings lie at half its own top
 * above the line (its highest sample within the raw crossings, one sample either side), walking out from
 * there, and never inside the raw ones. Kept raw: a side where the copy rises above its top before it falls
 * to half (a higher neighbour's flank), and a feature under {@link LOC_MIN_WIDTH} samples wide on the trace
 * (a one- or two-sample spike, which the average would give its own width of about 2 samples). A noiseless
 * Gaussian of σ samples reads σ² + 2/3 on the copy: each crossing 0.19 sample further out at σ = 2, 0.08 at
 * σ = 5, so the bounds move out by a little more than that and no more.
 */
function locCrossings(c: MeasureContext, m: LocalMeasure): void {
  const { x } = c;
  const { loc } = c;
  const l = m.line;
  if (m.rightIp - m.leftIp < LOC_MIN_WIDTH) { m.locL = m.leftIp; m.locR = m.rightIp; return; }
  const a = Math.max(m.start, Math.floor(m.leftIp) - 1), b = Math.min(m.end, Math.ceil(m.rightIp) + 1);
  let top = m.index, v = loc[top] - lineAt(l, x[top]);
  for (let j = a; j <= b; j++) { const w = loc[j] - lineAt(l, x[j]); if (w > v) { v = w; top = j; } }
  if (!(v > 0)) { m.locL = m.leftIp; m.locR = m.rightIp; return; }
  crossings(x, loc, l, top, v / 2, m.start, m.end);
  let cl = outs[0], cr = outs[1];
  // A side where the copy rises above its top before it falls to half lies on a higher neighbour's flank: raw there.
  for (let j = top - 1; j > cl; j--) if (loc[j] - lineAt(l, x[j]) > v) { cl = m.leftIp; break; }
  for (let j = top + 1; j < cr; j++) if (loc[j] - lineAt(l, x[j]) > v) { cr = m.rightIp; break; }
  m.locL = Math.min(cl, m.leftIp); m.locR = Math.max(cr, m.rightIp);
}

/** Width, apex and height of a peak against a given line and bounds (rule 2). */
function shape(c: MeasureContext, m: LocalMeasure, fwhmGuess: number): number {
  return shapeUnlessNarrow(c, m, fwhmGuess, 0);
}

/**
 * {@link shape}, except that where `minWidth` (x-units) is positive and the half-height width just measured is
 * under it (the expression detection's own-width test uses), it stops there and returns -1: the apex, the
 * height and the bounds walk's half-widths are left unmeasured (the crossings, the width itself, are set).
 */
function shapeUnlessNarrow(c: MeasureContext, m: LocalMeasure, fwhmGuess: number, minWidth: number): number {
  const { x, s } = c;
  const h0 = apexLevel(x, s, m.line, m.index, fwhmGuess, m.xApex);
  if (h0 > 0) {
    crossings(x, s, m.line, m.index, h0 / 2, m.start, m.end); m.leftIp = outs[0]; m.rightIp = outs[1];
    if (minWidth > 0 && xAt(x, m.rightIp) - xAt(x, m.leftIp) < minWidth) return -1;
    locCrossings(c, m);
  } else {
    m.leftIp = m.index; m.rightIp = m.index; m.locL = m.index; m.locR = m.index;
    if (minWidth > 0 && xAt(x, m.rightIp) - xAt(x, m.leftIp) < minWidth) return -1;
  }
  const fw = m.rightIp - m.leftIp;
  m.xApex = apexPosition(x, s, m.line, m.index, fw);
  m.height = apexLevel(x, s, m.line, m.index, fw, m.xApex);
  return fw;
}

/**
 * Measure one peak alone (rules 1–5).
 * @param i apex sample (any sample for a peak placed by hand).
 * @param firstWidth the half-prominence width in samples: the largest box of
 *   rule 1, and {@link WIDTH_LIMIT} times it bounds how far the first feet lie.
 */
export function measureLocal(c: MeasureContext, i: number, firstWidth: number): LocalMeasure {
  const m = blankMeasure();
  measureLocalInto(c, i, firstWidth, m);
  return m;
}

/** A measure to be filled by {@link measureLocalInto}; every field of the same kind as a finished one's. */
export function blankMeasure(): LocalMeasure {
  return {
    index: 0, xApex: 0, height: 0, leftIp: 0, rightIp: 0, locL: 0, locR: 0, start: 0, end: 0, startKind: 'valley', endKind: 'valley',
    line: { x0: 0, y0: 0, slope: 0 }, box: 0, split: 'none',
  };
}

/** A measure of one's own with the values of m (its line copied too); m may then be filled again. */
export function copyMeasure(m: LocalMeasure): LocalMeasure {
  const k: LocalMeasure = {
    index: m.index, xApex: m.xApex, height: m.height, leftIp: m.leftIp, rightIp: m.rightIp, locL: m.locL, locR: m.locR,
    start: m.start, end: m.end, startKind: m.startKind, endKind: m.endKind,
    line: { x0: m.line.x0, y0: m.line.y0, slope: m.line.slope }, box: m.box, split: m.split,
  };
  if (m.note !== undefined) k.note = m.note;
  return k;
}

/**
 * {@link measureLocal} into a measure the caller owns (from {@link blankMeasure}; its line object is set in
 * place, so a caller that keeps the result while measuring the next peak into the same object copies it
 * first, {@link copyMeasure}). Detection measures some 10⁵ candidates at 10⁶ points and keeps under a tenth:
 * one object filled again and again instead of one made per candidate.
 *
 * With `minWidth` > 0 (x-units) a peak whose final half-height width is under it (detection's own-width test,
 * the same expression: `xAt(x, rightIp) − xAt(x, leftIp) < minWidth`) is left half measured, and false is
 * returned: such a candidate is dropped whatever its apex and height, so they are not measured (93 % of the
 * candidates on 10⁶ points of noise). True: m is measured in full, as by {@link measureLocal}.
 */
export function measureLocalInto(c: MeasureContext, i: number, firstWidth: number, m: LocalMeasure, minWidth = 0): boolean {
  const { x, noise } = c;
  const sigma = noise.ruleSigmaAt(i);
  feet(c, i, Math.max(1, firstWidth), Math.max(2, Math.ceil(WIDTH_LIMIT * Math.max(1, firstWidth))), sigma);
  const fr = feetOut[0] | 0, f0 = feetOut[1] | 0, f1 = feetOut[3] | 0;
  m.index = i; m.xApex = x[i]; m.height = 0; m.leftIp = i; m.rightIp = i; m.locL = i; m.locR = i;
  m.start = f0; m.end = f1; m.startKind = 'valley'; m.endKind = 'valley'; m.box = fr; m.split = 'none';
  // The measure owns its line, so it is set in place.
  const line = m.line as { x0: number; y0: number; slope: number };
  setLine(line, x[f0], feetOut[2], x[f1], feetOut[4]);
  let fw = shape(c, m, 2 * fr + 1);
  for (let pass = 0; pass < MAX_PASSES; pass++) {
    if (!(m.height > 0)) return true;
    const moved = rewalk(c, m, true, true);
    level(c, m.start, -1, m.startKind, m.box, sigma);
    const xa = outs[0], ya = outs[1];
    level(c, m.end, 1, m.endKind, m.box, sigma);
    setLine(line, xa, ya, outs[0], outs[1]);
    // The last shape (no bound moved, or the last pass) gives the final width: under minWidth, the rest is not measured.
    fw = shapeUnlessNarrow(c, m, fw, !moved || pass === MAX_PASSES - 1 ? minWidth : 0);
    if (fw < 0) return false;
    if (!moved) break;
  }
  return true;
}

/**
 * Rule 3 for the chosen sides of a measured peak, against its current line
 * and own width; sets the bounds, their kinds and the box. True when a
 * bound moved.
 */
function rewalk(c: MeasureContext, m: LocalMeasure, left: boolean, right: boolean): boolean {
  const { s, noise } = c;
  const i = m.index;
  const sigma = noise.ruleSigmaAt(i);
  // Rule 2b: the half-widths of the walk (box, start, distance beyond the return, cap) from the smoothed copy.
  const hwL = Math.max(i - m.locL, 0.5), hwR = Math.max(m.locR - i, 0.5);
  const r = Math.floor((hwL + hwR) / 4);
  const sigmaBox = sigma * noise.boxFactor(2 * r + 1);
  const capL = Math.max(2, Math.ceil(WIDTH_LIMIT * hwL)), capR = Math.max(2, Math.ceil(WIDTH_LIMIT * hwR));
  const hull = hullUnder(c, i, Math.max(0, i - capL), Math.min(s.length - 1, i + capR), r);
  let moved = false;
  if (left) {
    const b = walkBound(c, i, -1, m.line, hull, r, sigmaBox, capL, Math.min(capL, Math.ceil(hwL)), Math.max(2 * r + 1, Math.ceil(RETURN_BEYOND * hwL)));
    const k = outKind;
    moved ||= b !== m.start || k !== m.startKind;
    m.start = b; m.startKind = k;
  }
  if (right) {
    const b = walkBound(c, i, 1, m.line, hull, r, sigmaBox, capR, Math.min(capR, Math.ceil(hwR)), Math.max(2 * r + 1, Math.ceil(RETURN_BEYOND * hwR)));
    const k = outKind;
    moved ||= b !== m.end || k !== m.endKind;
    m.end = b; m.endKind = k;
  }
  m.box = r;
  return moved;
}

/** The farthest a bound of m may lie from its apex on side dir, in samples: {@link WIDTH_LIMIT} own half-widths of that side (as in rule 3). */
function sideCap(m: LocalMeasure, dir: -1 | 1): number {
  const hw = dir < 0 ? m.index - m.leftIp : m.rightIp - m.index;
  return Math.max(2, Math.ceil(WIDTH_LIMIT * Math.max(hw, 0.5)));
}

/** Area of s − line between samples i0 and i1 (trapezoid rule). */
export function areaAbove(x: Float64Array, s: Float64Array, line: Line, i0: number, i1: number): number {
  let a = 0;
  let prev = s[i0] - lineAt(line, x[i0]);
  for (let i = i0; i < i1; i++) {
    const next = s[i + 1] - lineAt(line, x[i + 1]);
    a += 0.5 * (prev + next) * (x[i + 1] - x[i]);
    prev = next;
  }
  return a;
}

/**
 * The lowest point, above the line `under`, between two apexes (exclusive):
 * of the box average with half-width r (half the smaller box of the two
 * peaks: enough against noise, and a box average of an asymmetric valley
 * sits a little toward its shallow side); where that has no interior
 * minimum (one peak is a shoulder on the other), the lowest sample.
 */
function valleyBetween(c: MeasureContext, a: number, b: number, r: number, under: Line): number {
  const { x, s } = c;
  if (b - a < 2) return a + 1 <= b ? a + 1 : a;
  let best = a + 1, v = Infinity;
  for (let j = a + 1; j < b; j++) { const g = boxMean(s, j, r) - lineAt(under, x[j]); if (g < v) { v = g; best = j; } }
  if ((best === a + 1 || best === b - 1) && r > 0) {
    // No interior minimum of the average (a shoulder): the lowest sample.
    let w = Infinity;
    for (let j = a + 1; j < b; j++) { const g = s[j] - lineAt(under, x[j]); if (g < w) { w = g; best = j; } }
  }
  return best;
}

/** True when two neighbouring peaks (sorted by apex) overlap or end at nearby valleys: they share a valley. */
function touching(A: LocalMeasure, B: LocalMeasure): boolean {
  const near = A.endKind === 'valley' && B.startKind === 'valley' && B.start - A.end <= 2 * Math.max(A.box, B.box) + 1;
  return A.end >= B.start || near;
}

/** The valley between two touching peaks: its sample, and the box average there. */
function sharedValley(c: MeasureContext, A: LocalMeasure, B: LocalMeasure): [number, number] {
  const { x } = c;
  // Half the smaller box: enough against noise, and a box average shifts an asymmetric valley toward its shallow side.
  const r = Math.min(A.box, B.box) >> 1;
  // The valley is the lowest point above the pair's baseline (on a slope the lowest sample is not).
  const under = lineThrough(x[A.start], lineAt(A.line, x[A.start]), x[B.end], lineAt(B.line, x[B.end]));
  const v = valleyBetween(c, A.index, B.index, r, under);
  return [v, boxMean(c.s, v, r)];
}

/**
 * Rule 6a: peak k rides on a neighbour when its own half-height width is
 * under half the neighbour's, it is lower, and its apex lies either between
 * that neighbour's half-height crossings (a narrow bump on a broad peak's
 * top), or within the neighbour's bounds (a bump on its flank) when it is
 * also under 1/{@link FLANK_RIDER_NARROWER} of the neighbour's width and
 * sharing a valley would cut off more of the neighbour than it holds itself
 * (its own area, above its own line between its own bounds, is less than
 * the neighbour's area above the neighbour's line from its near bound out
 * to the neighbour's bound on that side, less its own). So a noise bump (a
 * few samples wide) on a broad peak's flank does not split it, while a
 * neighbour of comparable width, or a peak in the far tail where little of
 * the neighbour is left, still does. Of several such neighbours the highest
 * is the host. Returns, per peak, the index of the peak it rides on, or -1.
 */
export function ridersOf(c: MeasureContext, ms: readonly LocalMeasure[]): Int32Array {
  const { x, s } = c;
  const out = new Int32Array(ms.length).fill(-1);
  const fw = (m: LocalMeasure) => m.rightIp - m.leftIp;
  // Furthest right end of the peaks up to k, and furthest left start of those from k on: a scan outward from a
  // peak stops where no peak further out reaches its apex.
  const reachR = new Float64Array(ms.length), reachL = new Float64Array(ms.length);
  for (let k = 0, v = -Infinity; k < ms.length; k++) { v = Math.max(v, ms[k].end); reachR[k] = v; }
  for (let k = ms.length - 1, v = Infinity; k >= 0; k--) { v = Math.min(v, ms[k].start); reachL[k] = v; }
  for (let k = 0; k < ms.length; k++) {
    const B = ms[k];
    let host = -1;
    let ownB = NaN;
    for (const dir of [-1, 1]) {
      for (let j = k + dir; j >= 0 && j < ms.length; j += dir) {
        if (dir < 0 ? reachR[j] < B.index : reachL[j] > B.index) break;
        const A = ms[j];
        if (dir < 0 ? A.end < B.index : A.start > B.index) continue;
        if (!(fw(B) < fw(A) / 2 && B.height < A.height && (host < 0 || ms[host].height < A.height))) continue;
        if (A.leftIp <= B.index && B.index <= A.rightIp) { host = j; continue; }
        if (!(A.start <= B.index && B.index <= A.end)) continue;
        // On a flank only a bump far narrower than the neighbour (noise is a few samples wide) rides.
        if (!(fw(B) < fw(A) / FLANK_RIDER_NARROWER)) continue;
        // A split at this bump would give it the neighbour's area from its near bound out to the neighbour's bound
        // on that side: it rides where that is more than it holds itself.
        if (Number.isNaN(ownB)) ownB = Math.max(0, areaAbove(x, s, B.line, B.start, B.end));
        const cut = B.index > A.index ? areaAbove(x, s, A.line, Math.max(A.index, B.start), A.end) : areaAbove(x, s, A.line, A.start, Math.min(A.index, B.end));
        if (ownB < cut - ownB) host = j;
      }
    }
    out[k] = host;
  }
  return out;
}

/**
 * Rule 6b: of two touching neighbours (neither riding on the other), the
 * lower is not a peak of its own (a broad noisy top split in two) when its
 * box average at its apex rises less than `minRise` × σ_B (its own box)
 * above the valley between them, or when the two apexes lie within
 * {@link SAME_TOP_SHARE} of the narrower one's half-height width of each
 * other (both measured the same top; then the one of smaller prominence
 * goes): it is dropped, unless `keep` says otherwise
 * (peaks placed by hand). Repeats until no pair changes. Returns the peaks
 * kept, in order.
 */
export function mergeShallow(c: MeasureContext, ms: LocalMeasure[], minRise: number, keep: (m: LocalMeasure) => boolean, prominenceOf: (m: LocalMeasure) => number = () => 0): LocalMeasure[] {
  const { s, noise } = c;
  const out = ms.slice();
  let k = 0;
  while (k + 1 < out.length) {
    const A = out[k], B = out[k + 1];
    if (!touching(A, B)) { k++; continue; }
    const [v] = sharedValley(c, A, B);
    const rise = (m: LocalMeasure) => (boxMean(s, m.index, m.box) - boxMean(s, v, m.box)) / (noise.ruleSigmaAt(m.index) * noise.boxFactor(2 * m.box + 1));
    // Two maxima of one broad noisy top both measure that whole peak: their apexes (fitted over the top) fall
    // together, while the box average at the lower one, a few samples from the valley on the top's curve, can
    // still rise well above the valley's (the top's own curvature over the box). Of those the one with the
    // smaller prominence goes (the other carries the peak's own prominence).
    const fwx = (q: LocalMeasure) => xAt(c.x, q.rightIp) - xAt(c.x, q.leftIp);
    const sameTop = Math.abs(A.xApex - B.xApex) <= SAME_TOP_SHARE * Math.min(fwx(A), fwx(B));
    const pa = prominenceOf(A), pb = prominenceOf(B);
    const lower = sameTop && pa !== pb ? (pa < pb ? k : k + 1) : A.height <= B.height ? k : k + 1;
    const m = out[lower];
    if ((sameTop || rise(m) < minRise) && !keep(m)) {
      out.splice(lower, 1);
      k = Math.max(0, k - 1);
    } else {
      k++;
    }
  }
  return out;
}

/**
 * Rule 6 for a list of peaks sorted by apex: neighbours whose bounds
 * overlap, or whose valley bounds lie within a box length of each other,
 * share the lowest point between their apexes. `grouped[k]` says whether
 * peak k stands at or above the detection limit (or was placed by hand); a
 * valley with at least one such peak on either side is split by `rule`, so
 * a small neighbour below the limit does not raise a real peak's baseline
 * to the valley; a valley between two peaks below the limit just stops both
 * bounds there (chains of noise bumps never form one long baseline). Lines, widths, apexes
 * and heights of the peaks whose bounds or baseline changed are measured
 * again. Changes the measures in place.
 */
export function shareValleys(c: MeasureContext, ms: LocalMeasure[], grouped: readonly boolean[], rule: SplitRule): void {
  const { s, noise } = c;
  const changed = new Uint8Array(ms.length);
  for (let k = 0; k + 1 < ms.length; k++) {
    const A = ms[k], B = ms[k + 1];
    if (!touching(A, B)) continue;
    const [v] = sharedValley(c, A, B);
    const kind: BoundKind = grouped[k] || grouped[k + 1] ? 'shared-valley' : 'valley';
    A.end = v; A.endKind = kind; B.start = v; B.startKind = kind;
    if (v === A.index + 1 || v === B.index - 1) {
      const lower = s[A.index] < s[B.index] ? A : B;
      lower.note = 'No valley between this peak and its neighbour (one is a shoulder on the other): the split lies next to its apex, so the area is biased; fitting the overlap measures it better.';
    }
    changed[k] = 1; changed[k + 1] = 1;
  }
  const levelOf = (m: LocalMeasure, side: -1 | 1): [number, number] => side < 0
    ? boundLevel(c, m.start, -1, m.startKind, m.box, noise.ruleSigmaAt(m.index))
    : boundLevel(c, m.end, 1, m.endKind, m.box, noise.ruleSigmaAt(m.index));
  let k = 0;
  while (k < ms.length) {
    let e = k;
    while (e + 1 < ms.length && ms[e].endKind === 'shared-valley') e++;
    if (e > k) {
      // The outer bounds of a group were found against lines anchored at the valleys (high), so from widths
      // too narrow: walk them again against the group's own baseline until they settle.
      const first = ms[k], last = ms[e];
      for (let pass = 0; pass < MAX_PASSES; pass++) {
        const [xa, ya] = levelOf(first, -1), [xb, yb] = levelOf(last, 1);
        const line = lineThrough(xa, ya, xb, yb);
        for (let j = k; j <= e; j++) {
          const m = ms[j];
          m.split = rule;
          m.line = rule === 'perpendicular-drop' ? line : lineThrough(...levelOf(m, -1), ...levelOf(m, 1));
          shape(c, m, m.rightIp - m.leftIp);
          changed[j] = 0;
        }
        const movedL = first.height > 0 && rewalk(c, first, true, false);
        const movedR = last.height > 0 && rewalk(c, last, false, true);
        if (!movedL && !movedR) break;
        if (rule === 'valley-to-valley') { changed[k] = 1; changed[e] = 1; }
      }
    }
    for (let j = k; j <= e; j++) {
      const m = ms[j];
      if (changed[j]) {
        const [xa, ya] = levelOf(m, -1), [xb, yb] = levelOf(m, 1);
        m.line = lineThrough(xa, ya, xb, yb);
        shape(c, m, m.rightIp - m.leftIp);
      }
      if (!(m.height > 0) && m.split === 'perpendicular-drop') {
        // Below the group's line (a small peak in a deep stretch): its own valley-to-valley line instead.
        const [xa, ya] = levelOf(m, -1), [xb, yb] = levelOf(m, 1);
        m.line = lineThrough(xa, ya, xb, yb);
        m.split = 'valley-to-valley';
        shape(c, m, m.rightIp - m.leftIp);
      }
    }
    k = e + 1;
  }
}

/**
 * The width limit, last: a bound further than {@link WIDTH_LIMIT} of the
 * peak's final half-widths (of that side) from its apex is pulled in to
 * that distance ('width-limit'). Shared valleys are found between apexes
 * whatever their distance, and a width can narrow after the bounds were
 * walked: a 6-sample-wide peak between two neighbours kept valleys 26 and
 * 49 samples out. A peak with its own line gets that line again from the
 * levels at its bounds; a member of a perpendicular-drop group keeps the
 * group's line unless its area above it is not positive (a small peak in a
 * sagging stretch, as for a height below the line in
 * {@link shareValleys}): then its own valley-to-valley line. Changes m in place.
 */
export function capBounds(c: MeasureContext, m: LocalMeasure): void {
  const sigma = c.noise.ruleSigmaAt(m.index);
  let moved = clampToCap(c, m, sigma);
  if (m.split === 'perpendicular-drop' && (moved || m.height > 0) && !(areaAbove(c.x, c.s, m.line, m.start, m.end) > 0)) {
    m.split = 'valley-to-valley';
    ownLine(c, m, sigma);
    moved = clampToCap(c, m, sigma);
  }
  // A width that kept moving with its line: the bounds are pulled in once more, the line kept.
  if (moved) clampOnce(c, m);
}

/** Pull m's bounds in to its cap; where m has its own line, that line and the shape again, until they settle (at most 4 times). True when a bound moved. */
function clampToCap(c: MeasureContext, m: LocalMeasure, sigma: number): boolean {
  let moved = false;
  for (let pass = 0; pass < 4; pass++) {
    if (!clampOnce(c, m)) break;
    moved = true;
    if (m.split === 'perpendicular-drop') break;
    ownLine(c, m, sigma);
  }
  return moved;
}

/** One clamp of m's bounds to {@link WIDTH_LIMIT} own half-widths; true when one moved. */
function clampOnce(c: MeasureContext, m: LocalMeasure): boolean {
  const last = c.s.length - 1;
  const capL = sideCap(m, -1), capR = sideCap(m, 1);
  let now = false;
  if (m.index - m.start > capL) { m.start = Math.max(0, m.index - capL); m.startKind = 'width-limit'; now = true; }
  if (m.end - m.index > capR) { m.end = Math.min(last, m.index + capR); m.endKind = 'width-limit'; now = true; }
  return now;
}

/** m's own line through the levels at its bounds (rule 4), and its shape against it. */
function ownLine(c: MeasureContext, m: LocalMeasure, sigma: number): void {
  level(c, m.start, -1, m.startKind, m.box, sigma);
  const xa = outs[0], ya = outs[1];
  level(c, m.end, 1, m.endKind, m.box, sigma);
  m.line = lineThrough(xa, ya, outs[0], outs[1]);
  shape(c, m, m.rightIp - m.leftIp);
}

/** The 3-point centred average of s (ends: the 2-point average), for locating the bounds walk's half-widths only (rule 2b). */
export function locatingCopy(s: Float64Array): Float64Array {
  const n = s.length;
  const out = new Float64Array(n);
  if (n < 3) { out.set(s); return out; }
  out[0] = (s[0] + s[1]) / 2;
  for (let i = 1; i < n - 1; i++) out[i] = (s[i - 1] + s[i] + s[i + 1]) / 3;
  out[n - 1] = (s[n - 2] + s[n - 1]) / 2;
  return out;
}
