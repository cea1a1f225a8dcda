// End-to-end timings in headless Chromium: load a 10^6-row CSV to the drawn
// plot, then move the moving-average window slider and time what the page
// shows. Prints timings; asserts nothing (the figures depend on the machine
// and its load).
//
//   node e2e/timing.bench.mjs              1,000,000 rows, 7 slider moves
//   node e2e/timing.bench.mjs --rows 100000 --moves 9
//   node e2e/timing.bench.mjs --build      rebuild dist/ first (otherwise only when missing)
//   node e2e/timing.bench.mjs --profile    also print the main thread's top functions during the first slider move
//   node e2e/timing.bench.mjs --profile-out F   … and write that CPU profile to F (.cpuprofile, opens in DevTools)
//   node e2e/timing.bench.mjs --worker-profile-out F   … a CPU profile of the analysis worker during the first slider move
//   node e2e/timing.bench.mjs --profile-move K   profile slider move K instead of the first (the first may draw a new range)
//   node e2e/timing.bench.mjs --trace F    also write a Chromium trace (devtools timeline) of the second slider move to F
//   node e2e/timing.bench.mjs --steps 5 --alternatives 3   a longer stack (despike, baseline, Savitzky–Golay,
//                                          frequency filter before the moving average; 1 = the moving average alone,
//                                          the default) and that many of the loss panel's preset alternatives
//   node e2e/timing.bench.mjs --heap-detail   also print each thread's heap before and after a forced collection
//   node e2e/timing.bench.mjs --heap-snapshots D   … and write a heap snapshot of the page and of each worker to D
//
// Before the load and before every slider move it waits until the page is
// idle: no analysis in flight (the busy mark beside the plot title is gone),
// no main-thread task over 50 ms for 500 ms, and two idle callbacks in a row
// with at least 40 ms to spare.
//
// What is timed, all in the page with performance.now():
//   load_to_drawn_ms        the file input's change event → the first animation frame after the
//                           plot's raw trace reaches the file's last x
//   slider_to_processed_ms  the slider's input event → the first frame after the plot carries the
//                           new result (data-drawn on the figure, set once Plotly has drawn it)
//   slider_to_peaks_ms      … → the first frame after the peak table shows it (data-result-seq)
//   slider_to_loss_ms       … → the first frame after the loss panel shows it (data-result-seq)
//   longest_task_ms         the longest main-thread task (longtask observer) during the moves: from each
//                           slider input until the page is idle again (the figure's drawing of the last stage
//                           runs after the loss panel shows it)
// Printed besides (not in the TIMING line): the figure redrawn with no analysis behind it (the raw
// trace switched off and on), the plot library's share of every stage that changes the figure.
//   heap_mb                 after the moves: JS heap in use plus array-buffer and external-string
//                           storage (CDP Runtime.getHeapUsage: usedSize + backingStorageSize) of the
//                           page and of every worker, in MiB
// Slider figures are medians over the moves. The worker posts each stage as it lands (issue 16),
// so the three figures are when the page shows the processed trace, the peak table and the loss
// check of the new value.
//
// It serves dist/ with `vite preview` on 127.0.0.1 at TRACEWRIGHT_E2E_PORT (default 4173, or the
// first free port from 4180 when that one is taken) and drives the system Chromium
// (TRACEWRIGHT_CHROMIUM or /usr/bin/chromium). Not a Playwright spec: the file name matches
// neither *.spec.* nor *.test.*.
import { chromium } from '@playwright/test';
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, createWriteStream, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';

const PREFERRED_PORT = Number(process.env.TRACEWRIGHT_E2E_PORT ?? 4173);
/** Steps added (with their defaults) before the moving average for --steps 2…5, in this order. */
const EXTRA_STEPS = ['despike', 'baseline', 'savitzky-golay', 'frequency-filter'];
/** The loss panel's preset buttons clicked for --alternatives 1…4, in this order. */
const ALTERNATIVE_PRESETS = ['3-point moving average', '5-point moving average', 'Savitzky–Golay 11 points, order 2', 'Savitzky–Golay 25 points, order 4'];

function parseArgs(argv) {
  const o = { rows: 1_000_000, moves: 7, build: false, profile: false, profileOut: null, profileMove: 1, workerProfileOut: null, trace: null, steps: 1, alternatives: 0, heapDetail: false, heapSnapshots: null };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--rows') o.rows = Number(argv[++i]);
    else if (a === '--moves') o.moves = Number(argv[++i]);
    else if (a === '--build') o.build = true;
    else if (a === '--profile') o.profile = true;
    else if (a === '--trace') o.trace = argv[++i];
    else if (a === '--profile-out') { o.profile = true; o.profileOut = argv[++i]; }
    else if (a === '--worker-profile-out') o.workerProfileOut = argv[++i];
    else if (a === '--profile-move') o.profileMove = Number(argv[++i]);
    else if (a === '--steps') o.steps = Number(argv[++i]);
    else if (a === '--alternatives') o.alternatives = Number(argv[++i]);
    else if (a === '--heap-detail') o.heapDetail = true;
    else if (a === '--heap-snapshots') { o.heapDetail = true; o.heapSnapshots = argv[++i]; }
    else throw new RangeError(`Unknown option ${a}; see the head of e2e/timing.bench.mjs.`);
  }
  if (!(Number.isInteger(o.rows) && o.rows >= 1000)) throw new RangeError('--rows must be a whole number of at least 1000.');
  if (!(Number.isInteger(o.profileMove) && o.profileMove >= 1)) throw new RangeError('--profile-move must be a whole number of at least 1.');
  if (!(Number.isInteger(o.moves) && o.moves >= 1 && o.moves <= 40)) throw new RangeError('--moves must be from 1 to 40.');
  if (!(Number.isInteger(o.steps) && o.steps >= 1 && o.steps <= 1 + EXTRA_STEPS.length)) throw new RangeError(`--steps must be from 1 to ${1 + EXTRA_STEPS.length}.`);
  if (!(Number.isInteger(o.alternatives) && o.alternatives >= 0 && o.alternatives <= ALTERNATIVE_PRESETS.length)) throw new RangeError(`--alternatives must be from 0 to ${ALTERNATIVE_PRESETS.length}.`);
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

/** The preferred port unless something already serves there (perhaps another build): then the first free one from 4180. */
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
    const key = `${f.functionName || "(anonymous)"} ${f.url.split("/").pop()}:${f.lineNumber + 1}:${f.columnNumber + 1}`;
    self.set(key, (self.get(key) ?? 0) + profile.timeDeltas[i] / 1000);
  });
  return [...self.entries()].sort((a, b) => b[1] - a[1]).slice(0, count).map(([k, ms]) => `    ${ms.toFixed(0).padStart(7)} ms  ${k}`);
}

function median(a) {
  const s = [...a].sort((p, q) => p - q);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
}

// ---------------------------------------------------------------------------
// In the page (functions, not strings: the page's Content-Security-Policy forbids eval)

/** Long-task log, and the helpers the measurements use. */
function installProbes() {
  const w = window;
  w.__longTasks = [];
  w.__lastLongTaskEnd = 0;
  new PerformanceObserver((list) => {
    for (const e of list.getEntries()) { w.__longTasks.push({ start: e.startTime, duration: e.duration }); w.__lastLongTaskEnd = e.startTime + e.duration; }
  }).observe({ type: 'longtask', buffered: false });
  w.__nextFrame = () => new Promise((res) => requestAnimationFrame((t) => res(t)));
  w.__seq = (selector, attr) => Number(document.querySelector(selector)?.getAttribute(attr) ?? NaN);
}

/** Resolves once the page is idle (see the head of this file); rejects after `ms`. */
function waitIdle(ms) {
  const w = window;
  const t0 = performance.now();
  const idleCallback = () => new Promise((res) => requestIdleCallback((d) => res(d.timeRemaining()), { timeout: 1000 }));
  return new Promise((resolve, reject) => {
    const check = async () => {
      if (performance.now() - t0 > ms) { reject(new Error(`the page did not become idle within ${ms / 1000} s`)); return; }
      const busy = document.querySelector('.busy') !== null || document.querySelector('[data-testid="loading"]') !== null;
      const quiet = performance.now() - w.__lastLongTaskEnd > 500;
      if (!busy && quiet && (await idleCallback()) >= 40 && (await idleCallback()) >= 40) resolve(performance.now() - t0);
      else setTimeout(check, 50);
    };
    check();
  });
}

/**
 * The figure's redraw alone, no analysis: switch the raw trace off or on (one trace fewer or more, the
 * rest unchanged) and time the input event → the plot library's drawing done (the figure's data-drawn
 * attribute is written again) → the next frame. Returns [ms to drawn, ms to the frame].
 */
async function toggleRawRedraw() {
  const box = [...document.querySelectorAll('label.switch')].find((l) => l.textContent.trim() === 'raw')?.querySelector('input');
  const fig = document.querySelector('[data-testid="figure"]');
  if (!box || !fig) throw new Error('no raw switch or figure');
  return await new Promise((resolve) => {
    let drawnAt = 0;
    const t0 = performance.now();
    const mo = new MutationObserver(() => {
      mo.disconnect();
      drawnAt = performance.now() - t0;
      requestAnimationFrame((frame) => resolve([drawnAt, frame - t0]));
    });
    mo.observe(fig, { attributes: true, attributeFilter: ['data-drawn'] });
    box.click();
  });
}

/** Set the moving-average slider and time the first frames showing the new result in the plot, the peak table and the loss panel. */
async function moveSlider({ value, timeoutMs }) {
  const w = window;
  const el = document.querySelector('[data-testid="step-moving-average"] input[type="range"]');
  if (!el) throw new Error('no moving-average slider');
  const targets = {
    processed: ['[data-testid="figure"]', 'data-drawn'],
    peaks: ['[data-testid="peak-panel"]', 'data-result-seq'],
    loss: ['[data-testid="loss-panel"]', 'data-result-seq'],
  };
  // Each part carries its own count (the plot the processed stage's, the table the peaks stage's, the loss panel the loss stage's).
  const before = Object.fromEntries(Object.entries(targets).map(([name, [sel, attr]]) => [name, w.__seq(sel, attr)]));
  const tasksBefore = w.__longTasks.length;
  const got = {};
  // Issue 16: how the figure was drawn each time during the move ("lines": only changed lines replaced in place; "whole").
  const fig = document.querySelector('[data-testid="figure"]');
  const drawings = [];
  const drawnMo = new MutationObserver((records) => { for (const r of records) drawings.push(`${r.target.getAttribute('data-drawn-as') ?? '?'}${r.target.getAttribute('data-drawn-why') ? ` (${r.target.getAttribute('data-drawn-why')})` : ''}`); });
  if (fig) drawnMo.observe(fig, { attributes: true, attributeFilter: ['data-drawn'] });
  const t0 = performance.now();
  const setter = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, 'value').set;
  setter.call(el, String(value));
  el.dispatchEvent(new Event('input', { bubbles: true }));
  el.dispatchEvent(new Event('change', { bubbles: true }));
  // Each animation frame: has the part taken in a newer result? The frame's own time is when it shows.
  await new Promise((resolve, reject) => {
    const tick = (frameTime) => {
      for (const [name, [sel, attr]] of Object.entries(targets)) {
        if (got[name] === undefined && w.__seq(sel, attr) > before[name]) got[name] = Math.max(0, frameTime - t0);
      }
      if (Object.keys(got).length === 3) resolve();
      else if (performance.now() - t0 > timeoutMs) reject(new Error(`not everything was redrawn within ${timeoutMs / 1000} s (${JSON.stringify(got)})`));
      else requestAnimationFrame(tick);
    };
    requestAnimationFrame(tick);
  });
  // The figure may still be drawing the last stage (its drawing runs in a task after the panels' commit): the drawings
  // and long tasks of the move are read by moveTail once the page is idle again.
  w.__move = { t0, tasksBefore, drawings, drawnMo };
  return { ...got, seqBefore: before.peaks, seqAfter: w.__seq(...targets.peaks) };
}

/** After a move, once the page is idle: how the figure was drawn meanwhile, and every main-thread task over 50 ms since the slider moved. */
function moveTail() {
  const { t0, tasksBefore, drawings, drawnMo } = window.__move;
  drawnMo.disconnect();
  const tasks = window.__longTasks.slice(tasksBefore).filter((t) => t.start + t.duration >= t0).map((t) => t.duration);
  return { drawings, tasks, longest: tasks.reduce((m, d) => Math.max(m, d), 0) };
}

// ---------------------------------------------------------------------------

/**
 * CDP senders for every worker of the page, and the workers those workers start (the second detection thread is
 * started by the computation worker), and a detach. Sessions are not flattened: a nested worker's messages travel
 * wrapped in Target.sendMessageToTarget / receivedMessageFromTarget once per level.
 */
async function workerSenders(page) {
  const session = await page.context().newCDPSession(page);
  /** Each worker's path of session ids, outermost first. */
  const workers = [];
  const pending = new Map();
  let nextId = 1;
  const listeners = [];
  const sendTo = (path, method, params) => {
    const id = nextId++;
    let message = JSON.stringify({ id, method, params });
    for (let i = path.length - 1; i >= 1; i--) message = JSON.stringify({ id: nextId++, method: 'Target.sendMessageToTarget', params: { sessionId: path[i], message } });
    return { id, sent: session.send('Target.sendMessageToTarget', { sessionId: path[0], message }) };
  };
  const attached = (path) => {
    workers.push(path);
    // Its own workers too.
    sendTo(path, 'Target.setAutoAttach', { autoAttach: true, waitForDebuggerOnStart: false, flatten: false }).sent.catch(() => {});
  };
  const route = (path, msg) => {
    if (msg.method === 'Target.attachedToTarget') { if (msg.params.targetInfo.type === 'worker') attached([...path, msg.params.sessionId]); return; }
    if (msg.method === 'Target.receivedMessageFromTarget') { route([...path, msg.params.sessionId], JSON.parse(msg.params.message)); return; }
    const key = path.join('/');
    if (msg.method) { for (const l of listeners) if (l.key === key && l.method === msg.method) l.f(msg.params); return; }
    const done = pending.get(msg.id);
    if (done) { pending.delete(msg.id); done(msg); }
  };
  session.on('Target.attachedToTarget', (ev) => { if (ev.targetInfo.type === 'worker') attached([ev.sessionId]); });
  session.on('Target.receivedMessageFromTarget', (ev) => route([ev.sessionId], JSON.parse(ev.message)));
  await session.send('Target.setAutoAttach', { autoAttach: true, waitForDebuggerOnStart: false, flatten: false });
  await new Promise((res) => setTimeout(res, 600));
  const senders = workers.map((path) => (method, params) => new Promise((res, rej) => {
    const { id, sent } = sendTo(path, method, params);
    pending.set(id, (msg) => (msg.error ? rej(new Error(msg.error.message)) : res(msg.result)));
    sent.catch(rej);
  }));
  const onWorkerEvent = (k, method, f) => listeners.push({ key: workers[k].join('/'), method, f });
  return { senders, detach: () => session.detach(), onWorkerEvent };
}

/** Heap in use plus array-buffer storage, page and workers (CDP Runtime.getHeapUsage), in bytes. */
async function heapBytes(page) {
  const session = await page.context().newCDPSession(page);
  const u = await session.send('Runtime.getHeapUsage', {});
  let total = u.usedSize + (u.backingStorageSize ?? 0);
  await session.detach();
  const { senders, detach } = await workerSenders(page);
  let counted = 0;
  for (const send of senders) {
    try {
      const w = await send('Runtime.getHeapUsage', {});
      total += w.usedSize + (w.backingStorageSize ?? 0);
      counted++;
    } catch { /* a worker that went away */ }
  }
  await detach();
  return { bytes: total, workers: counted };
}

/** Each thread's heap (MiB: used, array buffers) as it stands and after a forced collection; snapshots to `dir` when given. */
async function heapDetail(page, dir) {
  const mb = (b) => (b / 1048576).toFixed(1);
  const one = async (name, send, on) => {
    const a = await send('Runtime.getHeapUsage', {});
    await send('HeapProfiler.collectGarbage', {});
    const b = await send('Runtime.getHeapUsage', {});
    if (dir) {
      const chunks = [];
      on((chunk) => chunks.push(chunk));
      await send('HeapProfiler.enable', {});
      await send('HeapProfiler.takeHeapSnapshot', { reportProgress: false });
      writeFileSync(join(dir, `${name.replace(' ', '-')}.heapsnapshot`), chunks.join(''));
    }
    return `  heap ${name}: used ${mb(a.usedSize)} + buffers ${mb(a.backingStorageSize ?? 0)}; after collection ${mb(b.usedSize)} + ${mb(b.backingStorageSize ?? 0)}`;
  };
  const session = await page.context().newCDPSession(page);
  const lines = [await one('page', (m, p) => session.send(m, p), (f) => session.on('HeapProfiler.addHeapSnapshotChunk', (e) => f(e.chunk)))];
  await session.detach();
  const { senders, detach, onWorkerEvent } = await workerSenders(page);
  for (let k = 0; k < senders.length; k++) {
    try { lines.push(await one(`worker ${k + 1}`, senders[k], (f) => onWorkerEvent(k, 'HeapProfiler.addHeapSnapshotChunk', (p) => f(p.chunk)))); } catch { /* a worker that went away */ }
  }
  await detach();
  return lines;
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
  console.log(`${fileName}: ${o.rows.toLocaleString('en')} rows written; LOAD start ${loadavg().map((v) => v.toFixed(2)).join(' ')}`);

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
      args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--no-first-run', ...(process.env.TRACEWRIGHT_JS_FLAGS ? [`--js-flags=${process.env.TRACEWRIGHT_JS_FLAGS}`] : [])],
    });
    const page = await browser.newPage({ viewport: { width: 1400, height: 900 } });
    const errors = [];
    page.on('pageerror', (e) => errors.push(String(e)));
    const version = browser.version();
    await page.goto(BASE);
    await page.evaluate(installProbes);
    await page.waitForFunction(() => document.querySelector('[data-testid="figure"]')?.data?.some((d) => d.name === 'raw'), null, { timeout: 60_000 });
    const idleDemo = await page.evaluate(waitIdle, 120_000);
    console.log(`demo drawn; idle after ${idleDemo.toFixed(0)} ms more`);

    // Load: change event → the first frame after the raw trace reaches the file's last x.
    await page.evaluate((last) => {
      const w = window;
      const input = document.querySelector('[data-testid="file-input"]');
      w.__loadDrawn = new Promise((resolve) => {
        input.addEventListener('change', () => {
          const t0 = performance.now();
          const tick = (frameTime) => {
            const gd = document.querySelector('[data-testid="figure"]');
            const t = (gd && gd.data ? gd.data : []).find((d) => d.name === 'raw');
            if (t && t.x && t.x.length && Math.abs(t.x[t.x.length - 1] - last) <= last * 0.01) resolve(frameTime - t0);
            else requestAnimationFrame(tick);
          };
          requestAnimationFrame(tick);
        }, { capture: true, once: true });
      });
    }, lastX);
    const tasksBeforeLoad = await page.evaluate(() => window.__longTasks.length);
    await page.getByTestId('file-input').setInputFiles(file);
    const loadMs = await page.evaluate(() => Promise.race([window.__loadDrawn, new Promise((_, rej) => setTimeout(() => rej(new Error('the loaded trace was not drawn within 180 s')), 180_000))]));
    const loadTasks = await page.evaluate((k) => window.__longTasks.slice(k).map((t) => t.duration), tasksBeforeLoad);
    console.log(`load to drawn: ${loadMs.toFixed(0)} ms; main-thread tasks over 50 ms meanwhile: ${loadTasks.length}, longest ${loadTasks.length ? Math.max(...loadTasks).toFixed(0) : 0} ms`);
    await page.evaluate(waitIdle, 300_000);

    // A moving average to move (after --steps − 1 other steps), then the alternatives asked for.
    for (const step of [...EXTRA_STEPS.slice(0, o.steps - 1), 'moving-average']) {
      await page.selectOption('#add-step-choice', step);
      const seq0 = await page.evaluate(() => window.__seq('[data-testid="peak-panel"]', 'data-result-seq'));
      await page.getByRole('button', { name: 'Add step', exact: true }).click();
      await page.waitForFunction((s) => window.__seq('[data-testid="peak-panel"]', 'data-result-seq') > s, seq0, { timeout: 300_000 });
      await page.evaluate(waitIdle, 300_000);
    }
    for (const label of ALTERNATIVE_PRESETS.slice(0, o.alternatives)) {
      const seq0 = await page.evaluate(() => window.__seq('[data-testid="loss-panel"]', 'data-result-seq'));
      await page.getByTestId('loss-panel').getByRole('button', { name: label, exact: true }).click();
      await page.waitForFunction((s) => window.__seq('[data-testid="loss-panel"]', 'data-result-seq') > s, seq0, { timeout: 300_000 });
      await page.evaluate(waitIdle, 300_000);
    }
    if (o.steps > 1 || o.alternatives > 0) {
      const stack = await page.evaluate(() => [...document.querySelectorAll('[data-testid^="step-"]')].map((e) => e.getAttribute('data-testid')).join(', '));
      console.log(`stack: ${stack}; alternatives: ${o.alternatives}`);
    }

    const moves = [];
    let cdp = null;
    let workerProfiling = null;
    const profiled = Math.min(o.profileMove, o.moves) - 1;
    for (let k = 0; k < o.moves; k++) {
      const value = 7 + 2 * k;
      const idle = await page.evaluate(waitIdle, 300_000);
      if (o.workerProfileOut && k === profiled) {
        workerProfiling = await workerSenders(page);
        for (const send of workerProfiling.senders) { await send('Profiler.enable', {}); await send('Profiler.start', {}); }
      }
      if (o.profile && k === profiled) {
        cdp = await page.context().newCDPSession(page);
        await cdp.send('Profiler.enable');
        await cdp.send('Profiler.start');
      }
      const tracing = o.trace && k === Math.min(1, o.moves - 1);
      if (tracing) await browser.startTracing(page, { path: o.trace, categories: ['devtools.timeline', 'disabled-by-default-devtools.timeline', 'blink.user_timing', 'v8.execute', 'disabled-by-default-v8.cpu_profiler'] });
      const shown = await page.evaluate(moveSlider, { value, timeoutMs: 300_000 });
      await page.evaluate(waitIdle, 300_000);
      const m = { ...shown, ...(await page.evaluate(moveTail)) };
      if (tracing) { await browser.stopTracing(); console.log(`  trace of this move written to ${o.trace}`); }
      moves.push(m);
      console.log(`  move to ${value} points (idle after ${idle.toFixed(0)} ms): processed ${m.processed.toFixed(0)} ms, peaks ${m.peaks.toFixed(0)} ms, loss ${m.loss.toFixed(0)} ms, longest task ${m.longest.toFixed(0)} ms (tasks over 50 ms: ${m.tasks.map((d) => d.toFixed(0)).join(', ') || 'none'}), figure drawn ${m.drawings.join(' + ') || 'never'}${m.seqAfter - m.seqBefore !== 1 ? ` (${m.seqAfter - m.seqBefore} results arrived)` : ''}`);
      if (workerProfiling && k === profiled) {
        // The analysis worker is the one whose profile holds the most functions (the load worker sits idle).
        const profiles = [];
        for (const send of workerProfiling.senders) { try { profiles.push((await send('Profiler.stop', {})).profile); } catch { /* gone */ } }
        const best = profiles.sort((a, b) => b.nodes.length - a.nodes.length)[0];
        if (best) { writeFileSync(o.workerProfileOut, JSON.stringify(best)); console.log(`  worker CPU profile of this move written to ${o.workerProfileOut}`); }
        await workerProfiling.detach();
        workerProfiling = null;
      }
      if (cdp && k === profiled) {
        const { profile } = await cdp.send('Profiler.stop');
        if (o.profileOut) writeFileSync(o.profileOut, JSON.stringify(profile));
        console.log(`  main thread during slider move ${profiled + 1}, top self time:`);
        for (const line of topSelf(profile, 15)) console.log(line);
        cdp = null;
      }
    }
    await page.evaluate(waitIdle, 300_000);
    const drawnTraces = await page.evaluate(() => (document.querySelector('[data-testid="figure"]')?.data ?? []).map((d) => `${d.name} ${d.x?.length ?? 0}`).join('; '));
    console.log(`figure after the moves (trace, points): ${drawnTraces}`);
    // The plot library's share: the figure redrawn with no analysis behind it (raw off, raw on; 3 times each).
    const redraws = [];
    for (let k = 0; k < 6; k++) {
      await page.evaluate(waitIdle, 60_000);
      redraws.push(await page.evaluate(toggleRawRedraw));
    }
    const drawnMs = redraws.map((r) => r[0]).sort((a, b) => a - b);
    console.log(`figure redraw alone (raw switched off and on, 6 times): to drawn min ${drawnMs[0].toFixed(0)} ms, median ${median(drawnMs).toFixed(0)} ms; to the next frame median ${median(redraws.map((r) => r[1])).toFixed(0)} ms`);
    const heap = await heapBytes(page);
    if (o.heapDetail) for (const line of await heapDetail(page, o.heapSnapshots)) console.log(line);
    // The table draws only the rows near its scrolled box (ui/WindowedTable.tsx): the count of all is its aria-rowcount less the header row.
    const rows = await page.evaluate(() => Number(document.querySelector('[data-testid="peak-table"]')?.getAttribute('aria-rowcount') ?? 1) - 1);
    const med = (key) => median(moves.map((m) => m[key]));
    const longest = Math.max(...moves.map((m) => m.longest));
    console.log(`peak table after the moves: ${rows} rows; heap counted on the page and ${heap.workers} worker(s)`);
    console.log('the worker posts processed, peaks and loss as separate stages: each figure is when the page shows that part of the new value.');
    console.log(`Chromium ${version}, node ${process.version}, ${new Date().toISOString()}, LOAD end ${loadavg().map((v) => v.toFixed(2)).join(' ')}`);
    if (errors.length) console.log(`page errors: ${errors.join(' | ')}`);
    console.log(`TIMING points=${o.rows} load_to_drawn_ms=${loadMs.toFixed(0)} slider_to_processed_ms=${med('processed').toFixed(0)} slider_to_peaks_ms=${med('peaks').toFixed(0)} slider_to_loss_ms=${med('loss').toFixed(0)} longest_task_ms=${longest.toFixed(0)} heap_mb=${(heap.bytes / 1048576).toFixed(0)}`);
  } finally {
    if (browser) await browser.close();
    try { process.kill(-server.pid, 'SIGTERM'); } catch { /* already gone */ }
    rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((e) => { console.error(e); process.exitCode = 1; });
