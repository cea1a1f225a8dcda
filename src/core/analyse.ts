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
import { residual as residualOf, residualDiagnostics, type ResidualDiagnostics } from './diagnostics.ts';
import { noisePeakToPeak, noiseRms, noiseRobust, type NoiseEstimate } from './noise.ts';
import { noiseWindowsMedian } from './noise-windows.ts';
import { applyPeakDecisions, defaultPeakOptions, detectPeaks, type Peak, type PeakDecisions, type PeakOptions, type SnrDefinition } from './peaks.ts';

/**
 * How noise is measured for S/N = H/σ: 'windows' (automatic, median of
 * local SDs; valid after smoothing), 'rms' (about a line over the quiet
 * range the user marked), 'robust' (point-to-point differences; white noise
 * only, so raw traces only).
 */
export type NoiseMethod = 'windows' | 'rms' | 'robust';

export interface NoiseSettings {
  method: NoiseMethod;
  /** Quiet baseline range the user marked (x-units); needed by 'rms' and for the peak-to-peak figure. */
  quietRange: [number, number] | null;
}

/** Peak thresholds as the user sets them; prominence in multiples of σ so it scales with the data. */
export interface PeakSettings {
  /** 'processed' (default) or 'raw': the trace peaks and noise are measured on. */
  measureOn: 'processed' | 'raw';
  minProminenceSigma: number;
  minSnr: number;
  /** x-units; 0 = three sample spacings. */
  minWidth: number;
  /** x-units; 0 = off. */
  minSeparation: number;
  snrDefinition: SnrDefinition;
  pharmacopoeialMultiplier: number;
  negative: boolean;
  detectionLimit: number;
  quantitationLimit: number;
}

export const DEFAULT_NOISE_SETTINGS: NoiseSettings = { method: 'windows', quietRange: null };

export const DEFAULT_PEAK_SETTINGS: PeakSettings = {
  measureOn: 'processed', minProminenceSigma: 2, minSnr: 2, minWidth: 0, minSeparation: 0,
  snrDefinition: 'rms', pharmacopoeialMultiplier: 5, negative: false, detectionLimit: 3, quantitationLimit: 10,
};

export interface NoiseReport {
  /** σ used for H/σ on the measured trace. */
  sigma: NoiseEstimate;
  /** The same estimator on the raw trace, so the user sees what smoothing did to the noise. */
  rawSigma: NoiseEstimate | null;
  /** Peak-to-peak range over the quiet range, when one is marked. */
  peakToPeak: NoiseEstimate | null;
  /** Sentences: fallbacks and problems. */
  notes: string[];
}

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
  ms: number;
}

/** Measure noise on `sig` by the chosen method; `raw` gives the comparison figure. */
export function measureNoise(sig: Signal, raw: Signal, settings: NoiseSettings): NoiseReport {
  const notes: string[] = [];
  const pick = (s: Signal): NoiseEstimate | null => {
    if (settings.method === 'rms') {
      if (settings.quietRange) {
        const r = noiseRms(s.x, s.y, settings.quietRange[0], settings.quietRange[1]);
        if (r.ok) return r;
        notes.push(`${r.message} The automatic estimate is used instead.`);
      } else {
        notes.push('No quiet baseline range is marked, so the automatic estimate is used. Mark a range on the plot to use the RMS about a line.');
      }
    }
    if (settings.method === 'robust') {
      if (s !== raw) notes.push('Point-to-point differences assume white noise; on a smoothed trace they understate σ and overstate S/N. Prefer the automatic estimate or a quiet range.');
      const r = noiseRobust(s.y);
      if (r.ok) return r;
    }
    const w = noiseWindowsMedian(s.x, s.y);
    if (w.ok) return w;
    const r = noiseRobust(s.y);
    if (r.ok) { notes.push(`${w.message} The point-to-point estimate is used.`); return r; }
    return null;
  };
  const sigma = pick(sig);
  const before = notes.length;
  const rawSigma = sig === raw ? sigma : pick(raw);
  notes.length = before; // fallback sentences for the raw comparison would repeat the same advice
  let peakToPeak: NoiseEstimate | null = null;
  if (settings.quietRange) {
    const r = noisePeakToPeak(sig.x, sig.y, settings.quietRange[0], settings.quietRange[1]);
    if (r.ok) peakToPeak = r; else notes.push(r.message);
  }
  if (!sigma) throw new Error('noise could not be estimated on a valid trace');
  return { sigma, rawSigma, peakToPeak, notes };
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
  let residual: Signal;
  let note: string | undefined;
  try {
    const r = residualOf(raw, run.final);
    residual = { x: r.x, y: r.y };
    note = r.note ?? undefined;
    const removed = deliberateRemovals(raw, run);
    if (removed) {
      const on = removed.x.length === r.x.length ? removed.y : interpolateLinear(removed.x, removed.y, r.x);
      const y = new Float64Array(r.y.length);
      for (let i = 0; i < y.length; i++) y[i] = r.y[i] - (Number.isFinite(on[i]) ? on[i] : 0);
      residual = { x: r.x, y };
      note = `${note ? `${note} ` : ''}What baseline correction and blank subtraction removed on purpose is left out of the residual, so it shows only what the other steps took away.`;
    }
  } catch (e) {
    residual = { x: run.final.x, y: new Float64Array(run.final.x.length) };
    note = `${(e as Error).message} The residual is not shown.`;
  }
  const processedSomething = run.runs.some((r) => r.status === 'ok');
  const diagnostics = processedSomething && residual.y.length >= 3 ? residualDiagnostics(residual.y) : null;
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
  let noise: NoiseReport | null = null;
  let peaks: Peak[] = [];
  let peakOptions: PeakOptions | null = null;
  let peakProblem: string | undefined;
  const ps = request.peaks ?? DEFAULT_PEAK_SETTINGS;
  const measured = ps.measureOn === 'raw' ? raw : run.final;
  if (measured.y.length >= 5) {
    noise = measureNoise(measured, raw, request.noise ?? DEFAULT_NOISE_SETTINGS);
    const sigma = noise.sigma.sigma;
    if (!(sigma > 0)) {
      peakProblem = 'The noise is zero (the trace is perfectly smooth or constant), so S/N cannot be measured. Mark a quiet range with some noise, or measure on the raw trace.';
    } else {
      const dx = meanStep(measured.x);
      const base = defaultPeakOptions(sigma, dx);
      peakOptions = {
        ...base,
        minProminence: ps.minProminenceSigma * sigma,
        minSnr: ps.minSnr,
        minWidth: ps.minWidth > 0 ? ps.minWidth : base.minWidth,
        minSeparation: ps.minSeparation,
        snrDefinition: ps.snrDefinition,
        pharmacopoeialMultiplier: ps.pharmacopoeialMultiplier,
        negative: ps.negative,
        limits: { detection: ps.detectionLimit, quantitation: ps.quantitationLimit },
        pharmacopoeialNoise: ctx.blank ? { x: ctx.blank.x, y: ctx.blank.y, fromBlank: true } : undefined,
      };
      try {
        peaks = detectPeaks(measured.x, measured.y, peakOptions);
        const d = request.decisions;
        if (d && (d.added.length || d.removed.length)) peaks = applyPeakDecisions(peaks, d, measured.x, measured.y, peakOptions);
      } catch (e) {
        peakProblem = (e as Error).message;
        peaks = [];
      }
    }
  }
  return {
    noise, peaks, peakOptions, peakProblem, diagnostics,
    sampleId: sample.id, processed: run.final, residual, residualNote: note, baseline: run.baseline,
    intermediate, runs, events: run.events, ms: Date.now() - t0,
  };
}
