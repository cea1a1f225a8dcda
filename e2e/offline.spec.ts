import { expect, test, type Page } from '@playwright/test';
import { createServer, type Server } from 'node:http';
import type { AddressInfo, Socket } from 'node:net';
import { readFileSync, statSync } from 'node:fs';
import { extname, join, normalize, resolve } from 'node:path';

// Issue 13, "It does not open offline": after one visit the page opens and works with its server
// STOPPED (not the browser's offline switch, which does not govern a service worker's own fetches,
// so such a test can pass falsely); dist/index.html opened from disk says how to serve it.

const DIST = resolve('dist');
const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8', '.js': 'text/javascript; charset=utf-8', '.css': 'text/css; charset=utf-8',
  '.json': 'application/json', '.webmanifest': 'application/manifest+json', '.png': 'image/png', '.csv': 'text/csv; charset=utf-8',
};

/** A plain static server over dist/ on a free port of this machine, which the test can stop for good. */
async function serveDist(): Promise<{ origin: string; stop: () => Promise<void> }> {
  const sockets = new Set<Socket>();
  const server: Server = createServer((req, res) => {
    const path = decodeURIComponent(new URL(req.url ?? '/', 'http://x').pathname);
    let file = normalize(join(DIST, path));
    if (!file.startsWith(DIST)) { res.writeHead(403).end(); return; }
    try { if (statSync(file).isDirectory()) file = join(file, 'index.html'); } catch { res.writeHead(404).end(); return; }
    try {
      const body = readFileSync(file);
      res.writeHead(200, { 'content-type': TYPES[extname(file)] ?? 'application/octet-stream', 'cache-control': 'no-cache' }).end(body);
    } catch {
      res.writeHead(404).end();
    }
  });
  server.on('connection', (s) => { sockets.add(s); s.on('close', () => sockets.delete(s)); });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  const { port } = server.address() as AddressInfo;
  return {
    origin: `http://127.0.0.1:${port}`,
    stop: () => new Promise<void>((r) => { for (const s of sockets) s.destroy(); server.close(() => r()); }),
  };
}

async function demoDrawn(page: Page) {
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible({ timeout: 30_000 });
  await expect.poll(() => page.evaluate(() => {
    const gd = document.querySelector('[data-testid="figure"]') as unknown as { data?: { name: string; x: number[] }[] } | null;
    return gd?.data?.find((t) => t.name === 'processed')?.x.length ?? 0;
  }), { timeout: 30_000 }).toBeGreaterThan(100);
}

test('after one visit the page opens and works with its server stopped', async ({ browser }) => {
  test.setTimeout(180_000);
  const server = await serveDist();
  const context = await browser.newContext({ serviceWorkers: 'allow' });
  const page = await context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(String(e)));
  await page.goto(`${server.origin}/`);
  await demoDrawn(page);
  await expect.poll(() => page.evaluate(() => !!navigator.serviceWorker.controller), { timeout: 30_000 }).toBe(true);
  await expect(page.getByTestId('session-status')).toContainText('opens without its server', { timeout: 30_000 });
  // Every file of the build is in the copy.
  const listed = JSON.parse(/const FILES = (\[[\s\S]*?\]);/.exec(readFileSync(join(DIST, 'sw.js'), 'utf8'))![1]) as string[];
  const cached = await page.evaluate(async () => {
    const name = (await caches.keys()).find((k) => k.startsWith('tracewright-'))!;
    return (await (await caches.open(name)).keys()).map((r) => new URL(r.url).pathname);
  });
  for (const f of listed) expect(cached, f).toContain(`/${f === './' ? '' : f}`);
  expect(listed).toEqual(expect.arrayContaining(['index.html', 'manifest.webmanifest', 'demo/demo-sample.csv', 'icons/icon-192.png']));

  // The server is stopped for good: nothing answers at that address any more.
  await server.stop();
  await expect(fetch(`${server.origin}/`)).rejects.toThrow();

  // A reload, and a new tab opened at the address: both come up from the copy and work.
  await page.reload();
  await demoDrawn(page);
  const tab = await context.newPage();
  await tab.goto(`${server.origin}/`);
  await demoDrawn(tab);
  await tab.close();
  await page.getByTestId('file-input').setInputFiles('test/fixtures/hostile/x-descending.csv');
  await expect(page.getByRole('heading', { name: /x-descending\.csv/ })).toBeVisible({ timeout: 30_000 });
  await page.selectOption('#add-step-choice', 'moving-average');
  await page.getByRole('button', { name: 'Add step' }).click();
  await expect(page.getByTestId('residual-verdict')).toBeVisible({ timeout: 30_000 });
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-cleaned-csv').click()]);
  expect(readFileSync((await download.path())!, 'utf8')).toContain('x-descending.csv');
  expect(errors).toEqual([]);
  await context.close();
});

test('the web app manifest names the page, its start address and its icons, all served from the build', () => {
  const m = JSON.parse(readFileSync(join(DIST, 'manifest.webmanifest'), 'utf8')) as { name: string; start_url: string; display: string; icons: { src: string; sizes: string; type: string }[] };
  expect(m.name).toBe('Tracewright');
  expect(m.start_url).toBe('./');
  expect(m.display).toBe('standalone');
  const sizes = m.icons.map((i) => i.sizes);
  expect(sizes).toEqual(expect.arrayContaining(['192x192', '512x512']));
  for (const i of m.icons) {
    const png = readFileSync(join(DIST, i.src));
    // PNG signature (ISO/IEC 15948) and the stated size in the IHDR chunk.
    expect(png.subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
    expect(`${png.readUInt32BE(16)}x${png.readUInt32BE(20)}`).toBe(i.sizes);
  }
  expect(readFileSync(join(DIST, 'index.html'), 'utf8')).toContain('<link rel="manifest" href="./manifest.webmanifest"');
});

test('dist/index.html opened from disk says, in plain HTML without any script, how to serve it', async ({ browser }) => {
  for (const javaScriptEnabled of [true, false]) {
    const context = await browser.newContext({ javaScriptEnabled });
    const page = await context.newPage();
    await page.goto(`file://${join(DIST, 'index.html')}`);
    const note = page.getByTestId('not-started');
    await expect(note).toContainText('Tracewright did not start');
    await expect(note).toContainText('python3 -m http.server 8000');
    // It fades in after a few seconds (a served page replaces it long before).
    await expect.poll(() => note.evaluate((e) => getComputedStyle(e).opacity), { timeout: 10_000 }).toBe('1');
    await context.close();
  }
});

test('the served page replaces the how-to-serve note at once', async ({ page }) => {
  await page.goto('/');
  await demoDrawn(page);
  await expect(page.getByTestId('not-started')).toHaveCount(0);
});
