import { expect, test } from '@playwright/test';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { useBuiltCli } from './cli-fixture.ts';
import { addStep, csvBody, download, openWithDemo, reportBody, settled } from './helpers.ts';

// The page's exports of the demo, downloaded, against the command line run on the same files with the
// method the page saved: equal apart from the time stamp line, the byte-order mark and the confirmation.

const { work, cli } = useBuiltCli('tracewright-e2e-cli-');

test('the command line writes the page\'s exports of the demo, with the method the page saved', async ({ page }) => {
  test.setTimeout(120_000);
  await openWithDemo(page);
  await addStep(page, 'blank-subtraction');
  await addStep(page, 'savitzky-golay');
  await page.selectOption('#snr-def', 'pharmacopoeial');
  await page.locator('#nf-Smallest-S-N-kept').fill('3');
  await expect(page.getByTestId('peak-table').locator('thead')).toContainText('S/N (2H/h)');
  await settled(page);

  const method = (await download(page, 'save-recipe')).text;
  const saved = JSON.parse(method);
  expect(saved.version).toBe(2);
  expect(saved.steps.map((s: { step: string }) => s.step)).toEqual(['blank-subtraction', 'savitzky-golay']);
  expect(saved.analysis.peaks).toMatchObject({ snrDefinition: 'pharmacopoeial', minSnr: 3 });
  writeFileSync(join(work, 'method.json'), method);

  const cleaned = await download(page, 'export-cleaned-csv');
  const peaks = await download(page, 'export-peaks-csv');
  const report = await download(page, 'export-report');
  expect(cleaned.d.suggestedFilename()).toBe('demo-sample-cleaned.csv');
  expect(peaks.d.suggestedFilename()).toBe('demo-sample-peaks.csv');
  expect(report.d.suggestedFilename()).toBe('demo-sample-report.html');
  for (const [name, d] of [['demo-sample-cleaned.csv', cleaned], ['demo-sample-peaks.csv', peaks], ['demo-sample-report.html', report]] as const) {
    writeFileSync(join(work, `page-${name}`), d.text);
  }

  const out = join(work, 'cli');
  const scans = Array.from({ length: 8 }, (_, i) => ['--scan', `public/demo/demo-scan-${i + 1}.csv`]).flat();
  const r = await cli(['analyse', 'public/demo/demo-sample.csv', '--blank', 'public/demo/demo-blank.csv', ...scans, '--method', join(work, 'method.json'), '--out', out]);
  expect(r.code, r.stderr).toBe(0);
  const mine = (f: string) => readFileSync(join(out, f), 'utf8');

  expect(cleaned.text.startsWith('\uFEFF')).toBe(true);
  expect(csvBody(mine('demo-sample-cleaned.csv'))).toBe(csvBody(cleaned.text));
  expect(csvBody(mine('demo-sample-peaks.csv'))).toBe(csvBody(peaks.text));
  // Only the time stamp lines differ in the CSVs.
  const diff = (a: string, b: string) => a.split('\r\n').filter((l, i) => l !== b.split('\r\n')[i]);
  expect(diff(mine('demo-sample-cleaned.csv'), cleaned.text.replace(/^\uFEFF/, ''))).toEqual([expect.stringMatching(/^# Written at: /)]);
  expect(reportBody(mine('demo-sample-report.html'))).toBe(reportBody(report.text));
  // The page's report has the core's SVG plots, no picture of the page.
  expect(report.text).toContain('<svg class="plot"');
  expect(report.text).not.toMatch(/<img\b/);
});

test('a method file loads its analysis settings into the page; a file without them brings the defaults', async ({ page }) => {
  await openWithDemo(page);
  const method = {
    format: 'tracewright-recipe', version: 2,
    steps: [{ uid: 'step-1', step: 'moving-average', enabled: true, params: { window: 5 } }],
    analysis: { noise: { method: 'blank', quietRange: null }, peaks: { snrDefinition: 'region', detectionLimit: 2, quantitationLimit: 12 } },
  };
  await page.getByTestId('recipe-input').setInputFiles({ name: 'method.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(method)) });
  await expect(page.locator('#snr-def')).toHaveValue('region');
  await expect(page.locator('#noise-method')).toHaveValue('blank');
  await expect(page.locator('#nf-Detection-limit-S-N')).toHaveValue('2');
  await expect(page.getByTestId('step-moving-average')).toBeVisible();
  await expect(page.getByText(/^The noise and peak settings saved with it are in use/)).toBeVisible();

  await page.getByTestId('recipe-input').setInputFiles({ name: 'old.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify({ format: 'tracewright-recipe', version: 1, steps: [] })) });
  await expect(page.locator('#snr-def')).toHaveValue('rms');
  await expect(page.locator('#noise-method')).toHaveValue('auto');
  await expect(page.getByText(/holds no noise and peak settings .* so the defaults are in use/)).toBeVisible();
});
