import { expect, test } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { openWithDemo, plotted } from './helpers.ts';

const truth = JSON.parse(readFileSync('public/demo/demo-truth.json', 'utf8'));

test('two alternatives on the demo: the ledger follows each feature, and export asks to confirm what is lost', async ({ page }) => {
  await openWithDemo(page);
  // Current stack: a 9-point moving average, wider than half the narrowest peak's width.
  await page.selectOption('#add-step-choice', 'moving-average');
  await page.getByRole('button', { name: 'Add step' }).click();
  const box = page.getByTestId('step-moving-average').getByRole('textbox', { name: /^Window/ });
  await box.fill('9');
  await box.press('Enter');
  // Two alternatives in one click each.
  await page.getByRole('button', { name: '3-point moving average' }).click();
  await page.getByRole('button', { name: 'Savitzky–Golay 25 points, order 4' }).click();
  const ledger = page.getByTestId('ledger');
  await expect(ledger.locator('thead th')).toHaveText(['Feature at (min)', 'no processing (raw)', 'the current stack', '3-point moving average', 'Savitzky–Golay 25 points, order 4']);
  // Every true peak that stands on its own is a ledger row, found in every column.
  const positions = (await ledger.locator('tbody th[scope="row"]').allInnerTexts()).map(Number);
  for (const p of truth.peaks.filter((q: { trueSn: number }) => q.trueSn >= 20)) {
    const i = positions.findIndex((x) => Math.abs(x - p.centre) <= 0.03);
    expect(i, `feature at ${p.centre}`).toBeGreaterThanOrEqual(0);
    const cells = await ledger.locator('tbody tr').nth(i).locator('td').allInnerTexts();
    expect(cells.every((c) => !/^lost/.test(c))).toBe(true);
  }
  // The window advice warns in words, and the overlay draws both alternatives.
  await expect(page.getByTestId('loss-panel')).toContainText('above the usual limit');
  const names = (await plotted(page)).map((t) => t.name);
  expect(names).toContain('3-point moving average');
  expect(names).toContain('Savitzky–Golay 25 points, order 4');
  // The 9-point average weakens the sharp early peak: a σ = 2-point Gaussian keeps (1/9)Σexp(−k²/8) ≈ 54 % of its height.
  const warnings = page.getByTestId('loss-warnings');
  await expect(warnings).toContainText(/feature at 1\.(19|20)\d* min keeps only 5\d %/);
  await page.getByRole('button', { name: 'Report (HTML)' }).click();
  const confirm = page.getByTestId('loss-confirm');
  await expect(confirm).toBeVisible();
  await expect(confirm).toContainText(/1\.(19|20)/);
  const download = page.waitForEvent('download');
  await page.getByRole('button', { name: 'Export anyway' }).click();
  const file = await (await download).path();
  const html = readFileSync(file, 'utf8');
  // The confirmation and its list go into the report, beside the caution.
  expect(html).toContain('This is not a validated system');
  expect(html).toMatch(/confirm/i);
  expect(html).toMatch(/data-role="confirmation"[\s\S]*feature at 1\.(19|20)/);
});
