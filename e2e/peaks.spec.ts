import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { openWithDemo } from './helpers.ts';

const truth = JSON.parse(readFileSync('public/demo/demo-truth.json', 'utf8'));

async function apexColumn(page: Page): Promise<number[]> {
  const cells = await page.getByTestId('peak-table').locator('tbody tr td:nth-child(2)').allInnerTexts();
  return cells.map(Number).filter(Number.isFinite);
}

test('the demo peak table lists every true peak that is not a shoulder, with S/N flags', async ({ page }) => {
  await openWithDemo(page);
  await expect(page.getByTestId('peak-table')).toBeVisible();
  const apexes = await apexColumn(page);
  const separate = truth.peaks.filter((p: { label: string }) => p.label !== 'shoulder');
  for (const p of separate) {
    // within two sample spacings of the true centre (0.01 min per point)
    expect(apexes.some((x) => Math.abs(x - p.centre) <= 0.02), `peak at ${p.centre}`).toBe(true);
  }
  // the big isolated peak is quantifiable
  const row = page.getByTestId('peak-table').locator('tbody tr').filter({ hasText: /^\d+\s*4\.(29|30)/ });
  await expect(row.first()).toContainText('quantifiable');
  await expect(page.getByTestId('peak-summary')).toContainText('H/σ');
});

test('marking a quiet range changes the noise and the S/N column', async ({ page }) => {
  await openWithDemo(page);
  const sigmaBefore = await page.getByTestId('noise-sigma').innerText();
  // The S/N column, found by its header (issue 17: the columns shown can change).
  const snrCol = (await page.getByTestId('peak-table').locator('thead th').allInnerTexts()).findIndex((h) => h.startsWith('S/N')) + 1;
  const snrBefore = await page.getByTestId('peak-table').locator(`tbody tr td:nth-child(${snrCol})`).allInnerTexts();
  await page.getByRole('button', { name: 'Mark a range' }).click();
  // Drag across 9.2–9.8 min on the plot (peak-free in the demo's ground truth).
  const box = await page.evaluate(() => {
    const gd = document.querySelector('[data-testid="figure"]') as unknown as { _fullLayout: { xaxis: { l2p: (v: number) => number; _offset: number }; yaxis: { _offset: number; _length: number } } };
    const r = (gd as unknown as HTMLElement).getBoundingClientRect();
    const xa = gd._fullLayout.xaxis, ya = gd._fullLayout.yaxis;
    return { x0: r.left + xa._offset + xa.l2p(9.2), x1: r.left + xa._offset + xa.l2p(9.8), y: r.top + ya._offset + ya._length / 2 };
  });
  await page.mouse.move(box.x0, box.y);
  await page.mouse.down();
  await page.mouse.move((box.x0 + box.x1) / 2, box.y, { steps: 5 });
  await page.mouse.move(box.x1, box.y, { steps: 5 });
  await page.mouse.up();
  await page.getByRole('button', { name: 'Use the marked range as quiet baseline' }).click();
  await expect(page.getByTestId('noise-sigma')).not.toHaveText(sigmaBefore);
  const sigma = parseFloat(await page.getByTestId('noise-sigma').innerText());
  // The demo's true noise SD is 0.05 mAU; ~60 points give a relative SE of about 9 %, so 30 % is a wide bound.
  expect(Math.abs(sigma - truth.noiseSd) / truth.noiseSd).toBeLessThan(0.3);
  await expect.poll(async () => JSON.stringify(await page.getByTestId('peak-table').locator(`tbody tr td:nth-child(${snrCol})`).allInnerTexts())).not.toBe(JSON.stringify(snrBefore));
  await expect(page.locator('#noise-method')).toHaveValue('rms');
});
