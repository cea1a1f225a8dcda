/**
 * One input of a command-line run: read the file with the page's loader,
 * analyse each chosen trace with the method (and the blank and scans), and
 * make the page's exports plus the summary. Runs in the main thread or in a
 * worker thread (--jobs); it returns texts and never writes, so the main
 * thread names and writes every file in input order whatever the job count.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { basename } from 'node:path';
import { analyse } from '../core/analysis/index.ts';
import { cleanedTraceCsv } from '../core/export/cleaned-csv.ts';
import { peakTableCsv } from '../core/export/peak-csv.ts';
import { reportHtml } from '../core/export/report-html.ts';
import { analysisSummary, summaryJson, traceShortName } from '../core/export/summary.ts';
import type { CsvCellOptions } from '../core/io/csv-write.ts';
import { loadFile } from '../core/io/load.ts';
import type { LoadOptions, LoadResult } from '../core/io/types.ts';
import { analysisOf, parseRecipeText, type Recipe } from '../core/method.ts';
import { STEP_REGISTRY } from '../core/steps/registry.ts';
import type { Trace } from '../core/trace.ts';
import { calibrate, quantifySamples, type CalibrationSet, type SampleAmounts } from '../core/calibration/calibrate.ts';
import { calibrationExport } from '../core/calibration/export.ts';
import { defaultCalibrationSettings } from '../core/calibration/settings.ts';
import { readStandardsCsv } from '../core/calibration/standards.ts';
import { standardKeyOf } from '../core/calibration/trace-keys.ts';
import { exportTime } from '../core/export/version.ts';
import { fitExportExtras } from '../core/export/fit-extras.ts';
import type { Peak } from '../core/measure/peak-types.ts';
import { fitsForTrace, type CliFitOptions } from './fits.ts';
import { amountPeakColumns, joinExtraColumns } from '../core/export/amount-columns.ts';
import { peakNamingOf } from '../core/export/peak-names.ts';

/** What every job of a run shares; plain data, so it can be handed to a worker thread. */
export interface JobSetup {
  /** The validated method as JSON text (recipeToJson), quiet range already applied. */
  methodJson: string;
  blank: SupportFile | null;
  scans: SupportFile[];
  dialect: NonNullable<LoadOptions['dialect']>;
  traceName: string | null;
  traceIndex: number | null;
  /** Time written into every file, ms since 1970. */
  nowMs: number;
  /** Issue 21: standard runs (--standard) and the amounts CSV (--amounts); empty / null without calibration. */
  standards: SupportFile[];
  amounts: SupportFile | null;
  /** Issue 18: regions to fit on every trace, and the figure columns; null without them. Absent is read as null. */
  fit?: CliFitOptions | null;
  figures?: { deadTime: number | null } | null;
}

/** A blank or scan file: the path as given and its bytes. */
export interface SupportFile {
  path: string;
  bytes: Uint8Array;
}

/** The texts for one analysed trace. */
export interface TraceOutput {
  /** The trace's own name (column or block). */
  trace: string;
  cleaned: string;
  peaks: string;
  report: string;
  /** The summary file's text and the same summary on one line. */
  summary: string;
  summaryLine: string;
  warnings: string[];
  /** Issue 21: the trace's amounts by the calibration, or null without standards. */
  amounts: SampleAmounts | null;
  /** Issue 18: the trace's peaks, for the run's combined table (--combine). */
  peakRows: Peak[];
}

export interface JobOutcome {
  index: number;
  /** The input as given. */
  file: string;
  /** True when the file holds several traces (output names then carry the trace name). */
  multi: boolean;
  outputs: TraceOutput[];
  /** Why the file, or one of its traces, could not be read or analysed. */
  errors: string[];
}

/** Shared, once per thread: the method and the blank and scan traces. */
export interface JobContext {
  setup: JobSetup;
  method: Recipe;
  blank: Trace | null;
  scans: Trace[];
  /** Issue 21: the calibration from the standards, or null without them. */
  calibration: CalibrationSet | null;
}

/** The CSV options of the page's default export: comma and decimal point. */
const CSV: CsvCellOptions = { delimiter: ',', decimal: '.' };

/** "path, line n: problem advice", the form every refusal takes on standard error. */
function refusal(path: string, loaded: Extract<LoadResult, { ok: false }>): string {
  const e = loaded.error;
  return `${path}${e.line ? `, line ${e.line}` : ''}: ${e.problem} ${e.advice}`;
}

type TraceChoice = { ok: true; traces: Trace[] } | { ok: false; message: string };

/**
 * The traces of a loaded file the run asks for (--trace NAME, --trace-index
 * N, or all), or why none can be taken. A name matches a trace's own name
 * (the column or block name) or its full name ("file: column").
 */
export function chooseTraces(path: string, traces: readonly Trace[], name: string | null, index: number | null): TraceChoice {
  const names = traces.map((t) => `"${traceShortName(t)}"`).join(', ');
  if (name !== null) {
    const hits = traces.filter((t) => traceShortName(t) === name || t.name === name);
    if (hits.length === 1) return { ok: true, traces: hits };
    if (hits.length === 0) return { ok: false, message: `${path}: no trace is named "${name}"; the file holds ${names}. Name one of them with --trace, or pick one by position with --trace-index (0 = first).` };
    return { ok: false, message: `${path}: ${hits.length} traces are named "${name}". Pick one by position with --trace-index (0 = first) instead of --trace.` };
  }
  if (index !== null) {
    if (index < traces.length) return { ok: true, traces: [traces[index]] };
    return { ok: false, message: `${path}: --trace-index ${index} is past the end; the file holds ${traces.length} trace${traces.length === 1 ? '' : 's'} (${names}), numbered from 0.` };
  }
  return { ok: true, traces: [...traces] };
}

/**
 * Load a file the way the run asks (delimiter and decimal sign when given),
 * refusing what the page would have to ask about: numbers that read two
 * ways (settled by --delimiter or --decimal) or which columns are meant
 * (settled by --trace).
 */
export function loadForRun(path: string, bytes: Uint8Array, setup: Pick<JobSetup, 'dialect' | 'traceName' | 'traceIndex'>): { ok: true; traces: Trace[]; notices: string[] } | { ok: false; message: string } {
  // Node's own SHA-256 (the same hex as the loader's pure one, test/core/io/sha256.test.ts): about 15 ms for a 20 MB
  // file against 180 ms, a third of the load (issue 16).
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const loaded = loadFile(bytes, basename(path), { dialect: setup.dialect, sha256 });
  if (!loaded.ok) return { ok: false, message: refusal(path, loaded) };
  for (const q of loaded.report.questions ?? []) {
    const where = `${path}${q.line ? `, line ${q.line}` : ''}`;
    if (q.kind === 'number-format') {
      return { ok: false, message: `${where}: ${q.message} Say which with --delimiter (, ; tab or space) or --decimal (point or comma).` };
    }
    if (setup.traceName === null && setup.traceIndex === null) {
      return { ok: false, message: `${where}: ${q.message} Name the trace with --trace (or pick it by position with --trace-index).` };
    }
  }
  return { ok: true, traces: loaded.traces, notices: loaded.report.notices };
}

/**
 * A blank or scan: its file must load and give one trace (or the one named
 * by --trace / --trace-index when it holds several).
 * @returns the trace, or the sentence that makes the run stop with status 2.
 */
export function loadSupport(role: 'blank' | 'scan' | 'standard', file: SupportFile, setup: JobSetup): Trace | string {
  const loaded = loadForRun(file.path, file.bytes, setup);
  if (!loaded.ok) return `The ${role} cannot be used. ${loaded.message}`;
  if (loaded.traces.length === 1) return loaded.traces[0];
  const pick = chooseTraces(file.path, loaded.traces, setup.traceName, setup.traceIndex);
  if (pick.ok && pick.traces.length === 1) return pick.traces[0];
  return `The ${role} cannot be used. ${file.path} holds ${loaded.traces.length} traces; a ${role} must be one trace, or --trace / --trace-index must name one that it holds.`;
}

/** Prepare what every job of the run shares. @returns the context, or the sentence that stops the run (status 2). */
export function jobContext(setup: JobSetup): JobContext | string {
  const check = parseRecipeText(setup.methodJson, STEP_REGISTRY);
  if (!check.ok) return `The method does not validate: ${check.problems.join(' ')}`;
  let blank: Trace | null = null;
  if (setup.blank) {
    const t = loadSupport('blank', setup.blank, setup);
    if (typeof t === 'string') return t;
    blank = t;
  }
  const scans: Trace[] = [];
  for (const s of setup.scans) {
    const t = loadSupport('scan', s, setup);
    if (typeof t === 'string') return t;
    scans.push(t);
  }
  const calibration = setup.standards.length ? calibrationOf(setup, check.recipe, blank, scans) : null;
  if (typeof calibration === 'string') return calibration;
  return { setup, method: check.recipe, blank, scans, calibration };
}

/** The analysis of one trace with the run's method, blank and scans. */
function analyseWith(trace: Trace, method: Recipe, blank: Trace | null, scans: readonly Trace[]) {
  const settings = analysisOf(method);
  const all = new Map<string, Trace>([[trace.id, trace]]);
  if (blank) all.set(blank.id, blank);
  for (const s of scans) all.set(s.id, s);
  return analyse({ sampleId: trace.id, blankId: blank?.id, scanIds: scans.map((s) => s.id), recipe: method, noise: settings.noise, peaks: settings.peaks }, all, STEP_REGISTRY);
}

/**
 * Issue 21: analyse each standard with the method (same steps, blank, scans and settings as the samples), name
 * its peaks by the method's named-peak table and fit the calibration from the amounts table.
 * @returns the calibration, or the sentence that stops the run (status 2).
 */
function calibrationOf(setup: JobSetup, method: Recipe, blank: Trace | null, scans: readonly Trace[]): CalibrationSet | string {
  const named = analysisOf(method).namedPeaks;
  if (!named || named.peaks.length === 0) return 'Calibration needs named peaks: save them with the method, or give --named-peaks FILE.';
  if (!setup.amounts) return '--standard needs --amounts FILE.';
  const read = readStandardsCsv(new TextDecoder('utf-8').decode(setup.amounts.bytes), basename(setup.amounts.path));
  if (!read.ok) return `The amounts file cannot be used: ${read.problems.map((p) => `${setup.amounts!.path}${p.line !== null ? `, line ${p.line}` : ''}: ${p.problem}`).join(' ')}`;
  const standardTraces = [];
  for (const f of setup.standards) {
    const t = loadSupport('standard', f, setup);
    if (typeof t === 'string') return t;
    try {
      standardTraces.push({ trace: standardKeyOf(t, read.table), peaks: analyseWith(t, method, blank, scans).peaks });
    } catch (e) {
      return `The standard ${f.path} could not be analysed (${e instanceof Error ? e.message : String(e)}).`;
    }
  }
  const settings = analysisOf(method).calibration ?? defaultCalibrationSettings();
  return calibrate({ namedPeaks: named, standards: read.table, standardTraces, settings });
}

/**
 * Analyse one input: every chosen trace with the method, the blank and the
 * scans, and make the cleaned-trace CSV, peak-table CSV and report exactly
 * as the page's default export does, plus the summary. A trace whose
 * analysis fails is named in `errors`; the file's other traces still come out.
 */
export function runJob(ctx: JobContext, index: number, path: string): JobOutcome {
  const out: JobOutcome = { index, file: path, multi: false, outputs: [], errors: [] };
  let bytes: Uint8Array;
  try {
    bytes = new Uint8Array(readFileSync(path));
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    out.errors.push(`${path}: cannot be read (${code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'a folder inside a folder is not read' : code === 'EACCES' ? 'permission denied' : (e as Error).message}).`);
    return out;
  }
  const loaded = loadForRun(path, bytes, ctx.setup);
  if (!loaded.ok) { out.errors.push(loaded.message); return out; }
  out.multi = loaded.traces.length > 1;
  const pick = chooseTraces(path, loaded.traces, ctx.setup.traceName, ctx.setup.traceIndex);
  if (!pick.ok) { out.errors.push(pick.message); return out; }
  const method = ctx.method;
  const now = new Date(ctx.setup.nowMs);
  for (const trace of pick.traces) {
    try {
      const result = analyseWith(trace, method, ctx.blank, ctx.scans);
      // Issue 21: the trace's amounts, named as the inputs are (the path, with the trace's name when the file holds several).
      const amounts = ctx.calibration ? quantifySamples(ctx.calibration, [{ trace: out.multi ? `${path}: ${traceShortName(trace)}` : path, peaks: result.peaks }])[0] : null;
      const calibration = ctx.calibration && amounts ? calibrationExport(ctx.calibration, [amounts], exportTime(now)) : null;
      // Issue 18: region fits and figure columns, as the page's exports carry them.
      const fitted = ctx.setup.fit ? fitsForTrace(trace, result, ctx.setup.fit, exportTime(now)) : { fits: [], problems: [] };
      const figures = ctx.setup.figures ?? null;
      const fitAdd = fitted.fits.length || figures ? fitExportExtras({ trace, result, fits: fitted.fits, figures, measureOn: analysisOf(method).peaks.measureOn }) : { extra: null, lines: [] };
      // Issue 21: the named peaks' amounts as peak table columns.
      const amountColumns = calibration ? amountPeakColumns(calibration.samples[0] ?? null, peakNamingOf(method, result.peaks)?.names ?? [], calibration.confidenceLevel) : null;
      const add = { extra: joinExtraColumns(fitAdd.extra, amountColumns), lines: fitAdd.lines };
      const summary = analysisSummary({ trace, result, method, registry: STEP_REGISTRY, inputFile: path, loadNotices: loaded.notices, fits: fitted.fits, calibration });
      summary.warnings.push(...fitted.problems);
      out.outputs.push({
        trace: traceShortName(trace),
        cleaned: cleanedTraceCsv({ trace, result, recipe: method, registry: STEP_REGISTRY, options: CSV, now }),
        peaks: peakTableCsv({ trace, result, recipe: method, registry: STEP_REGISTRY, options: CSV, now, extra: add.extra, extraComments: add.lines }),
        report: reportHtml({ trace, result, recipe: method, registry: STEP_REGISTRY, now, calibration, fits: fitted.fits, extra: add.extra, extraLines: add.lines }),
        summary: summaryJson(summary),
        summaryLine: summaryJson(summary, true),
        warnings: summary.warnings,
        amounts,
        peakRows: [...result.peaks],
      });
    } catch (e) {
      out.errors.push(`${path}: the trace "${traceShortName(trace)}" could not be analysed (${e instanceof Error ? e.message : String(e)}).`);
    }
  }
  return out;
}
