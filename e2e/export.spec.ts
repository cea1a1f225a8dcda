import { expect, test, type Download, type Page } from '@playwright/test';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { strFromU8, unzipSync } from 'fflate';
import { exportFile, openWithDemo, trace } from './helpers.ts';

const CAUTION = "This is not a validated system; the laboratory's own procedures, validated methods and regulators' requirements govern.";
const DEMO_SHA = createHash('sha256').update(readFileSync('public/demo/demo-sample.csv')).digest('hex');

/** Click an export button (confirming a loss dialog when asked) and read the file's bytes. */
async function download(page: Page, testId: string): Promise<{ d: Download; bytes: Buffer; confirmed: boolean }> {
  const { d, confirmed } = await exportFile(page, testId);
  return { d, bytes: readFileSync(await d.path()), confirmed };
}

function text(bytes: Buffer): string {
  return bytes.toString('utf8').replace(/^\uFEFF/, '');
}

test('cleaned trace CSV: header has the SHA-256 of the demo file and the caution; rows are the plotted processed trace', async ({ page }) => {
  await openWithDemo(page);
  await expect(page.getByTestId('export-cleaned-csv')).toBeEnabled();
  const { d, bytes } = await download(page, 'export-cleaned-csv');
  expect(d.suggestedFilename()).toBe('demo-sample-cleaned.csv');
  const csv = text(bytes);
  expect(csv).toContain(`# Input SHA-256: ${DEMO_SHA}`);
  expect(csv).toContain(`# Caution: ${CAUTION}`);
  const lines = csv.split('\r\n').filter((l) => l !== '' && !l.startsWith('#'));
  const rows = lines.slice(1).map((l) => l.split(',').map(Number));
  const processed = await trace(page, 'processed');
  // 1200 points draw whole at this viewport (fewer than two per pixel column), so the counts must agree.
  expect(rows.length).toBe(processed!.x.length);
  processed!.x.forEach((x, i) => {
    expect(rows[i][0]).toBe(x);
    expect(rows[i][2]).toBe(processed!.y[i]);
  });
});

test('peak table CSV has one row per row of the page table, and the report holds the caution, hash and recipe', async ({ page }) => {
  await openWithDemo(page);
  const pageRows = await page.getByTestId('peak-table').locator('tbody tr').count();
  const peaks = text((await download(page, 'export-peaks-csv')).bytes);
  expect(peaks).toContain('# S/N definition in use:');
  expect(peaks.split('\r\n').filter((l) => l !== '' && !l.startsWith('#')).length - 1).toBe(pageRows);

  const { d, bytes, confirmed } = await download(page, 'export-report');
  expect(d.suggestedFilename()).toBe('demo-sample-report.html');
  const html = text(bytes);
  // A confirmation given before the export is written into the report.
  if (confirmed) expect(html).toContain('Export confirmed at');
  expect(html).toContain(CAUTION);
  expect(html).toContain(DEMO_SHA);
  expect(html).toContain('"format": "tracewright-recipe"');
  expect(html).not.toMatch(/<script/i);
  expect(html).not.toMatch(/\b(src|href)\s*=\s*["']?https?:/i);
});

test('a hostile file name is escaped in the report', async ({ page }) => {
  await openWithDemo(page);
  const name = '<img src=x onerror=alert(1)>.csv';
  await page.getByTestId('file-input').setInputFiles({ name, mimeType: 'text/csv', buffer: readFileSync('e2e/fixtures/absorbance-semicolon.csv') });
  await expect(page.getByRole('heading', { name: /onerror/ })).toBeVisible();
  await expect(page.getByTestId('export-report')).toBeEnabled();
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length).toBe(60);
  const html = text((await download(page, 'export-report')).bytes);
  expect(html).toContain('&lt;img src=x onerror=alert(1)&gt;.csv');
  expect(html).not.toContain('<img src=x');
});

test('recipe: save gives a valid recipe file; a corrupt recipe is refused and the stack is untouched', async ({ page }) => {
  await openWithDemo(page);
  const saved = JSON.parse(text((await download(page, 'save-recipe')).bytes));
  expect(saved.format).toBe('tracewright-recipe');
  const before = await page.locator('[data-testid^="step-"]').count();
  await page.getByTestId('recipe-input').setInputFiles({ name: 'future.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify({ ...saved, version: 999 })) });
  await expect(page.getByTestId('notice-error').first()).toContainText('future.json');
  expect(await page.locator('[data-testid^="step-"]').count()).toBe(before);
});

test('batch: one good and one broken file give a ZIP of the good one and one listed problem', async ({ page }) => {
  await openWithDemo(page);
  const [d] = await Promise.all([
    page.waitForEvent('download'),
    page.getByTestId('batch-input').setInputFiles(['public/demo/demo-sample.csv', 'e2e/fixtures/broken-text.csv']),
  ]);
  const files = unzipSync(new Uint8Array(readFileSync(await d.path())));
  expect(Object.keys(files).sort()).toEqual(['demo-sample-cleaned.csv', 'demo-sample-report.html', 'peaks-all-files.csv', 'peaks-combined.csv', 'problems.txt', 'recipe.json']);
  expect(strFromU8(files['demo-sample-cleaned.csv'])).toContain(DEMO_SHA);
  await expect(page.getByTestId('batch-errors')).toContainText('broken-text.csv');
});

/** File names of the traces in the session saved in IndexedDB (what a reload would restore). */
async function savedFileNames(page: Page): Promise<string[]> {
  return page.evaluate(() => new Promise<string[]>((resolve) => {
    const req = indexedDB.open('tracewright-session', 1);
    req.onerror = () => resolve([]);
    req.onsuccess = () => {
      const db = req.result;
      if (!db.objectStoreNames.contains('meta')) { db.close(); resolve([]); return; }
      const tx = db.transaction('meta', 'readonly');
      const ptr = tx.objectStore('meta').get('pointer');
      ptr.onsuccess = () => {
        const g = (ptr.result as { generation: number } | undefined)?.generation;
        if (g === undefined) { resolve([]); return; }
        const meta = tx.objectStore('meta').get(`gen-${g}`);
        meta.onsuccess = () => resolve(((meta.result?.heads ?? []) as { source: { fileName: string } }[]).map((h) => h.source.fileName));
      };
      tx.oncomplete = () => db.close();
    };
  }));
}

test('the session survives a reload', async ({ page }) => {
  await openWithDemo(page);
  await page.getByTestId('file-input').setInputFiles('e2e/fixtures/absorbance-semicolon.csv');
  await expect(page.getByRole('heading', { name: /absorbance-semicolon\.csv/ })).toBeVisible();
  const steps = await page.locator('[data-testid^="step-"]').count();
  // Autosave runs about a second after the last change; wait until the saved generation holds the new file.
  await expect.poll(() => savedFileNames(page), { timeout: 20_000 }).toContain('absorbance-semicolon.csv');
  await page.reload();
  await expect(page.getByRole('heading', { name: /absorbance-semicolon\.csv/ })).toBeVisible({ timeout: 20_000 });
  await expect(page.getByTestId('notice-info').filter({ hasText: 'previous session was restored' })).toBeVisible({ timeout: 20_000 });
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length).toBe(60);
  expect(await page.locator('[data-testid^="step-"]').count()).toBe(steps);

  // Start over empties the saved session; the page comes back with the demo.
  await page.getByTestId('start-over').click();
  await page.getByTestId('start-over-confirm').click();
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible({ timeout: 20_000 });
});
