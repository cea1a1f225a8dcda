/**
 * One analysis pass: run the recipe on the sample, form the residual, and
 * (as the modules land) measure noise, find peaks and compare alternatives.
 * Pure: the worker calls it, and so do tests and benchmarks in Node.
 */
import { PipelineCache, runPipeline, type StepStatus } from './pipeline.ts';
import type { Recipe, Registry } from './recipe.ts';
import type { Signal, SpikeEvent, StepContext } from './steps/types.ts';
import type { Trace } from './trace.ts';
import { interpolateLinear } from './numeric/interpolate.ts';

export interface AnalyseRequest {
  sampleId: string;
  blankId?: string;
  scanIds: string[];
  recipe: Recipe;
  /** uid of a step whose output the page wants to draw as well. */
  showUid?: string | null;
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
  baseline?: Float64Array;
  intermediate?: Signal | null;
  runs: StepRunSummary[];
  events: SpikeEvent[];
  ms: number;
}

/** Residual raw − processed on the processed grid (raw interpolated when the grids differ). */
export function residualOf(raw: Signal, processed: Signal): { residual: Signal; note?: string } {
  const n = processed.x.length;
  const r = new Float64Array(n);
  let same = raw.x.length === n;
  if (same) for (let i = 0; i < n; i++) if (raw.x[i] !== processed.x[i]) { same = false; break; }
  if (same) {
    for (let i = 0; i < n; i++) r[i] = raw.y[i] - processed.y[i];
    return { residual: { x: processed.x, y: r } };
  }
  const rawOn = interpolateLinear(raw.x, raw.y, processed.x);
  for (let i = 0; i < n; i++) r[i] = Number.isFinite(rawOn[i]) ? rawOn[i] - processed.y[i] : 0;
  return { residual: { x: processed.x, y: r }, note: 'The processed trace has a different x grid, so the raw trace was interpolated linearly onto it to form the residual.' };
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
  const { residual, note } = residualOf(raw, run.final);
  const runs: StepRunSummary[] = run.runs.map((r) => ({
    uid: r.uid, step: r.step, status: r.status, message: r.message,
    notes: r.output?.notes ?? [], figures: r.output?.figures, cached: r.cached, ms: r.ms,
    points: r.output?.y.length ?? 0, eventCount: r.output?.events?.length ?? 0, extra: r.output?.extra,
  }));
  let intermediate: Signal | null = null;
  if (request.showUid) {
    const hit = run.runs.find((r) => r.uid === request.showUid && r.output);
    if (hit?.output) intermediate = { x: hit.output.x, y: hit.output.y };
  }
  return {
    sampleId: sample.id, processed: run.final, residual, residualNote: note, baseline: run.baseline,
    intermediate, runs, events: run.events, ms: Date.now() - t0,
  };
}
