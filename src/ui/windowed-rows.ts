/**
 * Which rows of a long table to draw (issue 16): the rows inside the scrolled
 * box plus an overscan on each side, and the heights of the two spacer rows
 * that stand for the rows not drawn, so the scrollbar stays honest. Pure
 * arithmetic over row heights (measured ones, an estimate for the others);
 * the component that reads the box and the rows is src/ui/WindowedTable.tsx.
 */

/** Tables with at most this many rows draw every row (no spacers): the demo's tables stay as they were. */
export const DRAW_ALL_UP_TO = 60;
/** Rows drawn beyond each edge of the box, so a short scroll shows rows already laid out. */
export const OVERSCAN = 15;
/** Row height assumed before any row was measured (px): one line of 12.5-pixel text with 4-pixel padding. */
export const FIRST_ROW_ESTIMATE = 26;
/** Box height assumed before the box was measured (px): the `.table-wrap` max-height in styles.css. */
export const FIRST_BOX_ESTIMATE = 420;

/** The rows to draw: [start, end) and the spacer heights before and after them (px). */
export interface RowWindow { start: number; end: number; before: number; after: number }

/** What the box shows: its scroll offset and height, and the height above the first row inside the scrolled content (the header). */
export interface BoxView { scrollTop: number; boxHeight: number; headHeight: number }

/**
 * The rows overlapping the visible part of the box, widened by `overscan`
 * rows on each side. `heights[i]` is row i's height (≥ 0, px). The scroll
 * offset is clamped to the content (a box scrolled past the end shows the
 * last rows); a box taller than the content draws every row. Every index
 * 0..n−1 is either before `start` (in the spacer above), drawn, or at or
 * after `end` (in the spacer below), exactly once.
 */
export function rowWindow(heights: ArrayLike<number>, view: BoxView, overscan = OVERSCAN): RowWindow {
  const n = heights.length;
  if (n === 0) return { start: 0, end: 0, before: 0, after: 0 };
  let total = 0;
  for (let i = 0; i < n; i++) total += heights[i];
  // The rows' own coordinate: 0 at the top of the first row. The header is sticky: it covers the top headHeight
  // pixels of the box, so rows from scrollTop to scrollTop + boxHeight − headHeight are in view.
  const seen = Math.max(0, view.boxHeight - view.headHeight);
  const top = Math.min(Math.max(0, view.scrollTop), Math.max(0, total - seen));
  const bottom = top + seen;
  let first = -1, last = -1, y = 0;
  for (let i = 0; i < n; i++) {
    const h = heights[i];
    if (first < 0 && y + h > top) first = i;
    if (y < bottom || (h === 0 && y <= bottom)) last = i;
    else break;
    y += h;
  }
  if (first < 0) first = n - 1; // rows of height 0 only, or scrolled past all
  if (last < first) last = first;
  const start = Math.max(0, first - overscan);
  const end = Math.min(n, last + 1 + overscan);
  let before = 0;
  for (let i = 0; i < start; i++) before += heights[i];
  let after = 0;
  for (let i = end; i < n; i++) after += heights[i];
  return { start, end, before, after };
}

/** Every row, no spacers: what a short table draws. */
export const wholeWindow = (n: number): RowWindow => ({ start: 0, end: n, before: 0, after: 0 });

/**
 * The height of each row in the order shown: the measured height kept under
 * the row's key (a peak keeps its height when the table is re-sorted), else
 * `estimate`.
 */
export function rowHeights(keys: readonly string[], measured: ReadonlyMap<string, number>, estimate: number): Float64Array {
  const out = new Float64Array(keys.length);
  for (let i = 0; i < keys.length; i++) out[i] = measured.get(keys[i]) ?? estimate;
  return out;
}

/** The estimate for rows not measured yet: the mean measured height, or `fallback` when none is measured. */
export function meanHeight(measured: ReadonlyMap<string, number>, fallback = FIRST_ROW_ESTIMATE): number {
  if (measured.size === 0) return fallback;
  let s = 0;
  for (const h of measured.values()) s += h;
  return s / measured.size;
}

/**
 * The heights of the rows drawn, from the tops of their first table rows (a
 * row's detail row counts in its height) and the bottom edge of the last one:
 * `tops[k]` is the top of drawn row k, `bottom` the top of what follows the
 * last drawn row.
 */
export function heightsFromTops(tops: readonly number[], bottom: number): number[] {
  return tops.map((t, k) => Math.max(0, (k + 1 < tops.length ? tops[k + 1] : bottom) - t));
}

/**
 * The scroll offset that brings row `index` into the box, or null when it is
 * already wholly in view: the row is put in the middle of the box.
 */
export function scrollToShow(heights: ArrayLike<number>, index: number, view: BoxView): number | null {
  if (index < 0 || index >= heights.length) return null;
  let y = 0;
  for (let i = 0; i < index; i++) y += heights[i];
  const rowTop = view.headHeight + y, rowBottom = rowTop + heights[index];
  // The header is sticky: it covers the top headHeight pixels of the box.
  if (rowTop >= view.scrollTop + view.headHeight && rowBottom <= view.scrollTop + view.boxHeight) return null;
  return Math.max(0, rowTop - view.headHeight - (view.boxHeight - view.headHeight - heights[index]) / 2);
}
