import { expect, test } from '@playwright/test';
import { readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { useBuiltCli } from './cli-fixture.ts';
import { addStep, csvBody, download, expectSameWithinRounding, openWithDemo, reportBody, settled } from './helpers.ts';

// Issue 20: with the blank and the scans following the sample (a moving average before blank subtraction and
// aligned averaging), the page's exports of the demo against the command line's --blank/--scan on the same files.

const { work, cli } = useBuiltCli('tracewright-e2e-companions-');

test('blank and scans follow the sample: the command line\'s --blank and --scan give the page\'s numbers; a scan leaves with one click', async ({ page }) => {
  test.setTimeout(150_000);
  await openWithDemo(page);
  await addStep(page, 'moving-average');
  await addStep(page, 'blank-subtraction');
  await addStep(page, 'ensemble-average');
  const avg = page.getByTestId('step-ensemble-average');
  await avg.getByLabel('Align each scan to the signal first').check();
  await page.selectOption('#snr-def', 'pharmacopoeial');
  await settled(page);
  const table = page.getByTestId('scan-alignment');
  await expect(table.locator('tbody tr')).toHaveCount(8);
  await expect(avg).toContainText('Each scan was aligned to the signal before averaging');
  await expect(page.getByTestId('step-moving-average')).toContainText('Applied with the same parameters to the blank');
  await expect(page.getByTestId('step-blank-subtraction')).toContainText('The blank is not subtracted from itself');
  await avg.screenshot({ path: join(tmpdir(), 'tracewright-i20-averaging.png') });

  const method = (await download(page, 'save-recipe')).text;
  const saved = JSON.parse(method);
  expect(saved.steps.map((s: { step: string }) => s.step)).toEqual(['moving-average', 'blank-subtraction', 'ensemble-average']);
  expect(saved.steps[2].params.align).toBe(true);
  writeFileSync(join(work, 'method.json'), method);
  const cleaned = await download(page, 'export-cleaned-csv');
  const peaks = await download(page, 'export-peaks-csv');
  const report = await download(page, 'export-report');

  const out = join(work, 'cli');
  const scans = Array.from({ length: 8 }, (_, i) => ['--scan', `public/demo/demo-scan-${i + 1}.csv`]).flat();
  const r = await cli(['analyse', 'public/demo/demo-sample.csv', '--blank', 'public/demo/demo-blank.csv', ...scans, '--method', join(work, 'method.json'), '--out', out]);
  expect(r.code, r.stderr).toBe(0);
  const mine = (f: string) => readFileSync(join(out, f), 'utf8');
  expect(csvBody(mine('demo-sample-cleaned.csv'))).toBe(csvBody(cleaned.text));
  // σ is carried through the aligned averaging by a simulation whose seeded noise goes through Math.log and
  // Math.cos, which Chromium and Node do not round alike: the numbers it feeds agree to about 1e-16, not bit for bit.
  expectSameWithinRounding(csvBody(mine('demo-sample-peaks.csv')), csvBody(peaks.text));
  expectSameWithinRounding(reportBody(mine('demo-sample-report.html')), reportBody(report.text));
  // The shifts are in the report, step by step.
  expect(report.text).toContain('Each scan was aligned to the signal before averaging');

  // One click leaves a scan out; the averaging then counts 8 traces (the signal and 7 scans).
  await table.locator('tbody tr').first().getByRole('button', { name: /^Leave out the scan / }).click();
  await settled(page);
  await expect(table.locator('tbody tr')).toHaveCount(7);
  await expect(avg).toContainText('Averaged 8 scans');
});
