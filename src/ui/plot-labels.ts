/**
 * Issue 17: peak labels that never overlap. Labels are taken in order of
 * priority (named peaks, then peaks added by hand, then the highest S/N) and
 * each is kept only when its box, centred above its apex, overlaps no label
 * already kept and lies inside the plotting area; the rest are dropped (their
 * markers stay, with the figures on hover).
 */

export interface LabelItem {
  /** Apex in pixels from the plotting area's left and top edges. */
  px: number;
  py: number;
  text: string;
  /** Higher first. */
  priority: number;
}

export interface LabelBox { left: number; right: number; top: number; bottom: number }

/** Pixel size of the label font (11 px system sans): a generous width per character, and the line height. */
export const LABEL_CHAR_WIDTH = 7;
export const LABEL_HEIGHT = 15;
/** Gap between the apex and the label's bottom edge (the marker sits between), and the clear space kept around each label. */
export const LABEL_GAP = 7;
export const LABEL_PAD = 2;

/** Where a label may go, in the order tried (the names are the plot library's text positions). */
export const LABEL_SPOTS = ['top center', 'middle right', 'middle left'] as const;
export type LabelSpot = (typeof LABEL_SPOTS)[number];

/** The box a label would take at one spot: centred above its apex, or beside it at the apex's height. */
export function labelBox(it: LabelItem, spot: LabelSpot = 'top center'): LabelBox {
  const w = it.text.length * LABEL_CHAR_WIDTH;
  if (spot === 'top center') return { left: it.px - w / 2 - LABEL_PAD, right: it.px + w / 2 + LABEL_PAD, top: it.py - LABEL_GAP - LABEL_HEIGHT - LABEL_PAD, bottom: it.py - LABEL_GAP + LABEL_PAD };
  const left = spot === 'middle right' ? it.px + LABEL_GAP : it.px - LABEL_GAP - w;
  return { left: left - LABEL_PAD, right: left + w + LABEL_PAD, top: it.py - LABEL_HEIGHT / 2 - LABEL_PAD, bottom: it.py + LABEL_HEIGHT / 2 + LABEL_PAD };
}

function overlaps(a: LabelBox, b: LabelBox): boolean {
  return a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;
}

/**
 * Labels the trace plot places at most (issue 16): each text label costs the figure about a millisecond of
 * every redraw (the plot library measures it), and 150 of them over a whole 10⁶-point trace are more than
 * a reader takes in; the highest priority are kept, and the note under the plot says how many of how many.
 */
export const PLOT_LABELS = 60;

/**
 * The labels kept (index into `items` and spot), in the input order; a label is tried above its apex, then
 * right, then left. At most `max`: the placing goes in priority order and stops there, so the labels kept
 * are the first `max` of those an unlimited placing keeps.
 */
export function placeLabels(items: readonly LabelItem[], width: number, height: number, max = Infinity): { index: number; spot: LabelSpot; box: LabelBox }[] {
  const order = items.map((_, i) => i).sort((a, b) => items[b].priority - items[a].priority || items[a].px - items[b].px);
  const kept: { index: number; spot: LabelSpot; box: LabelBox }[] = [];
  for (const i of order) {
    if (kept.length >= max) break;
    const it = items[i];
    if (!Number.isFinite(it.px) || !Number.isFinite(it.py)) continue;
    for (const spot of LABEL_SPOTS) {
      const box = labelBox(it, spot);
      if (box.left < 0 || box.right > width || box.top < 0 || box.bottom > height) continue;
      if (kept.some((k) => overlaps(k.box, box))) continue;
      kept.push({ index: i, spot, box });
      break;
    }
  }
  return kept.sort((a, b) => a.index - b.index);
}

/** The plotting area a set of labels was placed for: axis ranges in data units and the area's size in pixels. */
export interface PlotGeometry { x: [number, number]; y: [number, number]; w: number; h: number }

/**
 * Largest shift, in pixels, of any point of the plotting area between the
 * geometry the labels were placed for (`placed`) and the one drawn (`drawn`).
 * Both maps from data to pixels are linear, so the shift is largest at an
 * end of the drawn ranges.
 */
export function labelShift(placed: PlotGeometry, drawn: PlotGeometry): number {
  const shift = (a: [number, number], la: number, b: [number, number], lb: number) => {
    const at = (v: number) => Math.abs(((v - a[0]) / (a[1] - a[0])) * la - ((v - b[0]) / (b[1] - b[0])) * lb);
    return Math.max(at(b[0]), at(b[1]));
  };
  return Math.max(shift(placed.x, placed.w, drawn.x, drawn.w), shift(placed.y, placed.h, drawn.y, drawn.h));
}

/**
 * Issue 16: labels placed for `placed` stay clear of each other on `drawn`
 * when no point moves by more than LABEL_PAD pixels: two labels then move
 * against each other by at most 2 × LABEL_PAD, the clear space kept between
 * them, so they may touch but never overlap (and a label may come up to
 * LABEL_PAD pixels nearer the area's edge). Only a larger change places them
 * again, which costs the figure a second drawing; a slider move that lowers
 * the tallest peak by a fraction of a pixel does not.
 */
export function labelsStillClear(placed: PlotGeometry | null, drawn: PlotGeometry): boolean {
  return placed !== null && labelShift(placed, drawn) <= LABEL_PAD;
}
