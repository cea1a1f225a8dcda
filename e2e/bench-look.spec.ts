import { expect, test } from '@playwright/test';
import { addStep, openWithDemo, settled } from './helpers.ts';

// Issue 17: screenshots of the page at 1280 × 800 in the light and the dark theme, for a person to look at.
for (const scheme of ['light', 'dark'] as const) {
  test(`screenshots at 1280 × 800, ${scheme}`, async ({ page }) => {
    test.skip(!process.env.TRACEWRIGHT_SHOTS, 'pictures for a person to look at: set TRACEWRIGHT_SHOTS to a folder');
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.emulateMedia({ colorScheme: scheme });
    await openWithDemo(page);
    const dir = process.env.TRACEWRIGHT_SHOTS!;
    await page.getByTestId('guide-toggle').click();
    await page.screenshot({ path: `${dir}/guide-${scheme}.png` });
    await page.getByTestId('guide-close').click();
    await addStep(page, 'moving-average');
    await page.getByRole('button', { name: /5-point moving average/ }).click();
    await settled(page);
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: `${dir}/page-${scheme}.png` });
    await page.selectOption('#peak-order', 'snr');
    await page.getByTestId('peak-table').locator('tbody tr').nth(2).click();
    await expect(page.getByTestId('focus-view')).toBeVisible();
    await settled(page);
    await page.getByTestId('focus-view').scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${dir}/focus-${scheme}.png` });
    await page.getByTestId('peak-panel').scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${dir}/table-${scheme}.png` });
    await page.getByTestId('loss-panel').scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${dir}/loss-${scheme}.png` });
    await page.keyboard.press('?');
    await page.getByTestId('shortcuts').scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${dir}/keys-${scheme}.png` });
  });
}
