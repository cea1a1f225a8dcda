import { expect, test } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { openWithDemo, trace } from './helpers.ts';

const truth = JSON.parse(readFileSync('public/demo/demo-truth.json', 'utf8'));

async function addStep(page: import('@playwright/test').Page, id: string) {
  await page.selectOption('#add-step-choice', id);
  await page.getByRole('button', { name: 'Add step' }).click();
}

test('Savitzky–Golay: the processed trace changes with the window and the residual appears', async ({ page }) => {
  await openWithDemo(page);
  const raw = (await trace(page, 'raw'))!;
  await addStep(page, 'savitzky-golay');
  await expect(page.getByTestId('residual-verdict')).toBeVisible();
  await expect.poll(async () => (await trace(page, 'residual (raw − processed)'))?.y.some((v) => v !== 0)).toBe(true);
  const first = (await trace(page, 'processed'))!;
  expect(first.y).not.toEqual(raw.y);
  // Type a wider window: the plotted processed data must change again.
  const windowBox = page.getByTestId('step-savitzky-golay').getByRole('textbox', { name: /^Window/ });
  await windowBox.fill('41');
  await windowBox.press('Enter');
  await expect.poll(async () => JSON.stringify((await trace(page, 'processed'))!.y) !== JSON.stringify(first.y)).toBe(true);
  // A wider window flattens the tallest peak more.
  const second = (await trace(page, 'processed'))!;
  expect(Math.max(...second.y)).toBeLessThan(Math.max(...first.y));
  // Undo brings the first window back.
  await page.getByRole('button', { name: 'Undo' }).click();
  await expect(windowBox).not.toHaveValue('41');
  await expect.poll(async () => JSON.stringify((await trace(page, 'processed'))!.y) === JSON.stringify(first.y)).toBe(true);
});

test('Remove spikes (Hampel) lists the demo spike as a replaced point', async ({ page }) => {
  await openWithDemo(page);
  await addStep(page, 'despike');
  const events = page.getByTestId('spike-events');
  await expect(events).toBeVisible();
  const xs = await events.locator('tbody tr td:first-child').allInnerTexts();
  const spikeX = truth.spike.x as number;
  expect(xs.map(Number).some((x) => Math.abs(x - spikeX) < 1e-6)).toBe(true);
  // and it is marked on the plot
  const marks = await trace(page, 'replaced points');
  expect(marks?.x.some((x) => Math.abs(x - spikeX) < 1e-6)).toBe(true);
});

test('steps reorder by keyboard and the order is announced', async ({ page }) => {
  await openWithDemo(page);
  await addStep(page, 'moving-average');
  await addStep(page, 'despike');
  const titles = page.locator('.steps .step-title');
  await expect(titles).toHaveText(['Moving average', 'Remove spikes']);
  await page.getByRole('button', { name: /Reorder Remove spikes/ }).focus();
  await page.keyboard.press('ArrowUp');
  await expect(titles).toHaveText(['Remove spikes', 'Moving average']);
});
