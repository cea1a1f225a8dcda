import { expect, test } from '@playwright/test';
import { addStep, openWithDemo, settled } from './helpers.ts';

/**
 * Issue 14: after an edit that puts a non-linear step in the stack (σ then carried by simulation), the page marks
 * S/N provisional (noise panel and peak table) until the noise and peak stages of the new request land, and shows
 * no mark once they have. The marks may last only milliseconds on the demo, so a MutationObserver records every
 * time one is in the page.
 */
test('S/N is marked provisional while σ is carried through a despiking step, and the mark clears when it lands', async ({ page }) => {
  await openWithDemo(page);
  await settled(page);
  await expect(page.getByTestId('noise-provisional')).toHaveCount(0);
  await page.evaluate(() => {
    const w = window as unknown as { seenMarks: string[] };
    w.seenMarks = [];
    const look = () => {
      if (document.querySelector('[data-testid="noise-provisional"]')) w.seenMarks.push('noise');
      if (document.querySelector('[data-testid="peak-panel"][data-snr-provisional="true"]')) w.seenMarks.push('table');
    };
    new MutationObserver(look).observe(document.body, { subtree: true, childList: true, attributes: true, characterData: true });
  });
  await addStep(page, 'despike');
  await expect(page.getByTestId('noise-route')).toContainText('by simulation');
  await settled(page);
  const seen = await page.evaluate(() => (window as unknown as { seenMarks: string[] }).seenMarks);
  expect(seen).toContain('noise');
  expect(seen).toContain('table');
  // Landed: no mark left, σ carried by simulation, the peak table final.
  await expect(page.getByTestId('noise-provisional')).toHaveCount(0);
  await expect(page.getByTestId('peak-panel')).not.toHaveAttribute('data-snr-provisional', 'true');
  await expect(page.getByTestId('peaks-provisional')).toHaveCount(0);
});
