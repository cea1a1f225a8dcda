/**
 * The raw trace measured with the user's settings (hand decisions left out):
 * the loss check's reference column and what "appears only after processing"
 * is judged against. Worked out once per trace and settings (memo).
 */
import type { Signal, StepContext } from '../../steps/types.ts';
import type { AnalysisMemo } from '../memo.ts';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, type AnalyseRequest } from '../request.ts';
import { measurePeaksStepwise, type Measured } from './measure.ts';
import type { Stepwise } from '../pause.ts';

/** Pauses inside detection (pause.ts); kept in the memo only when finished. */
export function rawReferenceStepwise(request: AnalyseRequest, raw: Signal, ctx: StepContext, memo: AnalysisMemo): Stepwise<Measured> {
  const ps = { ...(request.peaks ?? DEFAULT_PEAK_SETTINGS), measureOn: 'processed' as const };
  const noiseSettings = request.noise ?? DEFAULT_NOISE_SETTINGS;
  const key = JSON.stringify([noiseSettings, ps, ctx.blank?.id ?? null]);
  return memo.reference.getStepwise(request.sampleId, raw.y, key, () => measurePeaksStepwise(raw, raw, noiseSettings, ps, ctx, null));
}
