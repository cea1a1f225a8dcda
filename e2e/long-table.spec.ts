import { expect, test, type Locator, type Page } from '@playwright/test';
import { rmSync } from 'node:fs';
import { addStep, openWithDemo, settled, writeNoisyCsv } from './helpers.ts';

// Issue 16, "the page draws little": on a long noisy trace the peak table (up to 500 rows) and the loss ledger
// (up to 300) draw only the rows in or near their scrolled box; spacer rows keep the scrollbar honest, and
// aria-rowcount / aria-rowindex tell assistive technology the whole count and each drawn row's place.

/** Scroll a table's box to `fraction` of its range and wait two frames for the rows of that place. */
async function scrollBox(table: Locator, fraction: number): Promise<void> {
  await table.evaluate((t, f) => {
    const wrap = t.parentElement as HTMLElement;
    wrap.scrollTop = f * (wrap.scrollHeight - wrap.clientHeight);
  }, fraction);
  await table.page().evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
}

/** What the table draws now: its row count, the drawn rows' aria-rowindex, the spacers, the box. */
async function drawn(table: Locator) {
  return table.evaluate((t) => {
    const wrap = t.parentElement as HTMLElement;
    const rows = Array.from(t.querySelectorAll('tbody tr')) as HTMLTableRowElement[];
    return {
      rowCount: Number(t.getAttribute('aria-rowcount')),
      trs: rows.length,
      indices: rows.filter((r) => r.hasAttribute('aria-rowindex')).map((r) => Number(r.getAttribute('aria-rowindex'))),
      labels: rows.map((r) => r.getAttribute('aria-label') ?? ''),
      spacers: rows.filter((r) => r.classList.contains('spacer')).map((r) => ({ hidden: r.getAttribute('aria-hidden'), cells: r.cells.length, span: r.cells[0].colSpan })),
      box: wrap.clientHeight,
      scrollHeight: wrap.scrollHeight,
      headerCols: t.querySelectorAll('thead th[scope="col"]').length,
    };
  });
}

/** The drawn rows at the bottom of the box: the last one is the table's last row, no row is missing between. */
async function checkBottom(table: Locator, cap: number): Promise<void> {
  await scrollBox(table, 1);
  // Heights measured on the way may move the bottom once: scroll again to the new end.
  await scrollBox(table, 1);
  const d = await drawn(table);
  expect(d.indices.at(-1)).toBe(d.rowCount);
  expect(d.indices).toEqual(Array.from({ length: d.indices.length }, (_, k) => d.indices[0] + k));
  expect(d.trs).toBeLessThan(cap / 4);
  // At the bottom only the spacer above is left.
  expect(d.spacers).toEqual([{ hidden: 'true', cells: 1, span: d.headerCols }]);
}

async function longTrace(page: Page, file: string): Promise<void> {
  await openWithDemo(page);
  await page.getByTestId('file-input').setInputFiles(file);
  await expect(page.getByRole('heading', { name: /long-table\.csv/ })).toBeVisible({ timeout: 90_000 });
}

test('10⁵ noisy points: the peak table and the ledger draw only the rows near their box, and all rows are reachable', async ({ page }) => {
  test.setTimeout(240_000);
  // Invented: eight Gaussian peaks on 10⁵ points of seeded white noise (the project's generator); the noise gives
  // some three hundred candidates below the detection limit (kept and marked), so the table is long.
  const { file, dir } = writeNoisyCsv({
    name: 'long-table.csv', points: 100_000, seed: 1616, header: 'time (min),signal (mAU)', dx: 0.0001, xDigits: 4,
    peaks: Array.from({ length: 8 }, (_, k) => [10_000 + 11_000 * k, 8 + 6 * k, 20 + 5 * k] as const),
  });
  const shots = process.env.TRACEWRIGHT_SHOTS;
  try {
    await page.setViewportSize({ width: 1280, height: 900 });
    await longTrace(page, file);
    await settled(page);
    const panel = page.getByTestId('peak-panel');
    await expect(panel.getByTestId('peak-summary')).toContainText(/below the detection limit/, { timeout: 60_000 });
    // Every stage in (noise bumps, S/N carried through the steps): the rows no longer change under the scroll checks.
    await expect(panel).not.toHaveAttribute('data-provisional', 'true', { timeout: 60_000 });
    await expect(panel).not.toHaveAttribute('data-snr-provisional', 'true', { timeout: 60_000 });
    await settled(page);
    const table = page.getByTestId('peak-table');
    await expect(table).toHaveAttribute('data-windowed', 'true');
    await table.scrollIntoViewIfNeeded();
    // At the top: the header row and every peak row counted, far fewer drawn, rows 2, 3, … in order, one spacer below.
    const top = await drawn(table);
    const peakRows = top.rowCount - 1;
    expect(peakRows).toBeGreaterThan(200);
    expect(top.trs).toBeLessThan(100);
    expect(top.indices.slice(0, 3)).toEqual([2, 3, 4]);
    expect(top.labels[0]).toMatch(/^Peak 1 at /);
    expect(top.spacers).toEqual([{ hidden: 'true', cells: 1, span: top.headerCols }]);
    // The box is bounded: a few dozen rows in view.
    expect(top.box).toBeLessThanOrEqual(420);
    await expect(table.locator('caption')).toHaveCount(1);

    // Half-way: rows around the middle, spacers above and below; the header stays aligned with the cells.
    await scrollBox(table, 0.5);
    const mid = await drawn(table);
    expect(mid.spacers).toHaveLength(2);
    const half = Math.round(peakRows / 2) + 1;
    expect(mid.indices).toContain(half);
    expect(mid.indices[0]).toBeGreaterThan(half - 50);
    expect(mid.indices.at(-1)).toBeLessThan(half + 50);
    expect(mid.indices).toEqual(Array.from({ length: mid.indices.length }, (_, k) => mid.indices[0] + k));
    const aligned = await table.evaluate((t) => {
      const heads = Array.from(t.querySelectorAll('thead th')) as HTMLElement[];
      const row = t.querySelector('tbody tr[aria-rowindex]') as HTMLTableRowElement;
      return heads.map((h, k) => Math.abs(h.getBoundingClientRect().left - row.cells[k].getBoundingClientRect().left));
    });
    expect(Math.max(...aligned)).toBeLessThan(1);
    if (shots) await page.screenshot({ path: `${shots}/long-table-middle.png` });

    // No row jumps: scrolled up in steps of 150 px through rows not measured yet, a row in view before moves down by
    // exactly the step (estimated heights replaced by measured ones are made up for above it).
    for (let step = 0; step < 4; step++) {
      const before = await table.evaluate((t) => {
        const wrap = t.parentElement as HTMLElement;
        const box = wrap.getBoundingClientRect();
        const row = (Array.from(t.querySelectorAll('tbody tr[aria-rowindex]')) as HTMLElement[]).find((r) => r.getBoundingClientRect().top > box.top + 60)!;
        return { key: row.dataset.rowKey!, top: row.getBoundingClientRect().top - box.top, scrollTop: wrap.scrollTop };
      });
      await table.evaluate((t) => { (t.parentElement as HTMLElement).scrollTop -= 150; });
      await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(() => requestAnimationFrame(r)))));
      const after = await table.evaluate((t, key) => {
        const wrap = t.parentElement as HTMLElement;
        const row = t.querySelector(`tbody tr[data-row-key="${key}"]`) as HTMLElement | null;
        return row ? row.getBoundingClientRect().top - wrap.getBoundingClientRect().top : null;
      }, before.key);
      if (before.scrollTop < 150) break;
      expect(after, `row ${before.key} after scrolling up 150 px`).not.toBeNull();
      expect(Math.abs(after! - (before.top + 150)), `step ${step}, row ${before.key}: at ${before.top} px (scrollTop ${before.scrollTop}), then ${after} px`).toBeLessThan(1);
    }

    // A click on a drawn row far down still zooms to its peak and marks it selected.
    const deep = table.locator('tbody tr[aria-rowindex]').nth(5);
    const deepLabel = await deep.getAttribute('aria-label');
    await deep.click();
    await expect(table.locator('tbody tr.selected')).toHaveAttribute('aria-label', deepLabel!);
    // Its details open as a row of their own: the rows after it count one more, and the table one more in all.
    const selectedRow = table.locator('tbody tr.selected');
    const at = Number(await selectedRow.getAttribute('aria-rowindex'));
    await selectedRow.getByTestId('row-details').click();
    await expect(table.getByTestId('peak-detail')).toHaveAttribute('aria-rowindex', String(at + 1));
    await expect(table).toHaveAttribute('aria-rowcount', String(peakRows + 2));
    await expect(table.locator(`tbody tr[aria-rowindex="${at + 2}"]`)).toHaveAttribute('aria-label', new RegExp(`^Peak ${at} at `));
    await selectedRow.getByTestId('row-details').click();
    await expect(table.getByTestId('peak-detail')).toHaveCount(0);
    await expect(table).toHaveAttribute('aria-rowcount', String(peakRows + 1));

    // The bottom: the last rows are drawn with their places, the last peak's last.
    await checkBottom(table, peakRows);
    const bottomLabels = (await drawn(table)).labels.filter(Boolean);
    expect(bottomLabels.at(-1)).toMatch(new RegExp(`^Peak ${peakRows} at `));
    if (shots) await page.screenshot({ path: `${shots}/long-table-bottom.png` });

    // Re-sorted with a row focused: focus stays with that peak (or leaves the table when its row is no longer drawn), never on another peak.
    await scrollBox(table, 0);
    const first = table.locator('tbody tr[aria-rowindex]').first();
    const apex = /at (\S+);/.exec((await first.getAttribute('aria-label'))!)![1];
    await first.focus();
    const orderBefore = await page.locator('#peak-order').inputValue();
    await page.evaluate(() => {
      const sel = document.querySelector('#peak-order') as HTMLSelectElement;
      Object.getOwnPropertyDescriptor(HTMLSelectElement.prototype, 'value')!.set!.call(sel, sel.value === 'x' ? 'snr' : 'x');
      sel.dispatchEvent(new Event('change', { bubbles: true }));
    });
    await expect.poll(() => page.evaluate(() => (document.querySelector('#peak-order') as HTMLSelectElement).value)).not.toBe(orderBefore);
    const focused = await page.evaluate(() => document.activeElement?.getAttribute('aria-label') ?? document.activeElement?.tagName ?? '');
    expect(focused === 'BODY' || focused.includes(`at ${apex};`), focused).toBe(true);

    // The ledger: a step and the noise-level rows make it long (up to 300 rows); it too draws only near its box.
    await addStep(page, 'moving-average');
    await settled(page);
    await page.getByTestId('ledger-noise-toggle').check();
    await settled(page);
    const ledger = page.getByTestId('ledger');
    await expect(ledger).toHaveAttribute('data-windowed', 'true', { timeout: 60_000 });
    await ledger.scrollIntoViewIfNeeded();
    const l = await drawn(ledger);
    expect(l.rowCount).toBeGreaterThan(61);
    expect(l.trs).toBeLessThan(100);
    await checkBottom(ledger, l.rowCount);
    if (shots) await page.screenshot({ path: `${shots}/long-ledger-bottom.png` });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
