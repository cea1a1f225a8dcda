// Stage 1 (src/core/analysis/stages/process.ts): run the recipe, summarise each
// step's run, hand out an intermediate output, and say whether anything ran.
// The 5-point moving average is checked against its definition by hand.
import { describe, expect, it } from 'vitest';
import { intermediateOf, processSample, processedSomething, runSummaries, stackOf } from '../../../../src/core/analysis/stages/process.ts';
import { emptyRecipe } from '../../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../../src/core/steps/registry.ts';
import { recipeOf, synthetic } from '../fixture.ts';

const t = synthetic(1, 300);

describe('processSample and what the step panel sees', () => {
  it('a 5-point moving average: the interior is the mean of 5 raw points; one summary per step', () => {
    const recipe = recipeOf(['moving-average', { window: 5 }], ['boxcar', { size: 2 }]);
    const run = processSample(t, t.id, recipe, STEP_REGISTRY, {});
    const s = runSummaries(run);
    expect(s.map((r) => [r.step, r.status])).toEqual([['moving-average', 'ok'], ['boxcar', 'ok']]);
    expect(s[0].points).toBe(300);
    expect(s[1].points).toBe(150);
    const first = intermediateOf(run, recipe.steps[0].uid)!;
    const i = 100;
    expect(first.y[i]).toBeCloseTo((t.y[i - 2] + t.y[i - 1] + t.y[i] + t.y[i + 1] + t.y[i + 2]) / 5, 12);
    expect(intermediateOf(run, null)).toBeNull();
    expect(intermediateOf(run, 'no-such-uid')).toBeNull();
    expect(processedSomething(run)).toBe(true);
    const stack = stackOf(run, recipe, STEP_REGISTRY, {}, t.id);
    expect(stack.run).toBe(run);
    expect(stack.cacheKey).toBe(t.id);
  });

  it('an empty recipe processes nothing and hands the raw trace on', () => {
    const run = processSample(t, t.id, emptyRecipe(), STEP_REGISTRY, {});
    expect(processedSomething(run)).toBe(false);
    expect(runSummaries(run)).toEqual([]);
    expect(run.final.y).toEqual(t.y);
  });
});
