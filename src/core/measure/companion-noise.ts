/**
 * The blank that the pharmacopoeial S/N (2H/h) takes h from (issue 20).
 *
 * H is measured on the processed trace, so h must come from the blank
 * processed by the same stack: a raw blank beside a smoothed sample mixes
 * two noise levels (on the demo after a 41-point Savitzky–Golay, 2H/h read
 * 0.197 against H/σ 3.29). The pipeline carries the blank through every
 * step (src/core/pipeline.ts); a trace measured raw keeps the raw blank.
 * Without a blank there is nothing here, and h comes from the trace itself,
 * labelled as a deviation from the pharmacopoeial procedure (peak-snr.ts).
 */
import type { PipelineResult } from '../pipeline.ts';
import type { Signal, StepContext } from '../steps/types.ts';

/**
 * @param measured the trace peaks are measured on (processed, or raw itself)
 * @param raw the raw sample
 * @param ctx the raw blank and scans
 * @param stack the run that made `measured`, when it is processed
 */
export function pharmacopoeialBlank(
  measured: Signal, raw: Signal, ctx: StepContext, stack: { run: PipelineResult } | null,
): { x: Float64Array; y: Float64Array; fromBlank: true } | undefined {
  if (!ctx.blank) return undefined;
  const b = measured !== raw && stack ? stack.run.companions.blank ?? ctx.blank : ctx.blank;
  return { x: b.x, y: b.y, fromBlank: true };
}
