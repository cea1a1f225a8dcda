import { expect, test } from '@playwright/test';
import { rmSync } from 'node:fs';
import { addStep, openWithDemo, settled, trace, writeNoisyCsv } from './helpers.ts';

// Issue 16, "markers are capped and ranked": despiking a long trace with hundreds of spikes crosses at most 100 of
// the replaced points on the plot, the largest changes first, and a note under the plot says how many of how many.
// (Before: a cross on every one; 1,983 crosses at 10⁶ points took a whole drawing of the figure to about 0.5 s.)
test('hundreds of replaced points: 100 crosses, the largest change among them, a note with the count', async ({ page }) => {
  test.setTimeout(120_000);
  // An invented trace: 40,000 points of unit noise with a one-point spike every 97 points (412 of them), sized
  // 20 + (i mod 13) so they differ; one far larger (300) at point 20,079.
  const spike = (i: number) => (i === 20_079 ? 300 : i % 97 === 0 && i > 0 ? 20 + (i % 13) : 0);
  const { file, dir } = writeNoisyCsv({ name: 'many-spikes.csv', points: 40_000, seed: 11, peaks: [], extra: spike });
  try {
    await openWithDemo(page);
    await page.getByTestId('file-input').setInputFiles(file);
    await expect(page.getByRole('heading', { name: /many-spikes\.csv/ })).toBeVisible({ timeout: 60_000 });
    await addStep(page, 'despike');
    await settled(page);
    const summary = page.getByTestId('spike-events').locator('xpath=..').locator('summary');
    const replaced = Number((await summary.innerText()).match(/^([\d,]+) point/)![1].replace(/,/g, ''));
    expect(replaced).toBeGreaterThan(400);
    const crosses = (await trace(page, 'replaced points'))!;
    expect(crosses.x).toHaveLength(100);
    // The largest change is crossed.
    expect(crosses.x.some((x) => Math.abs(x - 20.079) < 1e-9)).toBe(true);
    await expect(page.getByTestId('replaced-note')).toHaveText(new RegExp(`^Crosses on 100 of the ${replaced.toLocaleString('en')} replaced points in view`));
    if (process.env.TRACEWRIGHT_SHOTS) await page.locator('.plot-box').screenshot({ path: `${process.env.TRACEWRIGHT_SHOTS}/replaced-crosses.png` });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
