import { expect, test } from '@playwright/test';
import { readFileSync, rmSync } from 'node:fs';
import { openWithDemo, plotted, writeNoisyCsv } from './helpers.ts';

const truth = JSON.parse(readFileSync('public/demo/demo-truth.json', 'utf8'));

test('after a 3-point average the demo spike appears only after processing: in the table, on the plot and in the export gate', async ({ page }) => {
  await openWithDemo(page);
  await page.selectOption('#add-step-choice', 'moving-average');
  await page.getByRole('button', { name: 'Add step' }).click();
  const box = page.getByTestId('step-moving-average').getByRole('textbox', { name: /^Window/ });
  await box.fill('3');
  await box.press('Enter');
  // The spike: one sample 40 noise SD high at 10.00 min (demo-truth.json), spread over three samples by the average.
  const spikeX = truth.spike.x as number;
  const row = page.getByTestId('peak-table').locator('tbody tr').filter({ hasText: new RegExp(`^\\d+\\s*${spikeX.toFixed(2).replace('.', '\\.')}`) });
  await expect(row).toHaveCount(1);
  await expect(row).toContainText('only after processing');
  // On the plot: its own marker set, at the spike.
  await expect.poll(async () => (await plotted(page)).find((t) => t.name === 'appears only after processing')?.x.some((v) => Math.abs(v - spikeX) < 0.02) ?? false).toBe(true);
  // In the export gate: the confirmation lists it before anything leaves.
  await page.getByRole('button', { name: 'Peak table (CSV)' }).click();
  const confirm = page.getByTestId('loss-confirm');
  await expect(confirm).toBeVisible();
  await expect(confirm).toContainText(/feature at 10\.00\d* min .*appears only after processing/);
  // The raw trace has no such row (the spike is one sample wide there).
  await page.selectOption('#measure-on', 'raw');
  await expect(page.getByTestId('peak-table').locator('tbody tr').filter({ hasText: new RegExp(`^\\d+\\s*${spikeX.toFixed(2).replace('.', '\\.')}`) })).toHaveCount(0);
});

test('with 10⁶ noisy points the peak table shows the real peaks first, and says how many bumps pure noise would give', async ({ page }) => {
  test.setTimeout(240_000);
  // Invented: four Gaussian peaks (S/N 20 to 200) on 10⁶ points of seeded white noise (the project's generator),
  // written to a temporary CSV.
  const peaks = [[150_000, 20, 12], [400_000, 50, 20], [650_000, 200, 8], [900_000, 35, 30]] as const;
  const { file, dir } = writeNoisyCsv({ name: 'long-noisy.csv', points: 1_000_000, seed: 20261202, peaks });
  try {
    await openWithDemo(page);
    await page.getByTestId('file-input').setInputFiles(file);
    await expect(page.getByRole('heading', { name: /long-noisy\.csv/ })).toBeVisible({ timeout: 60_000 });
    await expect(page.getByTestId('noise-bumps')).toContainText(/Pure noise of this length \(1,000,000 points\) would give about \d+ bumps at or above S\/N 3/, { timeout: 150_000 });
    const apexes = (await page.getByTestId('peak-table').locator('tbody tr td:nth-child(2)').allInnerTexts()).map(Number);
    // The four real peaks are the first four rows (ordered by S/N when the list is long), tallest first.
    const first = apexes.slice(0, 4).sort((a, b) => a - b);
    expect(first.map((v) => Math.round(v))).toEqual(peaks.map(([c]) => Math.round(c * 0.001)).sort((a, b) => a - b));
    // The table draws only the rows near its box (issue 16); aria-rowcount counts them all (and the header row).
    const rowsInAll = Number(await page.getByTestId('peak-table').getAttribute('aria-rowcount')) - 1;
    expect(rowsInAll).toBeGreaterThanOrEqual(apexes.length);
    await expect(page.locator('#peak-order')).toHaveValue(rowsInAll >= 500 ? 'snr' : 'x');
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
