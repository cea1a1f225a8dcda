import { describe, expect, it } from 'vitest';
import { LABEL_PAD, labelBox, labelShift, labelsStillClear, placeLabels, type LabelItem, type PlotGeometry } from '../../src/ui/plot-labels.ts';
import { makeRng } from '../../src/core/numeric/random.ts';

// Issue 17: labels on the plot never overlap; which are kept follows the priority.
describe('placeLabels', () => {
  it('keeps the higher priority label where two collide, and moves a neighbour beside its apex when that is free', () => {
    const at = (px: number, py: number, priority: number): LabelItem => ({ px, py, text: '12', priority });
    expect(placeLabels([at(200, 100, 1), at(200, 100, 3), at(200, 100, 2)], 400, 300).map((k) => [k.index, k.spot])).toEqual([[1, 'top center']]);
    // A lower neighbour 10 px to the right whose top spot is taken by the first label: placed to its right.
    expect(placeLabels([at(200, 100, 2), at(210, 110, 1)], 400, 300).map((k) => k.spot)).toEqual(['top center', 'middle right']);
  });

  it('never keeps two overlapping boxes nor a box outside the plotting area (2,000 random labels)', () => {
    const rng = makeRng(5);
    const items: LabelItem[] = Array.from({ length: 2000 }, () => ({ px: rng.uniform() * 800, py: rng.uniform() * 350, text: (rng.uniform() * 500).toFixed(1), priority: rng.uniform() }));
    const kept = placeLabels(items, 800, 350);
    expect(kept.length).toBeGreaterThan(20);
    for (const k of kept) {
      expect(k.box).toEqual(labelBox(items[k.index], k.spot));
      expect(k.box.left).toBeGreaterThanOrEqual(0);
      expect(k.box.right).toBeLessThanOrEqual(800);
      expect(k.box.top).toBeGreaterThanOrEqual(0);
      expect(k.box.bottom).toBeLessThanOrEqual(350);
    }
    for (let a = 0; a < kept.length; a++) {
      for (let b = a + 1; b < kept.length; b++) {
        const p = kept[a].box, q = kept[b].box;
        expect(p.left < q.right && q.left < p.right && p.top < q.bottom && q.top < p.bottom).toBe(false);
      }
    }
  });

  it('issue 16: at most `max` labels, and they are the highest-priority ones an unlimited placing keeps', () => {
    const rng = makeRng(60);
    const items: LabelItem[] = Array.from({ length: 2000 }, () => ({ px: rng.uniform() * 800, py: rng.uniform() * 350, text: (rng.uniform() * 500).toFixed(1), priority: rng.uniform() }));
    const all = placeLabels(items, 800, 350);
    expect(all.length).toBeGreaterThan(60);
    const firstByPriority = [...all].sort((a, b) => items[b.index].priority - items[a.index].priority).slice(0, 60).sort((a, b) => a.index - b.index);
    expect(placeLabels(items, 800, 350, 60)).toEqual(firstByPriority);
  });

  it('a label at the top edge goes beside its apex instead of being dropped', () => {
    const got = placeLabels([{ px: 100, py: 12, text: '350', priority: 1 }], 400, 300);
    expect(got.map((k) => k.spot)).toEqual(['middle right']);
  });
});

// Issue 16: labels are placed again (a second drawing of the figure) only when the drawn plotting area moves them by more than their clear space.
describe('labelShift and labelsStillClear', () => {
  const g: PlotGeometry = { x: [0, 100], y: [-1, 9], w: 800, h: 300 };
  it('measures the largest shift in pixels (worked by hand)', () => {
    expect(labelShift(g, g)).toBe(0);
    // 12 px less height: the top of the area moves 12 px against the bottom.
    expect(labelShift(g, { ...g, h: 288 })).toBeCloseTo(12, 12);
    // y-range moved up by 1 % of its span (0.1) on 300 px: every point 3 px.
    expect(labelShift(g, { ...g, y: [-0.9, 9.1] })).toBeCloseTo(3, 12);
    // x-range widened by 0.1 at each end: on the old map (8 px per unit) each end moves 0.8 px.
    expect(labelShift(g, { ...g, x: [-0.1, 100.1] })).toBeCloseTo(0.8, 9);
    expect(labelsStillClear(null, g)).toBe(false);
    expect(labelsStillClear(g, { ...g, y: [-0.99, 9.01] })).toBe(true); // 0.3 px
    expect(labelsStillClear(g, { ...g, h: 288 })).toBe(false);
  });

  it('labels placed for one area and drawn on another within the clear space never overlap (400 random cases, those within the clear space)', () => {
    const rng = makeRng(16);
    let checked = 0, overlapping = 0;
    for (let c = 0; c < 400; c++) {
      const placed: PlotGeometry = { x: [rng.uniform() * 10, 50 + rng.uniform() * 100], y: [-rng.uniform(), 1 + rng.uniform() * 10], w: 400 + rng.uniform() * 600, h: 200 + rng.uniform() * 200 };
      // A drawn area nudged by up to 4 px at each end and ±2 px in size; only those within the clear space are checked.
      const nudge = (r: [number, number], len: number): [number, number] => {
        const px = (r[1] - r[0]) / len;
        return [r[0] + (rng.uniform() - 0.5) * 8 * px, r[1] + (rng.uniform() - 0.5) * 8 * px];
      };
      const drawn: PlotGeometry = { x: nudge(placed.x, placed.w), y: nudge(placed.y, placed.h), w: placed.w + (rng.uniform() - 0.5) * 4, h: placed.h + (rng.uniform() - 0.5) * 4 };
      // The shift by brute force over points of the drawn area (its corners included) equals labelShift; within the clear space it is at most LABEL_PAD.
      let brute = 0;
      for (let k = 0; k <= 40; k++) {
        const x = drawn.x[0] + (k / 40) * (drawn.x[1] - drawn.x[0]), y = drawn.y[0] + (k / 40) * (drawn.y[1] - drawn.y[0]);
        brute = Math.max(brute,
          Math.abs(((x - placed.x[0]) / (placed.x[1] - placed.x[0])) * placed.w - ((x - drawn.x[0]) / (drawn.x[1] - drawn.x[0])) * drawn.w),
          Math.abs(((y - placed.y[0]) / (placed.y[1] - placed.y[0])) * placed.h - ((y - drawn.y[0]) / (drawn.y[1] - drawn.y[0])) * drawn.h));
      }
      expect(labelShift(placed, drawn)).toBeCloseTo(brute, 9);
      if (!labelsStillClear(placed, drawn)) continue;
      expect(brute).toBeLessThanOrEqual(LABEL_PAD + 1e-9);
      const pts = Array.from({ length: 120 }, () => ({ x: placed.x[0] + rng.uniform() * (placed.x[1] - placed.x[0]), y: placed.y[0] + rng.uniform() * (placed.y[1] - placed.y[0]), text: (rng.uniform() * 99).toFixed(1), priority: rng.uniform() }));
      const toPx = (q: PlotGeometry, p: { x: number; y: number }) => ({ px: ((p.x - q.x[0]) / (q.x[1] - q.x[0])) * q.w, py: q.h - ((p.y - q.y[0]) / (q.y[1] - q.y[0])) * q.h });
      const kept = placeLabels(pts.map((p) => ({ ...toPx(placed, p), text: p.text, priority: p.priority })), placed.w, placed.h);
      // Where the drawn figure puts each kept label: its text box (the box less its clear space) at the drawn apex.
      const boxes = kept.map((k) => {
        const b = labelBox({ ...toPx(drawn, pts[k.index]), text: pts[k.index].text, priority: 0 }, k.spot);
        return { left: b.left + LABEL_PAD, right: b.right - LABEL_PAD, top: b.top + LABEL_PAD, bottom: b.bottom - LABEL_PAD };
      });
      for (let a = 0; a < boxes.length; a++) {
        for (let b = a + 1; b < boxes.length; b++) {
          const p = boxes[a], q = boxes[b];
          if (p.left < q.right - 1e-9 && q.left < p.right - 1e-9 && p.top < q.bottom - 1e-9 && q.top < p.bottom - 1e-9) overlapping++;
        }
      }
      checked++;
    }
    expect(overlapping).toBe(0);
    expect(checked).toBeGreaterThan(15);
  });
});
