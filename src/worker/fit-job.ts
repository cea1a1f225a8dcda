/**
 * The fit job (issue 18), run by the computation worker beside the analysis:
 * the versions of the sample (raw, the current stack's output, the loss
 * check's alternatives) come from the same cached pipeline, then the pure
 * core fits the region (core/measure/fit/job.ts). Kept apart from the
 * analysis so the two evolve separately.
 */
import type { AlternativeRequest } from '../core/analysis/index.ts';
import { runFitJob, type FitJobOutcome, type FitSettings, type FitVersion } from '../core/measure/fit/job.ts';
import type { PeakStart } from '../core/measure/fit/region.ts';
import { runPipeline, type PipelineCache } from '../core/pipeline.ts';
import type { Recipe, Registry } from '../core/method.ts';
import type { StepContext } from '../core/steps/types.ts';
import type { Trace } from '../core/trace.ts';

export interface FitRequest {
  sampleId: string;
  blankId?: string;
  scanIds: string[];
  /** The current stack. */
  recipe: Recipe;
  /** The loss check's alternatives; each is fitted for the processing check. */
  alternatives?: AlternativeRequest[];
  settings: FitSettings;
  /** Starting peaks, e.g. the peak table's rows inside the region. */
  starts?: PeakStart[];
}

export type { FitJobOutcome };

/** Label of the current stack's output in every sentence. */
export const CURRENT_LABEL = 'the current stack';

/** Run a fit request against the traces the worker holds. */
export function fitRequest(request: FitRequest, traces: ReadonlyMap<string, Trace>, registry: Registry, cache?: PipelineCache): FitJobOutcome {
  const sample = traces.get(request.sampleId);
  if (!sample) return { ok: false, message: 'The trace to fit is not loaded any more.' };
  const ctx: StepContext = {
    blank: request.blankId ? traces.get(request.blankId) : undefined,
    scans: request.scanIds.map((id) => traces.get(id)).filter((t): t is Trace => t !== undefined),
  };
  const raw = { x: sample.x, y: sample.y };
  const version = (label: string, recipe: Recipe): FitVersion | undefined => {
    const run = runPipeline(raw, sample.id, recipe, registry, ctx, cache);
    if (!run.runs.some((r) => r.status === 'ok')) return undefined;
    return { label, x: run.final.x, y: run.final.y };
  };
  const processed = version(CURRENT_LABEL, request.recipe);
  const alternatives = (request.alternatives ?? []).map((a) => version(a.label, a.recipe)).filter((v): v is FitVersion => v !== undefined);
  if (request.settings.on === 'processed' && !processed) {
    return { ok: false, message: 'No processing step ran, so there is no processed trace to fit; fit the raw trace, or add a step.' };
  }
  return runFitJob({ settings: request.settings, raw: { label: 'raw', ...raw }, processed, alternatives, starts: request.starts });
}
