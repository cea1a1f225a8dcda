/**
 * The analysis summary: one JSON object per analysed trace, the contract
 * other programs read (`<stem>-summary.json` and the command line's --json
 * lines). Its schema is src/core/export/summary.schema.json and the
 * README's "Summary file" section; schema 1 may gain fields, never lose or
 * rename one. Numbers are written at full precision (shortest round-trip
 * text); a number that is missing or not finite is null, never NaN or
 * Infinity; x-values are in the trace's x-units.
 *
 * This is the one place the summary is built.
 */
import { amountSummary } from './amount-columns.ts';
import type { CalibrationExport } from '../calibration/export.ts';
import { fitSummary, type FitForExport } from './fit-export.ts';
import type { AnalyseResult } from '../analysis/index.ts';
import type { PeakFlag, SnrDefinition } from '../measure/peak-types.ts';
import { analysisOf, recipeToJson, type Recipe, type Registry } from '../method.ts';
import type { Trace } from '../trace.ts';
import { TOOL_VERSION } from './version.ts';
import { peakNamingOf } from './peak-names.ts';
import { cleanReportFields, reasonFor, type HandReason, type ReportFields } from './report-fields.ts';

export const SUMMARY_SCHEMA = 1;

/** Peak status words of the summary, from the page's flags. */
export type SummaryStatus = 'quantifiable' | 'detected' | 'below-detection' | 'not-measured';

export interface SummaryPeak {
  x: number | null;
  height: number | null;
  area: number | null;
  fwhm: number | null;
  start: number | null;
  end: number | null;
  snr: number | null;
  status: SummaryStatus;
  hand: null | 'added' | 'removed' | 'bounds';
  afterProcessingOnly: boolean;
  /** Issue 21: the name the method's named-peak table gives this peak, or null. */
  name: string | null;
  /** Issue 17, added: the reason given for the hand change, '' when none was given; present only when the page passed its reasons. */
  reason?: string;
}

export interface Summary {
  schema: 1;
  tool: { name: 'tracewright'; version: string };
  input: { file: string; sha256: string; trace: string };
  units: { x: string; y: string };
  method: Record<string, unknown>;
  points: { in: number; out: number };
  noise: { sigma: number | null; method: string; points: number | null; assumptionsHeld: boolean; fallback: string | null };
  snr: { definition: 'H/sigma' | '2H/h' | 'mean/SD'; detectionLimit: number; quantitationLimit: number; expectedNoisePeaksAboveDetection: number | null };
  peaks: SummaryPeak[];
  residual: { verdict: string };
  warnings: string[];
  /** Issue 18, added: region fits (export/fit-export.ts fitSummary); present only when fits were made. */
  fits?: Record<string, unknown>[];
  /** Issue 21, added: amounts of the named peaks (export/amount-columns.ts); present only with a calibration. */
  amounts?: Record<string, unknown>[];
  /** Issue 17, added: analyst, sample, instrument and run as filled in the page; present only when given. */
  report?: ReportFields;
}

export interface SummaryInput {
  trace: Trace;
  /** The analysis of `trace` with `method`. */
  result: AnalyseResult;
  /** The processing method the analysis ran with (steps and analysis settings). */
  method: Recipe;
  registry: Registry;
  /** The input as the user named it (a path on the command line, a file name in the page). */
  inputFile: string;
  /** The loader's notices for the file (they become warnings). */
  loadNotices?: readonly string[];
  /** Tool version; default the package's. */
  version?: string;
  /** Issue 18: region fits to add as `fits`. */
  fits?: readonly FitForExport[];
  /** Issue 21: this trace's amounts (a calibration export holding this trace only), added as `amounts`. */
  calibration?: CalibrationExport | null;
  /** Issue 17: the report's fields (added as `report`) and the reasons for hand changes (each peak's `reason`). */
  fields?: ReportFields | null;
  reasons?: readonly HandReason[] | null;
}

const STATUS: Record<PeakFlag, SummaryStatus> = {
  quantifiable: 'quantifiable',
  detectable: 'detected',
  'below-detection': 'below-detection',
  'not-measured': 'not-measured',
};

const SNR_NAME: Record<SnrDefinition, Summary['snr']['definition']> = { rms: 'H/sigma', pharmacopoeial: '2H/h', region: 'mean/SD' };

/** The estimate each noise method gives when it can run (NoiseEstimate.method). */

/** A finite number, or null. */
function num(v: number | null | undefined): number | null {
  return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

/**
 * The trace's own name: the loader names traces "<file name>: <column or
 * block name>", and the file is already in `input.file`.
 */
export function traceShortName(trace: Trace): string {
  const prefix = `${trace.source.fileName}: `;
  return trace.name.startsWith(prefix) ? trace.name.slice(prefix.length) : trace.name;
}

/**
 * Build the summary of one analysed trace.
 *
 * Warnings, in this order: the loader's notices, steps that could not run,
 * a residual that could not be formed, the noise notes (fallbacks and
 * assumptions), why peaks could not be measured, and the features the
 * current stack loses or weakens against the raw trace (what the page asks
 * the user to confirm before exporting).
 */
export function analysisSummary(input: SummaryInput): Summary {
  const { trace, result, method, registry } = input;
  const settings = analysisOf(method);
  const warnings: string[] = [...(input.loadNotices ?? [])];
  for (const r of result.runs) {
    if (r.status !== 'error') continue;
    const label = registry.find((d) => d.id === r.step)?.label ?? r.step;
    warnings.push(`Step "${label}" was not applied: ${r.message ?? 'it could not run.'}`);
  }
  const stepsRan = result.runs.some((r) => r.status === 'ok');
  if (stepsRan && !result.diagnostics && result.residualNote) warnings.push(`Residual: ${result.residualNote}`);

  let noise: Summary['noise'];
  if (result.noise) {
    const n = result.noise;
    // The noise report lists every check behind σ; a check on the method ('method') or on carrying σ through
    // the stack ('carried') that did not hold means another route than the one asked for was taken.
    const fell = n.checks.find((c) => (c.id === 'method' || c.id === 'carried') && c.held === false);
    const fallback = fell ? fell.text : n.sigma.method === 'none' ? 'No noise estimate could be made.' : null;
    noise = { sigma: num(n.sigma.sigma), method: n.sigma.method, points: num(n.sigma.points), assumptionsHeld: n.assumptionsHeld && fallback === null, fallback };
    warnings.push(...n.notes);
  } else {
    noise = { sigma: null, method: 'not measured', points: null, assumptionsHeld: false, fallback: null };
  }
  if (result.peakProblem) warnings.push(`Peaks could not be measured: ${result.peakProblem}`);
  if (result.loss) warnings.push(...result.loss.currentWarnings);

  const definition = result.peakOptions?.snrDefinition ?? settings.peaks.snrDefinition;
  const limits = result.peakOptions?.limits ?? { detection: settings.peaks.detectionLimit, quantitation: settings.peaks.quantitationLimit };
  const naming = peakNamingOf(method, result.peaks);
  if (naming?.missing.length) warnings.push(`Named peaks not found: ${naming.missing.join(', ')}.`);
  const step = trace.x.length > 1 ? Math.abs(trace.x[trace.x.length - 1] - trace.x[0]) / (trace.x.length - 1) : 0;
  const peaks: SummaryPeak[] = result.peaks.map((p, i) => ({
    x: num(p.x), height: num(p.height), area: num(p.area), fwhm: num(p.fwhm), start: num(p.start), end: num(p.end), snr: num(p.snr),
    status: STATUS[p.flag],
    // 'bounds': start or end moved by hand (issue 17, hand-bounds.ts); an added peak stays 'added'.
    hand: p.removedByUser ? 'removed' : p.origin === 'added-by-user' ? 'added' : p.boundsByUser ? 'bounds' : null,
    // Marked when the raw trace has nothing there that passes the same thresholds (measure/peak-table.ts).
    afterProcessingOnly: p.marks.includes('appears-only-after-processing'),
    name: naming?.names[i] ?? null,
    ...(input.reasons ? { reason: reasonFor(p, input.reasons, step) } : {}),
  }));

  let verdict: string;
  if (result.diagnostics) verdict = result.diagnostics.verdict;
  else if (stepsRan) verdict = `Not tested: ${result.residualNote ?? 'the residual could not be formed.'}`;
  else verdict = 'No processing step ran, so nothing was removed.';

  return {
    schema: SUMMARY_SCHEMA,
    tool: { name: 'tracewright', version: input.version ?? TOOL_VERSION },
    input: { file: input.inputFile, sha256: trace.source.sha256, trace: traceShortName(trace) },
    units: { x: trace.xUnit, y: trace.yUnit },
    method: JSON.parse(recipeToJson(method)) as Record<string, unknown>,
    points: { in: trace.x.length, out: result.processed.x.length },
    noise,
    snr: {
      definition: SNR_NAME[definition], detectionLimit: limits.detection, quantitationLimit: limits.quantitation,
      // Simulated through the same detector for this length, noise correlation and thresholds (measure/noise-bumps.ts).
      expectedNoisePeaksAboveDetection: result.noiseBumps ? num(result.noiseBumps.aboveDetection) : null,
    },
    peaks,
    residual: { verdict },
    warnings,
    ...(input.fits && input.fits.length ? { fits: fitSummary(input.fits) } : {}),
    ...(input.calibration?.samples[0] ? { amounts: amountSummary(input.calibration.samples[0], input.calibration.confidenceLevel) } : {}),
    ...(input.fields ? { report: cleanReportFields(input.fields) } : {}),
  };
}

/**
 * The summary as JSON text: indented with a final line break for the file,
 * or on one line (for one-summary-per-line output). JSON has no NaN or
 * Infinity; {@link analysisSummary} already turned them into null.
 */
export function summaryJson(summary: Summary, oneLine = false): string {
  return oneLine ? JSON.stringify(summary) : `${JSON.stringify(summary, null, 2)}\n`;
}
