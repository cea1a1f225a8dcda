/**
 * How little of a figure must be drawn again (issue 16). The plot library's
 * `react` redraws the whole figure whenever any trace's data change: every
 * line, every marker with its style, both axes and the key, 60–170 ms on this
 * machine for the trace plot. When a slider moves, the processed trace and its
 * residual land first (only lines change), then the peaks (only markers and
 * labels change); the layout, the key and the axes' ranges stay as they were.
 * Such traces can be replaced in place (the library's `animate` with no
 * transition and no redraw), which draws just them.
 *
 * That is allowed only when the result is the same figure a whole drawing
 * would give. {@link figureUpdate} says so when:
 *
 *   * the figures have the same traces in the same order and the same layout
 *     (compared by value), but for new ranges of y axes (see below);
 *   * every trace that changed is a scatter trace and changed only its points
 *     (x, y and the per-point texts, {@link POINT_KEYS}), not its style;
 *   * for each axis the library ranges by itself (autorange), no changed trace
 *     can set the range, before or after. The library finds the range from
 *     each trace's extremes, each with a padding in pixels: on y 5 % of the
 *     axis for every scatter trace; on x 5 % only for traces with markers or
 *     text (a line alone ends at its last point); plus half a marker's size
 *     for markers. An extreme of a changed trace that lies inside what the
 *     unchanged drawn traces span, by at least the padding it has beyond
 *     theirs (converted with the axis's scale as drawn now), never sets the
 *     range, so the range cannot move. Axes with a range of their own (the
 *     trace's x span, zoomed, or {@link steadyRange}) need no such test.
 *
 * A layout that changed only the range of y axes with a range of their own
 * (a residual that outgrew its panel) gives an update in place with those
 * ranges, set first. Anything else is drawn whole. An update in place also names one unchanged
 * trace of each panel with no changed trace (the library would clear that
 * panel otherwise). Pure: nothing here changes its input.
 */
import type { PlotData, PlotLayout, PlotValues } from 'plotly.js-strict-dist-min';

/** The fields of a trace that hold its points: replaced in place; any other change draws the figure whole. */
export const POINT_KEYS = ['x', 'y', 'text', 'hovertext', 'textposition'] as const;

/**
 * What to do with a figure: draw it whole, or replace these traces' points in place (none: nothing changed); for an
 * update in place, `ranges` (when given) are the y axes' new ranges, set first ("yaxis2.range": [a, b]).
 */
export type FigureUpdate = { kind: 'whole'; why: string } | { kind: 'in-place'; traces: number[]; ranges?: Record<string, [number, number]> };

/** Equal by value: numbers by ===, NaN equal to NaN; arrays and typed arrays element by element; plain objects key by key. */
export function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a === 'number' && typeof b === 'number') return Number.isNaN(a) && Number.isNaN(b);
  if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') return false;
  const la = Array.isArray(a) || ArrayBuffer.isView(a), lb = Array.isArray(b) || ArrayBuffer.isView(b);
  if (la !== lb) return false;
  if (la) {
    const x = a as ArrayLike<unknown>, y = b as ArrayLike<unknown>;
    if (x.length !== y.length) return false;
    for (let i = 0; i < x.length; i++) if (!sameValue(x[i], y[i])) return false;
    return true;
  }
  const ka = Object.keys(a as object).filter((k) => (a as Record<string, unknown>)[k] !== undefined);
  const kb = Object.keys(b as object).filter((k) => (b as Record<string, unknown>)[k] !== undefined);
  if (ka.length !== kb.length) return false;
  for (const k of ka) if (!sameValue((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k])) return false;
  return true;
}

/** The top-level keys where two objects differ (for the reason a figure is drawn whole). */
function differing(a: object, b: object): string[] {
  const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
  return [...keys].filter((k) => !sameValue((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
}

/** Smallest and largest finite value, or null when there is none. */
export function extent(v: PlotValues | undefined): [number, number] | null {
  if (!v) return null;
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < v.length; i++) {
    const e = v[i];
    if (e === null || !Number.isFinite(e)) continue;
    if (e < lo) lo = e;
    if (e > hi) hi = e;
  }
  return hi >= lo ? [lo, hi] : null;
}

/** The layout key of a trace's axis: "x" → "xaxis", "y2" → "yaxis2". */
const axisKey = (id: string | undefined, letter: 'x' | 'y') => `${letter}axis${(id ?? letter).slice(1)}`;

/** Does the layout leave this axis to the library to range? (no range given, or autorange asked for) */
function autoRanged(layout: PlotLayout, key: string): boolean {
  const ax = (layout as Record<string, unknown>)[key] as { autorange?: unknown; range?: unknown } | undefined;
  if (!ax) return true;
  if (ax.autorange === false) return !Array.isArray(ax.range);
  return ax.autorange !== undefined || !Array.isArray(ax.range);
}

/**
 * Pixels a trace's extreme points may need beyond their value, more than a line's, when the library ranges
 * an axis `lengthPx` long: on x 5 % of it for markers or text; half the marker's size and its outline for
 * markers; with 2 px to spare when there is any.
 */
function reachBeyondLine(t: PlotData, letter: 'x' | 'y', lengthPx: number): number {
  const mode = t.mode ?? '';
  const markers = mode.includes('markers'), text = mode.includes('text');
  const size = typeof t.marker?.size === 'number' ? t.marker.size : Array.isArray(t.marker?.size) ? Math.max(...t.marker.size) : 6;
  const px = (markers ? size / 2 + (t.marker?.line?.width ?? 0) : 0) + (letter === 'x' && (markers || text) ? 0.05 * lengthPx : 0);
  return px > 0 ? px + 2 : 0;
}

/** What the drawn figure says now, beyond the data and layout it was given (the user may have used its controls). */
export interface LiveFigure {
  /** Is trace i drawn (the user may have hidden it with the key)? Only drawn traces may hold an axis's range. */
  shown(i: number): boolean;
  /** Does the library range this axis ("yaxis2") by itself now (the user may have asked it to, by double-click)? */
  autoRanged(key: string): boolean;
  /** This axis as drawn now: data units per pixel and its length in pixels, or null when not known. */
  scale(key: string): { unitsPerPixel: number; lengthPx: number } | null;
}

const NOTHING_LIVE: LiveFigure = { shown: () => true, autoRanged: () => false, scale: () => null };

/** The least drawing that turns figure `prev` into `next` (see the head of this file), with what the drawn figure says now. */
export function figureUpdate(
  prev: { data: readonly PlotData[]; layout: PlotLayout } | null,
  next: { data: readonly PlotData[]; layout: PlotLayout },
  live: LiveFigure = NOTHING_LIVE,
): FigureUpdate {
  if (!prev) return { kind: 'whole', why: 'first drawing' };
  if (prev.data.length !== next.data.length) return { kind: 'whole', why: 'traces added or removed' };
  let ranges: Record<string, [number, number]> | undefined;
  if (!sameValue(prev.layout, next.layout)) {
    ranges = newRangesOnly(prev.layout, next.layout, live) ?? undefined;
    if (!ranges) return { kind: 'whole', why: `layout changed (${differing(prev.layout, next.layout).join(', ')})` };
  }
  const changed: number[] = [];
  for (let i = 0; i < next.data.length; i++) {
    const a = prev.data[i], b = next.data[i];
    if (a === b) continue;
    const style = (t: PlotData) => Object.fromEntries(Object.entries(t).filter(([k]) => !(POINT_KEYS as readonly string[]).includes(k)));
    const sa = style(a), sb = style(b);
    if (!sameValue(sa, sb)) return { kind: 'whole', why: `trace ${i} (${b.name ?? 'unnamed'}) changed its style (${differing(sa, sb).join(', ')})` };
    if (POINT_KEYS.every((k) => sameValue(a[k], b[k]))) continue;
    if ((b.type ?? 'scatter') !== 'scatter' || (b.fill !== undefined && b.fill !== 'none')) return { kind: 'whole', why: `trace ${i} (${b.name ?? 'unnamed'}) is not a scatter trace without fill` };
    // A field dropped cannot be replaced in place (the library would keep the old one).
    if (POINT_KEYS.some((k) => a[k] !== undefined && b[k] === undefined)) return { kind: 'whole', why: `trace ${i} (${b.name ?? 'unnamed'}) dropped a field` };
    changed.push(i);
  }
  const moved = new Set(changed);
  for (const letter of ['x', 'y'] as const) {
    const axes = new Set(changed.map((i) => axisKey(next.data[i][`${letter}axis`], letter)));
    for (const key of axes) {
      if (!autoRanged(next.layout, key) && !live.autoRanged(key)) continue;
      // What the unchanged, drawn traces on this axis span (their own paddings only widen the range further).
      let lo = Infinity, hi = -Infinity;
      next.data.forEach((t, i) => {
        if (moved.has(i) || !live.shown(i) || axisKey(t[`${letter}axis`], letter) !== key) return;
        const e = extent(t[letter]);
        if (e) { lo = Math.min(lo, e[0]); hi = Math.max(hi, e[1]); }
      });
      const scale = live.scale(key);
      for (const i of changed) {
        if (axisKey(next.data[i][`${letter}axis`], letter) !== key) continue;
        const reach = scale ? reachBeyondLine(next.data[i], letter, scale.lengthPx) : 0;
        if (!scale && reachBeyondLine(next.data[i], letter, 0) > 0) return { kind: 'whole', why: `the ${key} scale is not known` };
        const margin = reach * (scale?.unitsPerPixel ?? 0);
        for (const e of [extent(prev.data[i][letter]), extent(next.data[i][letter])]) {
          if (e && !(e[0] >= lo + margin && e[1] <= hi - margin)) return { kind: 'whole', why: `trace ${i} (${next.data[i].name ?? 'unnamed'}) may move the ${key} range` };
        }
      }
    }
  }
  if (changed.length === 0) return ranges ? { kind: 'in-place', traces: [], ranges } : { kind: 'in-place', traces: [] };
  // The library's in-place step clears every panel (x and y axis pair) none of whose traces it is given (plotly.js
  // 4.1, cartesian plot: a panel's layers with no trace given are removed), so each other panel sends one trace
  // too, its points unchanged: the one with the fewest.
  const panel = (t: PlotData) => `${t.xaxis ?? 'x'}${t.yaxis ?? 'y'}`;
  const given = new Set(changed.map((i) => panel(next.data[i])));
  const also = new Map<string, number>();
  next.data.forEach((t, i) => {
    const p = panel(t);
    if (given.has(p)) return;
    const j = also.get(p);
    if (j === undefined || (t.x?.length ?? 0) < (next.data[j].x?.length ?? 0)) also.set(p, i);
  });
  const traces = [...changed, ...also.values()].sort((a, b) => a - b);
  return ranges ? { kind: 'in-place', traces, ranges } : { kind: 'in-place', traces };
}

/**
 * When the only change of the layout is the range of y axes that have a range of their own before and after (the
 * steady ranges of {@link steadyRange}: a residual that outgrew its panel), those new ranges ("yaxis2.range": [a, b]);
 * otherwise null. Not for an axis the user let the library range (by double-click): that is drawn whole.
 */
function newRangesOnly(prev: PlotLayout, next: PlotLayout, live: LiveFigure): Record<string, [number, number]> | null {
  const out: Record<string, [number, number]> = {};
  for (const key of differing(prev, next)) {
    if (!/^yaxis\d*$/.test(key) || live.autoRanged(key)) return null;
    const a = (prev as Record<string, unknown>)[key], b = (next as Record<string, unknown>)[key];
    if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') return null;
    const ax = a as { autorange?: unknown; range?: unknown }, bx = b as { autorange?: unknown; range?: unknown };
    if (differing(ax, bx).some((k) => k !== 'range') || ax.autorange !== false || bx.autorange !== false) return null;
    const r = bx.range;
    if (!Array.isArray(r) || r.length !== 2 || !r.every((v) => typeof v === 'number' && Number.isFinite(v)) || !(r[1] > r[0])) return null;
    out[`${key}.range`] = [r[0], r[1]];
  }
  return Object.keys(out).length ? out : null;
}

/**
 * The fields of trace `t` to send for an update in place: its points, typed arrays as plain arrays of the same
 * numbers. The library's in-place step (plotly.js 4.1, `expandObjectPaths` on what it is given) walks every
 * element of a typed array as an object key and tests it against two patterns, but passes a plain array over:
 * about 14 ms of a marker update at 10⁶ points for the 3,258-point residual sent with it (issue 16).
 */
export function pointsOf(t: PlotData): Partial<PlotData> {
  const out: Record<string, unknown> = {};
  for (const k of POINT_KEYS) {
    const v: unknown = t[k];
    if (v !== undefined) out[k] = ArrayBuffer.isView(v) && !(v instanceof DataView) ? Array.from(v as Float64Array) : v;
  }
  return out as Partial<PlotData>;
}

/** How {@link steadyRange} widens the data's extent: on each side a share of it, more when the data outgrew the range held; whole steps or not; how much of a held range the data must fill to keep it. */
export interface SteadyRule { pad: number; regrowPad: number; wholeSteps: boolean; minFill: number }

/**
 * The residual's panel: 4 % on each side, out to whole steps; 40 % after the residual outgrew its range (it is
 * likely to go on growing: a window dragged wider widens it step by step, and each new range is one whole drawing);
 * kept while the residual fills at least 40 % of it.
 */
export const RESIDUAL_RANGE: SteadyRule = { pad: 0.04, regrowPad: 0.4, wholeSteps: true, minFill: 0.4 };

/**
 * The trace's own panel: 6 % on each side (about the plot library's own 5 % and room for half a marker on a
 * 300–400 px panel), no rounding; kept while the data fill at least 80 % of it. The raw trace, drawn unchanged,
 * usually holds it.
 */
export const TRACE_RANGE: SteadyRule = { pad: 0.06, regrowPad: 0.06, wholeSteps: false, minFill: 0.8 };

/**
 * A range for an axis that stays put while its data change a little (issue
 * 16), so a slider move that leaves the data about where they were leaves
 * the axis as it is and the figure can be updated in place. With no `held`
 * range: the data's extent widened by `rule.pad` of it on each side, then
 * (`wholeSteps`) out to whole steps of 1, 2, 2.5 or 5 × 10ᵏ, the step about a
 * fifth of the extent. A `held` range (the one drawn now) is kept while the
 * data stay inside it and fill at least `minFill` of it; otherwise a new
 * range is found as above with `regrowPad`. Null when there is nothing
 * finite to range (the library then ranges the axis itself).
 */
export function steadyRange(values: readonly (PlotValues | undefined)[], held: readonly [number, number] | null = null, rule: SteadyRule = RESIDUAL_RANGE): [number, number] | null {
  let lo = Infinity, hi = -Infinity;
  for (const v of values) {
    const e = extent(v);
    if (e) { lo = Math.min(lo, e[0]); hi = Math.max(hi, e[1]); }
  }
  if (!(hi >= lo)) return null;
  if (held && lo >= held[0] && hi <= held[1] && hi - lo >= rule.minFill * (held[1] - held[0])) return [held[0], held[1]];
  const span = hi - lo || Math.abs(hi) * 0.1 || 1;
  const pad = (held ? rule.regrowPad : rule.pad) * span;
  let a = lo - pad, b = hi + pad;
  if (rule.wholeSteps) {
    const rough = span / 5;
    const mag = 10 ** Math.floor(Math.log10(rough));
    const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((st) => st >= rough * (1 - 1e-12)) ?? 10 * mag;
    // Whole steps printed as the decimal a reader expects (no 0.30000000000000004).
    const tidy = (v: number) => Number(v.toPrecision(12));
    a = tidy(Math.floor(a / step) * step);
    b = tidy(Math.ceil(b / step) * step);
  }
  return Number.isFinite(a) && Number.isFinite(b) && b > a ? [a, b] : null;
}
