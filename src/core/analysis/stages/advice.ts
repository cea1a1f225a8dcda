/** Window advice for the smoothing steps of the current stack, from the raw trace's narrowest quantifiable peak. */
import type { Recipe, Registry } from '../../method.ts';
import { windowAdvice, type WindowAdvice } from '../../measure/loss-matching.ts';
import type { WindowAdviceRow } from '../result.ts';
import { points, type Points } from '../../units.ts';

/** Smoothing steps whose window gets advice, and how to read it. */
function adviceFor(step: string, params: Record<string, unknown>, narrowest: Points): WindowAdvice | null {
  const w = points(Number(params.window));
  if (!Number.isInteger(w) || w < 1) return null;
  try {
    if (step === 'moving-average') return windowAdvice('moving-average', w, 0, narrowest);
    if (step === 'savitzky-golay' && Number(params.derivative ?? 0) === 0) return windowAdvice('savitzky-golay', w, Number(params.order), narrowest);
  } catch {
    return null;
  }
  return null;
}

export function windowAdviceRows(recipe: Recipe, registry: Registry, narrowest: Points | null): WindowAdviceRow[] {
  const advice: WindowAdviceRow[] = [];
  if (!narrowest) return advice;
  for (const st of recipe.steps) {
    if (!st.enabled) continue;
    const a = adviceFor(st.step, st.params, narrowest);
    if (a) advice.push({ uid: st.uid, stepLabel: registry.find((d) => d.id === st.step)?.label ?? st.step, advice: a });
  }
  return advice;
}
