/**
 * Speed benchmark of the core against SciPy on the same machine, call by call.
 *
 *   npm run bench                 sizes 1e5 and 1e6, 7 alternating pairs per row
 *   npm run bench -- --big        adds 1e7 (3 pairs there)
 *   npm run bench -- --rows running-median --sizes 1000000 --runs 15 --no-csv --no-memory
 *   npm run bench -- --spsolve    adds AsLS against scipy.sparse spsolve (tens of seconds per call at 1e6)
 *   npm run bench -- --json out.json
 *
 * Prints, never asserts: every figure depends on the machine and its load.
 * The SciPy side is one persistent Python process (test/bench/scipy_bench.py
 * --serve) fed the very same samples through raw float64 files. Our call and
 * SciPy's call alternate one by one (the order swaps every pair), so both meet
 * the same load; each row reports the minimum of each side, the ratio of the
 * minimums and the median of the per-pair ratios, and one machine-readable
 * line:
 *   RATIO name=<row> n=<points> ours_ms=<min> ref_ms=<min> ratio=<ours_ms/ref_ms> median_ratio=<median of per-pair ratios>
 * See test/bench/README.md for what each row means.
 */
import { spawn, spawnSync, type ChildProcessWithoutNullStreams } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createInterface } from 'node:readline';
import Papa from 'papaparse';
import { makeBenchTrace, SEED, type BenchTrace } from './bench-trace.ts';
import { savitzkyGolay } from '../../src/core/numeric/savgol.ts';
import { slidingMedian } from '../../src/core/numeric/sliding-median.ts';
import { movingAverage } from '../../src/core/steps/moving-average.ts';
import { baselineAsls } from '../../src/core/steps/baseline.ts';
import { defaultPeakOptions, detectPeaks } from '../../src/core/measure/peak-table.ts';
import { findLocalMaxima, peakProminences, peakWidths, prominentMaxima } from '../../src/core/measure/peak-detection.ts';
import { locatingCopy, measureLocal, xAt } from '../../src/core/measure/peak-bounds.ts';
import { noiseModel } from '../../src/core/measure/peak-snr.ts';
import { loadFile, loadFileHashed } from '../../src/core/io/load.ts';
import { parseDelimited } from '../../src/core/io/delimited.ts';
import { sha256Hex, sha256HexNative } from '../../src/core/io/sha256.ts';
import { analyse } from '../../src/core/analysis/index.ts';
import { PipelineCache } from '../../src/core/pipeline.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import { createTrace } from '../../src/core/trace.ts';
import type { Trace } from '../../src/core/trace.ts';
import type { Recipe, RecipeStep } from '../../src/core/method.ts';
import type { StepDefinition, StepParams } from '../../src/core/steps/types.ts';

// ---------------------------------------------------------------------------
// Options

interface Options {
  sizes: number[];
  runs: number;
  rows: string[] | null;
  scipy: boolean;
  spsolve: boolean;
  csv: boolean;
  memory: boolean;
  json: string | null;
}

function parseArgs(argv: string[]): Options {
  const o: Options = { sizes: [1e5, 1e6], runs: 7, rows: null, scipy: true, spsolve: false, csv: true, memory: true, json: null };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--big') o.sizes = [1e5, 1e6, 1e7];
    else if (a === '--sizes') o.sizes = argv[++i].split(',').map(Number);
    else if (a === '--runs') o.runs = Number(argv[++i]);
    else if (a === '--rows') o.rows = argv[++i].split(',');
    else if (a === '--no-scipy') o.scipy = false;
    else if (a === '--spsolve') o.spsolve = true;
    else if (a === '--no-csv') o.csv = false;
    else if (a === '--no-memory') o.memory = false;
    else if (a === '--json') o.json = argv[++i];
    else throw new RangeError(`Unknown option ${a}; see the head of test/bench/run.ts.`);
  }
  if (!o.sizes.every((n) => Number.isInteger(n) && n >= 1000)) throw new RangeError('Sizes must be whole numbers of at least 1000 points.');
  if (!(Number.isInteger(o.runs) && o.runs >= 1)) throw new RangeError('--runs must be a whole number ≥ 1.');
  const known = ROWS.map((r) => r.name);
  const unknown = (o.rows ?? []).filter((r) => !known.includes(r));
  if (unknown.length) throw new RangeError(`Unknown row ${unknown.join(', ')}; rows are ${known.join(', ')}.`);
  return o;
}

/** Pairs at a size: fewer at 10^7 so the big run stays within minutes; one for the slow sparse solve. */
function runsAt(n: number, runs: number, row: RowSpec): number {
  if (row.slowRef && n > 2e5) return 1;
  return n >= 5e6 ? Math.min(runs, 3) : runs;
}

// ---------------------------------------------------------------------------
// The seeded synthetic trace

// makeBenchTrace, SEED and NOISE_SD: test/bench/bench-trace.ts (the peak-table digests use the same trace).

// ---------------------------------------------------------------------------
// Statistics

function median(a: number[]): number {
  const s = [...a].sort((p, q) => p - q);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
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
function probeDiff(ours: Probe, theirs: Probe): number {
  let e = 0;
  for (let k = 0; k < ours.values.length; k++) e = Math.max(e, Math.abs(ours.values[k] - theirs.values[k]) / Math.max(1, Math.abs(theirs.values[k])));
  const n = ours.idx[ours.idx.length - 1] + 1;
  return Math.max(e, Math.abs(ours.sum - theirs.sum) / Math.max(n, Math.abs(theirs.sum)));
}

// ---------------------------------------------------------------------------
// The SciPy process

interface ScipyCheck { probe?: Probe; iterations?: number; count?: number; widthSum?: number; indexSum?: number; error?: string }

/** One persistent `scipy_bench.py --serve`, asked one thing at a time. */
class ScipyServer {
  private readonly child: ChildProcessWithoutNullStreams;
  private readonly waiting: ((line: string) => void)[] = [];
  private closed: string | null = null;

  constructor(script: string) {
    this.child = spawn('python3', [script, '--serve'], { stdio: ['pipe', 'pipe', 'pipe'] });
    createInterface({ input: this.child.stdout }).on('line', (line) => this.waiting.shift()?.(line));
    this.child.stderr.on('data', (d: Buffer) => process.stderr.write(`scipy_bench.py: ${d.toString()}`));
    this.child.on('exit', (code) => {
      this.closed = `scipy_bench.py exited with status ${code}`;
      for (const w of this.waiting.splice(0)) w(JSON.stringify({ error: this.closed }));
    });
  }

  ask<T>(msg: Record<string, unknown>): Promise<T> {
    if (this.closed) return Promise.reject(new Error(this.closed));
    return new Promise<T>((res, rej) => {
      this.waiting.push((line) => {
        const v = JSON.parse(line) as T & { error?: string };
        if (v.error) rej(new Error(v.error)); else res(v);
      });
      this.child.stdin.write(`${JSON.stringify(msg)}\n`);
    });
  }

  quit(): void {
    if (!this.closed) this.child.stdin.end(`${JSON.stringify({ op: 'quit' })}\n`);
  }
}

function scipyAvailable(): boolean {
  const r = spawnSync('python3', ['-c', 'import scipy'], { encoding: 'utf8' });
  return r.status === 0;
}

// ---------------------------------------------------------------------------
// Rows

interface RowSpec {
  /** Row name in the RATIO line (and the SciPy row it is timed against). */
  name: string;
  /** SciPy row (default: name). */
  ref?: string;
  label: string;
  /** Target ratio ours/SciPy of the minimums, or null when informative only. */
  target: number | null;
  /** A RATIO line is printed only for the issue's rows; the others print INFO lines. */
  ratioLine: boolean;
  /** SciPy takes seconds per call: one pair above 2·10^5 points. */
  slowRef?: boolean;
  /** Runs only on request. */
  optIn?: 'spsolve';
  ours: (tr: BenchTrace) => unknown;
  /** What our call computed, for the agreement column. */
  agree: (out: unknown, theirs: ScipyCheck) => string;
}

const sameProbe = (out: unknown, theirs: ScipyCheck): string =>
  theirs.probe ? `probe diff ${probeDiff(probe(out as Float64Array), theirs.probe).toExponential(1)}` : '';

const aslsAgree = (out: unknown, theirs: ScipyCheck): string => {
  const r = out as { baseline: Float64Array; iterations: number };
  return `${sameProbe(r.baseline, theirs)}; solves ours ${r.iterations}, SciPy ${theirs.iterations}`;
};

/** The four calls SciPy makes (maxima, prominences, the prominence threshold, widths at half prominence), ours. */
function peakPrimitives(y: Float64Array, sigma: number) {
  const maxima = findLocalMaxima(y);
  const prom = peakProminences(y, maxima);
  const keep: number[] = [];
  for (let k = 0; k < maxima.length; k++) if (prom.prominences[k] >= 2 * sigma) keep.push(k);
  const idx = Int32Array.from(keep, (k) => maxima[k]);
  const pd = {
    prominences: Float64Array.from(keep, (k) => prom.prominences[k]),
    leftBases: Int32Array.from(keep, (k) => prom.leftBases[k]),
    rightBases: Int32Array.from(keep, (k) => prom.rightBases[k]),
  };
  return { idx, widths: peakWidths(y, idx, 0.5, pd).widths };
}

/** The candidates (by position in prominentMaxima's columns) that pass the height and own-width tests, per trace. */
const survivorsOf = new WeakMap<Float64Array, Int32Array>();

/**
 * The floor of any pre-filter: the merged candidate pass, then the local
 * measures of only the candidates that pass the height and own-width tests
 * (found beforehand, untimed), as if a perfect pre-filter had rejected the
 * others for free. Rows are not made (less work than the real call): if
 * this row is above 0.5× SciPy, no conservative pre-filter can bring the
 * `peaks` row there.
 */
function peaksPrefilterFloor(t: BenchTrace) {
  const o = defaultPeakOptions(t.sigma, t.x[1] - t.x[0]);
  let keep = survivorsOf.get(t.y);
  if (!keep) {
    const c0 = prominentMaxima(t.y, o.minProminence), ctx = { x: t.x, s: t.y, noise: noiseModel(t.y, o), loc: locatingCopy(t.y) };
    const k: number[] = [];
    for (let j = 0; j < c0.count; j++) {
      const m = measureLocal(ctx, c0.index[j], c0.halfWidth[j]);
      if (m.height > 0 && xAt(t.x, m.rightIp) - xAt(t.x, m.leftIp) >= o.minWidth) k.push(j);
    }
    keep = Int32Array.from(k);
    survivorsOf.set(t.y, keep);
  }
  const c = prominentMaxima(t.y, o.minProminence), ctx = { x: t.x, s: t.y, noise: noiseModel(t.y, o), loc: locatingCopy(t.y) };
  const out = [];
  for (const j of keep) out.push(measureLocal(ctx, c.index[j], c.halfWidth[j]));
  return { candidates: c.count, measured: out.length };
}

const ROWS: RowSpec[] = [
  {
    name: 'savitzky-golay', label: 'Savitzky–Golay w25 o2', target: 1.0, ratioLine: true,
    ours: (t) => savitzkyGolay(t.y, 25, 2), agree: sameProbe,
  },
  {
    name: 'moving-average', label: 'moving average w25', target: 1.0, ratioLine: true,
    ours: (t) => movingAverage(t.y, 25, 'repeat'), agree: sameProbe,
  },
  {
    name: 'running-median', label: 'running median w25', target: 1.0, ratioLine: true,
    ours: (t) => slidingMedian(t.y, 25, 'nearest'), agree: sameProbe,
  },
  {
    name: 'running-median-w7', label: '  running median w7 (noise windows use it)', target: null, ratioLine: false,
    ours: (t) => slidingMedian(t.y, 7, 'nearest'), agree: sameProbe,
  },
  {
    name: 'running-median-w201', label: '  running median w201 (two heaps)', target: null, ratioLine: false,
    ours: (t) => slidingMedian(t.y, 201, 'nearest'), agree: sameProbe,
  },
  {
    name: 'asls', label: 'AsLS λ1e5 p0.01 ≤10 (vs solveh_banded)', target: 1.0, ratioLine: true,
    ours: (t) => baselineAsls(t.y, 1e5, 0.01, 10), agree: aslsAgree,
  },
  {
    name: 'asls-spsolve', label: '  same, vs sparse spsolve', target: null, ratioLine: false, slowRef: true, optIn: 'spsolve',
    ours: (t) => baselineAsls(t.y, 1e5, 0.01, 10), agree: aslsAgree,
  },
  {
    name: 'peaks', label: 'peak detection, all measures', target: 0.5, ratioLine: true,
    ours: (t) => detectPeaks(t.x, t.y, defaultPeakOptions(t.sigma, t.x[1] - t.x[0])),
    agree: (out, theirs) => `${(out as unknown[]).length} table rows; SciPy ${theirs.count} peaks before our S/N and width filters`,
  },
  {
    name: 'peak-candidates', ref: 'peaks', label: '  merged candidate pass (detection)', target: null, ratioLine: false,
    ours: (t) => prominentMaxima(t.y, 2 * t.sigma),
    agree: (out, theirs) => `${(out as { count: number }).count === theirs.count ? 'same' : 'DIFFERENT'} count, ${theirs.count} peaks`,
  },
  {
    name: 'peaks-prefilter-floor', ref: 'peaks', label: '  floor of any pre-filter', target: null, ratioLine: false,
    ours: (t) => peaksPrefilterFloor(t),
    agree: (out) => { const r = out as { candidates: number; measured: number }; return `${r.measured} of ${r.candidates} candidates measured`; },
  },
  {
    name: 'peak-primitives', ref: 'peaks', label: '  peak primitives only', target: null, ratioLine: false,
    ours: (t) => peakPrimitives(t.y, t.sigma),
    agree: (out, theirs) => {
      const r = out as { idx: Int32Array; widths: Float64Array };
      let widthSum = 0, indexSum = 0;
      for (let k = 0; k < r.idx.length; k++) { widthSum += r.widths[k]; indexSum += r.idx[k]; }
      const same = r.idx.length === theirs.count && indexSum === theirs.indexSum;
      const wd = Math.abs(widthSum - (theirs.widthSum ?? 0)) / Math.max(1, Math.abs(theirs.widthSum ?? 0));
      return `${same ? 'same' : 'DIFFERENT'} ${theirs.count} peaks, width sum rel. diff ${wd.toExponential(1)}`;
    },
  },
];

interface RowResult {
  name: string;
  label: string;
  n: number;
  target: number | null;
  ratioLine: boolean;
  ours: number[];
  ref: number[];
  /** ours[k] / ref[k] for each alternating pair k. */
  ratios: number[];
  agreement: string;
  load: number;
}

const gc = (globalThis as { gc?: () => void }).gc;

/** One timed call of ours; a collection first (outside the timing), so garbage from earlier calls is not charged to this one. */
function timeOurs(fn: () => unknown): { ms: number; out: unknown } {
  gc?.();
  const t0 = performance.now();
  const out = fn();
  return { ms: performance.now() - t0, out };
}

/**
 * Time one row at one size: a warm-up of ours on a 20 000-point slice (up to
 * 10 calls, at most 1 s) and one untimed full call of each side, then `runs` pairs, the order swapped every
 * pair (ours first in even pairs, SciPy first in odd ones).
 */
async function benchRow(row: RowSpec, tr: BenchTrace, runs: number, sp: ScipyServer | null): Promise<RowResult> {
  const n = tr.y.length;
  const ref = row.ref ?? row.name;
  const slice: BenchTrace = { ...tr, x: tr.x.subarray(0, 20000), y: tr.y.subarray(0, 20000) };
  // Up to 10 calls on the slice (at most 1 s): one was not enough for the peak detector, whose first full calls
  // at 10⁵ points ran 3-4 times slower than later ones (the row measured the compiler, not the code).
  for (let k = 0, t0 = performance.now(); k < 10 && performance.now() - t0 < 1000; k++) row.ours(slice);
  const first = timeOurs(() => row.ours(tr));
  let agreement = '';
  if (sp) {
    if (!row.slowRef || n <= 2e5) await sp.ask({ op: 'call', row: ref, n });
    const theirs = await sp.ask<ScipyCheck>({ op: 'check', row: ref, n });
    agreement = row.agree(first.out, theirs);
  }
  const ours: number[] = [], refs: number[] = [], ratios: number[] = [];
  for (let k = 0; k < runs; k++) {
    let o: number, r = NaN;
    if (sp && k % 2 === 1) {
      r = (await sp.ask<{ ms: number }>({ op: 'call', row: ref, n })).ms;
      o = timeOurs(() => row.ours(tr)).ms;
    } else {
      o = timeOurs(() => row.ours(tr)).ms;
      if (sp) r = (await sp.ask<{ ms: number }>({ op: 'call', row: ref, n })).ms;
    }
    ours.push(o);
    if (sp) { refs.push(r); ratios.push(o / r); }
  }
  process.stderr.write(`  ${row.name} n=${n}: ours min ${Math.min(...ours).toFixed(1)} ms${sp ? `, SciPy min ${Math.min(...refs).toFixed(1)} ms` : ''}\n`);
  return { name: row.name, label: row.label, n, target: row.target, ratioLine: row.ratioLine, ours, ref: refs, ratios, agreement, load: loadavg()[0] };
}

// ---------------------------------------------------------------------------
// CSV parse

interface CsvResult {
  rows: number; mb: number; loadMs: number; loadHashedMs: number; parseMs: number; hashMs: number; nativeHashMs: number;
  sameHash: boolean; decodeMs: number; papaMs: number; papaRows: number; ok: boolean;
}

/** Median wall time (ms) of `runs` calls after one untimed call. */
function timedMedian<T>(runs: number, fn: () => T): { ms: number; out: T } {
  let out = fn();
  const times: number[] = [];
  for (let r = 0; r < runs; r++) {
    const t0 = performance.now();
    out = fn();
    times.push(performance.now() - t0);
  }
  return { ms: median(times), out };
}

async function timedMedianAsync<T>(runs: number, fn: () => Promise<T>): Promise<{ ms: number; out: T }> {
  let out = await fn();
  const times: number[] = [];
  for (let r = 0; r < runs; r++) {
    const t0 = performance.now();
    out = await fn();
    times.push(performance.now() - t0);
  }
  return { ms: median(times), out };
}

async function benchCsv(dir: string, runs: number): Promise<CsvResult> {
  const n = 1_000_000;
  const tr = makeBenchTrace(n, SEED + 7);
  const parts: string[] = ['time (min),signal (mV)\n'];
  for (let i = 0; i < n; i++) parts.push(`${tr.x[i].toFixed(5)},${tr.y[i].toFixed(7)}\n`);
  const file = join(dir, 'million.csv');
  writeFileSync(file, parts.join(''));
  const bytes = new Uint8Array(readFileSync(file));
  const load = timedMedian(runs, () => loadFile(bytes, 'million.csv'));
  const loadHashed = await timedMedianAsync(runs, () => loadFileHashed(bytes, 'million.csv'));
  const parse = timedMedian(runs, () => parseDelimited(bytes, 'million.csv'));
  const hash = timedMedian(runs, () => sha256Hex(bytes));
  const nativeHash = await timedMedianAsync(runs, () => sha256HexNative(bytes));
  const decode = timedMedian(runs, () => new TextDecoder('utf-8').decode(bytes));
  const text = decode.out;
  const papa = timedMedian(runs, () => Papa.parse<string[]>(text));
  const ok = load.out.ok && load.out.traces[0].y.length === n && loadHashed.out.ok;
  process.stderr.write(`  csv: load ${load.ms.toFixed(0)} ms, PapaParse ${papa.ms.toFixed(0)} ms\n`);
  return {
    rows: n, mb: bytes.length / 1e6, loadMs: load.ms, loadHashedMs: loadHashed.ms, parseMs: parse.ms, hashMs: hash.ms,
    nativeHashMs: nativeHash.ms, sameHash: nativeHash.out.hex === hash.out, decodeMs: decode.ms,
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
  if (ms === undefined || !Number.isFinite(ms)) return '—';
  return ms >= 100 ? ms.toFixed(0) : ms >= 10 ? ms.toFixed(1) : ms.toFixed(2);
}

/** Short decimal for the machine-readable lines: enough digits, no exponent for ordinary values. */
function num(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(4))) : 'NaN';
}

function summary(r: RowResult) {
  const oursMin = Math.min(...r.ours);
  const refMin = r.ref.length ? Math.min(...r.ref) : NaN;
  return {
    oursMin, refMin, ratio: oursMin / refMin,
    medianRatio: r.ratios.length ? median(r.ratios) : NaN,
    minPairRatio: r.ratios.length ? Math.min(...r.ratios) : NaN,
  };
}

function printTable(rows: RowResult[]): void {
  const head = ['step', 'n', 'pairs', 'ours min', 'SciPy min', 'ratio', 'median', 'best pair', 'target', 'verdict', 'same numbers?'];
  const widths = [38, 4, 5, 8, 9, 6, 6, 9, 6, 7, 0];
  const last = widths.length - 1;
  const line = (cells: string[]) => cells.map((c, i) => (i === 0 || i === last ? pad(c, widths[i]) : pad(c, widths[i], true))).join(' | ');
  console.log(line(head));
  console.log(line(widths.map((w, i) => '-'.repeat(i === last ? 13 : w))));
  for (const r of rows) {
    const s = summary(r);
    const has = Number.isFinite(s.ratio);
    const verdict = !has || r.target === null ? '—' : s.ratio <= r.target ? 'meets' : 'MISSES';
    console.log(line([
      r.label, r.n.toExponential(0).replace('+', ''), String(r.ours.length), fmtMs(s.oursMin), fmtMs(s.refMin),
      has ? `${s.ratio.toFixed(2)}×` : '—', has ? `${s.medianRatio.toFixed(2)}×` : '—', has ? `${s.minPairRatio.toFixed(2)}×` : '—',
      r.target === null ? '—' : `≤${r.target.toFixed(1)}×`, verdict, r.agreement,
    ]));
  }
  console.log('ratio: our fastest call / SciPy\'s fastest call (the targets apply to it); median: median over the alternating pairs of');
  console.log('ours / SciPy\'s in the same pair; best pair: the smallest of those. Times in ms, wall clock, one call each.');
}

function printMachineLines(rows: RowResult[]): void {
  for (const r of rows) {
    const s = summary(r);
    const tag = r.ratioLine ? 'RATIO' : 'INFO';
    console.log(`${tag} name=${r.name} n=${r.n} ours_ms=${num(s.oursMin)} ref_ms=${num(s.refMin)} ratio=${num(s.ratio)} median_ratio=${num(s.medianRatio)}`);
  }
}

function mb(b: number): string {
  return `${(b / 1048576).toFixed(0)} MB`;
}

function loadLine(): string {
  return loadavg().map((v) => v.toFixed(2)).join(' ');
}

// ---------------------------------------------------------------------------

async function main(): Promise<void> {
  const o = parseArgs(process.argv.slice(2));
  const started = performance.now();
  const useScipy = o.scipy && scipyAvailable();
  console.log(`Tracewright core benchmark, ${new Date().toISOString()}`);
  console.log(`node ${process.version}, ${cpus().length} × ${cpus()[0]?.model ?? 'unknown CPU'}; ${gc ? 'a collection before each of our calls (untimed)' : 'run with --expose-gc for a collection before each call'}`);
  console.log(`LOAD start ${loadLine()} (load average over 1, 5, 15 min; ${cpus().length} cores)`);
  console.log(`sizes ${o.sizes.map((n) => n.toExponential(0).replace('+', '')).join(', ')}; ${o.runs} alternating pairs per row (at most 3 at 10^7); seed ${SEED} + n`);
  const dir = mkdtempSync(join(tmpdir(), 'tracewright-bench-'));
  let sp: ScipyServer | null = null;
  try {
    if (useScipy) {
      sp = new ScipyServer(resolve(process.cwd(), 'test/bench/scipy_bench.py'));
      const v = await sp.ask<{ scipy: string; numpy: string; python: string }>({ op: 'hello' });
      console.log(`SciPy ${v.scipy}, NumPy ${v.numpy}, Python ${v.python} (one persistent process)`);
    } else {
      console.log(o.scipy ? 'python3 with SciPy not found: SciPy columns left empty.' : 'SciPy side switched off (--no-scipy).');
    }
    const chosen = ROWS.filter((r) => (o.rows ? o.rows.includes(r.name) : !r.optIn || (r.optIn === 'spsolve' && o.spsolve)));
    const results: RowResult[] = [];
    for (const n of o.sizes) {
      const tr = makeBenchTrace(n);
      process.stderr.write(`n = ${n} (${tr.peaks} peaks)\n`);
      if (sp) {
        const file = join(dir, `y-${n}.f64`);
        writeFileSync(file, new Uint8Array(tr.y.buffer, tr.y.byteOffset, tr.y.byteLength));
        await sp.ask({ op: 'load', n, file, sigma: tr.sigma });
      }
      for (const row of chosen) results.push(await benchRow(row, tr, runsAt(n, o.runs, row), sp));
    }
    console.log('');
    printTable(results);
    console.log('');
    printMachineLines(results);
    console.log(`LOAD end ${loadLine()}`);

    let csv: CsvResult | null = null;
    if (o.csv) {
      csv = await benchCsv(dir, 3);
      console.log('');
      console.log(`CSV, ${csv.rows.toLocaleString('en')} rows, ${csv.mb.toFixed(1)} MB (median of 3):`);
      console.log(`  loadFile (pure SHA-256 + decode + dialect + numbers): ${csv.loadMs.toFixed(0)} ms   target ≤ 500 ms: ${csv.loadMs <= 500 ? 'meets' : 'MISSES'}${csv.ok ? '' : '  (LOAD FAILED)'}`);
      console.log(`  loadFileHashed (native digest first, as the page):    ${csv.loadHashedMs.toFixed(0)} ms   target ≤ 500 ms: ${csv.loadHashedMs <= 500 ? 'meets' : 'MISSES'}`);
      console.log(`  SHA-256 of the bytes: pure ${csv.hashMs.toFixed(0)} ms, native (crypto.subtle) ${csv.nativeHashMs.toFixed(0)} ms; same hex: ${csv.sameHash ? 'yes' : 'NO'}`);
      console.log(`  parseDelimited alone:                                 ${csv.parseMs.toFixed(0)} ms`);
      console.log(`  PapaParse default, Papa.parse(text):                  ${csv.papaMs.toFixed(0)} ms (${csv.papaRows.toLocaleString('en')} rows of strings; + ${csv.decodeMs.toFixed(0)} ms TextDecoder to get the text)`);
      console.log(`  ratio loadFileHashed / (decode + PapaParse):          ${(csv.loadHashedMs / (csv.papaMs + csv.decodeMs)).toFixed(2)}×`);
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
    console.log(`total ${((performance.now() - started) / 1000).toFixed(1)} s; LOAD at exit ${loadLine()}`);
    if (o.json) {
      writeFileSync(o.json, JSON.stringify({ date: new Date().toISOString(), node: process.version, rows: results, csv, mem }, null, 1));
    }
  } finally {
    sp?.quit();
    rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((e: unknown) => { console.error(e); process.exitCode = 1; });
