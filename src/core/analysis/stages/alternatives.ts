/**
 * One job per alternative stack: run it, measure noise and peaks with the
 * same settings as the current stack, and test its residual. Kept per trace
 * and settings (memo): moving the current stack's slider changes none of it.
 */
import type { PipelineCache } from '../../pipeline.ts';
import type { Registry } from '../../method.ts';
import type { Signal, StepContext } from '../../steps/types.ts';
import { residualDiagnostics } from '../../measure/residual-tests.ts';
import type { AlternativeMeasured, AnalysisMemo } from '../memo.ts';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, type AlternativeRequest, type AnalyseRequest } from '../request.ts';
import { measurePeaksStepwise } from './measure.ts';
import type { Stepwise } from '../pause.ts';
import { processSample, stackOf } from './process.ts';
import { rawScaleOf, residualOfRun } from './residual.ts';

/** Pauses inside detection (pause.ts); kept in the memo only when finished. */
export function measureAlternative(
  request: AnalyseRequest, alt: AlternativeRequest, raw: Signal, ctx: StepContext, registry: Registry, memo: AnalysisMemo, cache?: PipelineCache,
): Stepwise<AlternativeMeasured> {
  const ps = { ...(request.peaks ?? DEFAULT_PEAK_SETTINGS), measureOn: 'processed' as const };
  const noiseSettings = request.noise ?? DEFAULT_NOISE_SETTINGS;
  const key = JSON.stringify([alt.id, alt.label, alt.recipe.steps, noiseSettings, ps, request.blankId ?? null, request.scanIds]);
  return memo.alternatives.getStepwise(request.sampleId, raw.y, key, function* () {
    const r = processSample(raw, request.sampleId, alt.recipe, registry, ctx, cache);
    const measured = yield* measurePeaksStepwise(r.final, raw, noiseSettings, ps, ctx, stackOf(r, alt.recipe, registry, ctx, request.sampleId));
    const res = residualOfRun(raw, r);
    const diag = res.ok && r.runs.some((x) => x.status === 'ok') ? residualDiagnostics(res.residual.y, rawScaleOf(raw.y)) : null;
    return {
      measured,
      outcome: {
        id: alt.id, label: alt.label, processed: r.final, diagnostics: diag,
        noiseSigma: measured.noise?.sigma.sigma ?? null, peakCount: measured.peaks.length,
        problems: r.runs.filter((x) => x.status === 'error').map((x) => x.message ?? 'a step could not run'),
      },
    };
  });
}
