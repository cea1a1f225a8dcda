/**
 * Issues 18 and 21 with issue 13's promise, "nothing is lost": a region fit,
 * the named-peak table, the standards with their amounts and the calibration
 * settings survive a reload that follows at once (the journal) and one after
 * the database save; the fit is drawn again, the amounts come back within
 * their intervals of the truth, and the exports still carry the fit. The
 * ledger has a column with the fit's count on each version.
 * Invented demo data (scripts/make-demo.mjs; truth in public/demo/demo-truth.json
 * and demo-standards-truth.json).
 */
import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { download, markRange, openWithDemo, sessionSaved } from './helpers.ts';

const DEMO = 'public/demo';
const truth = JSON.parse(readFileSync(join(DEMO, 'demo-standards-truth.json'), 'utf8')) as { dyes: { name: string; sampleAmount: number }[]; files: { file: string }[] };

/** Every dye's amount shown with an interval that holds its truth. */
async function amountsHoldTruth(page: Page) {
  const rows = page.getByTestId('calibration-panel').getByTestId('amounts-result').locator('tbody tr');
  await expect(rows).toHaveCount(3, { timeout: 60_000 });
  for (const d of truth.dyes) {
    const interval = rows.filter({ has: page.locator(`td:text-is("${d.name}")`) }).locator('td[data-role="interval"]');
    await expect.poll(async () => Number(await interval.getAttribute('data-low') || NaN), { timeout: 60_000 }).toBeLessThanOrEqual(d.sampleAmount);
    expect(Number(await interval.getAttribute('data-high'))).toBeGreaterThanOrEqual(d.sampleAmount);
  }
}

/** The fit panel shows the shoulder fit: two peaks on the raw trace, drawn with its residuals. */
async function fitShown(page: Page) {
  const panel = page.getByTestId('fit-panel');
  await expect(panel.getByTestId('fit-result')).toHaveAttribute('data-count', '2', { timeout: 30_000 });
  await expect(panel.getByTestId('fit-decision')).toContainText('The fit on the raw trace supports 2 Gaussian peaks.');
  await expect(panel.getByTestId('fit-figure')).toHaveAttribute('data-drawn', /\d+/);
}

test('reload keeps the region fit, the named peaks, the standards and their amounts', async ({ page }) => {
  test.setTimeout(180_000);
  await openWithDemo(page);
  await page.getByTestId('recipe-input').setInputFiles('test/fixtures/calibration/demo-method.json');
  await page.getByTestId('named-peaks-input').setInputFiles(join(DEMO, 'demo-named-peaks.csv'));
  await page.getByTestId('standard-files-input').setInputFiles(truth.files.map((f) => join(DEMO, f.file)));
  await page.getByTestId('amounts-input').setInputFiles(join(DEMO, 'demo-standards.csv'));
  await amountsHoldTruth(page);
  // An alternative for the loss check, so the fit compares versions and the ledger gets its column.
  await page.getByRole('button', { name: '3-point moving average' }).click();

  await markRange(page, 5.4, 6.9);
  const panel = page.getByTestId('fit-panel');
  await panel.getByTestId('fit-on').selectOption('raw');
  await panel.getByTestId('fit-baseline').selectOption('quadratic');
  await panel.getByTestId('fit-run').click();
  await fitShown(page);
  const ledgerCell = page.getByTestId('ledger').locator('tbody tr').filter({ has: page.locator('th', { hasText: /^(5\.9|6\.0)/ }) }).getByTestId('ledger-fit');
  await expect(page.getByTestId('ledger').locator('thead th', { hasText: 'Peak count by region fit' })).toHaveCount(1);
  // Measured on the demo: the current stack (baseline + 11-point Savitzky–Golay) and the 3-point average keep both peaks.
  await expect(ledgerCell).toHaveText('Fit 1: 2 peaks on raw, no fewer after any processing.');
  await expect(ledgerCell).toHaveAttribute('title', /^Fit 1 \(5\.[34]\d*–6\.[89]\d*, gaussian\): /);
  const before = await ledgerCell.innerText();
  await page.getByTestId('fit-panel').screenshot({ path: test.info().outputPath('fit-before-reload.png') });

  // A reload at once: the journal holds the fit, the tables and the settings.
  await page.reload();
  await fitShown(page);
  await expect(page.getByTestId('named-peak-table').locator('tbody tr')).toHaveCount(3);
  await expect(page.getByTestId('amounts-table')).toContainText('demo-standard-L3-b.csv');
  await amountsHoldTruth(page);
  await expect(page.getByTestId('fit-baseline')).toHaveValue('quadratic');
  await expect(ledgerCell).toHaveText(before, { timeout: 30_000 });

  // After the database save, a second reload: the same.
  await sessionSaved(page);
  await page.reload();
  await fitShown(page);
  await amountsHoldTruth(page);
  const csv = (await download(page, 'export-peaks-csv')).text.replace(/^\uFEFF/, '');
  expect(csv).toContain('# Fit 1: raw trace');
  expect(csv).toMatch(/^peak #,name,apex/m);
  // The named rows carry their amounts (issue 21), each dye's truth inside its interval.
  const rows = csv.split('\r\n').filter((l) => l && !l.startsWith('#')).map((l) => l.split(','));
  const [nameCol, lowCol, highCol] = ['name', 'amount interval low (95 %)', 'amount interval high (95 %)'].map((h) => rows[0].indexOf(h));
  expect(Math.min(nameCol, lowCol, highCol)).toBeGreaterThanOrEqual(0);
  for (const d of truth.dyes) {
    const row = rows.find((r) => r[nameCol] === d.name)!;
    expect(Number(row[lowCol])).toBeLessThanOrEqual(d.sampleAmount);
    expect(Number(row[highCol])).toBeGreaterThanOrEqual(d.sampleAmount);
  }
  const html = (await download(page, 'export-report')).text;
  expect(html).toContain('<h2>Region fits</h2>');
  expect(html).toContain('<h2>Calibration and amounts</h2>');
  expect(html).toContain('data-role="ledger-fits"');
  await page.getByTestId('loss-panel').screenshot({ path: test.info().outputPath('ledger-after-reload.png') });
});
