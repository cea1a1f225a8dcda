/**
 * src/ui/WindowedTable.tsx: a long table draws only the rows in or near its
 * scrolled box, as it is first drawn (static markup, before any scroll or
 * measurement: the box taken as its 420-pixel max-height, rows as 26 px).
 * Checked by properties that follow from the definition (common practice for
 * windowed lists and WAI-ARIA 1.2's aria-rowcount / aria-rowindex, from
 * memory): the table says how many rows it has in all; each drawn row says
 * its place; a spacer row, hidden from assistive technology, stands for the
 * rows not drawn with their estimated height; a short table draws every row
 * and no spacer; an empty table shows its message. The arithmetic itself is
 * tested in test/ui/windowed-rows.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { WindowedTable, type RowAttrs, type WindowedTableProps } from '../../src/ui/WindowedTable.tsx';
import { DRAW_ALL_UP_TO, FIRST_BOX_ESTIMATE, FIRST_ROW_ESTIMATE, OVERSCAN, rowWindow } from '../../src/ui/windowed-rows.ts';

function table(n: number, extra: Partial<WindowedTableProps> = {}): string {
  const keys = Array.from({ length: n }, (_, i) => `peak-${(i * 37) % 1009}`);
  const props: WindowedTableProps = {
    label: 'Test table (scrolls)', className: 'data', testId: 't', keys, columns: 3,
    head: createElement('thead', null, createElement('tr', { 'aria-rowindex': 1 }, createElement('th', { scope: 'col' }, 'A'))),
    row: (i: number, attrs: RowAttrs) => createElement('tr', { key: keys[i], ...attrs }, createElement('td', null, `row ${i}`)),
    empty: createElement('tr', null, createElement('td', null, 'Nothing here.')),
    ...extra,
  };
  return renderToStaticMarkup(createElement(WindowedTable, props));
}

/** The drawn rows: each with its aria-rowindex, key and text. */
const drawn = (h: string) => Array.from(h.matchAll(/<tr aria-rowindex="(\d+)" data-row-key="([^"]+)"><td>row (\d+)<\/td><\/tr>/g)).map((m) => ({ index: Number(m[1]), key: m[2], i: Number(m[3]) }));
const spacers = (h: string) => Array.from(h.matchAll(/<tr class="spacer" aria-hidden="true"><td colSpan="3" style="height:([\d.]+)px"><\/td><\/tr>/g)).map((m) => Number(m[1]));

describe('WindowedTable', () => {
  it('500 rows: the table counts all of them; it draws the first box-full and the overscan, and one spacer for the rest', () => {
    const h = table(500);
    expect(h).toContain('aria-rowcount="501"');
    expect(h).toContain('role="region"');
    expect(h).toContain('aria-label="Test table (scrolls)"');
    expect(h).toContain('tabindex="0"');
    const rows = drawn(h);
    const want = rowWindow(new Array<number>(500).fill(FIRST_ROW_ESTIMATE), { scrollTop: 0, boxHeight: FIRST_BOX_ESTIMATE, headHeight: 0 });
    expect(rows.map((r) => r.i)).toEqual(Array.from({ length: want.end }, (_, i) => i));
    // Far fewer rows than 500: the box's rows (420 / 26, rounded up) and the overscan below.
    expect(rows.length).toBe(Math.ceil(FIRST_BOX_ESTIMATE / FIRST_ROW_ESTIMATE) + OVERSCAN);
    // aria-rowindex: the header is row 1, data row i is row i + 2; keys are the rows' identities, not their positions.
    rows.forEach((r) => { expect(r.index).toBe(r.i + 2); expect(r.key).toBe(`peak-${(r.i * 37) % 1009}`); });
    // No spacer above at the top; the one below is as tall as the rows not drawn.
    expect(spacers(h)).toEqual([(500 - rows.length) * FIRST_ROW_ESTIMATE]);
    expect(h).not.toContain('Nothing here.');
  });

  it(`at most ${DRAW_ALL_UP_TO} rows: every row, no spacer`, () => {
    for (const n of [1, 2, DRAW_ALL_UP_TO]) {
      const h = table(n);
      expect(drawn(h).map((r) => r.i)).toEqual(Array.from({ length: n }, (_, i) => i));
      expect(spacers(h)).toEqual([]);
      expect(h).toContain(`aria-rowcount="${n + 1}"`);
    }
    expect(spacers(table(DRAW_ALL_UP_TO + 1))).toHaveLength(1);
  });

  it('no rows: the empty message, no spacer; a caller’s own row count and row index (rows of their own inside) are used', () => {
    const e = table(0);
    expect(e).toContain('Nothing here.');
    expect(drawn(e)).toEqual([]);
    expect(spacers(e)).toEqual([]);
    // The message row is the only body row: every row is in the page, so no count is given.
    expect(e).not.toContain('aria-rowcount');
    // As the peak table does when row 0 has its detail row open: the rows after it count one more.
    const h = table(100, { rowIndex: (i) => i + 2 + (i > 0 ? 1 : 0), rowCount: 102 });
    expect(h).toContain('aria-rowcount="102"');
    expect(drawn(h).slice(0, 3).map((r) => r.index)).toEqual([2, 4, 5]);
  });
});
