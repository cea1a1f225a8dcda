/**
 * A command-line run from start to exit status: read the arguments, check
 * the method, blank and scans before anything is written (status 2 when
 * they fail), list the inputs, analyse them (in this thread or in worker
 * threads), and write each input's files in input order, so names and
 * contents do not depend on --jobs.
 */
import { mkdirSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { basename, join, resolve } from 'node:path';
import { Worker } from 'node:worker_threads';
import { exportSafeName, uniqueNamer, zipBaseName } from '../core/export/names.ts';
import { TOOL_VERSION } from '../core/export/version.ts';
import { analysisOf, emptyRecipe, parseRecipeText, recipeToJson, recipeWithAnalysis, type Recipe } from '../core/method.ts';
import { STEP_REGISTRY } from '../core/steps/registry.ts';
import { parseArgs, type AnalyseOptions } from './args.ts';
import { ANALYSE_HELP, MAIN_HELP } from './help.ts';
import { calibrationExport, calibrationExportJson } from '../core/calibration/export.ts';
import type { SampleAmounts } from '../core/calibration/calibrate.ts';
import { readNamedPeaksCsv } from '../core/calibration/named-peaks.ts';
import { amountsCsv, calibrationTableCsv } from '../core/export/calibration-csv.ts';
import { exportTime, TOOL_LABEL, TOOL_NAME, CAUTION } from '../core/export/version.ts';
import { batchCombinedCsv, type CombinedRun } from '../core/export/batch-combined.ts';
import { jobContext, runJob, type JobContext, type JobOutcome, type JobSetup, type SupportFile } from './job.ts';

/** Where a run reads and writes besides files: the process's streams and settings, or a test's stand-ins. */
export interface CliIo {
  stdout: (text: string) => void;
  stderr: (text: string) => void;
  /** True when standard error is a terminal: progress is then a bar redrawn in place. */
  stderrIsTTY: boolean;
  /** Width of the terminal in characters, for the bar. */
  columns?: number;
  cwd: string;
  env: Readonly<Record<string, string | undefined>>;
  /** The built command line's own module; worker threads load it for --jobs above 1. Without it every job runs in this thread. */
  workerUrl?: URL;
}

/** Files a run with standards writes once, beside the summaries (issue 21). */
const CALIBRATION_FILES = ['calibration.json', 'calibration-table.csv', 'amounts.csv'];
/** The combined table a run with --combine writes once (issue 18), named as in the page's batch ZIP. */
const COMBINED_FILE = 'peaks-combined.csv';

export const EXIT_OK = 0;
export const EXIT_INPUT_FAILED = 1;
export const EXIT_USAGE = 2;

const PREFIX = 'tracewright: ';

/** Run the command line; resolves to the exit status. Never throws for anything a user can cause. */
export async function runCli(argv: readonly string[], io: CliIo): Promise<number> {
  const parsed = parseArgs(argv);
  if (parsed.kind === 'help') { io.stdout(parsed.topic === 'analyse' ? ANALYSE_HELP : MAIN_HELP); return EXIT_OK; }
  if (parsed.kind === 'version') { io.stdout(`tracewright ${TOOL_VERSION}\n`); return EXIT_OK; }
  if (parsed.kind === 'usage-error') {
    io.stderr(`${PREFIX}${parsed.message}\nSee "tracewright ${parsed.topic === 'analyse' ? 'analyse ' : ''}--help".\n`);
    return EXIT_USAGE;
  }
  return analyseRun(parsed.options, io);
}

function stop(io: CliIo, message: string): number {
  io.stderr(`${PREFIX}${message}\nNothing was written.\n`);
  return EXIT_USAGE;
}

function readSupport(io: CliIo, path: string, what: string): Uint8Array | string {
  try {
    return new Uint8Array(readFileSync(resolve(io.cwd, path)));
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    return `The ${what} ${path} cannot be read (${code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a folder' : (e as Error).message}).`;
  }
}

/** The time written into the files: SOURCE_DATE_EPOCH (reproducible-builds.org) when set, else now. */
function runTime(env: CliIo['env']): number | string {
  const epoch = env.SOURCE_DATE_EPOCH;
  if (epoch === undefined || epoch === '') return Date.now();
  if (!/^\d{1,12}$/.test(epoch.trim())) return `SOURCE_DATE_EPOCH must be a whole number of seconds since 1970; got "${epoch}".`;
  return Number(epoch.trim()) * 1000;
}

interface Input { path: string; index: number }

/** Expand folders into their files (directly inside, in name order); other arguments stay as given. */
function listInputs(io: CliIo, args: readonly string[]): { inputs: Input[]; problems: string[] } {
  const inputs: Input[] = [];
  const problems: string[] = [];
  for (const arg of args) {
    const abs = resolve(io.cwd, arg);
    let isDir: boolean;
    try { isDir = statSync(abs).isDirectory(); } catch { isDir = false; }
    if (!isDir) { inputs.push({ path: arg, index: inputs.length }); continue; }
    let names: string[];
    try {
      names = readdirSync(abs).filter((n) => {
        try { return statSync(join(abs, n)).isFile(); } catch { return false; }
      });
    } catch (e) {
      problems.push(`${arg}: the folder cannot be read (${(e as Error).message}).`);
      continue;
    }
    names.sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
    for (const n of names) inputs.push({ path: join(arg, n), index: inputs.length });
  }
  return { inputs, problems };
}

/** Progress on standard error: a bar redrawn in place on a terminal, plain lines otherwise. */
class Progress {
  private done = 0;
  private barShown = false;
  constructor(private readonly io: CliIo, private readonly total: number) {}

  /** A line of text (a problem or a warning), kept above the bar. */
  line(text: string): void {
    this.clearBar();
    this.io.stderr(`${PREFIX}${text}\n`);
    this.drawBar();
  }

  step(file: string, what: string): void {
    this.done += 1;
    if (this.io.stderrIsTTY) {
      this.last = file;
      this.drawBar();
    } else {
      this.io.stderr(`${PREFIX}[${this.done}/${this.total}] ${file}: ${what}\n`);
    }
  }

  finish(text: string): void {
    this.clearBar();
    this.io.stderr(`${PREFIX}${text}\n`);
  }

  private last = '';

  private clearBar(): void {
    if (this.barShown) { this.io.stderr('\r\x1b[K'); this.barShown = false; }
  }

  private drawBar(): void {
    if (!this.io.stderrIsTTY || this.done === 0) return;
    const width = Math.max(10, Math.min(40, (this.io.columns ?? 80) - 40));
    const filled = Math.round((width * this.done) / this.total);
    const name = this.last.length > 30 ? `…${this.last.slice(-29)}` : this.last;
    this.io.stderr(`\r\x1b[K[${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${this.done}/${this.total} ${name}`);
    this.barShown = true;
  }
}

/** Run the jobs in worker threads, `count` at a time; outcomes are handed over as they finish. */
async function runInWorkers(setup: JobSetup, inputs: readonly Input[], count: number, workerUrl: URL, onOutcome: (o: JobOutcome) => void): Promise<void> {
  let next = 0;
  const startWorker = (): Promise<void> => new Promise((done) => {
    const worker = new Worker(workerUrl, { workerData: { tracewrightJob: setup } });
    let current: Input | null = null;
    const give = () => {
      if (next >= inputs.length) { current = null; void worker.terminate(); return; }
      current = inputs[next++];
      worker.postMessage({ index: current.index, path: current.path });
    };
    worker.on('message', (m: { type: 'ready' } | { type: 'done'; outcome: JobOutcome } | { type: 'fatal'; message: string }) => {
      if (m.type === 'done') { onOutcome(m.outcome); give(); } else if (m.type === 'ready') give();
      else {
        // The context was checked in this thread first, so this is a fault, not a user error.
        if (current) onOutcome({ index: current.index, file: current.path, multi: false, outputs: [], errors: [`${current.path}: the worker could not start (${m.message}).`] });
        current = null;
        void worker.terminate();
      }
    });
    worker.on('error', (e) => {
      // A crash (e.g. out of memory) fails the file it was on; a fresh worker takes the rest.
      if (current) onOutcome({ index: current.index, file: current.path, multi: false, outputs: [], errors: [`${current.path}: the analysis stopped unexpectedly (${e.message}).`] });
      current = null;
    });
    worker.on('exit', () => {
      if (next < inputs.length) void startWorker().then(done); else done();
    });
  });
  await Promise.all(Array.from({ length: count }, () => startWorker()));
}

/** The worker thread's side: build the context once, then analyse each input it is given. */
export function workerLoop(port: { on(ev: 'message', f: (m: { index: number; path: string }) => void): void; postMessage(m: unknown): void }, setup: JobSetup): void {
  const ctx = jobContext(setup);
  if (typeof ctx === 'string') { port.postMessage({ type: 'fatal', message: ctx }); return; }
  port.on('message', (m) => port.postMessage({ type: 'done', outcome: runJob(ctx, m.index, m.path) }));
  port.postMessage({ type: 'ready' });
}

async function analyseRun(options: AnalyseOptions, io: CliIo): Promise<number> {
  const now = runTime(io.env);
  if (typeof now === 'string') return stop(io, now);

  // Everything that can stop the run with status 2 is checked before anything is written.
  let recipe: Recipe = emptyRecipe();
  if (options.method) {
    const bytes = readSupport(io, options.method, 'method file');
    if (typeof bytes === 'string') return stop(io, bytes);
    const check = parseRecipeText(new TextDecoder('utf-8').decode(bytes), STEP_REGISTRY);
    if (!check.ok) return stop(io, `The method file ${options.method} does not validate:\n  ${check.problems.join('\n  ')}`);
    recipe = check.recipe;
  }
  const analysis = analysisOf(recipe);
  // As the page's "Use the marked range as quiet baseline": the RMS about a line over it.
  const noise = options.quietRange ? { method: 'rms' as const, quietRange: options.quietRange } : analysis.noise;
  // Issue 21: --named-peaks replaces the method's named-peak table.
  let namedPeaks = analysis.namedPeaks ?? null;
  if (options.namedPeaks) {
    const bytes = readSupport(io, options.namedPeaks, 'named-peak file');
    if (typeof bytes === 'string') return stop(io, bytes);
    const read = readNamedPeaksCsv(new TextDecoder('utf-8').decode(bytes), basename(options.namedPeaks));
    if (!read.ok) return stop(io, `The named-peak file cannot be used:\n  ${read.problems.map((p) => `${options.namedPeaks}${p.line !== null ? `, line ${p.line}` : ''}: ${p.problem}`).join('\n  ')}`);
    namedPeaks = read.table;
  }
  const method = recipeWithAnalysis(recipe, noise, analysis.peaks, { namedPeaks, calibration: analysis.calibration ?? null });

  const support = (path: string, what: string): SupportFile | string => {
    const bytes = readSupport(io, path, what);
    return typeof bytes === 'string' ? bytes : { path, bytes };
  };
  let blank: SupportFile | null = null;
  if (options.blank) {
    const b = support(options.blank, 'blank');
    if (typeof b === 'string') return stop(io, b);
    blank = b;
  }
  const scans: SupportFile[] = [];
  for (const p of options.scans) {
    const s = support(p, 'scan');
    if (typeof s === 'string') return stop(io, s);
    scans.push(s);
  }
  const standards: SupportFile[] = [];
  for (const p of options.standards) {
    const s = support(p, 'standard');
    if (typeof s === 'string') return stop(io, s);
    standards.push(s);
  }
  let amounts: SupportFile | null = null;
  if (options.amounts) {
    const a = support(options.amounts, 'amounts file');
    if (typeof a === 'string') return stop(io, a);
    amounts = a;
  }
  const setup: JobSetup = {
    methodJson: recipeToJson(method), blank, scans, dialect: options.dialect,
    traceName: options.traceName, traceIndex: options.traceIndex, nowMs: now, standards, amounts,
    fit: options.fit, figures: options.figures,
  };
  const ctx: JobContext | string = jobContext(setup);
  if (typeof ctx === 'string') return stop(io, ctx);

  const { inputs, problems } = listInputs(io, options.inputs);
  if (inputs.length === 0 && problems.length === 0) return stop(io, 'No input files: the folders given hold no files.');
  const outDir = resolve(io.cwd, options.out);
  try {
    mkdirSync(outDir, { recursive: true });
    if (!statSync(outDir).isDirectory()) return stop(io, `--out ${options.out} is not a folder.`);
  } catch (e) {
    return stop(io, `The output folder ${options.out} cannot be made (${(e as Error).message}).`);
  }

  // Files of this run that an output must never replace.
  const protectedPaths = new Set<string>([
    ...inputs.map((i) => i.path), ...(options.method ? [options.method] : []), ...(options.blank ? [options.blank] : []), ...options.scans,
    ...options.standards, ...(options.amounts ? [options.amounts] : []), ...(options.namedPeaks ? [options.namedPeaks] : []),
  ].map((p) => resolve(io.cwd, p)));
  if (ctx.calibration) {
    const clash = CALIBRATION_FILES.find((n) => protectedPaths.has(join(outDir, n)));
    if (clash) return stop(io, `The output ${clash} would replace an input of this run; choose another --out.`);
    for (const p of ctx.calibration.problems) io.stderr(`${PREFIX}calibration: ${p}\n`);
  }
  if (options.combine && protectedPaths.has(join(outDir, COMBINED_FILE))) return stop(io, `The output ${COMBINED_FILE} would replace an input of this run; choose another --out.`);
  const combinedRuns: CombinedRun[] = [];
  const sampleAmounts: SampleAmounts[] = [];
  const progress = new Progress(io, inputs.length);
  let failed = problems.length > 0;
  for (const p of problems) progress.line(p);
  const nameOf = uniqueNamer();
  let traces = 0;

  const write = (o: JobOutcome) => {
    const base = zipBaseName(basename(o.file));
    let written = 0;
    for (const t of o.outputs) {
      const stem = nameOf(o.multi ? `${base}_${exportSafeName(t.trace) || 'trace'}` : base);
      const files: [string, string][] = [[`${stem}-cleaned.csv`, t.cleaned], [`${stem}-peaks.csv`, t.peaks], [`${stem}-report.html`, t.report], [`${stem}-summary.json`, t.summary]];
      const clash = files.find(([name]) => protectedPaths.has(join(outDir, name)));
      if (clash) {
        o.errors.push(`${o.file}: its output ${clash[0]} would replace an input of this run, so nothing was written for it; choose another --out.`);
        continue;
      }
      try {
        for (const [name, text] of files) writeFileSync(join(outDir, name), text);
      } catch (e) {
        o.errors.push(`${o.file}: the outputs of "${t.trace}" could not be written (${(e as Error).message}).`);
        continue;
      }
      traces += 1;
      written += 1;
      for (const w of t.warnings) progress.line(`${o.file}${o.multi ? ` (${t.trace})` : ''}: ${w}`);
      if (options.json) io.stdout(`${t.summaryLine}\n`);
      if (t.amounts) sampleAmounts.push(t.amounts);
      combinedRuns.push({ name: o.multi ? `${o.file}: ${t.trace}` : o.file, peaks: t.peakRows });
    }
    for (const e of o.errors) progress.line(e);
    if (o.errors.length) failed = true;
    const what = `${written} trace${written === 1 ? '' : 's'} written`;
    progress.step(o.file, o.errors.length ? `problem, ${written ? what : 'nothing written'}` : what);
  };

  // Outcomes may finish out of order in worker threads; files are written in input order.
  const waiting = new Map<number, JobOutcome>();
  let nextIndex = 0;
  const take = (o: JobOutcome) => {
    waiting.set(o.index, o);
    while (waiting.has(nextIndex)) {
      const ready = waiting.get(nextIndex)!;
      waiting.delete(nextIndex);
      nextIndex += 1;
      write(ready);
    }
  };
  const jobs = Math.min(options.jobs, inputs.length);
  if (jobs > 1 && io.workerUrl) await runInWorkers(setup, inputs, jobs, io.workerUrl, take);
  else for (const input of inputs) take(runJob(ctx, input.index, input.path));

  if (ctx.calibration) {
    // Issue 21: the calibration and every written trace's amounts, once per run, beside the summaries.
    const exp = calibrationExport(ctx.calibration, sampleAmounts, exportTime(new Date(now)));
    const csv = { delimiter: ',' as const, decimal: '.' as const };
    try {
      writeFileSync(join(outDir, 'calibration.json'), calibrationExportJson(exp));
      writeFileSync(join(outDir, 'calibration-table.csv'), calibrationTableCsv(exp, csv));
      writeFileSync(join(outDir, 'amounts.csv'), amountsCsv(exp, csv));
    } catch (e) {
      progress.line(`the calibration files could not be written (${(e as Error).message}).`);
      failed = true;
    }
  }
  if (options.combine) {
    // Issue 18: peaks matched across the written traces, as the page's batch ZIP holds them.
    const head = [`${TOOL_NAME} peaks matched across the traces of a run: mean and %RSD of retention time and area`, `Written by: ${TOOL_LABEL}`, `Written at: ${exportTime(new Date(now))}`, `Caution: ${CAUTION}`];
    try {
      writeFileSync(join(outDir, COMBINED_FILE), batchCombinedCsv(combinedRuns, { delimiter: ',', decimal: '.' }, head, options.combine.window ?? undefined));
    } catch (e) {
      progress.line(`the combined table could not be written (${(e as Error).message}).`);
      failed = true;
    }
  }
  progress.finish(`${inputs.length} input${inputs.length === 1 ? '' : 's'}, ${traces} trace${traces === 1 ? '' : 's'} written to ${options.out}${failed ? '; some inputs had problems (listed above)' : ''}.`);
  return failed ? EXIT_INPUT_FAILED : EXIT_OK;
}
