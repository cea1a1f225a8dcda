/**
 * Issue 21 end to end on the invented demo standards (scripts/make-demo.mjs,
 * truth in public/demo/demo-standards-truth.json): with the baseline and
 * Savitzky–Golay method, the named-peak table, the six standard runs (three
 * levels in duplicate) and their amounts loaded through the panel, the
 * demo sample's named peaks get amounts whose 95 % intervals hold the true
 * amounts; the names reach the peak table, the plot and the exports.
 */
import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { exportFile, openWithDemo, plotted } from './helpers.ts';

const DEMO = 'public/demo';
const truth = JSON.parse(readFileSync(join(DEMO, 'demo-standards-truth.json'), 'utf8')) as { dyes: { name: string; sampleAmount: number }[]; files: { file: string }[] };

async function setUp(page: Page) {
  await openWithDemo(page);
  await page.getByTestId('recipe-input').setInputFiles('test/fixtures/calibration/demo-method.json');
  await page.getByTestId('named-peaks-input').setInputFiles(join(DEMO, 'demo-named-peaks.csv'));
  await page.getByTestId('standard-files-input').setInputFiles(truth.files.map((f) => join(DEMO, f.file)));
  await page.getByTestId('amounts-input').setInputFiles(join(DEMO, 'demo-standards.csv'));
}

test('the demo sample\'s named peaks: amounts within their 95 % intervals of the truth; names in the table and on the plot', async ({ page }) => {
  test.setTimeout(120_000);
  await setUp(page);
  const panel = page.getByTestId('calibration-panel');
  const rows = panel.getByTestId('amounts-result').locator('tbody tr');
  await expect(rows).toHaveCount(3, { timeout: 60_000 });
  for (const d of truth.dyes) {
    const row = rows.filter({ has: page.locator(`td:text-is("${d.name}")`) });
    const interval = row.locator('td[data-role="interval"]');
    await expect.poll(async () => Number(await interval.getAttribute('data-low') || NaN), { timeout: 60_000 }).toBeLessThanOrEqual(d.sampleAmount);
    expect(Number(await interval.getAttribute('data-high'))).toBeGreaterThanOrEqual(d.sampleAmount);
    const amount = Number(await row.locator('td[data-role="amount"]').getAttribute('data-value'));
    test.info().annotations.push({ type: 'amount', description: `${d.name}: ${amount} [${await interval.getAttribute('data-low')}, ${await interval.getAttribute('data-high')}], truth ${d.sampleAmount}` });
  }
  // Six standards in every curve, chosen by the lack-of-fit test (duplicates exist).
  for (const d of truth.dyes) await expect(panel.getByTestId(`curve-${d.name}`).getByTestId('curve-choice')).toContainText(/lack-of-fit/i);
  await expect(panel.getByTestId('missing-named')).toContainText('Every named peak was found');
  // The peak table and the plot carry the names.
  const table = page.getByTestId('peak-table');
  await expect(table.locator('th', { hasText: 'Name' })).toBeVisible();
  for (const d of truth.dyes) await expect(table.locator('td.peak-name', { hasText: d.name })).toHaveCount(1);
  // Issue 17: the labels are their own trace (thinned so they never overlap; named peaks are labelled first).
  await expect.poll(async () => (await plotted(page)).some((t) => t.name === 'peak labels (S/N)')).toBe(true);
  const labels = await page.evaluate(() => {
    const gd = document.querySelector('[data-testid="figure"]') as unknown as { data: { name: string; text?: string[] }[] };
    return gd.data.find((t) => t.name === 'peak labels (S/N)')?.text ?? [];
  });
  for (const d of truth.dyes) expect(labels.some((l) => l.startsWith(`${d.name} · `))).toBe(true);
  await panel.screenshot({ path: test.info().outputPath('calibration-panel.png') });
});

test('the report and the peak CSV carry the names, the calibration table and the amounts; the method saves the named peaks', async ({ page }) => {
  test.setTimeout(120_000);
  await setUp(page);
  await expect(page.getByTestId('amounts-result').locator('td[data-role="interval"][data-low]:not([data-low=""])')).toHaveCount(3, { timeout: 60_000 });
  const get = async (id: string) => {
    const { d } = await exportFile(page, id);
    return readFileSync(await d.path(), 'utf8').replace(/^\uFEFF/, '');
  };
  const report = await get('export-report');
  expect(report).toContain('<h2>Calibration and amounts</h2>');
  for (const d of truth.dyes) expect(report).toContain(d.name);
  expect(report).toContain('R² (figure only)');
  const csv = await get('export-peaks-csv');
  expect(csv).toMatch(/^peak #,name,apex/m);
  const amounts = await get('export-amounts-csv');
  expect(amounts).toContain('Orchard Red,measured');
  const cal = JSON.parse(await get('export-calibration-json'));
  expect(cal.calibrations).toHaveLength(3);
  const method = JSON.parse(await get('save-recipe'));
  expect(method.analysis.namedPeaks.peaks.map((p: { name: string }) => p.name)).toEqual(truth.dyes.map((d) => d.name));
});
