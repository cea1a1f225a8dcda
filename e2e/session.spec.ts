import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { openWithDemo, sessionSaved, trace } from './helpers.ts';

// Issue 13, "Nothing is lost": every edit survives a reload that follows at once; the undo history
// comes back; a browser that keeps nothing says so once and offers a session file, which loads back;
// a session that failed to draw is not restored again without asking.

async function addStep(page: Page, id: string) {
  await page.selectOption('#add-step-choice', id);
  await page.getByRole('button', { name: 'Add step' }).click();
}

/** The demo, with its traces stored in the browser's database (edits after this only touch the small parts). */
async function openStored(page: Page) {
  await openWithDemo(page);
  await sessionSaved(page);
}


async function expectRestored(page: Page, points = 1201) {
  await expect(page.getByTestId('notice-info').or(page.getByTestId('notice-warning')).filter({ hasText: 'previous session was restored' })).toBeVisible({ timeout: 30_000 });
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length ?? 0, { timeout: 30_000 }).toBe(points);
}

async function markRange(page: Page, from: number, to: number) {
  await page.getByRole('button', { name: 'Mark a range' }).click();
  const box = await page.evaluate(([a, b]) => {
    const gd = document.querySelector('[data-testid="figure"]') as unknown as { _fullLayout: { xaxis: { l2p: (v: number) => number; _offset: number }; yaxis: { _offset: number; _length: number } } };
    const r = (gd as unknown as HTMLElement).getBoundingClientRect();
    const xa = gd._fullLayout.xaxis, ya = gd._fullLayout.yaxis;
    return { x0: r.left + xa._offset + xa.l2p(a), x1: r.left + xa._offset + xa.l2p(b), y: r.top + ya._offset + ya._length / 2 };
  }, [from, to]);
  await page.mouse.move(box.x0, box.y);
  await page.mouse.down();
  await page.mouse.move((box.x0 + box.x1) / 2, box.y, { steps: 5 });
  await page.mouse.move(box.x1, box.y, { steps: 5 });
  await page.mouse.up();
}

test('each kind of edit followed at once by a reload is kept: steps, a loaded method, the quiet range, hand peaks, alternatives, and the undo history', async ({ page }) => {
  test.setTimeout(240_000);
  await openStored(page);

  // A step, and a reload at once.
  await addStep(page, 'savitzky-golay');
  await page.reload();
  await expectRestored(page);
  await expect(page.locator('.steps .step-title')).toHaveText(['Savitzky–Golay']);

  // A processing method loaded from a file, and a reload at once.
  const method = { format: 'tracewright-recipe', version: 1, steps: [{ step: 'despike', params: {} }, { step: 'moving-average', params: { window: 7 } }] };
  await page.getByTestId('recipe-input').setInputFiles({ name: 'method.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(method)) });
  await expect(page.locator('.steps .step-title')).toHaveText(['Remove spikes', 'Moving average']);
  await page.reload();
  await expectRestored(page);
  await expect(page.locator('.steps .step-title')).toHaveText(['Remove spikes', 'Moving average']);
  // The undo history came back with it: one undo gives the stack before the method.
  await expect(page.getByRole('button', { name: 'Undo' })).toBeEnabled();
  await page.getByRole('button', { name: 'Undo' }).click();
  await expect(page.locator('.steps .step-title')).toHaveText(['Savitzky–Golay']);
  await page.getByRole('button', { name: 'Redo' }).click();
  await expect(page.locator('.steps .step-title')).toHaveText(['Remove spikes', 'Moving average']);

  // A quiet range (peak-free in the demo's ground truth), and a reload at once.
  await markRange(page, 9.2, 9.8);
  await page.getByRole('button', { name: 'Use the marked range as quiet baseline' }).click();
  await page.reload();
  await expectRestored(page);
  await expect(page.getByTestId('noise-panel')).toContainText(/Quiet range: 9\.\d+ – 9\.\d+/);
  await expect(page.locator('#noise-method')).toHaveValue('rms');

  // A peak removed by hand, and a reload at once.
  await expect(page.getByRole('button', { name: 'Remove peak 1', exact: true })).toBeVisible({ timeout: 30_000 });
  await page.getByRole('button', { name: 'Remove peak 1', exact: true }).click();
  await page.reload();
  await expectRestored(page);
  await expect(page.getByTestId('peak-table')).toContainText('removed by hand', { timeout: 30_000 });

  // An alternative for the loss check, and a reload at once.
  await page.getByRole('button', { name: '3-point moving average' }).click();
  await page.reload();
  await expectRestored(page);
  await expect(page.getByTestId('loss-panel').locator('.alt-list')).toContainText('3-point moving average');
});

test('when the browser keeps nothing, the page says so once, keeps working, and the session saved to a file loads back elsewhere', async ({ page, browser }) => {
  test.setTimeout(180_000);
  // A private window with storage refused: no database, and the small store is full.
  await page.addInitScript(() => {
    // Init scripts also run in the service worker, which has no window.
    if (typeof window === 'undefined') return;
    Object.defineProperty(window, 'indexedDB', { configurable: true, get() { throw new DOMException('Access to storage is not allowed.', 'SecurityError'); } });
    Storage.prototype.setItem = function refuse() { throw new DOMException('The quota has been exceeded.', 'QuotaExceededError'); };
  });
  await openWithDemo(page);
  const banner = page.getByTestId('session-problem');
  await expect(banner).toBeVisible({ timeout: 20_000 });
  await expect(banner).toContainText('Your work is not being kept in this browser');
  await addStep(page, 'savitzky-golay');
  await addStep(page, 'baseline');
  await expect.poll(async () => (await trace(page, 'residual (raw − processed)'))?.y.some((v) => v !== 0)).toBe(true);
  // Said once: one message, however many saves failed.
  await expect(banner).toHaveCount(1);
  await expect(page.locator('.notice').filter({ hasText: 'could not be kept' })).toHaveCount(0);
  await expect(page.getByTestId('session-status')).toContainText('not kept in this browser');

  const [download] = await Promise.all([page.waitForEvent('download'), banner.getByTestId('save-session-file').click()]);
  expect(download.suggestedFilename()).toMatch(/^tracewright-session-.*\.json$/);
  const file = readFileSync((await download.path())!);
  const parsed = JSON.parse(file.toString('utf8'));
  expect(parsed.format).toBe('tracewright-session-file');
  expect(parsed.caution).toMatch(/not a validated system/i);

  // Another browser profile with working storage: open the file, confirm, and everything is back.
  const other = await browser.newContext();
  const page2 = await other.newPage();
  await openWithDemo(page2);
  await page2.getByTestId('session-file-input').first().setInputFiles({ name: 'my-session.json', mimeType: 'application/json', buffer: file });
  await page2.getByTestId('session-replace').getByRole('button', { name: 'Replace' }).click();
  const steps = await page.locator('.steps .step-title').allInnerTexts();
  expect(steps).toHaveLength(2);
  await expect(page2.locator('.steps .step-title')).toHaveText(steps);
  await expect(page2.getByTestId('notice-info').filter({ hasText: 'Session opened from my-session.json' })).toBeVisible();
  const a = (await trace(page, 'raw'))!;
  await expect.poll(async () => (await trace(page2, 'raw'))?.y.length).toBe(a.y.length);
  expect((await trace(page2, 'raw'))!.y).toEqual(a.y);
  await expect(page2.getByRole('button', { name: 'Undo' })).toBeEnabled();
  await other.close();
});

test('a session whose plot failed to draw is not restored without asking; the plot area says what failed and the rest works', async ({ page }) => {
  test.setTimeout(180_000);
  // A drawing fault injected into the browser itself (the page has no switch for this): text measuring throws once asked to.
  await page.addInitScript(() => {
    if (typeof SVGGraphicsElement === 'undefined') return;
    const measure = SVGGraphicsElement.prototype.getBBox;
    SVGGraphicsElement.prototype.getBBox = function faulty(this: SVGGraphicsElement) {
      if ((window as unknown as { __breakDrawing?: boolean }).__breakDrawing) throw new Error('injected drawing fault');
      return measure.call(this);
    };
    const rect = Element.prototype.getBoundingClientRect;
    Element.prototype.getBoundingClientRect = function faulty(this: Element) {
      if ((window as unknown as { __breakDrawing?: boolean }).__breakDrawing && this.closest?.('.js-plotly-plot')) throw new Error('injected drawing fault');
      return rect.call(this);
    };
  });
  await openStored(page);
  await page.evaluate(() => { (window as unknown as { __breakDrawing?: boolean }).__breakDrawing = true; });
  await page.getByTestId('file-input').setInputFiles('test/fixtures/hostile/x-descending.csv');
  const failed = page.getByTestId('figure-failed').or(page.getByTestId('part-failed'));
  await expect(failed.first()).toBeVisible({ timeout: 30_000 });
  await expect(failed.first()).toContainText('injected drawing fault');
  // The rest of the page still works: the steps, the noise panel, the export buttons.
  await addStep(page, 'moving-average');
  await expect(page.locator('.steps .step-title')).toHaveText(['Moving average']);
  await expect(page.getByTestId('export-panel')).toBeVisible();
  await expect(page.getByRole('heading', { name: /x-descending\.csv/ })).toBeVisible();
  await sessionSaved(page);

  // After a reload the page asks first instead of drawing the same thing into the same failure.
  await page.reload();
  const choice = page.getByTestId('start-choice');
  await expect(choice).toBeVisible({ timeout: 30_000 });
  await expect(choice).toContainText('injected drawing fault');
  await expect(page.getByRole('heading', { name: /x-descending\.csv/ })).toHaveCount(0);
  // Restoring anyway brings it back (the fault is gone after the reload).
  await choice.getByRole('button', { name: 'Restore it anyway' }).click();
  await expect(page.getByRole('heading', { name: /x-descending\.csv/ })).toBeVisible({ timeout: 30_000 });
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length).toBe(10);
  await expect(page.locator('.steps .step-title')).toHaveText(['Moving average']);
  // Drawn once, the question is not asked again.
  await page.reload();
  await expectRestored(page, 10);
  await expect(page.getByTestId('start-choice')).toHaveCount(0);
});

test('starting without the failed session opens the demo', async ({ page }) => {
  await openStored(page);
  await page.getByTestId('file-input').setInputFiles('test/fixtures/hostile/x-descending.csv');
  await expect(page.getByRole('heading', { name: /x-descending\.csv/ })).toBeVisible();
  await sessionSaved(page);
  await page.evaluate(() => localStorage.setItem('tracewright-draw-health', JSON.stringify({ state: 'failed', at: new Date().toISOString(), message: 'the plot: a fault' })));
  await page.reload();
  await expect(page.getByTestId('start-choice')).toBeVisible({ timeout: 30_000 });
  await page.getByTestId('start-choice').getByRole('button', { name: 'Start without it' }).click();
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible({ timeout: 30_000 });
  await expect(page.getByTestId('start-choice')).toHaveCount(0);
});
