import { expect, test } from '@playwright/test';
import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { useBuiltCli } from './cli-fixture.ts';
import { addStep, csvBody, download, openWithDemo, settled, writeNoisyCsv } from './helpers.ts';

// Issue 16: on a long trace the computation worker measures half of the peak candidates on a second thread
// (src/worker/detect-partner.ts). The page's peak table must be the command line's (one thread, no sharing)
// on the same file and method, and the second thread must really have been used.

const { work, cli } = useBuiltCli('tracewright-e2e-shared-detection-');

test('a long trace\'s peak table, measured on two threads in the page, is the command line\'s table on the same file', async ({ page }) => {
  test.setTimeout(240_000);
  // Invented: 2·10⁵ points of seeded white noise (the project's generator) with five Gaussian peaks; with a
  // 5-point moving average it has some 6,000 candidates, above the 4,096 from which detection shares them.
  const { file, dir } = writeNoisyCsv({ name: 'shared-long.csv', points: 200_000, seed: 61, peaks: [[20_000, 8, 12], [60_000, 30, 20], [100_000, 4, 6], [140_000, 60, 40], [180_000, 15, 9]] });
  try {
    await openWithDemo(page);
    await page.getByTestId('file-input').setInputFiles(file);
    await expect(page.getByRole('heading', { name: /shared-long\.csv/ })).toBeVisible({ timeout: 90_000 });
    await addStep(page, 'moving-average');
    await settled(page);
    await expect(page.getByTestId('peak-panel')).not.toHaveAttribute('data-provisional', 'true', { timeout: 60_000 });
    // The second thread runs beside the computation worker (a worker the page's own worker started).
    await expect.poll(() => page.workers().some((w) => w.url().includes('detect-partner')), { timeout: 30_000 }).toBe(true);

    const method = (await download(page, 'save-recipe')).text;
    writeFileSync(join(work, 'method.json'), method);
    const peaks = await download(page, 'export-peaks-csv');
    const out = join(work, 'cli');
    const r = await cli(['analyse', file, '--method', join(work, 'method.json'), '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const mine = csvBody(readFileSync(join(out, 'shared-long-peaks.csv'), 'utf8'));
    expect(mine.split('\n').length).toBeGreaterThan(100);
    expect(csvBody(peaks.text)).toBe(mine);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
