/**
 * src/ui/windowed-rows.ts: which rows of a long table are drawn for a scroll
 * offset. Checked by properties that follow from the definition (common
 * practice for windowed lists): every row is in exactly one of spacer above,
 * drawn rows, spacer below; the spacers are as tall as the rows they stand
 * for; the drawn rows cover the part of the box below the sticky header; the
 * overscan is at most the number asked for on each side. Edge cases: no
 * rows, one row, scrolled past the end, a box taller than the content.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { heightsFromTops, meanHeight, rowHeights, rowWindow, scrollToShow, wholeWindow, type BoxView } from '../../src/ui/windowed-rows.ts';

const sum = (h: ArrayLike<number>, a: number, b: number) => { let s = 0; for (let i = a; i < b; i++) s += h[i]; return s; };

const heightsArb = fc.array(fc.oneof(fc.integer({ min: 18, max: 30 }), fc.integer({ min: 0, max: 200 }), fc.double({ min: 0, max: 120, noNaN: true })), { minLength: 0, maxLength: 600 });
const viewArb = fc.record({ scrollTop: fc.double({ min: -100, max: 40_000, noNaN: true }), boxHeight: fc.double({ min: 0, max: 900, noNaN: true }), headHeight: fc.double({ min: 0, max: 60, noNaN: true }) });

describe('rowWindow', () => {
  it('every row index is in exactly one part: spacer above, drawn, spacer below; spacers are the heights of their rows', () => {
    fc.assert(fc.property(heightsArb, viewArb, fc.integer({ min: 0, max: 30 }), (h, view, over) => {
      const w = rowWindow(h, view, over);
      const parts = new Array<number>(h.length).fill(0);
      for (let i = 0; i < w.start; i++) parts[i]++;
      for (let i = w.start; i < w.end; i++) parts[i]++;
      for (let i = w.end; i < h.length; i++) parts[i]++;
      expect(parts.every((c) => c === 1)).toBe(true);
      expect(w.start).toBeGreaterThanOrEqual(0);
      expect(w.end).toBeLessThanOrEqual(h.length);
      expect(w.before).toBeCloseTo(sum(h, 0, w.start), 6);
      expect(w.after).toBeCloseTo(sum(h, w.end, h.length), 6);
      // At least one row is drawn whenever there is one.
      if (h.length > 0) expect(w.end).toBeGreaterThan(w.start);
    }));
  });

  it('the drawn rows cover the part of the box below the sticky header (the scroll offset clamped to the content)', () => {
    fc.assert(fc.property(heightsArb, viewArb, fc.integer({ min: 0, max: 30 }), (h, view, over) => {
      const w = rowWindow(h, view, over);
      const total = sum(h, 0, h.length);
      const seen = Math.max(0, view.boxHeight - view.headHeight);
      const top = Math.min(Math.max(0, view.scrollTop), Math.max(0, total - seen));
      const bottom = Math.min(total, top + seen);
      // The drawn rows span from at or above the top of the view to at or below its bottom.
      expect(w.before).toBeLessThanOrEqual(top + 1e-6);
      expect(total - w.after).toBeGreaterThanOrEqual(bottom - 1e-6);
    }));
  });

  it('draws at most the visible rows plus the overscan on each side', () => {
    // Rows of equal height make the count of visible rows exact: ceil(seen / h) + 1 at most (a partial row at each edge).
    fc.assert(fc.property(fc.integer({ min: 1, max: 800 }), fc.integer({ min: 10, max: 40 }), viewArb, fc.integer({ min: 0, max: 30 }), (n, rowH, view, over) => {
      const h = new Array<number>(n).fill(rowH);
      const w = rowWindow(h, view, over);
      const seen = Math.max(0, view.boxHeight - view.headHeight);
      expect(w.end - w.start).toBeLessThanOrEqual(Math.ceil(seen / rowH) + 1 + 2 * over);
    }));
  });

  it('500 rows of 26 px in a 420-px box with a 30-px header, overscan 15: 16 rows in view, 46–47 drawn, the scrollbar as tall as all rows', () => {
    const h = new Array<number>(500).fill(26);
    const top = rowWindow(h, { scrollTop: 0, boxHeight: 420, headHeight: 30 }, 15);
    // 390 px below the header hold rows 0..14 (15 × 26 = 390): rows 0–14 and 15 of overscan.
    expect(top).toEqual({ start: 0, end: 30, before: 0, after: 470 * 26 });
    const mid = rowWindow(h, { scrollTop: 260 * 26 + 5, boxHeight: 420, headHeight: 30 }, 15);
    // In view: row 260 (partly) to row 275 (partly, its top at 390 + 5 − 26·15 … ), so 245 … 290.
    expect(mid.start).toBe(245);
    expect(mid.end).toBe(291);
    expect(mid.before + sum(h, mid.start, mid.end) + mid.after).toBe(500 * 26);
  });

  it('edge cases: no rows, one row, scrolled past the end, a box taller than the content, a box of height 0', () => {
    const view: BoxView = { scrollTop: 0, boxHeight: 420, headHeight: 30 };
    expect(rowWindow([], view)).toEqual({ start: 0, end: 0, before: 0, after: 0 });
    expect(rowWindow([26], view)).toEqual({ start: 0, end: 1, before: 0, after: 0 });
    expect(rowWindow([26], { ...view, scrollTop: 9e9 })).toEqual({ start: 0, end: 1, before: 0, after: 0 });
    // Scrolled past the end: the last rows are drawn, as at the bottom of the scroll range.
    const h = new Array<number>(300).fill(20);
    const past = rowWindow(h, { ...view, scrollTop: 1e7 }, 10);
    expect(past.end).toBe(300);
    expect(past).toEqual(rowWindow(h, { ...view, scrollTop: 300 * 20 + 30 - 420 }, 10));
    // 390 px of rows in view from the bottom: rows 280.5 … 299, so 280 − 10 = 270 onwards.
    expect(past.start).toBe(270);
    // A box taller than the content: every row.
    expect(rowWindow(new Array<number>(40).fill(20), { scrollTop: 0, boxHeight: 2000, headHeight: 30 }, 0)).toEqual({ start: 0, end: 40, before: 0, after: 0 });
    // A box of height 0 (not laid out yet) still draws the row at the offset and the overscan.
    expect(rowWindow(h, { scrollTop: 0, boxHeight: 0, headHeight: 0 }, 5)).toEqual({ start: 0, end: 6, before: 0, after: 294 * 20 });
    expect(wholeWindow(7)).toEqual({ start: 0, end: 7, before: 0, after: 0 });
  });
});

describe('row heights', () => {
  it('a measured height follows its key (a re-sorted table keeps each peak’s height); the others take the estimate', () => {
    const measured = new Map([['p3', 40], ['p1', 22]]);
    expect(Array.from(rowHeights(['p1', 'p2', 'p3'], measured, 25))).toEqual([22, 25, 40]);
    expect(Array.from(rowHeights(['p3', 'p2', 'p1'], measured, 25))).toEqual([40, 25, 22]);
    expect(meanHeight(measured)).toBe(31);
    expect(meanHeight(new Map(), 26)).toBe(26);
  });

  it('heights from the tops of the drawn rows: differences, the last one to the bottom edge', () => {
    expect(heightsFromTops([100, 126, 170, 196], 222)).toEqual([26, 44, 26, 26]);
    expect(heightsFromTops([], 0)).toEqual([]);
    fc.assert(fc.property(fc.array(fc.double({ min: 0, max: 100, noNaN: true }), { minLength: 1, maxLength: 50 }), fc.double({ min: 0, max: 1000, noNaN: true }), (hs, top0) => {
      const tops = hs.map((_, k) => top0 + sum(hs, 0, k));
      const got = heightsFromTops(tops, top0 + sum(hs, 0, hs.length));
      got.forEach((g, k) => expect(g).toBeCloseTo(hs[k], 6));
    }));
  });
});

describe('scrollToShow', () => {
  it('a row wholly in view needs no scroll; one outside is brought to the middle of the box, then is in view', () => {
    const h = new Array<number>(500).fill(26);
    const view: BoxView = { scrollTop: 0, boxHeight: 420, headHeight: 30 };
    expect(scrollToShow(h, 3, view)).toBeNull();
    expect(scrollToShow(h, -1, view)).toBeNull();
    expect(scrollToShow(h, 500, view)).toBeNull();
    fc.assert(fc.property(fc.integer({ min: 0, max: 499 }), fc.integer({ min: 0, max: 13_000 }), (i, s) => {
      const to = scrollToShow(h, i, { ...view, scrollTop: s });
      const after = to ?? s;
      // Row i lies between the header's bottom and the box's bottom (when not clamped at the top of the content).
      const rowTop = 30 + 26 * i;
      expect(rowTop).toBeGreaterThanOrEqual(after + 30 - 1e-9);
      expect(rowTop + 26).toBeLessThanOrEqual(after + 420 + 1e-9);
      // The window drawn at the new offset holds row i.
      const w = rowWindow(h, { ...view, scrollTop: after }, 0);
      expect(i).toBeGreaterThanOrEqual(w.start);
      expect(i).toBeLessThan(w.end);
    }));
  });
});
