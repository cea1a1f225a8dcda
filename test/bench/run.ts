/**
 * Speed benchmark of the core against SciPy on the same machine, in the same run.
 *
 *   npm run bench                 sizes 1e5 and 1e6, 5 runs each
 *   npm run bench -- --big        adds 1e7 (3 runs; the NumPy Hampel is skipped there)
 *   npm run bench -- --runs 3 --no-scipy --no-csv --no-memory --json out.json
 *
 * Prints, never asserts: every figure depends on the machine and its load.
 * The SciPy side is test/bench/scipy_bench.py, fed the very same samples
 * through raw float64 files. See test/bench/README.md for what each row means.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import Papa from 'papaparse';
import { makeRng } from '../../src/core/numeric/random.ts';
import { savitzkyGolay } from '../../src/core/numeric/savgol.ts';
import { hampel, slidingMedian } from '../../src/core/numeric/sliding-median.ts';
import { movingAverage } from '../../src/core/steps/moving-average.ts';
import { baselineAsls } from '../../src/core/steps/baseline.ts';
import { defaultPeakOptions, detectPeaks } from '../../src/core/measure/peak-table.ts';
import { findLocalMaxima, peakProminences, peakWidths } from '../../src/core/measure/peak-detection.ts';
import { loadFile } from '../../src/core/io/load.ts';
import { parseDelimited } from '../../src/core/io/delimited.ts';
import { sha256Hex } from '../../src/core/io/sha256.ts';
import { analyse } from '../../src/core/analyse.ts';
import { PipelineCache } from '../../src/core/pipeline.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import { createTrace } from '../../src/core/trace.ts';
import type { Trace } from '../../src/core/trace.ts';
import type { Recipe, RecipeStep } from '../../src/core/recipe.ts';
import type { StepDefinition, StepParams } from '../../src/core/steps/types.ts';

// ---------------------------------------------------------------------------
// Options

interface Options {
  sizes: number[];
  runs: number;
  scipy: boolean;
  csv: boolean;
  memory: boolean;
  json: string | null;
}

function parseArgs(argv: string[]): Options {
  const o: Options = { sizes: [1e5, 1e6], runs: 5, scipy: true, csv: true, memory: true, json: null };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--big') o.sizes = [1e5, 1e6, 1e7];
    else if (a === '--sizes') o.sizes = argv[++i].split(',').map(Number);
    else if (a === '--runs') o.runs = Number(argv[++i]);
    else if (a === '--no-scipy') o.scipy = false;
    else if (a === '--no-csv') o.csv = false;
    else if (a === '--no-memory') o.memory = false;
    else if (a === '--json') o.json = argv[++i];
    else throw new RangeError(`Unknown option ${a}; see the head of test/bench/run.ts.`);
  }
  if (!o.sizes.every((n) => Number.isInteger(n) && n >= 1000)) throw new RangeError('Sizes must be whole numbers of at least 1000 points.');
  if (!(Number.isInteger(o.runs) && o.runs >= 1)) throw new RangeError('--runs must be a whole number ≥ 1.');
  return o;
}

/** Runs at a size: fewer at 10^7 so the big run stays within minutes. */
function runsAt(n: number, runs: number): number {
  return n >= 5e6 ? Math.min(runs, 3) : runs;
}

// ---------------------------------------------------------------------------
// The seeded synthetic trace

interface BenchTrace { x: Float64Array; y: Float64Array; sigma: number; peaks: number }

/** Base seed; each size uses seed + n so the traces are independent but fixed. */
const SEED = 20260801;
/** White-noise SD of the synthetic trace (y-units). */
const NOISE_SD = 0.05;

/**
 * Gaussian peaks (one per 4000 points, widths σ 4–64 points, heights 0.15–10
 * skewed towards small ones so some sit near the detection limit) on a
 * slow drift (offset, slope and one and a half sine periods), plus white
 * noise of SD 0.05. x in minutes at 0.001 min per point.
 */
function makeBenchTrace(n: number, seed = SEED + n): BenchTrace {
  const rng = makeRng(seed);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = i * 0.001;
    y[i] = 0.5 + 0.2 * (i / n) + 0.3 * Math.sin((3 * Math.PI * i) / n);
  }
  const peaks = Math.max(5, Math.round(n / 4000));
  for (let k = 0; k < peaks; k++) {
    const c = rng.uniform() * n;
    const s = 4 + 60 * rng.uniform();
    const h = 0.15 + 10 * rng.uniform() ** 3;
    const lo = Math.max(0, Math.floor(c - 6 * s)), hi = Math.min(n - 1, Math.ceil(c + 6 * s));
    for (let i = lo; i <= hi; i++) y[i] += h * Math.exp(-0.5 * ((i - c) / s) ** 2);
  }
  for (let i = 0; i < n; i++) y[i] += NOISE_SD * rng.normal();
  return { x, y, sigma: NOISE_SD, peaks };
}

// ---------------------------------------------------------------------------
// Timing

function median(a: number[]): number {
  const s = [...a].sort((p, q) => p - q);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
}

/**
 * Median wall time (ms) of `runs` calls, after a warm-up call on a short
 * slice and one untimed full call, so the JIT has compiled and settled the
 * kernel (the SciPy side makes the same untimed call).
 */
function timed<T>(runs: number, fn: () => T, warm?: () => unknown): { ms: number; times: number[]; out: T } {
  if (warm) warm();
  fn();
  const times: number[] = [];
  let out: T | undefined;
  for (let r = 0; r < runs; r++) {
    const t0 = performance.now();
    out = fn();
    times.push(performance.now() - t0);
  }
  return { ms: median(times), times, out: out as T };
}

interface Probe { idx: number[]; values: number[]; sum: number }

function probe(a: Float64Array): Probe {
  const n = a.length;
  const idx = Array.from({ length: 11 }, (_, k) => Math.round((k * (n - 1)) / 10));
  let sum = 0;
  for (let i = 0; i < n; i++) sum += a[i];
  return { idx, values: idx.map((i) => a[i]), sum };
}

/** Largest |ours − theirs| / max(1, |theirs|) over the probe values and the sums (sums relative to n). */
function probeDiff(ours: Probe, theirs: Probe | undefined): number | null {
  if (!theirs) return null;
  let e = 0;
  for (let k = 0; k < ours.values.length; k++) e = Math.max(e, Math.abs(ours.values[k] - theirs.values[k]) / Math.max(1, Math.abs(theirs.values[k])));
  const n = ours.idx[ours.idx.length - 1] + 1;
  return Math.max(e, Math.abs(ours.sum - theirs.sum) / Math.max(n, Math.abs(theirs.sum)));
}

// ---------------------------------------------------------------------------
// Rows

type StepKey = 'savgol' | 'moving-mean' | 'median' | 'hampel' | 'asls' | 'asls-banded' | 'peaks' | 'peak-primitives';

interface Row {
  key: StepKey;
  label: string;
  n: number;
  ms: number;
  times: number[];
  /** Target ratio ours/SciPy, or null when there is no like-for-like SciPy call. */
  target: number | null;
  scipyMs?: number;
  scipyMin?: number;
  agreement?: string;
  probe?: Probe;
  extra?: Record<string, number>;
}

const ROW_INFO: Record<StepKey, { label: string; target: number | null; scipy: string }> = {
  savgol: { label: 'Savitzky–Golay w25 o2', target: 1.0, scipy: 'savgol' },
  'moving-mean': { label: 'moving average w25', target: 1.0, scipy: 'moving-mean' },
  median: { label: 'running median w25', target: 1.0, scipy: 'median' },
  hampel: { label: 'Hampel k=12 t=3', target: null, scipy: 'hampel' },
  asls: { label: 'AsLS λ1e5 p0.01 ≤10', target: 1.0, scipy: 'asls' },
  'asls-banded': { label: '  same, vs solveh_banded', target: null, scipy: 'asls-banded' },
  peaks: { label: 'peak detection, all measures', target: 0.5, scipy: 'peaks' },
  'peak-primitives': { label: 'peak primitives only', target: null, scipy: 'peaks' },
};

function row(key: StepKey, n: number, t: { ms: number; times: number[] }, extra: Partial<Row> = {}): Row {
  return { key, label: ROW_INFO[key].label, n, ms: t.ms, times: t.times, target: ROW_INFO[key].target, ...extra };
}

function benchCore(tr: BenchTrace, runs: number): Row[] {
  const { x, y, sigma } = tr;
  const n = y.length;
  const small = y.subarray(0, 20000);
  const rows: Row[] = [];
  const log = (r: Row) => { rows.push(r); process.stderr.write(`  ours ${r.label} n=${n}: ${r.ms.toFixed(1)} ms\n`); };

  let t = timed(runs, () => savitzkyGolay(y, 25, 2), () => savitzkyGolay(small, 25, 2));
  log(row('savgol', n, t, { probe: probe(t.out) }));

  t = timed(runs, () => movingAverage(y, 25, 'repeat'), () => movingAverage(small, 25, 'repeat'));
  log(row('moving-mean', n, t, { probe: probe(t.out) }));

  t = timed(runs, () => slidingMedian(y, 25, 'nearest'), () => slidingMedian(small, 25, 'nearest'));
  log(row('median', n, t, { probe: probe(t.out) }));

  const th = timed(runs, () => hampel(y, 12, 3), () => hampel(small, 12, 3));
  log(row('hampel', n, th, { probe: probe(th.out.y), extra: { replaced: th.out.replaced.length } }));

  const ta = timed(runs, () => baselineAsls(y, 1e5, 0.01, 10), () => baselineAsls(small, 1e5, 0.01, 10));
  log(row('asls', n, ta, { probe: probe(ta.out.baseline), extra: { iterations: ta.out.iterations } }));
  rows.push(row('asls-banded', n, ta, { probe: probe(ta.out.baseline), extra: { iterations: ta.out.iterations } }));

  const opts = defaultPeakOptions(sigma, x[1] - x[0]);
  const xs = x.subarray(0, 20000);
  const tp = timed(runs, () => detectPeaks(x, y, opts), () => detectPeaks(xs, small, opts));
  log(row('peaks', n, tp, { extra: { peaks: tp.out.length } }));

  // The SciPy calls themselves: maxima, prominences, the prominence threshold, widths at half prominence.
  const primitives = (v: Float64Array) => {
    const maxima = findLocalMaxima(v);
    const prom = peakProminences(v, maxima);
    const keep: number[] = [];
    for (let k = 0; k < maxima.length; k++) if (prom.prominences[k] >= 2 * sigma) keep.push(k);
    const idx = Int32Array.from(keep, (k) => maxima[k]);
    const pd = {
      prominences: Float64Array.from(keep, (k) => prom.prominences[k]),
      leftBases: Int32Array.from(keep, (k) => prom.leftBases[k]),
      rightBases: Int32Array.from(keep, (k) => prom.rightBases[k]),
    };
    return { idx, widths: peakWidths(v, idx, 0.5, pd).widths };
  };
  const tq = timed(runs, () => primitives(y), () => primitives(small));
  let widthSum = 0, indexSum = 0;
  for (let k = 0; k < tq.out.idx.length; k++) { widthSum += tq.out.widths[k]; indexSum += tq.out.idx[k]; }
  log(row('peak-primitives', n, tq, { extra: { count: tq.out.idx.length, widthSum, indexSum } }));
  return rows;
}

// ---------------------------------------------------------------------------
// SciPy

interface ScipyStep { ms: number; times: number[]; probe?: Probe; count?: number; widthSum?: number; indexSum?: number; iterations?: number }
interface ScipyResult { scipy: string; numpy: string; python: string; cases: { n: number; steps: Record<string, ScipyStep> }[] }

function scipyAvailable(): boolean {
  const r = spawnSync('python3', ['-c', 'import scipy'], { encoding: 'utf8' });
  return r.status === 0;
}

function runScipy(dir: string, traces: Map<number, BenchTrace>, o: Options): ScipyResult | string {
  const cases = [...traces.entries()].map(([n, tr]) => {
    const file = join(dir, `y-${n}.f64`);
    writeFileSync(file, new Uint8Array(tr.y.buffer, tr.y.byteOffset, tr.y.byteLength));
    // A NumPy sliding-window Hampel at 10^7 would take minutes and has no target: skipped there.
    return { n, file, sigma: tr.sigma, runs: runsAt(n, o.runs), hampel: n < 5e6 };
  });
  const job = join(dir, 'job.json');
  writeFileSync(job, JSON.stringify({ cases }));
  const script = resolve(process.cwd(), 'test/bench/scipy_bench.py');
  const r = spawnSync('python3', [script, '--job', job], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024, stdio: ['ignore', 'pipe', 'inherit'] });
  if (r.status !== 0) return `scipy_bench.py exited with status ${r.status}${r.error ? ` (${r.error.message})` : ''}`;
  try {
    return JSON.parse(r.stdout) as ScipyResult;
  } catch {
    return 'scipy_bench.py did not print JSON';
  }
}

function attachScipy(rows: Row[], sp: ScipyResult): void {
  for (const r of rows) {
    const c = sp.cases.find((k) => k.n === r.n);
    const s = c?.steps[ROW_INFO[r.key].scipy];
    if (!s) continue;
    r.scipyMs = s.ms;
    r.scipyMin = Math.min(...s.times);
    if (r.key === 'peaks') {
      r.agreement = `${r.extra?.peaks} table rows; SciPy ${s.count} peaks before our S/N and width filters`;
    } else if (r.key === 'peak-primitives') {
      const same = r.extra?.count === s.count && r.extra?.indexSum === s.indexSum;
      const wd = Math.abs((r.extra?.widthSum ?? 0) - (s.widthSum ?? 0)) / Math.max(1, Math.abs(s.widthSum ?? 0));
      r.agreement = `${same ? 'same' : 'DIFFERENT'} ${s.count} peaks, width sum rel. diff ${wd.toExponential(1)}`;
    } else if (r.probe) {
      const d = probeDiff(r.probe, s.probe);
      let text = d === null ? '' : `probe diff ${d.toExponential(1)}`;
      if (r.key === 'asls' || r.key === 'asls-banded') text += `; solves ours ${r.extra?.iterations}, SciPy ${s.iterations}`;
      r.agreement = text;
    }
  }
}

// ---------------------------------------------------------------------------
// CSV parse

interface CsvResult { rows: number; mb: number; loadMs: number; parseMs: number; hashMs: number; decodeMs: number; papaMs: number; papaRows: number; ok: boolean }

function benchCsv(dir: string, runs: number): CsvResult {
  const n = 1_000_000;
  const tr = makeBenchTrace(n, SEED + 7);
  const parts: string[] = ['time (min),signal (mV)\n'];
  for (let i = 0; i < n; i++) parts.push(`${tr.x[i].toFixed(5)},${tr.y[i].toFixed(7)}\n`);
  const file = join(dir, 'million.csv');
  writeFileSync(file, parts.join(''));
  const bytes = new Uint8Array(readFileSync(file));
  const small = bytes.subarray(0, 200_000);
  const cut = small.lastIndexOf(10) + 1;
  const warmBytes = bytes.slice(0, cut);
  const load = timed(runs, () => loadFile(bytes, 'million.csv'), () => loadFile(warmBytes, 'warm.csv'));
  const parse = timed(runs, () => parseDelimited(bytes, 'million.csv'), () => parseDelimited(warmBytes, 'warm.csv'));
  const hash = timed(runs, () => sha256Hex(bytes), () => sha256Hex(warmBytes));
  const decode = timed(runs, () => new TextDecoder('utf-8').decode(bytes));
  const text = decode.out;
  const papa = timed(runs, () => Papa.parse<string[]>(text), () => Papa.parse<string[]>(text.slice(0, 200_000)));
  const ok = load.out.ok && load.out.traces[0].y.length === n;
  process.stderr.write(`  csv: load ${load.ms.toFixed(0)} ms, PapaParse ${papa.ms.toFixed(0)} ms\n`);
  return {
    rows: n, mb: bytes.length / 1e6, loadMs: load.ms, parseMs: parse.ms, hashMs: hash.ms, decodeMs: decode.ms,
    papaMs: papa.ms, papaRows: papa.out.data.length, ok,
  };
}

// ---------------------------------------------------------------------------
// Memory

interface MemoryResult { before: number; peak: number; afterGc: number | null; gcAvailable: boolean; samples: number; processedPoints: number[] }

/** JS heap plus typed-array backing stores (which V8 keeps outside heapUsed), in bytes. */
function jsBytes(): number {
  const m = process.memoryUsage();
  return m.heapUsed + m.arrayBuffers;
}

function benchMemory(): MemoryResult {
  const gc = (globalThis as { gc?: () => void }).gc;
  gc?.();
  const n = 1_000_000;
  const tr = makeBenchTrace(n, SEED + 11);
  const sample: Trace = createTrace({
    id: 'bench-sample', name: 'bench', x: tr.x, y: tr.y,
    source: { fileName: 'bench.csv', sha256: '0'.repeat(64), rowsRead: n, rowsSkipped: 0 },
  });
  gc?.();
  const before = jsBytes();
  let peak = before, samples = 0;
  const note = () => { samples++; peak = Math.max(peak, jsBytes()); };
  // Sample after every step's apply as well as between analyses: the run itself is synchronous.
  const registry = STEP_REGISTRY.map((d): StepDefinition => ({
    ...d,
    apply: (input, params, ctx) => { note(); const out = d.apply(input, params, ctx); note(); return out; },
  }));
  const step = (id: string, params: StepParams): RecipeStep => ({ uid: `${id}-${JSON.stringify(params)}`, step: id, enabled: true, params });
  const recipe = (sgWindow: number, maWindow: number): Recipe => ({
    format: 'tracewright-recipe', version: 1,
    steps: [
      step('despike', { method: 'hampel', window: 7, threshold: 3 }),
      step('baseline', { method: 'asls', lambda: 1e5, p: 0.01, maxIter: 10, order: 1, ranges: [] }),
      step('savitzky-golay', { window: sgWindow, order: 2, derivative: 0, edge: 'interp' }),
      step('moving-average', { window: maWindow, edge: 'shrink' }),
      step('boxcar', { size: 2, tail: 'drop' }),
    ],
  });
  const traces = new Map([[sample.id, sample]]);
  const cache = new PipelineCache();
  const kept = [];
  for (const [sg, ma] of [[11, 3], [25, 5], [51, 9]]) {
    const result = analyse({ sampleId: sample.id, scanIds: [], recipe: recipe(sg, ma) }, traces, registry, cache);
    const bad = result.runs.filter((r) => r.status !== 'ok');
    if (bad.length) throw new Error(`memory recipe did not run: ${bad.map((r) => `${r.step}: ${r.message}`).join('; ')}`);
    kept.push(result);
    note();
  }
  let afterGc: number | null = null;
  if (gc) { gc(); afterGc = jsBytes(); }
  return { before, peak, afterGc, gcAvailable: gc !== undefined, samples, processedPoints: kept.map((r) => r.processed.y.length) };
}

// ---------------------------------------------------------------------------
// Printing

function pad(s: string, w: number, right = false): string {
  return right ? s.padStart(w) : s.padEnd(w);
}

function fmtMs(ms: number | undefined): string {
  if (ms === undefined) return '—';
  return ms >= 100 ? ms.toFixed(0) : ms >= 10 ? ms.toFixed(1) : ms.toFixed(2);
}

function printTable(rows: Row[]): void {
  const head = ['step', 'n', 'ours ms', 'SciPy ms', 'ratio', 'min ratio', 'target', 'verdict', 'same numbers?'];
  const widths = [30, 4, 8, 8, 7, 9, 6, 7, 0];
  const last = widths.length - 1;
  const line = (cells: string[]) => cells.map((c, i) => (i === 0 || i === last ? pad(c, widths[i]) : pad(c, widths[i], true))).join(' | ');
  console.log(line(head));
  console.log(line(widths.map((w, i) => '-'.repeat(i === last ? 13 : w))));
  for (const r of rows) {
    const ratio = r.scipyMs ? r.ms / r.scipyMs : undefined;
    const minRatio = r.scipyMin ? Math.min(...r.times) / r.scipyMin : undefined;
    const verdict = ratio === undefined || r.target === null ? '—' : ratio <= r.target ? 'meets' : 'MISSES';
    console.log(line([
      r.label, r.n.toExponential(0).replace('+', ''), fmtMs(r.ms), fmtMs(r.scipyMs),
      ratio === undefined ? '—' : `${ratio.toFixed(2)}×`, minRatio === undefined ? '—' : `${minRatio.toFixed(2)}×`,
      r.target === null ? '—' : `≤${r.target.toFixed(1)}×`, verdict, r.agreement ?? '',
    ]));
  }
  console.log('ratio: ours median / SciPy median (the target applies to it); min ratio: fastest run / fastest run, less sensitive to other load on the machine.');
}

function mb(b: number): string {
  return `${(b / 1048576).toFixed(0)} MB`;
}

// ---------------------------------------------------------------------------

function main(): void {
  const o = parseArgs(process.argv.slice(2));
  const started = performance.now();
  const sp = o.scipy && scipyAvailable();
  console.log(`Tracewright core benchmark, ${new Date().toISOString()}`);
  console.log(`node ${process.version}, ${cpus().length} × ${cpus()[0]?.model ?? 'unknown CPU'}, load average ${loadavg().map((v) => v.toFixed(2)).join(' ')}`);
  console.log(`sizes ${o.sizes.map((n) => n.toExponential(0).replace('+', '')).join(', ')}; median of ${o.runs} runs (at most 3 at 10^7); seed ${SEED} + n`);
  const dir = mkdtempSync(join(tmpdir(), 'tracewright-bench-'));
  try {
    const traces = new Map<number, BenchTrace>();
    const rows: Row[] = [];
    for (const n of o.sizes) {
      const tr = makeBenchTrace(n);
      traces.set(n, tr);
      process.stderr.write(`n = ${n} (${tr.peaks} peaks)\n`);
      rows.push(...benchCore(tr, runsAt(n, o.runs)));
    }
    let spResult: ScipyResult | null = null;
    if (sp) {
      const r = runScipy(dir, traces, o);
      if (typeof r === 'string') console.log(`SciPy side not run: ${r}`);
      else { spResult = r; attachScipy(rows, r); }
    } else {
      console.log(o.scipy ? 'python3 with SciPy not found: SciPy columns left empty.' : 'SciPy side switched off (--no-scipy).');
    }
    traces.clear();
    if (spResult) console.log(`SciPy ${spResult.scipy}, NumPy ${spResult.numpy}, Python ${spResult.python}`);
    console.log('');
    printTable(rows);

    let csv: CsvResult | null = null;
    if (o.csv) {
      csv = benchCsv(dir, 3);
      console.log('');
      console.log(`CSV, ${csv.rows.toLocaleString('en')} rows, ${csv.mb.toFixed(1)} MB (median of 3):`);
      console.log(`  loadFile (hash + decode + dialect + numbers): ${csv.loadMs.toFixed(0)} ms   target ≤ 500 ms: ${csv.loadMs <= 500 ? 'meets' : 'MISSES'}${csv.ok ? '' : '  (LOAD FAILED)'}`);
      console.log(`  parseDelimited alone:                          ${csv.parseMs.toFixed(0)} ms (of which SHA-256 of the bytes ${csv.hashMs.toFixed(0)} ms)`);
      console.log(`  PapaParse default, Papa.parse(text):           ${csv.papaMs.toFixed(0)} ms (${csv.papaRows.toLocaleString('en')} rows of strings; + ${csv.decodeMs.toFixed(0)} ms TextDecoder to get the text)`);
      console.log(`  ratio loadFile / (decode + PapaParse):         ${(csv.loadMs / (csv.papaMs + csv.decodeMs)).toFixed(2)}×`);
    }
    let mem: MemoryResult | null = null;
    if (o.memory) {
      mem = benchMemory();
      console.log('');
      console.log('Memory, 10^6-point trace, 5 steps, 3 alternatives kept alive (heapUsed + typed-array stores):');
      console.log(`  before ${mb(mem.before)}; peak sampled ${mb(mem.peak)} (${mem.samples} samples) target < 250 MB: ${mem.peak < 250 * 1048576 ? 'meets' : 'MISSES'}`);
      console.log(mem.gcAvailable ? `  after gc with the three results alive: ${mb(mem.afterGc ?? 0)}` : '  (run node with --expose-gc for the after-gc figure)');
    }
    console.log('');
    console.log(`total ${((performance.now() - started) / 1000).toFixed(1)} s`);
    if (o.json) {
      writeFileSync(o.json, JSON.stringify({ date: new Date().toISOString(), node: process.version, scipy: spResult?.scipy, rows, csv, mem }, null, 1));
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

main();
