// How long a freshly opened page takes to show the demo analysed and go idle,
// and how many analyses it asks the worker for on the way. Prints figures;
// asserts nothing (they depend on the machine and its load).
//
//   node e2e/demo-open.bench.mjs                        dist/ of this checkout, 5 runs
//   node e2e/demo-open.bench.mjs --dist A --dist B      two builds, runs alternating A, B, A, B…
//   node e2e/demo-open.bench.mjs --runs 7
//
// Each run opens the page in a new browser context (no saved session, so the
// demo loads) and measures in the page with performance.now(), i.e. from the
// start of the navigation:
//   shown_ms     the first time the plot is drawn (the sample's raw trace; data-drawn set)
//   drawn_ms     the first time the plot carries an analysis result (data-drawn not "0")
//   idle_ms      the last time the busy mark beside the plot title went away (the page
//                stays idle for 2 s after the "Demo loaded" notice before the run ends)
//   analyses     analysis calls posted to the computation worker (each newer one cancels the older)
// One line per run: `DEMO_OPEN build=<n> shown_ms=… drawn_ms=… idle_ms=… analyses=… load=…`, then the minimum
// and median of each build.
//
// It serves each dist/ from a small static server on 127.0.0.1 at TRACEWRIGHT_E2E_PORT (default
// 4173) and drives the system Chromium (TRACEWRIGHT_CHROMIUM or /usr/bin/chromium). Not a
// Playwright spec: the file name matches neither *.spec.* nor *.test.*.
import { chromium } from '@playwright/test';
import { createServer } from 'node:http';
import { readFile } from 'node:fs/promises';
import { loadavg } from 'node:os';
import { extname, join, normalize, resolve } from 'node:path';

function parseArgs(argv) {
  const o = { dists: [], runs: 5 };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--dist') o.dists.push(resolve(argv[++i]));
    else if (a === '--runs') o.runs = Number(argv[++i]);
    else throw new RangeError(`Unknown option ${a}; see the head of e2e/demo-open.bench.mjs.`);
  }
  if (!o.dists.length) o.dists.push(resolve('dist'));
  if (!(Number.isInteger(o.runs) && o.runs >= 1 && o.runs <= 40)) throw new RangeError('--runs must be from 1 to 40.');
  return o;
}

const TYPES = { '.html': 'text/html', '.js': 'text/javascript', '.mjs': 'text/javascript', '.css': 'text/css', '.json': 'application/json', '.webmanifest': 'application/manifest+json', '.csv': 'text/csv', '.svg': 'image/svg+xml', '.png': 'image/png', '.woff2': 'font/woff2', '.wasm': 'application/wasm' };

/** A static server whose root can be switched between runs. */
function serve(port) {
  const state = { root: '' };
  const server = createServer(async (req, res) => {
    const path = decodeURIComponent(new URL(req.url, 'http://x').pathname);
    const file = normalize(join(state.root, path.endsWith('/') ? `${path}index.html` : path));
    if (!file.startsWith(state.root)) { res.writeHead(403).end(); return; }
    try {
      const body = await readFile(file);
      res.writeHead(200, { 'content-type': TYPES[extname(file)] ?? 'application/octet-stream', 'cache-control': 'no-store' }).end(body);
    } catch {
      res.writeHead(404).end();
    }
  });
  return new Promise((ok) => server.listen(port, '127.0.0.1', () => ok({ state, close: () => server.close() })));
}

/** Watches the page from its first script on (an init script). */
function watch() {
  const w = { shown: null, drawn: null, idle: null, notice: null, busy: false, analyses: 0 };
  window.__demoOpen = w;
  const post = Worker.prototype.postMessage;
  Worker.prototype.postMessage = function (msg, ...rest) {
    if (msg && msg.type === 'call' && msg.method === 'analyse') w.analyses += 1;
    return post.call(this, msg, ...rest);
  };
  const look = () => {
    const now = performance.now();
    const fig = document.querySelector('[data-testid="figure"]');
    if (w.shown === null && fig && fig.hasAttribute('data-drawn')) w.shown = now;
    if (w.drawn === null && fig && (fig.getAttribute('data-drawn') ?? '0') !== '0') w.drawn = now;
    if (w.notice === null && [...document.querySelectorAll('.notice')].some((n) => n.textContent.includes('Demo loaded'))) w.notice = now;
    const busy = document.querySelector('[aria-label="computing"]') !== null;
    if (w.busy && !busy) w.idle = now;
    w.busy = busy;
  };
  new MutationObserver(look).observe(document, { subtree: true, childList: true, attributes: true, attributeFilter: ['data-drawn', 'aria-label'] });
}

async function oneRun(browser, port) {
  const context = await browser.newContext({ viewport: { width: 1400, height: 900 } });
  const page = await context.newPage();
  await page.addInitScript(watch);
  await page.goto(`http://127.0.0.1:${port}/`);
  const read = () => page.evaluate(() => ({ ...window.__demoOpen, now: performance.now() }));
  let w = await read();
  const t0 = Date.now();
  // Done when the notice is in, the plot has a result, and the page has been idle for 2 s.
  while (!(w.notice !== null && w.drawn !== null && !w.busy && w.now - Math.max(w.idle ?? 0, w.notice) > 2000)) {
    if (Date.now() - t0 > 120_000) throw new Error(`The demo did not settle within 120 s: ${JSON.stringify(w)}`);
    await page.waitForTimeout(100);
    w = await read();
  }
  await context.close();
  return { shown: w.shown ?? w.drawn, drawn: w.drawn, idle: w.idle ?? w.drawn, analyses: w.analyses };
}

const median = (a) => { const s = [...a].sort((x, y) => x - y); const m = s.length >> 1; return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2; };

async function main() {
  const o = parseArgs(process.argv.slice(2));
  const port = Number(process.env.TRACEWRIGHT_E2E_PORT ?? 4173);
  const server = await serve(port);
  const browser = await chromium.launch({
    executablePath: process.env.TRACEWRIGHT_CHROMIUM ?? '/usr/bin/chromium',
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  const rows = o.dists.map(() => []);
  try {
    o.dists.forEach((d, i) => console.log(`build ${i}: ${d}`));
    for (let r = 0; r < o.runs; r++) {
      for (let i = 0; i < o.dists.length; i++) {
        server.state.root = o.dists[i];
        const m = await oneRun(browser, port);
        rows[i].push(m);
        console.log(`DEMO_OPEN build=${i} run=${r + 1} shown_ms=${m.shown.toFixed(0)} drawn_ms=${m.drawn.toFixed(0)} idle_ms=${m.idle.toFixed(0)} analyses=${m.analyses} load=${loadavg()[0].toFixed(2)}`);
      }
    }
  } finally {
    await browser.close();
    server.close();
  }
  rows.forEach((rs, i) => {
    const f = (k) => `${Math.min(...rs.map((m) => m[k])).toFixed(0)} / ${median(rs.map((m) => m[k])).toFixed(0)}`;
    console.log(`build ${i} (min / median of ${rs.length}): shown ${f('shown')} ms, drawn ${f('drawn')} ms, idle ${f('idle')} ms, analyses ${f('analyses')}`);
  });
}

await main();
