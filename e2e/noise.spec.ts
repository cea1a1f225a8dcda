import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { exportFile, openWithDemo } from './helpers.ts';

const truth = JSON.parse(readFileSync('public/demo/demo-truth.json', 'utf8'));

async function addStep(page: Page, id: string) {
  await page.selectOption('#add-step-choice', id);
  await page.getByRole('button', { name: 'Add step' }).click();
}

test('σ of the raw demo, carried exactly through Savitzky–Golay 11/2, with every check on the page and in the peak CSV', async ({ page }) => {
  await openWithDemo(page);
  const raw = parseFloat(await page.getByTestId('noise-sigma').innerText());
  // The demo's true noise SD is 0.05 (demo-truth.json); about 850 free second differences give a relative SE near 4 %.
  expect(Math.abs(raw / truth.noiseSd - 1)).toBeLessThan(0.15);
  await addStep(page, 'savitzky-golay');
  await expect(page.getByTestId('noise-route')).toContainText('exactly (linear steps), × 0.4555');
  // √Σc² of the 11-point quadratic weights is 0.4555 (Savitzky & Golay 1964; REFERENCES.md).
  await expect.poll(async () => parseFloat(await page.getByTestId('noise-sigma').innerText()) / raw).toBeCloseTo(0.4555, 2);
  await expect(page.getByTestId('noise-checks').locator('li')).not.toHaveCount(0);
  // A smoother's residual has too many runs: the verdict must not read clean.
  await expect(page.getByTestId('residual-verdict')).not.toHaveAttribute('data-level', 'clean');
  const { d } = await exportFile(page, 'export-peaks-csv');
  const csv = readFileSync(await d.path(), 'utf8');
  expect(csv).toMatch(/# Noise assumptions: /);
  expect(csv).toMatch(/# Noise check \((held|DID NOT HOLD|not tested)\): /);
  expect(csv).toContain('Carried exactly through the linear stack');
});
