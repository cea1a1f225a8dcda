// Window advice rows (src/core/analysis/stages/advice.ts). Source for the value:
// an 11-point moving average keeps 0.831139 of a σ = 5-point Gaussian's height
// (REFERENCES.md; (1/11)·Σ_{j=−5}^{5} exp(−j²/50)).
import { describe, expect, it } from 'vitest';
import { windowAdviceRows } from '../../../../src/core/analysis/stages/advice.ts';
import { STEP_REGISTRY, stepDefinition } from '../../../../src/core/steps/registry.ts';
import { points } from '../../../../src/core/units.ts';
import { recipeOf } from '../fixture.ts';

const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

describe('windowAdviceRows', () => {
  it('one row per enabled smoothing step with a window; the moving average keeps 0.831139 of a σ = 5-point Gaussian', () => {
    const recipe = recipeOf(['moving-average', { window: 11 }], ['savitzky-golay', { window: 11, order: 2 }], ['boxcar', { size: 4 }], ['savitzky-golay', { window: 11, order: 2, derivative: 1 }]);
    const rows = windowAdviceRows(recipe, STEP_REGISTRY, points(5 * FWHM_PER_SIGMA));
    // The boxcar has no window and the derivative filter smooths nothing: no rows for them.
    expect(rows.map((r) => r.stepLabel)).toEqual([stepDefinition('moving-average')!.label, stepDefinition('savitzky-golay')!.label]);
    expect(rows[0].uid).toBe(recipe.steps[0].uid);
    expect(rows[0].advice.expectedHeightKept).toBeCloseTo(0.831139, 5);
    expect(rows[0].advice.ratio).toBeCloseTo(11 / (5 * FWHM_PER_SIGMA), 12);
  });

  it('nothing without a narrowest peak, and nothing for a disabled step', () => {
    const recipe = recipeOf(['moving-average', { window: 11 }]);
    expect(windowAdviceRows(recipe, STEP_REGISTRY, null)).toEqual([]);
    recipe.steps[0].enabled = false;
    expect(windowAdviceRows(recipe, STEP_REGISTRY, points(10))).toEqual([]);
  });
});
