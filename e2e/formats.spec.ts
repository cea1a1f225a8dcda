import { expect, test } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { openWithDemo, trace } from './helpers.ts';

// Issue 7, end to end: open interchange formats dropped into the page plot with their own axis units.

test('a JCAMP-DX file plots with its units and every point', async ({ page }) => {
  await openWithDemo(page);
  // test/fixtures/jcamp/factors.jdx: XUNITS MINUTES, YUNITS mAU, 5 points x 10 … 14, y 1, 2, −3, 4, 5 after YFACTOR.
  await page.getByTestId('file-input').setInputFiles('test/fixtures/jcamp/factors.jdx');
  await expect(page.getByRole('heading', { name: /factors\.jdx/ })).toBeVisible();
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length).toBe(5);
  const raw = (await trace(page, 'raw'))!;
  expect(raw.x).toEqual([10, 11, 12, 13, 14]);
  expect(raw.y).toEqual([1, 2, -3, 4, 5]);
  await expect(page.locator('.xtitle')).toContainText('Time (min)');
  await expect(page.locator('.ytitle').first()).toContainText('(mAU)');
});

test('a JCAMP-DX spectrum with a .csv name is read by content', async ({ page }) => {
  await openWithDemo(page);
  await page.getByTestId('file-input').setInputFiles('test/fixtures/hostile/jcamp-named.csv');
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length).toBe(9);
  expect((await trace(page, 'raw'))!.x).toEqual([400, 405, 410, 415, 420, 425, 430, 435, 440]);
  await expect(page.locator('.xtitle')).toContainText('Wavelength (nm)');
  await expect(page.locator('.ytitle').first()).toContainText('Absorbance');
});

test('a chromatography netCDF file plots with its units, time from delay and interval', async ({ page }) => {
  await openWithDemo(page);
  // test/fixtures/netcdf/chromatogram.cdf: 21 points, delay 0.5 s, interval 0.2 s, detector_unit mAU, retention_unit seconds.
  await page.getByTestId('file-input').setInputFiles({ name: 'chromatogram.cdf', mimeType: 'application/octet-stream', buffer: readFileSync('test/fixtures/netcdf/chromatogram.cdf') });
  await expect(page.getByRole('heading', { name: /chromatogram\.cdf/ })).toBeVisible();
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length).toBe(21);
  const raw = (await trace(page, 'raw'))!;
  expect(raw.x[0]).toBeCloseTo(0.5, 12);
  expect(raw.x[10]).toBeCloseTo(2.5, 12); // t₁₀ = 0.5 + 10 × 0.2 s (issue 7 check value)
  expect(raw.x[20]).toBeCloseTo(4.5, 12);
  await expect(page.locator('.xtitle')).toContainText('(s)');
  await expect(page.locator('.ytitle').first()).toContainText('(mAU)');
});
