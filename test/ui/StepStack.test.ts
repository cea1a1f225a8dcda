import { beforeEach, describe, expect, it, vi } from 'vitest';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import { useApp } from '../../src/state/store.ts';
import { StepStack } from '../../src/ui/StepStack.tsx';
import { analyseNow, button, elements, html, loadDemoSample, press, resetStore, text, tree } from './harness.ts';

// src/ui/StepStack.tsx: the processing stack: add, reorder, switch, remove, edit; what each step reports.
vi.mock('plotly.js-strict-dist-min', () => ({ default: {} }));
beforeEach(() => resetStore());
const add = (id: string, params: Record<string, number> = {}) => {
  useApp.getState().addStep(id);
  const steps = useApp.getState().recipe.steps;
  for (const [k, v] of Object.entries(params)) useApp.getState().setParam(steps[steps.length - 1].uid, k, v);
};

describe('StepStack', () => {
  it('empty: says the raw trace is used as loaded; undo and redo disabled; every registered step can be chosen', () => {
    const h = html(StepStack);
    expect(text(h)).toContain('No steps: the raw trace is used as loaded.');
    expect(button(tree(StepStack), 'Undo').props.disabled).toBe(true);
    expect(button(tree(StepStack), 'Redo').props.disabled).toBe(true);
    for (const d of STEP_REGISTRY) expect(h).toContain(`<option value="${d.id}"`);
  });
  it('Add step adds the chosen (first) step; then undo is offered and takes it back', () => {
    press(tree(StepStack), 'Add step');
    expect(useApp.getState().recipe.steps.map((s) => s.step)).toEqual([STEP_REGISTRY[0].id]);
    press(tree(StepStack), 'Undo');
    expect(useApp.getState().recipe.steps).toEqual([]);
    expect(button(tree(StepStack), 'Redo').props.disabled).toBe(false);
  });
  it('a 5-point moving average reports the noise fall √5 ≈ 2.24 (from the definition: the mean of 5 independent values) and its cost on the narrowest peak', async () => {
    await loadDemoSample();
    add('moving-average', { window: 5 });
    await analyseNow();
    const t = text(html(StepStack));
    expect(t).toContain(`noise SD expected to fall by a factor of about ${Math.sqrt(5).toFixed(2)}`);
    expect(t).toMatch(/The 5-point moving average spans [\d.]+ × the narrowest peak's half-height width/); // the 1.2 min peak, FWHM 0.047 min (demo-truth.json)
    expect(t).toMatch(/1201 points out/); // demo-truth.json x.points: a smoother keeps every point
    expect(t).toContain('Window (points)');
    expect(t).toContain('= 0.05 min'); // 5 points × 0.01 min (demo-truth.json x.step)
  });
  it('switch, remove and the keyboard reorder act on that step only', () => {
    add('moving-average', { window: 5 });
    add('savitzky-golay');
    const [ma, sg] = useApp.getState().recipe.steps;
    const grip = elements(tree(StepStack)).find((e) => String(e.props['aria-label'] ?? '').startsWith('Reorder Moving average') || String(e.props['aria-label'] ?? '').match(/^Reorder .*position 1 of 2/))!;
    (grip.props.onKeyDown as (e: unknown) => void)({ key: 'ArrowDown', preventDefault() {} });
    expect(useApp.getState().recipe.steps.map((s) => s.uid)).toEqual([sg.uid, ma.uid]);
    const toggle = elements(tree(StepStack)).find((e) => e.type === 'input' && e.props.type === 'checkbox')!;
    (toggle.props.onChange as () => void)();
    expect(useApp.getState().recipe.steps.map((s) => s.enabled)).toEqual([false, true]);
    press(tree(StepStack), /^Remove Savitzky/);
    expect(useApp.getState().recipe.steps.map((s) => s.uid)).toEqual([ma.uid]);
  });
  it('“compare half and double window” adds both variants as alternatives of the loss check', () => {
    add('moving-average', { window: 9 });
    press(tree(StepStack), 'compare half and double window');
    expect(useApp.getState().alternatives.map((a) => a.recipe.steps[0].params.window)).toEqual([5, 19]);
  });
});
