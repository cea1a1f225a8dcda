import { expect, test, type Page } from '@playwright/test';
import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { openWithDemo, trace } from './helpers.ts';

// Issue 9: a sample of the hostile catalogue (test/hostile-catalogue.md) dropped into the real page.
// Each gives a notice naming the file; a refused file leaves the plotted trace as it was; no page error.

interface Drop { file: string; refused: boolean; points?: number; text: string | RegExp }

const SAMPLE: Drop[] = [
  { file: 'text/empty.csv', refused: true, text: 'The file is empty (0 bytes).' },
  { file: 'hostile/random-bytes.bin', refused: true, text: 'NUL bytes' },
  { file: 'text/picture.csv', refused: true, text: 'This is a PNG image' },
  { file: 'hostile/utf16le-no-bom.csv', refused: true, text: 'UTF-16 text without a byte-order mark' },
  { file: 'hostile/header-only.csv', refused: true, text: 'holds only text' },
  { file: 'hostile/x-all-same.csv', refused: true, text: 'only 1 distinct x value' },
  { file: 'jcamp/npoints-wrong.jdx', refused: true, text: 'says 12 points, but ##XYDATA= holds 10' },
  { file: 'hostile/netcdf-no-ordinate.cdf', refused: true, text: 'ordinate_values (the detector signal) is missing' },
  { file: 'hostile/recipe-bomb-array.json', refused: true, text: /./ },
  { file: 'hostile/x-descending.csv', refused: false, points: 10, text: 'x was not in ascending order' },
  { file: 'hostile/extreme-y.csv', refused: false, points: 6, text: 'skipped' },
  { file: 'hostile/quoted-newlines.csv', refused: false, points: 6, text: 'Not loaded (they do not hold numbers): column 3 (Note).' },
  { file: 'hostile/ragged.csv', refused: false, points: 6, text: 'has 4 fields; the table has 3' },
];

async function drop(page: Page, rel: string) {
  const name = rel.split('/').pop()!;
  await page.getByTestId('file-input').setInputFiles({ name, mimeType: 'application/octet-stream', buffer: readFileSync(`test/fixtures/${rel}`) });
  return name;
}

test('hostile files give a notice naming the file, refusals keep the plotted trace, no page error', async ({ page }) => {
  test.setTimeout(180_000);
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(String(e)));
  await openWithDemo(page);
  for (const d of SAMPLE) {
    const before = (await trace(page, 'raw'))!;
    const name = await drop(page, d.file);
    const notice = page.locator('.notice').filter({ hasText: name }).first();
    await expect(notice, d.file).toBeVisible();
    if (d.refused) {
      await expect(notice).toHaveAttribute('data-testid', 'notice-error');
      await expect(notice).toContainText(d.text);
      await expect(notice).toContainText('Nothing already loaded was changed.');
      const after = (await trace(page, 'raw'))!;
      expect(after.x, d.file).toEqual(before.x);
      expect(after.y, d.file).toEqual(before.y);
    } else {
      await expect(notice).not.toHaveAttribute('data-testid', 'notice-error');
      await expect(notice).toContainText(d.text);
      await expect(page.getByRole('heading', { name: new RegExp(name.replace('.', '\\.')) })).toBeVisible();
      await expect.poll(async () => (await trace(page, 'raw'))?.x.length, { message: d.file }).toBe(d.points);
      const raw = (await trace(page, 'raw'))!;
      for (let i = 1; i < raw.x.length; i++) expect(raw.x[i]).toBeGreaterThan(raw.x[i - 1]);
    }
    // Dismiss the notice so the next file's notice is the one found.
    await notice.getByRole('button', { name: /Dismiss notice/ }).click();
  }
  expect(errors).toEqual([]);
});

test('extreme magnitudes are drawn as they are in the file', async ({ page }) => {
  await openWithDemo(page);
  await drop(page, 'hostile/extreme-y.csv');
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length).toBe(6);
  const raw = (await trace(page, 'raw'))!;
  expect(raw.x).toEqual([0, 1, 2, 3, 4, 6]);
  expect(raw.y).toEqual([1e300, 1e-300, -1e300, 4.9e-324, Number.MAX_VALUE, -2.5e-310]);
});

test('a 50 MB file loads completely without freezing the page', async ({ page }) => {
  test.setTimeout(240_000);
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(String(e)));
  await openWithDemo(page);
  const { bigCsv } = await import('../test/fixtures/hostile/make-hostile.mjs');
  const big = bigCsv(50 * 1024 * 1024);
  // Playwright refuses buffers over 50 MB, so the file is written to the temporary folder for this run only.
  const path = join(tmpdir(), `big-50MB-${process.pid}.csv`);
  writeFileSync(path, big.bytes);
  const name = basename(path);
  await page.getByTestId('file-input').setInputFiles(path);
  rmSync(path);
  // While the worker parses, the page still answers.
  const t0 = Date.now();
  expect(await page.evaluate(() => 1 + 1)).toBe(2);
  expect(Date.now() - t0).toBeLessThan(5000);
  await expect(page.getByRole('heading', { name: new RegExp(name.replace('.', '\\.')) })).toBeVisible({ timeout: 180_000 });
  await expect(page.locator('.notice').filter({ hasText: name }).first()).toContainText(`${big.rows} rows read`);
  expect(errors).toEqual([]);
});
