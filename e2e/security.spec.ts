import { expect, test } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { openWithDemo, trace } from './helpers.ts';

// Issue 9, "No network": every request the built page makes stays on its own origin,
// and the strict Content-Security-Policy of the build is never violated.

test('the built page carries a strict Content-Security-Policy', () => {
  const html = readFileSync('dist/index.html', 'utf8');
  const m = /<meta http-equiv="Content-Security-Policy" content="([^"]+)"/.exec(html);
  expect(m, 'dist/index.html has a CSP meta').not.toBeNull();
  const csp = m![1];
  const directive = (name: string) => csp.split(';').map((d) => d.trim()).find((d) => d.startsWith(`${name} `)) ?? '';
  expect(directive('script-src')).toBe("script-src 'self'");
  expect(csp).not.toContain('unsafe-eval');
  expect(directive('worker-src')).toBe("worker-src 'self'");
  expect(directive('connect-src')).toBe("connect-src 'self'");
  expect(directive('object-src')).toBe("object-src 'none'");
  // No script is loaded from anywhere but the page's own files.
  for (const src of html.matchAll(/<script[^>]*src="([^"]+)"/g)) expect(src[1]).toMatch(/^\.?\/?assets\//);
});

test('no request leaves the origin and nothing breaks the policy while loading, processing and opening a file', async ({ page }) => {
  const requests: string[] = [];
  const violations: string[] = [];
  page.on('request', (r) => requests.push(r.url()));
  page.on('console', (m) => { if (m.text().includes('Content Security Policy')) violations.push(m.text()); });
  await page.exposeFunction('__reportCsp', (v: string) => violations.push(v));
  await page.addInitScript(() => {
    // Init scripts also run in the service worker, which has no document.
    if (typeof document === 'undefined') return;
    document.addEventListener('securitypolicyviolation', (e) => {
      (window as unknown as { __reportCsp: (v: string) => void }).__reportCsp(`${e.violatedDirective} ${e.blockedURI}`);
    });
  });

  await openWithDemo(page);
  const origin = new URL(page.url()).origin;
  // A worker did the computing (the plot drew), under worker-src 'self'.
  await page.selectOption('#add-step-choice', 'savitzky-golay');
  await page.getByRole('button', { name: 'Add step' }).click();
  await page.selectOption('#add-step-choice', 'frequency-filter');
  await page.getByRole('button', { name: 'Add step' }).click();
  await expect.poll(async () => (await trace(page, 'residual (raw − processed)'))?.y.some((v) => v !== 0)).toBe(true);
  await page.getByTestId('file-input').setInputFiles('e2e/fixtures/absorbance-semicolon.csv');
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length).toBe(60);
  // A header with markup is shown as text and runs nothing.
  await page.getByTestId('file-input').setInputFiles('test/fixtures/hostile/markup-header.csv');
  await expect(page.getByRole('heading', { name: /markup-header\.csv/ })).toBeVisible();
  expect(await page.evaluate(() => (window as unknown as { __pwned?: number }).__pwned)).toBeUndefined();
  await expect(page.locator('img[src="x"]')).toHaveCount(0);
  // The plot still draws under the policy.
  await expect(page.locator('[data-testid="figure"] .main-svg').first()).toBeVisible();
  expect((await trace(page, 'raw'))!.x.length).toBe(10);

  expect(requests.length).toBeGreaterThan(0);
  const foreign = requests.filter((u) => !u.startsWith('data:') && !u.startsWith('blob:') && new URL(u).origin !== origin);
  expect(foreign).toEqual([]);
  expect(violations).toEqual([]);
});

test('works offline after the first load: no request goes out and a file still loads and plots', async ({ page, context }) => {
  await openWithDemo(page);
  const origin = new URL(page.url()).origin;
  const after: string[] = [];
  page.on('request', (r) => after.push(r.url()));
  await context.setOffline(true);
  // The offline switch does not govern a service worker's own fetches, so reopening without the server is tested
  // by stopping the server (offline.spec.ts); here the open page must keep working without the network.
  await page.selectOption('#add-step-choice', 'moving-average');
  await page.getByRole('button', { name: 'Add step' }).click();
  await page.getByTestId('file-input').setInputFiles('test/fixtures/hostile/x-descending.csv');
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length).toBe(10);
  expect((await trace(page, 'raw'))!.x[0]).toBe(3100);
  await expect(page.locator('.xtitle')).toContainText('Wavenumber (1/cm)');
  expect(after.filter((u) => !u.startsWith('data:') && !u.startsWith('blob:') && new URL(u).origin !== origin)).toEqual([]);
  await context.setOffline(false);
});
