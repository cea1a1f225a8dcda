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

/** The box a label would take, centred above its apex. */
export function labelBox(it: LabelItem): LabelBox {
  const w = it.text.length * LABEL_CHAR_WIDTH;
  return { left: it.px - w / 2 - LABEL_PAD, right: it.px + w / 2 + LABEL_PAD, top: it.py - LABEL_GAP - LABEL_HEIGHT - LABEL_PAD, bottom: it.py - LABEL_GAP + LABEL_PAD };
}

function overlaps(a: LabelBox, b: LabelBox): boolean {
  return a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;
}

/** Indices (into `items`) of the labels kept, in the input order. */
export function placeLabels(items: readonly LabelItem[], width: number, height: number): number[] {
  const order = items.map((_, i) => i).sort((a, b) => items[b].priority - items[a].priority || items[a].px - items[b].px);
  const kept: { i: number; box: LabelBox }[] = [];
  for (const i of order) {
    const it = items[i];
    if (!Number.isFinite(it.px) || !Number.isFinite(it.py)) continue;
    const box = labelBox(it);
    if (box.left < 0 || box.right > width || box.top < 0 || box.bottom > height) continue;
    if (kept.some((k) => overlaps(k.box, box))) continue;
    kept.push({ i, box });
  }
  return kept.map((k) => k.i).sort((a, b) => a - b);
}
