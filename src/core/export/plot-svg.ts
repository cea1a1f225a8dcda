/**
 * The report's plots, drawn by the core as inline SVG, so the page's report
 * and the command line's are the same file (apart from the time and the
 * user's confirmation) and a report made without the page still has its
 * plots. Axis ticks fall on round values (1, 2 or 5 times a power of ten);
 * each series is thinned to the minimum and maximum per column so peaks and
 * spikes stay visible at any length.
 */
import { decimateMinMax } from '../numeric/decimate.ts';
import { escapeHtml, escapeText } from './html-text.ts';

export interface PlotSeries {
  x: Float64Array;
  y: Float64Array;
  colour: string;
  label: string;
  dash?: boolean;
}

/** A mark at a peak's apex; `label` (e.g. its row number in the peak table) is written beside it. */
export interface PlotMarker {
  x: number;
  y: number;
  label?: string;
  /** Draw the mark below the point (a dip) instead of above it. */
  below?: boolean;
  /** Which labels win where two would overlap: the higher weight (e.g. S/N) keeps its label. */
  weight?: number;
}

/** Most markers drawn; the rest are left out and the caption says so. */
export const PLOT_MAX_MARKERS = 300;
/** Markers are numbered only up to this many, so numbers stay readable. */
export const PLOT_MAX_MARKER_LABELS = 30;

/**
 * Round tick values covering [lo, hi]: the step is 1, 2 or 5 times a power
 * of ten chosen so that about `target` intervals fit (P. S. Heckbert, "Nice
 * numbers for graph labels", Graphics Gems, 1990, with the loose/tight
 * choice replaced by ticks strictly inside the range).
 *
 * @returns the step and the ticks inside [lo, hi] in ascending order; no
 *   ticks when the range is empty, not finite, or too narrow for its
 *   magnitude to be labelled in double precision.
 */
export function niceTicks(lo: number, hi: number, target = 5): { step: number; ticks: number[] } {
  if (!Number.isFinite(lo) || !Number.isFinite(hi) || !(hi > lo) || !(target >= 1)) return { step: 0, ticks: [] };
  const rough = (hi - lo) / target;
  const power = 10 ** Math.floor(Math.log10(rough));
  const f = rough / power;
  const step = (f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10) * power;
  const ticks: number[] = [];
  const first = Math.ceil(lo / step - 1e-9);
  const last = Math.floor(hi / step + 1e-9);
  // A span too small for its magnitude (e.g. 1e9 to 1e9 + 1e-7): multiples of the step are no longer
  // whole numbers apart in double precision, and their labels would all read the same; no ticks then.
  if (!(Math.abs(first) < 2 ** 52 && Math.abs(last) < 2 ** 52 && last - first <= 1000)) return { step, ticks: [] };
  for (let k = first; k <= last; k++) {
    // k·step, not a running sum: no drift, and 0 comes out as exactly 0.
    const v = k * step;
    ticks.push(Object.is(v, -0) ? 0 : v);
  }
  return { step, ticks };
}

/**
 * A tick value as text with the decimals its step needs (step 0.05 gives
 * two, so 1 reads "1.00"); exponent form for very large or very small steps.
 */
export function tickText(value: number, step: number): string {
  if (!(step > 0)) return String(value);
  const exp = Math.floor(Math.log10(step) + 1e-9);
  if (exp >= 6 || exp <= -6) {
    if (value === 0) return '0';
    const digits = Math.max(0, Math.floor(Math.log10(Math.abs(value)) + 1e-9) - exp);
    return value.toExponential(Math.min(20, digits));
  }
  // Every label of an axis with the same decimals (0.0, 0.2, … 1.0); 0 never as "-0".
  return (value === 0 ? 0 : value).toFixed(Math.max(0, -exp));
}

/**
 * A line plot as inline SVG text (760 × 260 user units, scaled by the
 * report's CSS). Axis ranges: x over the data, y over the data with 5 %
 * padding; ticks from {@link niceTicks}. Non-finite points are skipped.
 * Markers (at most {@link PLOT_MAX_MARKERS}) are drawn as small triangles,
 * numbered when there are at most {@link PLOT_MAX_MARKER_LABELS}; where two
 * numbers would overlap, the one with the lower weight is left out.
 *
 * @returns the SVG element, or a short paragraph when nothing finite can be drawn.
 */
export function svgLinePlot(series: readonly PlotSeries[], xLabel: string, yLabel: string, title: string, markers: readonly PlotMarker[] = []): string {
  const W = 760, H = 260, L = 70, R = 12, T = 24, B = 40;
  const thinned = series.map((s) => ({ ...s, d: decimateMinMax(s.x, s.y, -Infinity, Infinity, 700) }));
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (const s of thinned) {
    for (let i = 0; i < s.d.x.length; i++) {
      const xv = s.d.x[i], yv = s.d.y[i];
      if (!Number.isFinite(xv) || !Number.isFinite(yv)) continue;
      if (xv < x0) x0 = xv;
      if (xv > x1) x1 = xv;
      if (yv < y0) y0 = yv;
      if (yv > y1) y1 = yv;
    }
  }
  if (!(x1 >= x0) || !(y1 >= y0)) return '<p>No finite values to draw.</p>';
  // Values near the largest double: differences overflow, so an axis is drawn in units of 10^k (said in its label).
  const exponent = (lo: number, hi: number) => {
    const m = Math.max(Math.abs(lo), Math.abs(hi));
    return !Number.isFinite(hi - lo) || m > 1e290 ? Math.floor(Math.log10(m)) : 0;
  };
  const kx = exponent(x0, x1), ky = exponent(y0, y1);
  const sx = Number(`1e${kx}`), sy = Number(`1e${ky}`);
  x0 /= sx; x1 /= sx; y0 /= sy; y1 /= sy;
  if (kx) xLabel = `${xLabel} (axis in units of 1e${kx})`;
  if (ky) yLabel = `${yLabel} (axis in units of 1e${ky})`;
  if (x1 === x0) { x0 -= 0.5; x1 += 0.5; }
  if (y1 === y0) { y0 -= 0.5; y1 += 0.5; }
  const pad = (y1 - y0) * 0.05;
  y0 -= pad; y1 += pad;
  // Ticks and ranges are in drawing units (data ÷ 10^k); px and py take data values.
  const pxs = (v: number) => L + ((v - x0) / (x1 - x0)) * (W - L - R);
  const pys = (v: number) => H - B - ((v - y0) / (y1 - y0)) * (H - T - B);
  const px = (v: number) => pxs(v / sx);
  const py = (v: number) => pys(v / sy);
  const parts: string[] = [];
  parts.push(`<svg class="plot" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-label="${escapeHtml(title)}">`);
  parts.push(`<rect x="${L}" y="${T}" width="${W - L - R}" height="${H - T - B}" fill="#fff" stroke="#888"/>`);
  const xt = niceTicks(x0, x1, 6), yt = niceTicks(y0, y1, 4);
  for (const v of yt.ticks) {
    const y = pys(v).toFixed(1);
    parts.push(`<line x1="${L}" x2="${W - R}" y1="${y}" y2="${y}" stroke="#eee"/>`);
    parts.push(`<text x="${L - 6}" y="${(pys(v) + 4).toFixed(1)}" font-size="11" text-anchor="end">${escapeText(tickText(v, yt.step))}</text>`);
  }
  for (const v of xt.ticks) {
    const x = pxs(v).toFixed(1);
    parts.push(`<line x1="${x}" x2="${x}" y1="${H - B}" y2="${H - B + 4}" stroke="#888"/>`);
    parts.push(`<text x="${x}" y="${H - B + 16}" font-size="11" text-anchor="middle">${escapeText(tickText(v, xt.step))}</text>`);
  }
  parts.push(`<text x="${(L + W - R) / 2}" y="${H - 6}" font-size="12" text-anchor="middle">${escapeText(xLabel)}</text>`);
  parts.push(`<text x="14" y="${(T + H - B) / 2}" font-size="12" text-anchor="middle" transform="rotate(-90 14 ${(T + H - B) / 2})">${escapeText(yLabel)}</text>`);
  thinned.forEach((s, k) => {
    const pts: string[] = [];
    for (let i = 0; i < s.d.x.length; i++) {
      if (Number.isFinite(s.d.x[i]) && Number.isFinite(s.d.y[i])) pts.push(`${px(s.d.x[i]).toFixed(1)},${py(s.d.y[i]).toFixed(1)}`);
    }
    parts.push(`<polyline fill="none" stroke="${escapeHtml(s.colour)}" stroke-width="1.2"${s.dash ? ' stroke-dasharray="5 3"' : ''} points="${pts.join(' ')}"/>`);
    parts.push(`<text x="${L + 8 + k * 150}" y="${T - 8}" font-size="11" fill="${escapeHtml(s.colour)}">■ ${escapeText(s.label)}</text>`);
  });
  const shown = markers.filter((m) => Number.isFinite(m.x) && Number.isFinite(m.y) && m.x / sx >= x0 && m.x / sx <= x1).slice(0, PLOT_MAX_MARKERS);
  if (shown.length) {
    const numbered = shown.length <= PLOT_MAX_MARKER_LABELS;
    const placed = shown.map((m) => {
      const cx = px(m.x), cy = pys(Math.min(Math.max(m.y / sy, y0), y1));
      // A small triangle pointing at the apex from above (from below for a dip).
      const tip = m.below ? cy + 3 : cy - 3, back = m.below ? tip + 7 : tip - 7;
      parts.push(`<path d="M${cx.toFixed(1)} ${tip.toFixed(1)}L${(cx - 4).toFixed(1)} ${back.toFixed(1)}L${(cx + 4).toFixed(1)} ${back.toFixed(1)}Z" fill="#222"/>`);
      return { m, cx, ty: m.below ? back + 10 : back - 2 };
    });
    let dropped = 0;
    if (numbered) {
      // Labels in order of weight; one that would overlap a label already placed is left out.
      const boxes: { x0: number; x1: number; y: number }[] = [];
      const order = placed.filter((p) => p.m.label).sort((a, b) => (b.m.weight ?? 0) - (a.m.weight ?? 0));
      for (const p of order) {
        const w = 6 * p.m.label!.length + 2;
        const box = { x0: p.cx - w / 2, x1: p.cx + w / 2, y: p.ty };
        if (boxes.some((b) => box.x0 < b.x1 && b.x0 < box.x1 && Math.abs(b.y - box.y) < 11)) { dropped += 1; continue; }
        boxes.push(box);
        parts.push(`<text x="${p.cx.toFixed(1)}" y="${p.ty.toFixed(1)}" font-size="10" text-anchor="middle">${escapeText(p.m.label!)}</text>`);
      }
    }
    const legendX = L + 8 + thinned.length * 150;
    const key = numbered ? ` (number = row of the peak table${dropped ? '; crowded numbers left out' : ''})` : '';
    parts.push(`<text x="${legendX}" y="${T - 8}" font-size="11" fill="#222">▼ peak${escapeText(key)}</text>`);
  }
  parts.push('</svg>');
  return parts.join('');
}
