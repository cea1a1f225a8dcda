/**
 * Which rows of a long peak table the page shows (issue 16): the user's
 * decisions (peaks added or removed by hand) always, then the highest S/N
 * (never the first by position: on a long noisy trace those are noise), at
 * most a cap. The worker ranks the table when a peaks stage lands and sends
 * the chosen rows' indices with it, so the page does not sort tens of
 * thousands of peaks on its own thread; the page reads them back with
 * {@link peakTableRows}, which ranks there only when no worker did (the
 * in-process backend, tests).
 */
import type { Peak } from '../core/measure/peak-types.ts';

/** A peak the user decided on: added or removed by hand. */
const byHand = (p: Peak) => p.origin === 'added-by-user' || p.removedByUser === true;

/**
 * Indices into `peaks` of the rows shown, in this order: every decision by
 * hand in table order, then the others by S/N, highest first (not measured
 * last; equal S/N in table order), cut at `cap`.
 */
export function rankTableRows(peaks: readonly Peak[], cap: number): Uint32Array {
  const n = peaks.length;
  const mine: number[] = [];
  const rest = new Uint32Array(n);
  const key = new Float64Array(n);
  let m = 0;
  for (let i = 0; i < n; i++) {
    const p = peaks[i];
    if (byHand(p)) mine.push(i);
    else { rest[m++] = i; key[i] = p.snr ?? -Infinity; }
  }
  const take = Math.max(0, Math.min(cap, mine.length + m));
  const others = firstByKey(rest.subarray(0, m), key, Math.max(0, take - mine.length));
  const out = new Uint32Array(take);
  let k = 0;
  for (; k < take && k < mine.length; k++) out[k] = mine[k];
  for (let j = 0; k < take; k++, j++) out[k] = others[j];
  return out;
}

/** Rankings the worker sent, by the peak table they belong to (that array, as the page holds it). */
const ranked = new WeakMap<readonly Peak[], { cap: number; rows: Uint32Array }>();

/** The rows of `peaks` the page shows (see {@link rankTableRows}): the worker's ranking when it sent one, else ranked here once. */
export function peakTableRows(peaks: readonly Peak[], cap: number): readonly Peak[] {
  let r = ranked.get(peaks);
  if (!r || r.cap !== cap) {
    r = { cap, rows: rankTableRows(peaks, cap) };
    ranked.set(peaks, r);
  }
  const rows = r.rows;
  const out: Peak[] = new Array(rows.length);
  for (let i = 0; i < rows.length; i++) out[i] = peaks[rows[i]];
  return out;
}

/** Peak markers drawn on the plot at most (TracePlot.tsx): thousands of markers and labels would stall the page. */
export const PLOT_MARKERS = 300;

/**
 * Of those, markers below the detection limit at most (issue 16). On a long noisy trace most candidates are
 * noise bumps below S/N 3: hundreds of rings laid over the noise tell a reader little and cost the figure
 * about as much to draw as every line in it (about 50 ms of each redraw for 233 rings, 10⁵ points). The
 * page says how many it leaves out, and the peak table lists every one.
 */
export const PLOT_MARKERS_BELOW = 40;

const isBelow = (p: Peak) => p.origin !== 'added-by-user' && p.flag === 'below-detection';

/**
 * Indices into `peaks` of the markers the plot draws: every peak not removed by hand in table order while
 * there are at most `cap` and at most `belowCap` of them below the detection limit; else the peaks added by
 * hand, then the others by S/N, highest first (not measured counting as 0; equal S/N in table order), at most
 * `belowCap` below the detection limit, `cap` in all.
 */
export function rankMarkers(peaks: readonly Peak[], cap: number, belowCap: number = PLOT_MARKERS_BELOW): Uint32Array {
  const live: number[] = [];
  let below = 0;
  for (let i = 0; i < peaks.length; i++) {
    if (peaks[i].removedByUser) continue;
    live.push(i);
    if (isBelow(peaks[i])) below++;
  }
  if (live.length <= cap && below <= belowCap) return Uint32Array.from(live);
  const key = new Float64Array(peaks.length);
  const mine: number[] = [], above: number[] = [], under: number[] = [];
  for (const i of live) {
    if (peaks[i].origin === 'added-by-user') mine.push(i);
    else { (isBelow(peaks[i]) ? under : above).push(i); key[i] = peaks[i].snr ?? 0; }
  }
  const out = mine.slice(0, cap);
  // All by S/N, the ones below the detection limit skipped once `belowCap` of them are taken: the same as the
  // best `cap` of the others merged with the best `belowCap` of those below, in order.
  const a = firstByKey(above, key, cap), b = firstByKey(under, key, Math.max(0, Math.min(belowCap, cap)));
  let ia = 0, ib = 0;
  while (out.length < cap && (ia < a.length || ib < b.length)) {
    if (ib >= b.length || (ia < a.length && before(key, a[ia], b[ib]))) out.push(a[ia++]);
    else out.push(b[ib++]);
  }
  return Uint32Array.from(out);
}

/** Does index i come before j: higher key first, equal keys in index order. */
const before = (key: Float64Array, i: number, j: number) => key[i] > key[j] || (key[i] === key[j] && i < j);

/**
 * The first k of `idx` (indices in increasing order) ranked by key, highest first, equal keys in index order: the
 * same as sorting them all and keeping k, without sorting them all (issue 16: two sorts of 6,000–13,000 peaks with a
 * comparator were 6–23 ms of each peak stage in the worker). The k-th highest key comes from a sort of the keys
 * alone (native, no comparator); only the keys above it are sorted with the comparator, and those equal to it follow
 * in index order. With a NaN key (no order) everything is sorted with the comparator, as before.
 */
export function firstByKey(idx: ArrayLike<number>, key: Float64Array, k: number): number[] {
  const m = idx.length;
  const byKey = (i: number, j: number) => key[j] - key[i] || i - j;
  if (k <= 0) return [];
  if (k >= m) return Array.from(idx).sort(byKey);
  const vals = new Float64Array(m);
  let nan = false;
  for (let j = 0; j < m; j++) { const v = key[idx[j]]; vals[j] = v; if (v !== v) nan = true; }
  if (nan) return Array.from(idx).sort(byKey).slice(0, k);
  vals.sort();
  const t = vals[m - k];
  const top: number[] = [], ties: number[] = [];
  for (let j = 0; j < m; j++) {
    const i = idx[j], v = key[i];
    if (v > t) top.push(i); else if (v === t) ties.push(i);
  }
  top.sort(byKey);
  for (let j = 0; top.length < k && j < ties.length; j++) top.push(ties[j]);
  return top;
}

/** What the peak table says of the whole table: counts by standing and the summed area, peaks removed by hand left out. */
export interface PeakTotals { quantifiable: number; detectable: number; below: number; area: number }

export function peakTotals(peaks: readonly Peak[]): PeakTotals {
  const t: PeakTotals = { quantifiable: 0, detectable: 0, below: 0, area: 0 };
  for (const p of peaks) {
    if (p.removedByUser) continue;
    if (p.flag === 'quantifiable') t.quantifiable++; else if (p.flag === 'detectable') t.detectable++; else t.below++;
    t.area += p.area;
  }
  return t;
}

/** All the page needs of a long peak table without reading every row (sent by the worker with a peaks stage). */
export interface PeakView { cap: number; rows: Uint32Array; markerCap: number; markers: Uint32Array; totals: PeakTotals }

/** The worker's side: the view of a peak table, ranked here. */
export function peakView(peaks: readonly Peak[], cap: number, markerCap: number = PLOT_MARKERS): PeakView {
  return { cap, rows: rankTableRows(peaks, cap), markerCap, markers: rankMarkers(peaks, markerCap), totals: peakTotals(peaks) };
}

/** Views the worker sent, by the peak table they belong to. */
const views = new WeakMap<readonly Peak[], PeakView>();

/** Keep the worker's view of a peak table (bridge.ts, when a peaks stage lands). */
export function rememberPeakView(peaks: readonly Peak[], view: PeakView): void {
  views.set(peaks, view);
  ranked.set(peaks, { cap: view.cap, rows: view.rows });
}

/** The plot's markers (see {@link rankMarkers}): the worker's when it sent them, else ranked here. */
export function plotMarkers(peaks: readonly Peak[], cap: number = PLOT_MARKERS): Peak[] {
  const v = views.get(peaks);
  const idx = v && v.markerCap === cap ? v.markers : rankMarkers(peaks, cap);
  const out: Peak[] = new Array(idx.length);
  for (let i = 0; i < idx.length; i++) out[i] = peaks[idx[i]];
  return out;
}

/** The table's counts and summed area: the worker's when it sent them, else counted here. */
export function tableTotals(peaks: readonly Peak[]): PeakTotals {
  return views.get(peaks)?.totals ?? peakTotals(peaks);
}
