/**
 * Issue 17: the export session and the printable report. One loss
 * confirmation for several exports; the report's fields and a hand
 * change's reason reach the report, the peak CSV and the summary JSON; the
 * report printed to PDF by Chromium is A4 and its tables fit the page.
 */
import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { addStep, openWithDemo, settled } from './helpers.ts';

/** A4 in CSS pixels (96 per inch): 210 × 297 mm, less the report's 12 mm page margins (its @page rule). */
const MM = 96 / 25.4;
const PRINT_WIDTH = (210 - 24) * MM;
const PRINT_HEIGHT = (297 - 24) * MM;

async function withLoss(page: Page): Promise<void> {
  await openWithDemo(page);
  // A 9-point moving average weakens the demo's sharp early peak (see loss.spec.ts), so exports ask to confirm.
  await addStep(page, 'moving-average');
  const box = page.getByTestId('step-moving-average').getByRole('textbox', { name: /^Window/ });
  await box.fill('9');
  await box.press('Enter');
  await settled(page);
}

async function downloadText(page: Page, testId: string): Promise<string> {
  const waiting = page.waitForEvent('download');
  await page.getByTestId(testId).click();
  return readFileSync(await (await waiting).path(), 'utf8');
}

test('one confirmation per export session, summarised; report fields and a hand change\'s reason reach every export', async ({ page }) => {
  await withLoss(page);
  // Report fields, kept with the session.
  await page.getByTestId('report-field-analyst').fill('A. Chemist');
  await page.getByTestId('report-field-sample').fill('Lot <42>');
  await page.getByTestId('report-field-run').fill('run 7');
  // A hand change: remove the first peak; the inline field asks why, without blocking anything.
  const table = page.getByTestId('peak-table');
  await table.getByRole('button', { name: 'Remove peak 1', exact: true }).click();
  const ask = page.getByTestId('hand-reason');
  await expect(ask).toContainText('Why remove the peak at');
  await page.getByTestId('hand-reason-input').fill('carry-over from the wash');
  await ask.getByRole('button', { name: 'Keep this reason' }).click();
  await expect(ask).toHaveCount(0);
  await settled(page);

  // First guarded export: the confirmation, summarised per kind with counts.
  const waiting = page.waitForEvent('download');
  await page.getByTestId('export-report').click();
  const dialog = page.getByTestId('loss-confirm');
  await expect(dialog).toBeVisible();
  await expect(dialog.getByTestId('loss-counts')).toContainText(/\d+ lost, \d+ weakened, \d+ only after processing/);
  await expect(dialog.getByTestId('loss-summary')).toContainText(/^(Lost|Weakened|Appear only after processing): \d+ feature/);
  await dialog.getByRole('button', { name: 'Export anyway' }).click();
  const html = readFileSync(await (await waiting).path(), 'utf8');
  // Later exports in the same session do not ask again.
  const peaks = await downloadText(page, 'export-peaks-csv');
  await expect(dialog).toHaveCount(0);
  const summary = JSON.parse(await downloadText(page, 'export-summary'));
  await expect(dialog).toHaveCount(0);
  await expect(page.getByTestId('loss-confirmed')).toContainText('further exports use this confirmation');

  const summaryPage = html.slice(0, html.indexOf('data-role="detail"'));
  expect(summaryPage).toContain('<dt>Analyst</dt><dd>A. Chemist</dd>');
  expect(summaryPage).toContain('<dt>Sample</dt><dd>Lot &lt;42&gt;</dd>');
  expect(summaryPage).toContain('removed by hand: carry-over from the wash');
  expect(summaryPage).toContain('Export confirmed at');
  const header = peaks.split('\r\n').find((l) => l.startsWith('peak #'))!.split(',');
  const row1 = peaks.split('\r\n').find((l) => l.startsWith('1,'))!.split(',');
  expect(row1[header.indexOf('reason for the hand change')]).toBe('carry-over from the wash');
  expect(peaks).toContain('# Numbers: full precision');
  expect(summary.report).toEqual({ analyst: 'A. Chemist', sample: 'Lot <42>', instrument: '', run: 'run 7' });
  expect(summary.peaks[0]).toMatchObject({ hand: 'removed', reason: 'carry-over from the wash' });

  // The Print button prints the same report from a hidden frame of the page.
  await page.getByTestId('print-report').click();
  await expect(page.getByTestId('loss-confirm')).toHaveCount(0);
  const frame = page.frameLocator('iframe[data-testid="print-frame"]');
  await expect(frame.locator('[data-role="summary-page"]')).toContainText('A. Chemist');
});

test('the report printed to PDF by Chromium is A4; the summary fits one page and every table\'s last column is on the page', async ({ page, browser }) => {
  await withLoss(page);
  const waiting = page.waitForEvent('download');
  await page.getByTestId('export-report').click();
  await page.getByTestId('loss-confirm').getByRole('button', { name: 'Export anyway' }).click();
  const html = readFileSync(await (await waiting).path(), 'utf8');

  const report = await browser.newPage({ viewport: { width: Math.floor(PRINT_WIDTH), height: 1000 } });
  await report.setContent(html);
  await report.emulateMedia({ media: 'print' });
  // TRACEWRIGHT_SHOTS=<folder> keeps pictures of the printed report for a person to look at.
  if (process.env.TRACEWRIGHT_SHOTS) {
    await report.locator('[data-role="summary-page"]').screenshot({ path: `${process.env.TRACEWRIGHT_SHOTS}/report-summary.png` });
    await report.screenshot({ path: `${process.env.TRACEWRIGHT_SHOTS}/report-detail.png`, fullPage: true, clip: { x: 0, y: 4300, width: Math.floor(PRINT_WIDTH), height: 1800 } });
  }
  // Nothing is wider than the printable width of an A4 page.
  const widest = await report.evaluate(() => document.documentElement.scrollWidth);
  expect(widest).toBeLessThanOrEqual(Math.floor(PRINT_WIDTH));
  const tables = report.locator('table');
  expect(await tables.count()).toBeGreaterThan(3);
  for (const t of await tables.all()) {
    const last = await t.locator('thead th').last().boundingBox();
    expect(last).not.toBeNull();
    expect(last!.x + last!.width).toBeLessThanOrEqual(PRINT_WIDTH + 0.5);
  }
  // The summary fits the height of one page, and the detail starts a new one.
  const summaryBox = await report.locator('[data-role="summary-page"]').boundingBox();
  expect(summaryBox!.height).toBeLessThanOrEqual(PRINT_HEIGHT);
  expect(await report.locator('[data-role="detail"]').evaluate((e) => getComputedStyle(e).breakBefore)).toBe('page');
  // The PDF itself: every page is A4 (595.28 × 841.89 points, ISO 216), and the summary's last table column is on page 1.
  const pdf = await report.pdf({ format: 'A4', preferCSSPageSize: true, printBackground: true });
  const boxes = [...pdf.toString('latin1').matchAll(/\/MediaBox\s*\[\s*0 0 ([\d.]+) ([\d.]+)\s*\]/g)].map((m) => [Number(m[1]), Number(m[2])]);
  expect(boxes.length).toBeGreaterThan(1);
  for (const [w, h] of boxes) {
    expect(Math.abs(w - 595.28)).toBeLessThan(1);
    expect(Math.abs(h - 841.89)).toBeLessThan(1);
  }
  await report.close();
});
