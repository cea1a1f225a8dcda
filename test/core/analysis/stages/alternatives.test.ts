// One alternative stack measured (src/core/analysis/stages/alternatives.ts): run,
// measured with the same settings, residual tested, kept per trace and settings.
import { describe, expect, it } from 'vitest';
import { measureAlternative } from '../../../../src/core/analysis/stages/alternatives.ts';
import { measurePeaks } from '../../../../src/core/analysis/stages/measure.ts';
import { processSample, stackOf } from '../../../../src/core/analysis/stages/process.ts';
import { AnalysisMemo } from '../../../../src/core/analysis/memo.ts';
import { drain } from '../../../../src/core/analysis/pause.ts';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, type AnalyseRequest } from '../../../../src/core/analysis/request.ts';
import { emptyRecipe } from '../../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../../src/core/steps/registry.ts';
import { recipeOf, synthetic } from '../fixture.ts';

const t = synthetic(5);
const request: AnalyseRequest = { sampleId: t.id, scanIds: [], recipe: emptyRecipe() };

describe('measureAlternative', () => {
  it('measures the alternative stack as the current one would be measured, with its residual tested', () => {
    const alt = { id: 'ma9', label: '9-point moving average', recipe: recipeOf(['moving-average', { window: 9 }]) };
    const memo = new AnalysisMemo();
    const got = drain(measureAlternative(request, alt, t, {}, STEP_REGISTRY, memo));
    const run = processSample(t, t.id, alt.recipe, STEP_REGISTRY, {});
    const direct = measurePeaks(run.final, t, DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, {}, stackOf(run, alt.recipe, STEP_REGISTRY, {}, t.id));
    expect(got.outcome.id).toBe('ma9');
    expect(got.outcome.label).toBe('9-point moving average');
    expect(got.outcome.peakCount).toBe(direct.peaks.length);
    expect(got.outcome.noiseSigma).toBeCloseTo(direct.noise!.sigma.sigma, 12);
    expect(got.outcome.diagnostics).not.toBeNull();
    expect(got.outcome.problems).toEqual([]);
    expect(Array.from(got.outcome.processed.y)).toEqual(Array.from(run.final.y));
    expect(drain(measureAlternative(request, alt, t, {}, STEP_REGISTRY, memo))).toBe(got);
  });

  it('a step that cannot run is named among the problems', () => {
    const alt = { id: 'bad', label: 'window too large', recipe: recipeOf(['moving-average', { window: 100001 }]) };
    const got = drain(measureAlternative(request, alt, t, {}, STEP_REGISTRY, new AnalysisMemo()));
    expect(got.outcome.problems.length).toBe(1);
    expect(got.outcome.diagnostics).toBeNull();
  });
});
