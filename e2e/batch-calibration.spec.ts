/**
 * Issue 21, the page's batch ZIP with a calibration: with the demo's named
 * peaks, standards and amounts loaded (invented data, scripts/make-demo.mjs;
 * truth in public/demo/demo-standards-truth.json), a batch of the demo sample
 * gives a ZIP with calibration.json, calibration-table.csv and amounts.csv;
 * each dye's amount lies within its interval of the truth, and the file's
 * report has its calibration section.
 */
import { expect, test } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { strFromU8, unzipSync } from 'fflate';
import { openWithDemo } from './helpers.ts';

const DEMO = 'public/demo';
const truth = JSON.parse(readFileSync(join(DEMO, 'demo-standards-truth.json'), 'utf8')) as { dyes: { name: string; sampleAmount: number }[]; files: { file: string }[] };

test('batch with the calibration: the ZIP holds the calibration files, and the demo sample’s amounts hold the truth', async ({ page }) => {
  test.setTimeout(120_000);
  await openWithDemo(page);
  await page.getByTestId('recipe-input').setInputFiles('test/fixtures/calibration/demo-method.json');
  await page.getByTestId('named-peaks-input').setInputFiles(join(DEMO, 'demo-named-peaks.csv'));
  await page.getByTestId('standard-files-input').setInputFiles(truth.files.map((f) => join(DEMO, f.file)));
  await page.getByTestId('amounts-input').setInputFiles(join(DEMO, 'demo-standards.csv'));
  await expect(page.getByTestId('amounts-result').locator('td[data-role="interval"][data-low]:not([data-low=""])')).toHaveCount(3, { timeout: 60_000 });
  const [d] = await Promise.all([page.waitForEvent('download'), page.getByTestId('batch-input').setInputFiles([join(DEMO, 'demo-sample.csv')])]);
  const files = unzipSync(new Uint8Array(readFileSync(await d.path())));
  for (const n of ['calibration.json', 'calibration-table.csv', 'amounts.csv', 'peaks-combined.csv']) expect(Object.keys(files)).toContain(n);
  const cal = JSON.parse(strFromU8(files['calibration.json']));
  expect(cal.calibrations.map((c: { name: string; status: string }) => [c.name, c.status])).toEqual(truth.dyes.map((x) => [x.name, 'calibrated']));
  expect(cal.samples.map((s: { trace: string }) => s.trace)).toEqual(['demo-sample.csv']);
  for (const dye of truth.dyes) {
    const a = cal.samples[0].amounts.find((v: { name: string }) => v.name === dye.name);
    expect(a.interval.low, dye.name).toBeLessThanOrEqual(dye.sampleAmount);
    expect(a.interval.high, dye.name).toBeGreaterThanOrEqual(dye.sampleAmount);
  }
  expect(strFromU8(files['demo-sample-report.html'])).toContain('<h2>Calibration and amounts</h2>');
});
