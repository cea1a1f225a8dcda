/** Stage 1: run the recipe on the sample (outputs cached per step by the pipeline cache). */
import { runPipeline, type PipelineCache, type PipelineResult } from '../../pipeline.ts';
import type { Recipe, Registry } from '../../method.ts';
import type { Signal, StepContext } from '../../steps/types.ts';
import type { StackRun } from '../../measure/noise-report.ts';
import type { StepRunSummary } from '../result.ts';

export function processSample(raw: Signal, sampleId: string, recipe: Recipe, registry: Registry, ctx: StepContext, cache?: PipelineCache): PipelineResult {
  return runPipeline(raw, sampleId, recipe, registry, ctx, cache);
}

/** What the step panel shows of each step's run. */
export function runSummaries(run: PipelineResult): StepRunSummary[] {
  return run.runs.map((r) => ({
    uid: r.uid, step: r.step, status: r.status, message: r.message,
    notes: r.output?.notes ?? [], figures: r.output?.figures, cached: r.cached, ms: r.ms,
    points: r.output?.y.length ?? 0, eventCount: r.output?.events?.length ?? 0, events: r.output?.events, extra: r.output?.extra,
  }));
}

/** The output of the step the page asked to draw as well, if it ran. */
export function intermediateOf(run: PipelineResult, showUid: string | null | undefined): Signal | null {
  if (!showUid) return null;
  const hit = run.runs.find((r) => r.uid === showUid && r.output);
  return hit?.output ? { x: hit.output.x, y: hit.output.y } : null;
}

/** The stack as the noise measure needs it to carry the raw noise through by simulation. */
export function stackOf(run: PipelineResult, recipe: Recipe, registry: Registry, ctx: StepContext, sampleId: string): StackRun {
  return { run, recipe, registry, ctx, cacheKey: sampleId };
}

/** True when at least one step ran. */
export function processedSomething(run: PipelineResult): boolean {
  return run.runs.some((r) => r.status === 'ok');
}
