// End-to-end timings in headless Chromium: load a 10^6-row CSV to the drawn
// plot, then time slider moves to the redrawn plot. Prints timings; asserts
// nothing (the figures depend on the machine and its load).
//
//   node e2e/timing.bench.mjs              1,000,000 rows, 3 slider moves
//   node e2e/timing.bench.mjs --rows 10000000 --moves 3
//   node e2e/timing.bench.mjs --build      rebuild dist/ first (otherwise only when missing)
//   node e2e/timing.bench.mjs --profile    also print the main thread's top functions during the first slider move
//
// It serves dist/ with `vite preview` on 127.0.0.1:4173 (started and stopped
// here) and drives the system Chromium (TRACEWRIGHT_CHROMIUM or /usr/bin/chromium).
// Not a Playwright spec: the file name matches neither *.spec.* nor *.test.*.
import { chromium } from '@playwright/test';
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, createWriteStream } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const PREFERRED_PORT = 4173;

function parseArgs(argv) {
  const o = { rows: 1_000_000, moves: 3, build: false, profile: false };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--rows') o.rows = Number(argv[++i]);
    else if (a === '--moves') o.moves = Number(argv[++i]);
    else if (a === '--build') o.build = true;
    else if (a === '--profile') o.profile = true;
    else throw new RangeError(`Unknown option ${a}; see the head of e2e/timing.bench.mjs.`);
  }
  if (!(Number.isInteger(o.rows) && o.rows >= 1000)) throw new RangeError('--rows must be a whole number of at least 1000.');
  if (!(Number.isInteger(o.moves) && o.moves >= 1 && o.moves <= 40)) throw new RangeError('--moves must be from 1 to 40.');
  return o;
}

/** Seeded mulberry32 + Box–Muller (the same generator as src/core/numeric/random.ts), so the file is the same every run. */
function makeRng(seed) {
  let state = seed >>> 0;
  let spare = null;
  const uniform = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = () => {
    if (spare !== null) { const s = spare; spare = null; return s; }
    const r = Math.sqrt(-2 * Math.log(1 - uniform()));
    const a = 2 * Math.PI * uniform();
    spare = r * Math.sin(a);
    return r * Math.cos(a);
  };
  return { uniform, normal };
}

/** Invented trace as in test/bench/run.ts: Gaussian peaks on a drift with white noise, x in minutes. Written in chunks. */
async function writeCsv(file, n) {
  const rng = makeRng(20260801 + n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) y[i] = 0.5 + 0.2 * (i / n) + 0.3 * Math.sin((3 * Math.PI * i) / n);
  const peaks = Math.max(5, Math.round(n / 4000));
  for (let k = 0; k < peaks; k++) {
    const c = rng.uniform() * n, s = 4 + 60 * rng.uniform(), h = 0.15 + 10 * rng.uniform() ** 3;
    for (let i = Math.max(0, Math.floor(c - 6 * s)); i <= Math.min(n - 1, Math.ceil(c + 6 * s)); i++) y[i] += h * Math.exp(-0.5 * ((i - c) / s) ** 2);
  }
  for (let i = 0; i < n; i++) y[i] += 0.05 * rng.normal();
  const out = createWriteStream(file);
  const write = (s) => new Promise((res) => (out.write(s) ? res() : out.once('drain', res)));
  await write('time (min),signal (mV)\n');
  for (let i0 = 0; i0 < n; i0 += 100_000) {
    const parts = [];
    for (let i = i0; i < Math.min(n, i0 + 100_000); i++) parts.push(`${(i * 0.001).toFixed(5)},${y[i].toFixed(7)}\n`);
    await write(parts.join(''));
  }
  await new Promise((res) => out.end(res));
  return (n - 1) * 0.001;
}

async function answers(url) {
  try {
    return (await fetch(url)).ok;
  } catch {
    return false;
  }
}

/**
 * 4173 unless something already serves there (on a shared machine another
 * run's preview may be up, and it may serve a different build): then the
 * first free port from 4180.
 */
async function choosePort() {
  if (!(await answers(`http://127.0.0.1:${PREFERRED_PORT}`))) return PREFERRED_PORT;
  for (let p = 4180; p < 4200; p++) if (!(await answers(`http://127.0.0.1:${p}`))) return p;
  throw new Error('no free port between 4180 and 4199 for vite preview');
}

async function waitForServer(url, ms) {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    try {
      const r = await fetch(url);
      if (r.ok) return;
    } catch { /* not up yet */ }
    await new Promise((res) => setTimeout(res, 200));
  }
  throw new Error(`vite preview did not answer on ${url} within ${ms / 1000} s`);
}

/** Top self-time functions of a CDP CPU profile, as printable lines. */
function topSelf(profile, count) {
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const self = new Map();
  profile.samples.forEach((id, i) => {
    const f = byId.get(id).callFrame;
    const key = `${f.functionName || '(anonymous)'} ${f.url.split('/').pop()}:${f.lineNumber + 1}`;
    self.set(key, (self.get(key) ?? 0) + profile.timeDeltas[i] / 1000);
  });
  return [...self.entries()].sort((a, b) => b[1] - a[1]).slice(0, count).map(([k, ms]) => `    ${ms.toFixed(0).padStart(7)} ms  ${k}`);
}

function median(a) {
  const s = [...a].sort((p, q) => p - q);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
}

/** In the page: install a cheap fingerprint of one plotted trace (sum weighted by position), null when absent. */
function installFingerprint() {
  window.__fingerprint = (name) => {
    const gd = document.querySelector('[data-testid="figure"]');
    const t = (gd && gd.data ? gd.data : []).find((d) => d.name === name);
    if (!t || !t.y || !t.y.length) return null;
    let s = 0;
    for (let i = 0; i < t.y.length; i++) s += t.y[i] * ((i % 97) + 1);
    return t.y.length + ':' + s;
  };
}

async function main() {
  const o = parseArgs(process.argv.slice(2));
  if (o.build || !existsSync('dist/index.html')) {
    console.log('building dist/ …');
    const b = spawnSync('npx', ['vite', 'build', '--logLevel', 'warn'], { stdio: 'inherit' });
    if (b.status !== 0) throw new Error('vite build failed');
  }
  const dir = mkdtempSync(join(tmpdir(), 'tracewright-e2e-bench-'));
  const fileName = `timing-${o.rows}.csv`;
  const file = join(dir, fileName);
  const lastX = await writeCsv(file, o.rows);
  console.log(`${fileName}: ${o.rows.toLocaleString('en')} rows written`);

  // Our own preview server, in its own process group so it can be stopped with its children.
  const port = await choosePort();
  const BASE = `http://127.0.0.1:${port}`;
  if (port !== PREFERRED_PORT) console.log(`port ${PREFERRED_PORT} is taken; serving on ${port}`);
  const server = spawn('npx', ['vite', 'preview', '--host', '127.0.0.1', '--port', String(port), '--strictPort'], { stdio: 'ignore', detached: true });
  let serverExited = false;
  server.on('exit', () => { serverExited = true; });
  let browser;
  try {
    await waitForServer(BASE, 60_000);
    if (serverExited) throw new Error(`vite preview stopped at once; is port ${port} taken?`);
    browser = await chromium.launch({
      executablePath: process.env.TRACEWRIGHT_CHROMIUM ?? '/usr/bin/chromium',
      args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--no-first-run'],
    });
    const page = await browser.newPage({ viewport: { width: 1400, height: 900 } });
    const errors = [];
    page.on('pageerror', (e) => errors.push(String(e)));
    const version = browser.version();
    await page.goto(BASE);
    // Functions, not strings: the page's Content-Security-Policy forbids eval.
    await page.evaluate(installFingerprint);
    await page.waitForFunction(() => window.__fingerprint('raw') !== null, null, { timeout: 60_000 });

    // Long main-thread tasks and the moment the file input changes, recorded in the page.
    await page.evaluate(() => {
      const w = window;
      w.__longTasks = [];
      new PerformanceObserver((list) => { for (const e of list.getEntries()) w.__longTasks.push(e.duration); }).observe({ type: 'longtask', buffered: false });
      const input = document.querySelector('[data-testid="file-input"]');
      input.addEventListener('change', () => { w.__loadStart = performance.now(); }, { capture: true, once: true });
    });
    await page.getByTestId('file-input').setInputFiles(file);
    await page.waitForFunction((last) => {
      const gd = document.querySelector('[data-testid="figure"]');
      const t = (gd && gd.data ? gd.data : []).find((d) => d.name === 'raw');
      if (!t || !t.x || !t.x.length) return false;
      return Math.abs(t.x[t.x.length - 1] - last) <= last * 0.01;
    }, lastX, { timeout: 180_000, polling: 5 });
    const load = await page.evaluate(() => ({ ms: performance.now() - window.__loadStart, tasks: window.__longTasks.slice() }));
    console.log(`load to drawn (file input change → raw trace drawn): ${load.ms.toFixed(0)} ms   target ≤ 1500 ms: ${load.ms <= 1500 ? 'meets' : 'MISSES'}`);
    console.log(`  main-thread tasks over 50 ms during the load: ${load.tasks.length}; longest ${load.tasks.length ? Math.max(...load.tasks).toFixed(0) : 0} ms (the page should stay under 100 ms)`);
    const peakRows = async () => page.evaluate(() => ({
      rows: document.querySelectorAll('[data-testid="peak-table"] tbody tr').length,
      summary: document.querySelector('[data-testid="peak-summary"]')?.textContent ?? '',
    }));
    let pk = await peakRows();
    console.log(`  peak table after the load: ${pk.rows} rows (${pk.summary.trim()})`);

    // Add a moving average and wait for the processed trace to change.
    const redrawAfter = async (action) => page.evaluate(async (action) => {
      const fingerprint = window.__fingerprint;
      const before = fingerprint('processed');
      const t0 = performance.now();
      if (action.kind === 'slider') {
        const el = document.querySelector('[data-testid="step-moving-average"] input[type="range"]');
        if (!el) throw new Error('no moving-average slider');
        const setter = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, 'value').set;
        setter.call(el, String(action.value));
        el.dispatchEvent(new Event('input', { bubbles: true }));
        el.dispatchEvent(new Event('change', { bubbles: true }));
      } else {
        const button = [...document.querySelectorAll('button')].find((b) => b.textContent.trim() === 'Add step');
        button.click();
      }
      return await new Promise((resolve, reject) => {
        const tick = () => {
          const now = fingerprint('processed');
          if (now !== null && now !== before) resolve(performance.now() - t0);
          else if (performance.now() - t0 > 60_000) reject(new Error('the plot was not redrawn within 60 s'));
          else setTimeout(tick, 1);
        };
        setTimeout(tick, 0);
      });
    }, action);

    await page.selectOption('#add-step-choice', 'moving-average');
    const addMs = await redrawAfter({ kind: 'add' });
    console.log(`add moving average (default window) → redrawn: ${addMs.toFixed(0)} ms`);
    await page.evaluate(() => { window.__longTasks = []; });
    const moves = [];
    let cdp = null;
    if (o.profile) {
      cdp = await page.context().newCDPSession(page);
      await cdp.send('Profiler.enable');
      await cdp.send('Profiler.start');
    }
    for (let k = 0; k < o.moves; k++) {
      const value = 7 + 2 * k;
      moves.push(await redrawAfter({ kind: 'slider', value }));
      if (cdp && k === 0) {
        const { profile } = await cdp.send('Profiler.stop');
        console.log('  main thread during the first slider move, top self time:');
        for (const line of topSelf(profile, 15)) console.log(line);
        cdp = null;
      }
      // One move that takes more than 10 s says enough; the rest would only take minutes more.
      if (moves[k] > 10_000 && k + 1 < o.moves) { console.log(`  (a move took ${(moves[k] / 1000).toFixed(0)} s: the remaining moves are skipped)`); break; }
      await page.waitForTimeout(300);
    }
    pk = await peakRows();
    console.log(`  peak table after the moves: ${pk.rows} rows`);
    const tasks = await page.evaluate(() => window.__longTasks.slice());
    console.log(`slider move → redrawn plot, window 7…${7 + 2 * (moves.length - 1)} points: median ${median(moves).toFixed(0)} ms over ${moves.length}, max ${Math.max(...moves).toFixed(0)} ms (${moves.map((m) => m.toFixed(0)).join(', ')})   target ≤ 100 ms: ${median(moves) <= 100 ? 'meets' : 'MISSES'}`);
    console.log(`  main-thread tasks over 50 ms during the moves: ${tasks.length}; longest ${tasks.length ? Math.max(...tasks).toFixed(0) : 0} ms`);
    console.log(`Chromium ${version}, node ${process.version}, ${new Date().toISOString()}`);
    if (errors.length) console.log(`page errors: ${errors.join(' | ')}`);
  } finally {
    if (browser) await browser.close();
    try { process.kill(-server.pid, 'SIGTERM'); } catch { /* already gone */ }
    rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((e) => { console.error(e); process.exitCode = 1; });
