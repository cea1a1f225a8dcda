import { expect, test, type Page } from '@playwright/test';
import { rmSync } from 'node:fs';
import { openWithDemo, writeNoisyCsv } from './helpers.ts';

/** What identifies one peak table: its counts, the noise-bump sentence and its first rows. */
async function settledTable(page: Page): Promise<string> {
  await expect(page.locator('.busy')).toHaveCount(0, { timeout: 180_000 });
  await expect(page.getByTestId('peak-panel')).not.toHaveAttribute('data-provisional', 'true', { timeout: 180_000 });
  return page.evaluate(() => (window as unknown as { __table: () => string }).__table());
}

/** Set the window and wait for that value's own table: the peak table's result count must move first (the analysis is asked for on the next frame, so "not busy" right after the input can still be the old table). */
async function settledAfter(page: Page, value: number): Promise<string> {
  const panel = page.getByTestId('peak-panel');
  const before = await panel.getAttribute('data-result-seq');
  await setWindow(page, value);
  await expect(panel).not.toHaveAttribute('data-result-seq', before ?? '', { timeout: 180_000 });
  return settledTable(page);
}

async function setWindow(page: Page, value: number): Promise<void> {
  await page.evaluate((v) => {
    const el = document.querySelector<HTMLInputElement>('[data-testid="step-moving-average"] input[type="range"]')!;
    Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, 'value')!.set!.call(el, String(v));
    el.dispatchEvent(new Event('input', { bubbles: true }));
  }, value);
}

test('a drag of 10 slider steps on 10⁶ points ends with the table of the last value, and no earlier value’s table appears after it', async ({ page }) => {
  test.setTimeout(480_000);
  // Invented: three Gaussian peaks on 10⁶ points of seeded white noise (the project's generator), in a temporary CSV.
  const { file, dir } = writeNoisyCsv({ name: 'drag-long.csv', points: 1_000_000, seed: 16, peaks: [[200_000, 30, 15], [500_000, 80, 25], [800_000, 12, 40]] });
  try {
    await openWithDemo(page);
    await page.getByTestId('file-input').setInputFiles(file);
    await expect(page.getByRole('heading', { name: /drag-long\.csv/ })).toBeVisible({ timeout: 90_000 });
    await page.selectOption('#add-step-choice', 'moving-average');
    await page.getByRole('button', { name: 'Add step' }).click();
    await expect(page.getByTestId('step-moving-average').locator('input[type="range"]')).toBeVisible();
    // Every state the peak table passes through, recorded in the page as it changes.
    await page.evaluate(() => {
      const w = window as unknown as { __table: () => string; __seen: string[] };
      w.__table = () => {
        const panel = document.querySelector('[data-testid="peak-panel"]');
        if (!panel) return '';
        const rows = Array.from(panel.querySelectorAll('tbody tr')).slice(0, 5).map((r) => r.textContent);
        return [panel.querySelector('[data-testid="peak-summary"]')?.textContent, panel.querySelector('[data-testid="noise-bumps"]')?.textContent, ...rows].join(' | ');
      };
      w.__seen = [];
      new MutationObserver(() => {
        const panel = document.querySelector('[data-testid="peak-panel"]');
        // Only tables the page shows as final count (a provisional one says so on the page).
        if (!panel || panel.getAttribute('data-provisional') === 'true') return;
        const t = w.__table();
        if (w.__seen.at(-1) !== t) w.__seen.push(t);
      }).observe(document.body, { subtree: true, childList: true, characterData: true, attributes: true });
    });
    await settledTable(page);
    await page.evaluate(() => { (window as unknown as { __seen: string[] }).__seen = []; });

    // The drag: windows 5, 7, …, 23 points, one step every 40 ms (faster than one analysis of 10⁶ points).
    const values = Array.from({ length: 10 }, (_, k) => 5 + 2 * k);
    for (const v of values) {
      await setWindow(page, v);
      await page.waitForTimeout(40);
    }
    const final = await settledTable(page);
    const seen = await page.evaluate(() => (window as unknown as { __seen: string[] }).__seen);

    // The last value's own table, worked out on its own (away and back again).
    const other = await settledAfter(page, 41);
    const last = await settledAfter(page, values.at(-1)!);
    expect(other).not.toBe(last);
    expect(final).toBe(last);
    // Once the last value's table was shown, nothing else was shown as final after it.
    const first = seen.indexOf(last);
    expect(first).toBeGreaterThanOrEqual(0);
    expect(seen.slice(first)).toEqual([last]);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
