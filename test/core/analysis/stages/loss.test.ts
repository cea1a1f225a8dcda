// The loss check's last step (src/core/analysis/stages/loss.ts): raw, current
// stack and alternatives matched into one ledger, with sentences. Sources: a
// moving average of w points keeps (1/w)·Σ exp(−j²/2σ²) of a Gaussian's height
// (definition; REFERENCES.md lists 0.831139 for w = 11, σ = 5), so a 101-point
// average keeps about σ√(2π)/101 ≈ 0.25 of a σ = 10-point peak: quantifiable on the raw trace,
// lost or weakened after it.
import { describe, expect, it } from 'vitest';
import { lossReport } from '../../../../src/core/analysis/stages/loss.ts';
import { measurePeaks } from '../../../../src/core/analysis/stages/measure.ts';
import { processSample, stackOf } from '../../../../src/core/analysis/stages/process.ts';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, type AnalyseRequest } from '../../../../src/core/analysis/request.ts';
import { emptyRecipe } from '../../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../../src/core/steps/registry.ts';
import { recipeOf, synthetic } from '../fixture.ts';

const t = synthetic(6);
const reference = measurePeaks(t, t, DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, {}, null);

function measuredWith(recipe: ReturnType<typeof recipeOf>) {
  const run = processSample(t, t.id, recipe, STEP_REGISTRY, {});
  return measurePeaks(run.final, t, DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, {}, stackOf(run, recipe, STEP_REGISTRY, {}, t.id));
}

describe('lossReport', () => {
  it('no processing: raw and current agree, nothing is lost or weakened', () => {
    const request: AnalyseRequest = { sampleId: t.id, scanIds: [], recipe: emptyRecipe() };
    const r = lossReport(request, t, t, reference, reference, reference, [], null, STEP_REGISTRY);
    expect(r.currentWarnings).toEqual([]);
    expect(r.currentWeakened).toEqual([]);
    expect(r.ledger.rows.length).toBeGreaterThanOrEqual(2);
    expect(r.outcomes).toEqual([]);
  });

  it('a 101-point average: the narrow quantifiable peak at 14 is named as lost or weakened, and the window gets advice', () => {
    // Small peak: σ = 0.1 x-units = 10 points, height 0.8, raw S/N ≈ 8 — check it is on the raw trace first.
    const raw14 = reference.peaks.find((p) => Math.abs(p.x - 14) < 0.05);
    expect(raw14).toBeDefined();
    const recipe = recipeOf(['moving-average', { window: 101 }]);
    const current = measuredWith(recipe);
    const request: AnalyseRequest = { sampleId: t.id, scanIds: [], recipe };
    const r = lossReport(request, t, t, current, current, reference, [], null, STEP_REGISTRY);
    // The tall peak (σ = 15 points) is quantifiable on the raw trace and keeps ≈ 15·√(2π)/101 ≈ 0.37 of its height: named in the warnings.
    expect(r.currentWarnings.some((s) => /7\.00\d*/.test(s) && /(keeps only|lost|falls)/.test(s))).toBe(true);
    expect(r.currentItems?.length).toBe(r.currentWarnings.length);
    // The narrowest quantifiable raw peak sets the advice; the window is many times its width.
    expect(r.narrowestFwhmPoints).not.toBeNull();
    expect(r.advice).toHaveLength(1);
    expect(r.advice[0].advice.ratio).toBeGreaterThan(2);
  });

  it('rows below the detection limit in every column are counted, and carried only when asked', () => {
    const request: AnalyseRequest = { sampleId: t.id, scanIds: [], recipe: emptyRecipe() };
    const hidden = lossReport(request, t, t, reference, reference, reference, [], null, STEP_REGISTRY);
    const shown = lossReport({ ...request, ledgerNoiseLevel: true }, t, t, reference, reference, reference, [], null, STEP_REGISTRY);
    expect(shown.ledger.rows.length).toBe(hidden.ledger.rows.length + hidden.noiseLevelRows);
    expect(shown.noiseLevelShown).toBe(true);
    expect(hidden.noiseLevelShown).toBe(false);
  });
});
