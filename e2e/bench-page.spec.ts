import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { addStep, download, openWithDemo, plotted, settled } from './helpers.ts';

// Issue 17, the page at the bench: the self-check in two clicks, the peak table at 1,280 px, labels and legend
// keys, ranges excluded from peak finding, the first-use guide and the shortcuts. Demo data: scripts/make-demo.mjs,
// truth in public/demo/demo-truth.json (invented).
const truth = JSON.parse(readFileSync('public/demo/demo-truth.json', 'utf8')) as { peaks: { label: string; centre: number; height: number; sigma: number }[] };

/** A peak-table row whose apex reads within 0.01 of x (two decimals, either side). */
const apexRow = (x: number) => new RegExp(`^\\d+\\s*(${[x - 0.01, x, x + 0.01].map((v) => v.toFixed(2).replace('.', '\\.')).join('|')})`);

const VERDICTS = ['kept', 'weakened', 'lost', 'appears only after processing', 'not found'];

/** Page pixel of a data point on the main plot. */
async function pixelOf(page: Page, x: number, y: number): Promise<{ x: number; y: number }> {
  return page.evaluate(([dx, dy]) => {
    const gd = document.querySelector('[data-testid="figure"]') as unknown as HTMLElement & { _fullLayout: { xaxis: { l2p: (v: number) => number; _offset: number }; yaxis: { l2p: (v: number) => number; _offset: number } } };
    const r = gd.getBoundingClientRect();
    const xa = gd._fullLayout.xaxis, ya = gd._fullLayout.yaxis;
    return { x: r.left + xa._offset + xa.l2p(dx), y: r.top + ya._offset + ya.l2p(dy) };
  }, [x, y]);
}

test('the self-check in two clicks: a peak-table row or a peak on the plot shows that feature under each choice', async ({ page }) => {
  await openWithDemo(page);
  await addStep(page, 'moving-average');
  await page.getByRole('button', { name: /^5-point moving average/ }).click();
  await settled(page);
  // The ledger's header says once what changes are measured against.
  const loss = page.getByTestId('loss-panel');
  await expect(loss.getByTestId('loss-header')).toContainText('against the least-processed column that has it');
  expect((await loss.innerText()).split('least-processed column').length - 1).toBe(1);
  // Noise-level features are behind the toggle: more rows with it on.
  const rowsDefault = await page.getByTestId('ledger').locator('tbody tr').count();
  await page.getByTestId('ledger-noise-toggle').check();
  await expect.poll(() => page.getByTestId('ledger').locator('tbody tr').count()).toBeGreaterThan(rowsDefault);
  await page.getByTestId('ledger-noise-toggle').uncheck();

  // Click one: the row of the large peak at 4.3 min.
  const big = truth.peaks.reduce((a, b) => (b.height > a.height ? b : a));
  await page.getByTestId('peak-table').locator('tbody tr').filter({ hasText: apexRow(big.centre) }).first().click();
  const focus = page.getByTestId('focus-view');
  await expect(focus).toBeVisible();
  expect(Math.abs(Number(await focus.getAttribute('data-position')) - big.centre)).toBeLessThan(big.sigma);
  // Raw, the current stack and the alternative, side by side, each with S/N, height and area, and a verdict word.
  const cards = focus.locator('figure');
  await expect(cards).toHaveCount(3);
  await expect(cards.nth(0).getByTestId('focus-verdict')).toHaveText('reference');
  for (const k of [1, 2]) {
    expect(VERDICTS).toContain(await cards.nth(k).getByTestId('focus-verdict').innerText());
    await expect(cards.nth(k)).toContainText(/S\/N\s*\d/);
    await expect(cards.nth(k)).toContainText(/height\s*[\d.]+ mAU \([+−-]?[\d.]+ %\)/);
    await expect(cards.nth(k)).toContainText(/area\s*[\d.]+ mAU·min/);
  }
  // A 5-point average keeps a peak this large: the verdict is kept (its height within 80 % of raw).
  await expect(cards.nth(2).getByTestId('focus-verdict')).toHaveText('kept');
  // The small plots share one y scale (drawn in one SVG box size) and show the stretch around the feature.
  await expect(focus.locator('svg[role="img"]')).toHaveCount(3);
  await expect(focus).toContainText('one y scale for all');

  // Click two: a different peak, straight on the plot (the zoom from the row click is undone first).
  await page.keyboard.press('w');
  await settled(page);
  const other = truth.peaks.filter((p) => p.height > 1 && Math.abs(p.centre - big.centre) > 1)[0];
  const processed = (await plotted(page)).find((t) => t.name === 'processed')!;
  const i = processed.x.findIndex((v) => v >= other.centre);
  await page.getByTestId('figure').scrollIntoViewIfNeeded();
  const at = await pixelOf(page, processed.x[i], processed.y[i]);
  await page.mouse.click(at.x, at.y);
  await expect.poll(async () => Math.abs(Number(await focus.getAttribute('data-position')) - other.centre)).toBeLessThan(other.sigma * 2);
  await expect(cards).toHaveCount(3);
  await focus.getByRole('button', { name: 'close' }).click();
  await expect(focus).toHaveCount(0);
});

test('at 1,280 px the peak table fits the window with status and decision in view; columns shown and hidden are remembered', async ({ page }) => {
  await page.setViewportSize({ width: 1280, height: 800 });
  await openWithDemo(page);
  await settled(page);
  const table = page.getByTestId('peak-table');
  await table.scrollIntoViewIfNeeded();
  const fits = async () => page.evaluate(() => {
    const t = document.querySelector('[data-testid="peak-table"]') as HTMLElement;
    const wrap = t.parentElement as HTMLElement;
    const heads = Array.from(t.querySelectorAll('thead th')) as HTMLElement[];
    const edge = (col: string) => heads.find((h) => h.dataset.col === col)!.getBoundingClientRect().right;
    return { right: t.getBoundingClientRect().right, window: window.innerWidth, scroll: wrap.scrollWidth - wrap.clientWidth, status: edge('status'), decision: edge('decision') };
  });
  const f = await fits();
  expect(f.right).toBeLessThanOrEqual(f.window);
  expect(f.scroll).toBeLessThanOrEqual(0);
  expect(f.status).toBeLessThanOrEqual(f.window);
  expect(f.decision).toBeLessThanOrEqual(f.window);
  await expect(table.locator('thead th', { hasText: 'Status and marks' })).toBeInViewport();
  await expect(table.locator('thead th', { hasText: 'Decision' })).toBeInViewport();
  // A hidden column is in each row's details.
  await expect(table.locator('thead th', { hasText: 'FWHM' })).toHaveCount(0);
  await table.locator('tbody tr').first().getByTestId('row-details').click();
  await expect(table.getByTestId('peak-detail')).toContainText('FWHM (min)');
  await expect(table.getByTestId('peak-detail')).toContainText('Why these start and end');
  // Shown by choice, and remembered after a reload.
  await page.getByTestId('column-chooser').locator('summary').click();
  await page.getByTestId('col-fwhm').check();
  await expect(table.locator('thead th', { hasText: 'FWHM' })).toHaveCount(1);
  await page.reload();
  await expect(page.getByTestId('peak-table').locator('thead th', { hasText: 'FWHM' })).toHaveCount(1, { timeout: 20_000 });
});

test('labels on the plot never overlap, and every marker shape has a key in the legend', async ({ page }) => {
  await page.setViewportSize({ width: 1280, height: 800 });
  await openWithDemo(page);
  await addStep(page, 'moving-average');
  await settled(page);
  await expect(page.getByTestId('figure').locator('.textpoint text').first()).toBeVisible();
  const check = async () => page.evaluate(() => {
    const boxes = Array.from(document.querySelectorAll('[data-testid="figure"] .textpoint text')).map((t) => t.getBoundingClientRect()).filter((r) => r.width > 0);
    let overlaps = 0;
    for (let a = 0; a < boxes.length; a++) for (let b = a + 1; b < boxes.length; b++) {
      const p = boxes[a], q = boxes[b];
      if (p.left < q.right && q.left < p.right && p.top < q.bottom && q.top < p.bottom) overlaps++;
    }
    const gd = document.querySelector('[data-testid="figure"]') as unknown as { data: { name: string; mode?: string; showlegend?: boolean }[] };
    const markerNames = gd.data.filter((t) => (t.mode ?? '').includes('markers') && t.showlegend !== false).map((t) => t.name);
    const keys = Array.from(document.querySelectorAll('[data-testid="figure"] .legendtext')).map((t) => t.textContent ?? '');
    return { labels: boxes.length, overlaps, markerNames, keys };
  });
  const whole = await check();
  expect(whole.labels).toBeGreaterThan(3);
  expect(whole.overlaps).toBe(0);
  for (const n of whole.markerNames) expect(whole.keys).toContain(n);
  expect(whole.keys).toEqual(expect.arrayContaining([expect.stringMatching(/^quantifiable peak/), expect.stringMatching(/^below the detection limit/)]));
  // A narrower window (more labels compete for less room): still no overlap.
  await page.setViewportSize({ width: 1000, height: 800 });
  await settled(page);
  const narrow = await check();
  expect(narrow.overlaps).toBe(0);
});

test('a range excluded from peak finding: shaded, its peaks gone, the trace unchanged, kept in the method and stated in the peak CSV', async ({ page }) => {
  await openWithDemo(page);
  const big = truth.peaks.reduce((a, b) => (b.height > a.height ? b : a));
  const rowOf = () => page.getByTestId('peak-table').locator('tbody tr').filter({ hasText: apexRow(big.centre) });
  await expect(rowOf()).toHaveCount(1);
  const before = (await plotted(page)).find((t) => t.name === 'processed')!;
  await page.getByRole('button', { name: 'Mark a range' }).click();
  const a = await pixelOf(page, big.centre - 4 * big.sigma, big.height / 2), b = await pixelOf(page, big.centre + 4 * big.sigma, big.height / 2);
  await page.mouse.move(a.x, a.y);
  await page.mouse.down();
  await page.mouse.move((a.x + b.x) / 2, a.y + 3, { steps: 4 });
  await page.mouse.move(b.x, a.y + 5, { steps: 4 });
  await page.mouse.up();
  await page.getByRole('button', { name: 'Leave the marked range out of peak finding' }).click();
  await expect(rowOf()).toHaveCount(0);
  await expect(page.getByTestId('excluded-ranges')).toContainText('Left out of peak finding:');
  const shapes = await page.evaluate(() => (document.querySelector('[data-testid="figure"]') as unknown as { layout: { shapes: { name?: string; x0: number; x1: number }[] } }).layout.shapes.filter((s) => s.name === 'left out of peak finding'));
  expect(shapes).toHaveLength(1);
  expect(shapes[0].x0).toBeLessThan(big.centre);
  expect(shapes[0].x1).toBeGreaterThan(big.centre);
  await expect(page.getByTestId('figure').locator('.legendtext', { hasText: 'left out of peak finding' })).toHaveCount(1);
  const after = (await plotted(page)).find((t) => t.name === 'processed')!;
  expect(after.y).toEqual(before.y);
  const csv = (await download(page, 'export-peaks-csv')).text;
  expect(csv).toMatch(/# Excluded from peak finding \(x-units; the trace itself is unchanged[^\n]*\): \d[\d.]* to \d[\d.]*\./);
  const method = JSON.parse((await download(page, 'save-recipe')).text.replace(/^\uFEFF/, '')) as { analysis: { peaks: { excluded: number[][] } } };
  expect(method.analysis.peaks.excluded).toEqual([[shapes[0].x0, shapes[0].x1]]);
  // Put back: the peak returns.
  await page.getByRole('button', { name: /back into peak finding/ }).click();
  await expect(rowOf()).toHaveCount(1);
});

test('the first-use guide opens once, can be closed and reopened; the shortcut list and the shortcuts work', async ({ page }) => {
  await page.goto('/');
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible({ timeout: 20_000 });
  const guide = page.getByTestId('guide');
  await expect(guide).toBeVisible();
  for (const h of ['What to drop here', 'Where the noise comes from', 'What the flags mean']) await expect(guide.getByRole('heading', { name: h })).toBeVisible();
  await page.getByTestId('guide-close').click();
  await expect(guide).toHaveCount(0);
  await page.reload();
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible({ timeout: 20_000 });
  await expect(page.getByTestId('guide')).toHaveCount(0);
  await page.getByTestId('guide-toggle').click();
  await expect(page.getByTestId('guide')).toBeVisible();
  await page.getByTestId('guide-close').click();

  await page.locator('body').click({ position: { x: 2, y: 2 } });
  await page.keyboard.press('?');
  const keys = page.getByTestId('shortcuts');
  await expect(keys).toContainText('undo the last change');
  await expect(keys).toContainText('next / previous peak');
  await page.keyboard.press('?');
  await expect(keys).toHaveCount(0);
  // A: the step menu; then a step added and undone with Ctrl+Z, redone with Ctrl+Y.
  await page.keyboard.press('a');
  await expect(page.locator('#add-step-choice')).toBeFocused();
  await page.selectOption('#add-step-choice', 'moving-average');
  await page.getByRole('button', { name: 'Add step' }).click();
  await expect(page.getByTestId('step-moving-average')).toHaveCount(1);
  await page.locator('body').click({ position: { x: 2, y: 2 } });
  await page.keyboard.press('Control+z');
  await expect(page.getByTestId('step-moving-average')).toHaveCount(0);
  await page.keyboard.press('Control+y');
  await expect(page.getByTestId('step-moving-average')).toHaveCount(1);
  // N and P walk the peaks by position: selected row, zoomed plot, focused view.
  await settled(page);
  await page.locator('body').click({ position: { x: 2, y: 2 } });
  await page.keyboard.press('n');
  const rows = page.getByTestId('peak-table').locator('tbody tr');
  await page.selectOption('#peak-order', 'x');
  await page.locator('body').click({ position: { x: 2, y: 2 } });
  await expect(rows.first()).toHaveClass(/selected/);
  await page.keyboard.press('n');
  await expect(rows.nth(1)).toHaveClass(/selected/);
  await page.keyboard.press('p');
  await expect(rows.first()).toHaveClass(/selected/);
  await expect(page.getByTestId('focus-view')).toBeVisible();
  await page.keyboard.press('Escape');
  await expect(page.getByTestId('focus-view')).toHaveCount(0);
});
