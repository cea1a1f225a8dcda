/**
 * What the trace plot shows in y when the user zooms in x (issue 17): the
 * smallest and largest y of the drawn series inside the x-range, with a
 * margin, so a shoulder fills the plot instead of staying a bump.
 */
export interface DrawnSeries {
  x?: ArrayLike<number | null>;
  y?: ArrayLike<number | null>;
  yaxis?: string;
  visible?: boolean | 'legendonly';
}

/** y-range of the series on `axis` between from and to (x-units), padded by `pad` of the span; null when nothing is in view. */
export function visibleYRange(series: readonly DrawnSeries[], from: number, to: number, axis = 'y', pad = 0.06): [number, number] | null {
  let lo = Infinity, hi = -Infinity;
  for (const s of series) {
    if ((s.yaxis ?? 'y') !== axis || s.visible === false || s.visible === 'legendonly' || !s.x || !s.y) continue;
    const n = Math.min(s.x.length, s.y.length);
    for (let i = 0; i < n; i++) {
      const xv = s.x[i], yv = s.y[i];
      if (xv === null || yv === null || xv < from || xv > to || !Number.isFinite(yv)) continue;
      if (yv < lo) lo = yv;
      if (yv > hi) hi = yv;
    }
  }
  if (!(hi >= lo)) return null;
  const span = hi - lo || Math.abs(hi) * 0.1 || 1;
  return [lo - span * pad, hi + span * pad];
}

/** One series as the readout reads it: full-resolution x (ascending) and y. */
export interface ReadSeries {
  name: string;
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  /** The number of the series in the worker when it stayed there (worker/series.ts); x and y are then empty. */
  far?: number;
}

/** The sample of `s` nearest to x (in x); null for an empty series. */
export function nearestPoint(s: ReadSeries, x: number): { x: number; y: number; index: number } | null {
  const n = Math.min(s.x.length, s.y.length);
  if (n === 0 || !Number.isFinite(x)) return null;
  let lo = 0, hi = n;
  while (lo < hi) { const mid = (lo + hi) >>> 1; if (s.x[mid] < x) lo = mid + 1; else hi = mid; }
  let i = Math.min(lo, n - 1);
  if (i > 0 && Math.abs(s.x[i - 1] - x) <= Math.abs(s.x[i] - x)) i -= 1;
  return { x: s.x[i], y: s.y[i], index: i };
}

/** Δx, Δy and slope Δy/Δx from a to b (slope null when Δx is 0). */
export function twoPointMeasure(a: { x: number; y: number }, b: { x: number; y: number }): { dx: number; dy: number; slope: number | null } {
  const dx = b.x - a.x, dy = b.y - a.y;
  return { dx, dy, slope: dx === 0 ? null : dy / dx };
}

/** A unit for a ratio of units, e.g. "mAU/min"; empty parts stay visible as "1". */
export function slopeUnit(yUnit: string, xUnit: string): string {
  if (!yUnit && !xUnit) return '';
  return `${yUnit || '1'}/${xUnit ? (/[\s/·*]/.test(xUnit) ? `(${xUnit})` : xUnit) : '1'}`;
}

/** Rings the trace plot draws at most on features some choice loses (issue 16; the loss ledger lists every one). */
export const LOST_RINGS = 60;

/** A ledger row as {@link lostFeatures} reads it (core/measure/loss-matching.ts LedgerRow). */
export interface LostRowLike {
  readonly position: number;
  readonly firstFoundIn: number;
  readonly cells: readonly { readonly found: boolean; readonly snr: number | null; readonly standing: string }[];
}

/**
 * Features detectable where first found that some later column loses, and of them the ones the plot rings:
 * at most `cap`, quantifiable before detectable, then the highest S/N where first found (ties in ledger
 * order). On a long noisy trace hundreds of noise bumps just above S/N 3 are lost to smoothing; rings on
 * all of them hide the trace and cost each redraw more than its lines (397 rings at 10⁶ points).
 */
export function lostFeatures<R extends LostRowLike>(rows: readonly R[], cap: number = LOST_RINGS): { ringed: R[]; of: number } {
  const lost = rows.filter((r) => {
    const ref = r.cells[r.firstFoundIn];
    return (ref.standing === 'detectable' || ref.standing === 'quantifiable') && r.cells.some((c, k) => k > r.firstFoundIn && !c.found);
  });
  if (lost.length <= cap) return { ringed: lost, of: lost.length };
  const rank = (r: R) => { const ref = r.cells[r.firstFoundIn]; return (ref.standing === 'quantifiable' ? 1e12 : 0) + (ref.snr ?? 0); };
  const order = lost.map((_, i) => i).sort((a, b) => rank(lost[b]) - rank(lost[a]) || a - b);
  return { ringed: order.slice(0, cap).sort((a, b) => a - b).map((i) => lost[i]), of: lost.length };
}

/** Crosses the trace plot draws at most on replaced points in view (issue 16; the despiking step lists every one). */
export const REPLACED_CROSSES = 100;

/** A replaced point as {@link replacedCrosses} reads it (core/steps/types.ts SpikeEvent). */
export interface ReplacedLike {
  readonly x: number;
  readonly original: number;
  readonly replacement: number;
}

/**
 * Replaced points (despiking) with x in [from, to], and of them the ones the plot crosses: at most `cap`, the
 * largest changes |original − replacement| first (ties in the order given), returned in the order given. A
 * despiking step on a long noisy trace replaces thousands of noise extremes; a cross on each (1,983 at 10⁶
 * points) made a whole drawing of the figure take about 0.57 s of the page's one thread, while the spikes a reader
 * looks for are the largest changes. Zooming in crosses more of them.
 */
export function replacedCrosses<E extends ReplacedLike>(events: readonly E[], from = -Infinity, to = Infinity, cap: number = REPLACED_CROSSES): { crossed: E[]; of: number } {
  const inView = events.filter((e) => e.x >= from && e.x <= to);
  if (inView.length <= cap) return { crossed: inView, of: inView.length };
  const size = (e: E) => Math.abs(e.original - e.replacement);
  const order = inView.map((_, i) => i).sort((a, b) => size(inView[b]) - size(inView[a]) || a - b);
  return { crossed: order.slice(0, cap).sort((a, b) => a - b).map((i) => inView[i]), of: inView.length };
}

/** Squares the trace plot draws at most on peaks that appear only after processing (issue 16; the peak table marks every one). */
export const BORN_SQUARES = 60;

/** A peak as {@link bornSquares} reads it (core/measure/peak-types.ts Peak). */
export interface BornPeakLike {
  readonly flag: string;
  readonly snr: number | null;
  readonly marks: readonly string[];
}

/**
 * Peaks with a marker that appear only after processing, and of them the ones the plot squares: at most `cap`,
 * quantifiable before detectable, then the highest S/N (ties in the order given; below the detection limit never).
 * On a long noisy trace a moving average makes a hundred or more bumps just above S/N 3 that the raw trace does
 * not have; squares on all of them hide the trace (131 at 10⁵ noisy points), while the quantifiable ones, the
 * ones a report could take for real peaks, always come first.
 */
export function bornSquares<P extends BornPeakLike>(peaks: readonly P[], cap: number = BORN_SQUARES): { squared: P[]; of: number } {
  const born = peaks.filter((p) => p.marks.includes('appears-only-after-processing') && p.flag !== 'below-detection');
  if (born.length <= cap) return { squared: born, of: born.length };
  const rank = (p: P) => (p.flag === 'quantifiable' ? 1e12 : 0) + Math.min(p.snr ?? 0, 1e11);
  const order = born.map((_, i) => i).sort((a, b) => rank(born[b]) - rank(born[a]) || a - b);
  return { squared: order.slice(0, cap).sort((a, b) => a - b).map((i) => born[i]), of: born.length };
}
