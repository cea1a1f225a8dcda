/**
 * Ways to make alternative stacks for the loss check in one click: presets
 * (the current corrections plus one smoother), and variants of one step's
 * window (half and double).
 */
import type { AlternativeRequest } from '../core/analysis/index.ts';
import { cloneParams, makeRecipeStep, newStepUid, type Recipe } from '../core/method.ts';
import { stepDefinition } from '../core/steps/registry.ts';

/** Steps that smooth (and so can erase features); presets replace them. */
export const SMOOTHING_STEPS = new Set(['moving-average', 'savitzky-golay', 'local-order', 'boxcar', 'frequency-filter']);

export interface Preset {
  label: string;
  step: string;
  params: Record<string, number | string>;
}

export const PRESETS: Preset[] = [
  { label: '3-point moving average', step: 'moving-average', params: { window: 3 } },
  { label: '5-point moving average', step: 'moving-average', params: { window: 5 } },
  { label: 'Savitzky–Golay 11 points, order 2', step: 'savitzky-golay', params: { window: 11, order: 2 } },
  { label: 'Savitzky–Golay 25 points, order 4', step: 'savitzky-golay', params: { window: 25, order: 4 } },
];

function copy(recipe: Recipe): Recipe {
  return { ...recipe, steps: recipe.steps.map((s) => ({ ...s, uid: newStepUid(), params: cloneParams(s.params) })) };
}

/** The current stack's corrections (non-smoothing steps) followed by the preset's smoother. */
export function presetAlternative(recipe: Recipe, preset: Preset): AlternativeRequest | null {
  const def = stepDefinition(preset.step);
  if (!def) return null;
  const base = copy(recipe);
  base.steps = base.steps.filter((s) => !SMOOTHING_STEPS.has(s.step));
  base.steps.push(makeRecipeStep(def, preset.params));
  const corrections = base.steps.length > 1 ? ' after the current corrections' : '';
  return { id: newStepUid(), label: `${preset.label}${corrections}`, recipe: base };
}

function odd(v: number): number {
  const r = Math.round(v);
  return r % 2 === 1 ? r : r + 1;
}

/** The current stack with one step's window halved and doubled (odd, within limits). */
export function windowVariants(recipe: Recipe, uid: string): AlternativeRequest[] {
  const entry = recipe.steps.find((s) => s.uid === uid);
  const def = entry ? stepDefinition(entry.step) : undefined;
  const spec = def?.params.find((p) => p.key === 'window');
  if (!entry || !def || !spec || spec.kind !== 'int') return [];
  const w = Number(entry.params.window);
  const out: AlternativeRequest[] = [];
  for (const v of [odd(w / 2), odd(w * 2)]) {
    if (v === w || v < spec.min || v > spec.max) continue;
    const r = copy(recipe);
    const i = recipe.steps.findIndex((s) => s.uid === uid);
    r.steps[i].params.window = v;
    out.push({ id: newStepUid(), label: `${def.label} window ${v} (current stack otherwise)`, recipe: r });
  }
  return out;
}
