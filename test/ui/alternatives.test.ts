import { describe, expect, it } from 'vitest';
import { emptyRecipe, makeRecipeStep, type Recipe } from '../../src/core/method.ts';
import { stepDefinition } from '../../src/core/steps/registry.ts';
import { MOVING_AVERAGE_MAX_WINDOW } from '../../src/core/steps/moving-average.ts';
import { PRESETS, presetAlternative, SMOOTHING_STEPS, windowVariants } from '../../src/ui/alternatives.ts';

// src/ui/alternatives.ts: one-click alternative stacks for the loss check.
const def = (id: string) => { const d = stepDefinition(id); if (!d) throw new Error(id); return d; };
function stack(...steps: [string, Record<string, number>?][]): Recipe {
  return { ...emptyRecipe(), steps: steps.map(([id, p]) => makeRecipeStep(def(id), p)) };
}

describe('PRESETS', () => {
  it('every preset names a registered smoothing step with parameters the step accepts', () => {
    for (const p of PRESETS) {
      const d = def(p.step);
      expect(SMOOTHING_STEPS.has(p.step)).toBe(true);
      for (const [k, v] of Object.entries(p.params)) {
        const spec = d.params.find((s) => s.key === k);
        expect(spec, `${p.label}: ${k}`).toBeDefined();
        if (spec?.kind === 'int') { expect(v).toBeGreaterThanOrEqual(spec.min); expect(v).toBeLessThanOrEqual(spec.max); if (spec.odd) expect(Number(v) % 2).toBe(1); }
      }
    }
  });
  it('labels say the window and (Savitzky–Golay) the order the parameters hold', () => {
    for (const p of PRESETS) {
      expect(p.label).toContain(String(p.params.window));
      if (p.params.order !== undefined) expect(p.label).toContain(`order ${p.params.order}`);
    }
  });
});

describe('presetAlternative', () => {
  it('keeps the current corrections, replaces the current smoother with the preset’s, and says so', () => {
    const recipe = stack(['baseline'], ['moving-average', { window: 9 }]);
    const alt = presetAlternative(recipe, PRESETS[2])!;
    expect(alt.recipe.steps.map((s) => s.step)).toEqual(['baseline', 'savitzky-golay']);
    expect(alt.recipe.steps[1].params).toMatchObject({ window: 11, order: 2 });
    expect(alt.label).toBe('Savitzky–Golay 11 points, order 2 after the current corrections');
  });
  it('on a stack with no corrections the label is the preset’s alone', () => {
    const alt = presetAlternative(stack(['moving-average', { window: 9 }]), PRESETS[0])!;
    expect(alt.recipe.steps.map((s) => s.step)).toEqual(['moving-average']);
    expect(alt.label).toBe('3-point moving average');
  });
  it('never changes the current stack (new uids, copied parameters)', () => {
    const recipe = stack(['baseline'], ['moving-average', { window: 9 }]);
    const before = JSON.stringify(recipe);
    const alt = presetAlternative(recipe, PRESETS[0])!;
    alt.recipe.steps[0].params.x = 1;
    expect(JSON.stringify(recipe)).toBe(before);
    expect(alt.recipe.steps[0].uid).not.toBe(recipe.steps[0].uid);
  });
  it('an unknown step gives null, not a broken stack', () => {
    expect(presetAlternative(stack(), { label: 'x', step: 'no-such-step', params: {} })).toBeNull();
  });
});

describe('windowVariants', () => {
  it('halves and doubles the window, rounded to odd, the rest of the stack kept', () => {
    const recipe = stack(['baseline'], ['moving-average', { window: 9 }]);
    const v = windowVariants(recipe, recipe.steps[1].uid);
    expect(v.map((a) => a.recipe.steps[1].params.window)).toEqual([5, 19]); // 4.5 → 5 (odd); 18 → 19
    expect(v.map((a) => a.recipe.steps.map((s) => s.step))).toEqual([['baseline', 'moving-average'], ['baseline', 'moving-average']]);
    expect(v[0].label).toContain('window 5 (current stack otherwise)');
    expect(recipe.steps[1].params.window).toBe(9);
  });
  it('leaves out a variant outside the step’s limits or equal to the current window', () => {
    const small = stack(['moving-average', { window: 3 }]);
    expect(windowVariants(small, small.steps[0].uid).map((a) => a.recipe.steps[0].params.window)).toEqual([7]); // 1.5 → 3 = current; 6 → 7
    const big = stack(['moving-average', { window: MOVING_AVERAGE_MAX_WINDOW % 2 ? MOVING_AVERAGE_MAX_WINDOW : MOVING_AVERAGE_MAX_WINDOW - 1 }]);
    const w = Number(big.steps[0].params.window);
    expect(windowVariants(big, big.steps[0].uid).map((a) => a.recipe.steps[0].params.window)).toEqual([(w + 1) / 2 % 2 ? (w + 1) / 2 : (w + 1) / 2 + 1]); // doubled is over the limit
  });
  it('nothing for a step without a window or an unknown uid', () => {
    const recipe = stack(['baseline']);
    expect(windowVariants(recipe, recipe.steps[0].uid)).toEqual([]);
    expect(windowVariants(recipe, 'nope')).toEqual([]);
  });
});
