/**
 * One analysis pass: run the recipe on the sample, form the residual, and
 * (as the modules land) measure noise, find peaks and compare alternatives.
 * Pure: the worker calls it, and so do tests and benchmarks in Node.
 */
import { PipelineCache, runPipeline, type StepStatus } from './pipeline.ts';
import type { Recipe, Registry } from './recipe.ts';
import type { Signal, SpikeEvent, StepContext } from './steps/types.ts';
import type { Trace } from './trace.ts';
import { interpolateLinear, meanStep } from './numeric/interpolate.ts';
import { combineVerdict, HEIGHT_LOSS_TOLERANCE, residual as residualOf, residualDiagnostics, type ResidualDiagnostics } from './diagnostics.ts';
import { measureNoise, type NoiseReport, type NoiseSettings, type StackRun } from './measure/noise-report.ts';
import { matchPeaks, windowAdvice, type Ledger, type LedgerRow, type WindowAdvice } from './loss.ts';
import type { Peak, PeakDecisions, PeakOptions, SnrDefinition, SplitRule } from './measure/peak-types.ts';
import { applyPeakDecisions, defaultPeakOptions, detectPeaks, markAppearsOnlyAfterProcessing, markSaturatedOnRaw } from './measure/peak-table.ts';
import { expectedNoiseBumps, type NoiseBumpCount } from './measure/noise-bumps.ts';
import { pharmacopoeialBlank } from './measure/companion-noise.ts'; // issue 20
import { markGhostPeaks } from './measure/ghost-peaks.ts'; // issue 20

export { DEFAULT_NOISE_SETTINGS, measureNoise } from './measure/noise-report.ts';
export type { NoiseMethod, NoiseReport, NoiseSettings } from './measure/noise-report.ts';
import { DEFAULT_NOISE_SETTINGS } from './measure/noise-report.ts';

/** Peak thresholds as the user sets them; prominence in multiples of σ so it scales with the data. */
export interface PeakSettings {
  /** 'processed' (default) or 'raw': the trace peaks and noise are measured on. */
  measureOn: 'processed' | 'raw';
  minProminenceSigma: number;
  minSnr: number;
  /** x-units; 0 = 2.5 sample spacings (defaultPeakOptions). */
  minWidth: number;
  /** x-units; 0 = off. */
  minSeparation: number;
  snrDefinition: SnrDefinition;
  pharmacopoeialMultiplier: number;
  negative: boolean;
  detectionLimit: number;
  quantitationLimit: number;
  /** How peaks sharing a valley split the area (absent in sessions saved before it existed: perpendicular drop). */
  split?: SplitRule;
}

export const DEFAULT_PEAK_SETTINGS: PeakSettings = {
  measureOn: 'processed', minProminenceSigma: 2, minSnr: 2, minWidth: 0, minSeparation: 0,
  snrDefinition: 'rms', pharmacopoeialMultiplier: 5, negative: false, detectionLimit: 3, quantitationLimit: 10, split: 'perpendicular-drop',
};

export interface AnalyseRequest {
  sampleId: string;
  blankId?: string;
  scanIds: string[];
  recipe: Recipe;
  /** uid of a step whose output the page wants to draw as well. */
  showUid?: string | null;
  noise?: NoiseSettings;
  peaks?: PeakSettings;
  decisions?: PeakDecisions;
  /** Other stacks to compare with the current one (the loss check), at most {@link MAX_ALTERNATIVES}. */
  alternatives?: AlternativeRequest[];
  /** Also carry the ledger rows that are below the detection limit in every column (the page's toggle). */
  ledgerNoiseLevel?: boolean;
}

export const MAX_ALTERNATIVES = 6;

export interface AlternativeRequest {
  id: string;
  /** Words used in sentences, e.g. "5-point moving average". */
  label: string;
  recipe: Recipe;
}

/** One alternative's outcome, for the overlay and the residual verdicts. */
export interface AlternativeOutcome {
  id: string;
  label: string;
  processed: Signal;
  diagnostics: ResidualDiagnostics | null;
  noiseSigma: number | null;
  peakCount: number;
  /** Steps that could not run, in words. */
  problems: string[];
}

export interface WindowAdviceRow {
  uid: string;
  stepLabel: string;
  advice: WindowAdvice;
}

export interface LossReport {
  /** Column 0 is the raw trace (reference), column 1 the current stack, then the alternatives. */
  ledger: Ledger;
  /** Features below the detection limit in every column: left out of the ledger (counted only) unless asked for. */
  noiseLevelRows: number;
  /** True when the ledger holds those noise-level rows too. */
  noiseLevelShown: boolean;
  outcomes: AlternativeOutcome[];
  /** Narrowest half-height width among the reference's quantifiable peaks, in points; null when none is quantifiable. */
  narrowestFwhmPoints: number | null;
  advice: WindowAdviceRow[];
  /**
   * What the export asks the user to confirm: features the current stack loses or weakens against the raw
   * trace, and features that appear only after processing. Detectable features within the noise range (below
   * the S/N pure noise of this length reaches about once) are summed up in one sentence, not listed.
   */
  currentWarnings: string[];
  /** The quantifiable ones among them (lost, crossing a limit, or weakened beyond HEIGHT_LOSS_TOLERANCE): they keep the residual verdict from reading clean. */
  currentWeakened: string[];
}

export interface StepRunSummary {
  uid: string;
  step: string;
  status: StepStatus;
  message?: string;
  notes: string[];
  figures?: Record<string, number>;
  cached: boolean;
  ms: number;
  points: number;
  eventCount: number;
  /** Points this step replaced (despiking), listed so nothing is removed silently. */
  events?: SpikeEvent[];
  /** Per-point extras a panel may draw, e.g. the local polynomial order. */
  extra?: Record<string, Float64Array>;
}

export interface AnalyseResult {
  sampleId: string;
  processed: Signal;
  /** raw − processed on the processed grid. */
  residual: Signal;
  /** Sentence when the residual needed interpolation (the grid changed). */
  residualNote?: string;
  /** Tests on the residual; null when no step ran. */
  diagnostics: ResidualDiagnostics | null;
  baseline?: Float64Array;
  intermediate?: Signal | null;
  runs: StepRunSummary[];
  events: SpikeEvent[];
  noise: NoiseReport | null;
  peaks: Peak[];
  /** The options the peaks were measured with (for the table header and exports). */
  peakOptions: PeakOptions | null;
  /** Why peaks could not be measured, when they could not. */
  peakProblem?: string;
  /** How many noise-only peaks pure noise of this length and correlation would give with these settings. */
  noiseBumps: NoiseBumpCount | null;
  /** The loss check; null when there is nothing to compare. */
  loss: LossReport | null;
  ms: number;
}

/**
 * What depends on the raw trace alone is worked out once per trace and kept
 * while the trace lives (raw arrays are never changed, so their identity is
 * a safe key): the reference peak table per settings (the raw noise model is
 * kept the same way, in measure/noise-report.ts).
 */
const REFERENCES = new WeakMap<Float64Array, Map<string, Measured>>();

interface Measured {
  noise: NoiseReport | null;
  peaks: Peak[];
  peakOptions: PeakOptions | null;
  peakProblem?: string;
}

/** Noise and peaks on one signal with the user's settings. */
function measurePeaks(measured: Signal, raw: Signal, noiseSettings: NoiseSettings, ps: PeakSettings, ctx: StepContext, stack: StackRun | null, decisions?: PeakDecisions): Measured {
  if (measured.y.length < 5) return { noise: null, peaks: [], peakOptions: null, peakProblem: 'Fewer than 5 points: no peaks can be measured.' };
  const noise = measureNoise(measured, raw, noiseSettings, measured === raw ? null : stack);
  const sigma = noise.sigma.sigma;
  if (!Number.isFinite(sigma)) {
    return { noise, peaks: [], peakOptions: null, peakProblem: 'The noise figure is not a finite number (the values are so large that their squares overflow, or there was nothing to measure), so S/N cannot be measured. Mark a quiet range of ordinary values, or rescale the data.' };
  }
  if (!(sigma > 0)) {
    return { noise, peaks: [], peakOptions: null, peakProblem: 'The noise is zero (the trace is perfectly smooth or constant), so S/N cannot be measured. Mark a quiet range with some noise, or measure on the raw trace.' };
  }
  const dx = meanStep(measured.x);
  const base = defaultPeakOptions(sigma, dx);
  const peakOptions: PeakOptions = {
    ...base,
    minProminence: ps.minProminenceSigma * sigma,
    minSnr: ps.minSnr,
    minWidth: ps.minWidth > 0 ? ps.minWidth : base.minWidth,
    minSeparation: ps.minSeparation,
    snrDefinition: ps.snrDefinition,
    pharmacopoeialMultiplier: ps.pharmacopoeialMultiplier,
    negative: ps.negative,
    split: ps.split ?? 'perpendicular-drop',
    limits: { detection: ps.detectionLimit, quantitation: ps.quantitationLimit },
    pharmacopoeialNoise: pharmacopoeialBlank(measured, raw, ctx, stack), // issue 20: h from the blank processed by the same stack
    noiseProfile: noise.profile,
    // The measured trace's own noise correlation (the raw ρ carried through the stack): it sets S/N box factors.
    noiseCorrelation: noise.measuredRho,
  };
  try {
    let peaks = detectPeaks(measured.x, measured.y, peakOptions);
    if (decisions && (decisions.added.length || decisions.removed.length || decisions.bounds?.length)) peaks = /* issue 17: bounds */ applyPeakDecisions(peaks, decisions, measured.x, measured.y, peakOptions);
    return { noise, peaks, peakOptions };
  } catch (e) {
    return { noise, peaks: [], peakOptions, peakProblem: (e as Error).message };
  }
}

function stackOf(run: ReturnType<typeof runPipeline>, recipe: Recipe, registry: Registry, ctx: StepContext, sampleId: string): StackRun {
  return { run, recipe, registry, ctx, cacheKey: sampleId };
}

/** Smoothing steps whose window gets advice, and how to read it. */
function adviceFor(step: string, params: Record<string, unknown>, narrowest: number): WindowAdvice | null {
  const w = Number(params.window);
  if (!Number.isInteger(w) || w < 1) return null;
  try {
    if (step === 'moving-average') return windowAdvice('moving-average', w, 0, narrowest);
    if (step === 'savitzky-golay' && Number(params.derivative ?? 0) === 0) return windowAdvice('savitzky-golay', w, Number(params.order), narrowest);
  } catch {
    return null;
  }
  return null;
}

/** The raw trace measured with the user's settings (hand decisions left out), worked out once per trace and settings. */
function rawReference(request: AnalyseRequest, raw: Signal, ctx: StepContext): Measured {
  const ps = { ...(request.peaks ?? DEFAULT_PEAK_SETTINGS), measureOn: 'processed' as const };
  const noiseSettings = request.noise ?? DEFAULT_NOISE_SETTINGS;
  const refKey = JSON.stringify([noiseSettings, ps, ctx.blank?.id ?? null]);
  let refs = REFERENCES.get(raw.y);
  if (!refs) { refs = new Map(); REFERENCES.set(raw.y, refs); }
  let reference = refs.get(refKey);
  if (!reference) {
    reference = measurePeaks(raw, raw, noiseSettings, ps, ctx, null);
    if (refs.size > 8) refs.clear();
    refs.set(refKey, reference);
  }
  return reference;
}

/**
 * The loss check: the raw trace, the current stack and each alternative,
 * measured with the same noise and peak settings, matched into one ledger.
 */
function lossCheck(
  request: AnalyseRequest, raw: Signal, sample: Trace, run: ReturnType<typeof runPipeline>, main: Measured, reference: Measured,
  noiseBumps: NoiseBumpCount | null, ctx: StepContext, registry: Registry, cache?: PipelineCache,
): LossReport | null {
  const alts = (request.alternatives ?? []).slice(0, MAX_ALTERNATIVES);
  const currentRan = run.runs.some((r) => r.status === 'ok');
  if (!currentRan && alts.length === 0) return null;
  const ps = { ...(request.peaks ?? DEFAULT_PEAK_SETTINGS), measureOn: 'processed' as const };
  const noiseSettings = request.noise ?? DEFAULT_NOISE_SETTINGS;
  // Hand decisions belong to the current table only; the comparison uses what detection finds.
  const reuse = (request.peaks ?? DEFAULT_PEAK_SETTINGS).measureOn === 'processed' && !request.decisions?.added.length && !request.decisions?.removed.length;
  const current = reuse ? main : measurePeaks(run.final, raw, noiseSettings, ps, ctx, stackOf(run, request.recipe, registry, ctx, sample.id));
  const columns = [
    { id: 'raw', label: 'no processing (raw)', peaks: reference.peaks },
    { id: 'current', label: 'the current stack', peaks: current.peaks },
  ];
  const outcomes: AlternativeOutcome[] = [];
  for (const alt of alts) {
    const r = runPipeline(raw, sample.id, alt.recipe, registry, ctx, cache);
    const m = measurePeaks(r.final, raw, noiseSettings, ps, ctx, stackOf(r, alt.recipe, registry, ctx, sample.id));
    const res = residualOfRun(raw, r);
    const diag = res.ok && r.runs.some((x) => x.status === 'ok') ? residualDiagnostics(res.residual.y, maxAbs(raw.y)) : null;
    outcomes.push({
      id: alt.id, label: alt.label, processed: r.final, diagnostics: diag,
      noiseSigma: m.noise?.sigma.sigma ?? null, peakCount: m.peaks.length,
      problems: r.runs.filter((x) => x.status === 'error').map((x) => x.message ?? 'a step could not run'),
    });
    columns.push({ id: alt.id, label: alt.label, peaks: m.peaks });
  }
  const limits = { detection: ps.detectionLimit, quantitation: ps.quantitationLimit };
  const full = matchPeaks(columns, { dx: meanStep(raw.x), xUnit: sample.xUnit, limits });
  // Features below the detection limit in every column are noise-level candidates: counted, and carried only when
  // the page asks (a long noisy trace has tens of thousands, and sending them all would stall it).
  const atOrAbove = (r: LedgerRow) => r.cells.some((c) => c.standing === 'detectable' || c.standing === 'quantifiable');
  const kept = request.ledgerNoiseLevel ? full.rows.slice() : full.rows.filter(atOrAbove);
  const ledger: Ledger = { ...full, rows: kept, sentences: kept.flatMap((r) => r.sentences) };
  const noiseLevelRows = full.rows.filter((r) => !atOrAbove(r)).length;
  // Window advice from quantifiable features only: noise bumps that just pass S/N 3 are narrow by nature and would
  // make every window look too wide.
  const dxRaw = meanStep(raw.x);
  const quant = reference.peaks.filter((p) => p.flag === 'quantifiable' && !p.removedByUser);
  const narrowest = quant.length ? Math.min(...quant.map((p) => p.fwhm / dxRaw)) : null;
  const advice: WindowAdviceRow[] = [];
  if (narrowest) {
    for (const st of request.recipe.steps) {
      if (!st.enabled) continue;
      const a = adviceFor(st.step, st.params, narrowest);
      if (a) advice.push({ uid: st.uid, stepLabel: registry.find((d) => d.id === st.step)?.label ?? st.step, advice: a });
    }
  }
  const where = (x: number) => `${x.toPrecision(5)}${sample.xUnit ? ` ${sample.xUnit}` : ''}`;
  const stackName = (col: number) => (col === 1 ? 'the current stack' : `"${columns[col].label}"`);
  /** Quantifiable raw features a stack loses, drops below a limit, or keeps less than 1 − HEIGHT_LOSS_TOLERANCE of: no 'clean' verdict then. */
  const weakenedIn = (col: number): string[] => {
    const out: string[] = [];
    for (const row of full.rows) {
      if (row.firstFoundIn !== 0) continue;
      const ref = row.cells[0], cur = row.cells[col];
      if (ref.standing !== 'quantifiable') continue;
      if (!cur.found) out.push(`The feature at ${where(row.position)} (S/N ${ref.snr?.toFixed(1)} raw) is lost with ${stackName(col)}.`);
      else if (cur.crossed === 'down') out.push(`The feature at ${where(row.position)} falls from quantifiable (S/N ${ref.snr?.toFixed(1)}) to ${cur.standing.replace('-', ' ')} (S/N ${cur.snr?.toFixed(1)}) with ${stackName(col)}.`);
      else if (cur.heightKept !== null && cur.heightKept < 100 * (1 - HEIGHT_LOSS_TOLERANCE)) out.push(`The feature at ${where(row.position)} keeps only ${cur.heightKept.toFixed(0)} % of its raw height with ${stackName(col)}.`);
    }
    return out;
  };
  // The alternatives' verdicts cannot read clean while they weaken a quantifiable feature either.
  outcomes.forEach((o, k) => { if (o.diagnostics) o.diagnostics = combineVerdict(o.diagnostics, weakenedIn(k + 2)); });
  const currentWarnings: string[] = [];
  // Detectable features no higher than what pure noise of this length reaches about once are summed up, not listed.
  const ceiling = noiseBumps?.oneBumpSnr ?? null;
  const withinNoise = (snr: number | null, standing: string) => standing !== 'quantifiable' && ceiling !== null && snr !== null && snr < ceiling;
  let noiseLevelLosses = 0;
  for (const row of full.rows) {
    // Only features present on the raw trace can be lost by the current stack (column 1).
    if (row.firstFoundIn !== 0) continue;
    const ref = row.cells[0], cur = row.cells[1];
    if (ref.standing !== 'quantifiable' && ref.standing !== 'detectable') continue;
    let sentence: string | null = null;
    if (!cur.found) sentence = `The feature at ${where(row.position)} (S/N ${ref.snr?.toFixed(1)} raw) is lost with the current stack.`;
    else if (cur.crossed === 'down') sentence = `The feature at ${where(row.position)} falls from ${ref.standing} (S/N ${ref.snr?.toFixed(1)}) to ${cur.standing.replace('-', ' ')} (S/N ${cur.snr?.toFixed(1)}) with the current stack.`;
    else if (ref.standing === 'quantifiable' && cur.heightKept !== null && cur.heightKept < 100 * (1 - HEIGHT_LOSS_TOLERANCE)) sentence = `The feature at ${where(row.position)} keeps only ${cur.heightKept.toFixed(0)} % of its raw height with the current stack.`;
    if (!sentence) continue;
    if (withinNoise(ref.snr, ref.standing)) noiseLevelLosses++;
    else currentWarnings.push(sentence);
  }
  // Features the raw trace does not have (a spike smoothing spread, a bump smoothing made out of noise).
  let noiseLevelBorn = 0;
  for (const p of main.peaks) {
    if (p.removedByUser || !p.marks.includes('appears-only-after-processing')) continue;
    if (p.flag !== 'quantifiable' && p.flag !== 'detectable') continue;
    if (withinNoise(p.snr, p.flag)) { noiseLevelBorn++; continue; }
    currentWarnings.push(`The feature at ${where(p.x)} (S/N ${p.snr?.toFixed(1)}, ${p.flag === 'quantifiable' ? 'quantifiable' : 'detected'}) appears only after processing: the raw trace has nothing there that passes the same thresholds.`);
  }
  if (noiseLevelLosses + noiseLevelBorn > 0 && ceiling !== null) {
    const parts = [
      noiseLevelLosses ? `${noiseLevelLosses} detectable feature${noiseLevelLosses === 1 ? ' is' : 's are'} lost or weakened` : '',
      noiseLevelBorn ? `${noiseLevelBorn} detectable feature${noiseLevelBorn === 1 ? ' appears' : 's appear'} only after processing` : '',
    ].filter(Boolean);
    currentWarnings.push(`Within the noise range (below S/N ${ceiling.toFixed(1)}, which pure noise of this length reaches about once) ${parts.join(' and ')}; the ledger lists them.`);
  }
  return { ledger, noiseLevelRows, noiseLevelShown: !!request.ledgerNoiseLevel, outcomes, narrowestFwhmPoints: narrowest, advice, currentWarnings, currentWeakened: weakenedIn(1) };
}

function maxAbs(y: Float64Array): number {
  let m = 0;
  for (let i = 0; i < y.length; i++) { const a = Math.abs(y[i]); if (a > m) m = a; }
  return m;
}

/**
 * The residual of a pipeline run: raw − processed on the processed grid,
 * minus what baseline correction and blank subtraction removed on purpose.
 * When it cannot be formed (processed x outside the raw range) it is zero
 * and `ok` is false, with the reason in the note.
 */
function residualOfRun(raw: Signal, run: ReturnType<typeof runPipeline>): { residual: Signal; note?: string; ok: boolean } {
  try {
    const r = residualOf(raw, run.final);
    let note = r.note ?? undefined;
    const removed = deliberateRemovals(raw, run);
    if (removed) {
      const on = removed.x.length === r.x.length ? removed.y : interpolateLinear(removed.x, removed.y, r.x);
      for (let i = 0; i < r.y.length; i++) r.y[i] -= Number.isFinite(on[i]) ? on[i] : 0;
      note = `${note ? `${note} ` : ''}What baseline correction and blank subtraction removed on purpose is left out of the residual, so it shows only what the other steps took away.`;
    }
    return { residual: { x: r.x, y: r.y }, note, ok: true };
  } catch (e) {
    return { residual: { x: run.final.x, y: new Float64Array(run.final.x.length) }, note: `${(e as Error).message} The residual is not shown.`, ok: false };
  }
}

/** Steps whose change to the trace is a deliberate removal, not a loss. */
const DELIBERATE = new Set(['baseline', 'blank-subtraction']);

/**
 * Sum of what the deliberate steps removed (their input minus their output),
 * carried on the grid of the last such step; null when there were none.
 */
function deliberateRemovals(raw: Signal, run: ReturnType<typeof runPipeline>): Signal | null {
  let input: Signal = raw;
  let acc: Signal | null = null;
  for (const r of run.runs) {
    if (r.status !== 'ok' || !r.output) continue;
    const out = r.output;
    if (DELIBERATE.has(r.step) && out.x.length === input.x.length) {
      const d = new Float64Array(out.y.length);
      for (let i = 0; i < d.length; i++) d[i] = input.y[i] - out.y[i];
      if (acc && acc.x.length !== out.x.length) {
        const moved = interpolateLinear(acc.x, acc.y, out.x);
        for (let i = 0; i < d.length; i++) d[i] += Number.isFinite(moved[i]) ? moved[i] : 0;
      } else if (acc) {
        for (let i = 0; i < d.length; i++) d[i] += acc.y[i];
      }
      acc = { x: out.x, y: d };
    }
    input = { x: out.x, y: out.y };
  }
  return acc;
}

/** Run one analysis. `traces` holds every loaded trace by id. */
export function analyse(
  request: AnalyseRequest, traces: ReadonlyMap<string, Trace>, registry: Registry, cache?: PipelineCache,
): AnalyseResult {
  const t0 = Date.now();
  const sample = traces.get(request.sampleId);
  if (!sample) throw new Error(`No trace with id ${request.sampleId}`);
  const ctx: StepContext = {
    blank: request.blankId ? traces.get(request.blankId) : undefined,
    scans: request.scanIds.map((id) => traces.get(id)).filter((t): t is Trace => t !== undefined),
  };
  const raw: Signal = { x: sample.x, y: sample.y };
  const run = runPipeline(raw, sample.id, request.recipe, registry, ctx, cache);
  const { residual, note } = residualOfRun(raw, run);
  const processedSomething = run.runs.some((r) => r.status === 'ok');
  const residualTests = processedSomething && residual.y.length >= 3 ? residualDiagnostics(residual.y, maxAbs(raw.y)) : null;
  const runs: StepRunSummary[] = run.runs.map((r) => ({
    uid: r.uid, step: r.step, status: r.status, message: r.message,
    notes: r.output?.notes ?? [], figures: r.output?.figures, cached: r.cached, ms: r.ms,
    points: r.output?.y.length ?? 0, eventCount: r.output?.events?.length ?? 0, events: r.output?.events, extra: r.output?.extra,
  }));
  let intermediate: Signal | null = null;
  if (request.showUid) {
    const hit = run.runs.find((r) => r.uid === request.showUid && r.output);
    if (hit?.output) intermediate = { x: hit.output.x, y: hit.output.y };
  }
  const ps = request.peaks ?? DEFAULT_PEAK_SETTINGS;
  const measured = ps.measureOn === 'raw' ? raw : run.final;
  const main = measurePeaks(measured, raw, request.noise ?? DEFAULT_NOISE_SETTINGS, ps, ctx, stackOf(run, request.recipe, registry, ctx, sample.id), request.decisions);
  // The raw trace's own table: for the marks below and the loss check, which run only when something processed it
  // or alternatives are asked for.
  const reference = processedSomething || (request.alternatives?.length ?? 0) > 0 ? rawReference(request, raw, ctx) : main;
  if (measured !== raw && processedSomething) {
    // What the raw trace does not have, and tops flat at the raw trace's largest value (smoothing rounds them).
    main.peaks = markSaturatedOnRaw(markAppearsOnlyAfterProcessing(main.peaks, reference.peaks, meanStep(raw.x)), raw.x, raw.y, ps.negative);
  }
  if (ctx.blank && main.peakOptions) main.peaks = markGhostPeaks(main.peaks, pharmacopoeialBlank(measured, raw, ctx, stackOf(run, request.recipe, registry, ctx, sample.id))!, main.peakOptions, meanStep(measured.x)); // issue 20: ghost peaks
  const noiseBumps = main.peakOptions && main.peakOptions.noiseSigma > 0
    ? expectedNoiseBumps(measured.y.length, meanStep(measured.x), main.peakOptions, main.noise?.measuredRho)
    : null;
  const loss = lossCheck(request, raw, sample, run, main, reference, noiseBumps, ctx, registry, cache);
  const diagnostics = residualTests && loss ? combineVerdict(residualTests, loss.currentWeakened) : residualTests;
  return {
    noise: main.noise, peaks: main.peaks, peakOptions: main.peakOptions, peakProblem: main.peakProblem, noiseBumps, diagnostics, loss,
    sampleId: sample.id, processed: run.final, residual, residualNote: note, baseline: run.baseline,
    intermediate, runs, events: run.events, ms: Date.now() - t0,
  };
}
