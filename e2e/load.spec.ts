import { expect, test } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { openWithDemo, trace } from './helpers.ts';

const truth = JSON.parse(readFileSync('public/demo/demo-truth.json', 'utf8'));

test('opens with the demo trace plotted, on its own axes and units', async ({ page }) => {
  await openWithDemo(page);
  const raw = await trace(page, 'raw');
  expect(raw).toBeDefined();
  // The drawn trace spans the demo's time axis and reaches its tallest peak.
  const sample = readFileSync('public/demo/demo-sample.csv', 'utf8').split(/\r?\n/).filter((l) => /^-?\d/.test(l)).map((l) => l.split(',').map(Number));
  expect(raw!.x[0]).toBeCloseTo(sample[0][0], 9);
  expect(raw!.x[raw!.x.length - 1]).toBeCloseTo(sample[sample.length - 1][0], 9);
  const yMax = Math.max(...sample.map((r) => r[1]));
  expect(Math.max(...raw!.y)).toBeCloseTo(yMax, 9);
  const tallest = Math.max(...truth.peaks.map((p: { height: number }) => p.height));
  expect(yMax).toBeGreaterThan(tallest * 0.8);
  await expect(page.locator('.xtitle')).toContainText('Time (min)');
  await expect(page.getByRole('list').filter({ hasText: 'demo-blank.csv' })).toBeVisible();
});

test('a file chosen with the picker replaces the plotted trace', async ({ page }) => {
  await openWithDemo(page);
  await page.getByTestId('file-input').setInputFiles('e2e/fixtures/absorbance-semicolon.csv');
  await expect(page.getByRole('heading', { name: /absorbance-semicolon\.csv/ })).toBeVisible();
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length).toBe(60);
  const raw = await trace(page, 'raw');
  expect(raw!.x[0]).toBe(400);
  expect(raw!.x[59]).toBe(518);
  // y at 480 nm: 0.05 + 0.8 written with five decimals and a decimal comma
  expect(raw!.y[40]).toBeCloseTo(0.85, 5);
  await expect(page.locator('.xtitle')).toContainText('Wavelength (nm)');
  await expect(page.locator('.ytitle').first()).toContainText('Absorbance (AU)');
});

test('a broken file shows its error and the trace already loaded stays', async ({ page }) => {
  await openWithDemo(page);
  const before = await trace(page, 'raw');
  await page.getByTestId('file-input').setInputFiles('e2e/fixtures/broken-text.csv');
  const alert = page.getByTestId('notice-error').first();
  await expect(alert).toBeVisible();
  await expect(alert).toContainText('broken-text.csv');
  await page.getByTestId('file-input').setInputFiles('e2e/fixtures/binary.png');
  await expect(page.getByTestId('notice-error').first()).toContainText('binary.png');
  const after = await trace(page, 'raw');
  expect(after!.x).toEqual(before!.x);
  expect(after!.y).toEqual(before!.y);
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible();
});
