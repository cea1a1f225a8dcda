import { expect, type Page } from '@playwright/test';

export interface PlottedTrace { name: string; x: number[]; y: number[] }

/** The data Plotly actually drew (read from the graph div), not what we meant to draw. */
export async function plotted(page: Page): Promise<PlottedTrace[]> {
  return page.evaluate(() => {
    const gd = document.querySelector('[data-testid="figure"]') as unknown as { data?: { name: string; x: number[]; y: number[] }[] } | null;
    return (gd?.data ?? []).map((t) => ({ name: t.name, x: Array.from(t.x ?? []), y: Array.from(t.y ?? []) }));
  });
}

export async function trace(page: Page, name: string): Promise<PlottedTrace | undefined> {
  return (await plotted(page)).find((t) => t.name === name);
}

/** Open the page and wait until the demo sample is drawn. */
export async function openWithDemo(page: Page): Promise<void> {
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(String(e)));
  await page.goto('/');
  await expect.poll(async () => (await trace(page, 'processed'))?.x.length ?? 0, { timeout: 20_000 }).toBeGreaterThan(100);
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible();
  expect(errors).toEqual([]);
}

/** Everything loaded and edited so far is in the browser's database, not only in the journal (issue 13). */
export async function sessionSaved(page: Page): Promise<void> {
  const status = page.getByTestId('session-status');
  await expect(status).toContainText('kept in this browser', { timeout: 30_000 });
  await expect(status).toHaveAttribute('data-pending', 'false', { timeout: 30_000 });
}
