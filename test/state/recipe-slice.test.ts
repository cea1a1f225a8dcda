/**
 * src/state/recipe-slice.ts on a fresh store each: every stack edit is one
 * undo step, undo gives back the previous recipe exactly (the same object,
 * untouched by later edits), redo replays, a new edit clears the redo list,
 * no-op edits leave no history, and the history is bounded. Properties of
 * the slice's own definition (undo/redo as a pair of stacks: common practice).
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS } from '../../src/core/analysis/index.ts';
import { emptyRecipe, makeRecipeStep, recipeWithAnalysis } from '../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../src/core/steps/registry.ts';
import { STACK_HISTORY_KEYS, stackHistoryOf } from '../../src/state/recipe-slice.ts';
import { createAppStore } from '../../src/state/store.ts';

/** The recipe as plain JSON, for deep comparisons that also see a changed nested value. */
const json = (v: unknown) => JSON.stringify(v);

describe('recipe slice: undo and redo', () => {
  it('every stack edit can be undone and redone', () => {
    const useApp = createAppStore();
    const ids = STEP_REGISTRY.slice(0, 2).map((d) => d.id);
    expect(ids.length).toBe(2);
    const s = useApp.getState();
    s.addStep(ids[0]);
    s.addStep(ids[1]);
    const [a, b] = useApp.getState().recipe.steps;
    useApp.getState().moveStep(0, 1);
    expect(useApp.getState().recipe.steps.map((x) => x.uid)).toEqual([b.uid, a.uid]);
    useApp.getState().toggleStep(a.uid);
    expect(useApp.getState().recipe.steps[1].enabled).toBe(false);
    useApp.getState().removeStep(b.uid);
    expect(useApp.getState().recipe.steps.length).toBe(1);
    for (let i = 0; i < 5; i++) useApp.getState().undo();
    expect(useApp.getState().recipe.steps.length).toBe(0);
    for (let i = 0; i < 5; i++) useApp.getState().redo();
    expect(useApp.getState().recipe.steps.map((x) => [x.uid, x.enabled])).toEqual([[a.uid, false]]);
  });

  it('undo restores the previous recipe exactly: the same object, deeply unchanged by the edit that followed it', () => {
    const app = createAppStore();
    app.getState().addStep('savitzky-golay');
    app.getState().addStep('moving-average');
    const before = app.getState().recipe;
    const snapshot = json(before);
    const uid = before.steps[1].uid;
    app.getState().setParam(uid, 'window', 11);
    app.getState().toggleStep(before.steps[0].uid);
    app.getState().moveStep(0, 1);
    expect(json(before)).toBe(snapshot); // edits copy, never write into the old recipe
    app.getState().undo();
    app.getState().undo();
    app.getState().undo();
    expect(app.getState().recipe).toBe(before);
    expect(json(app.getState().recipe)).toBe(snapshot);
    app.getState().redo();
    expect(app.getState().recipe.steps[1].params.window).toBe(11);
  });

  it('a parameter edit is one undo step and does not touch the previous recipe', () => {
    const useApp = createAppStore();
    const def = STEP_REGISTRY.find((d) => d.params.some((p) => p.kind === 'int'))!;
    const key = def.params.find((p) => p.kind === 'int')!.key;
    useApp.getState().addStep(def.id);
    const before = useApp.getState().recipe;
    const uid = before.steps[0].uid;
    const old = before.steps[0].params[key];
    useApp.getState().setParam(uid, key, (old as number) + 2);
    expect(before.steps[0].params[key]).toBe(old);
    useApp.getState().undo();
    expect(useApp.getState().recipe.steps[0].params[key]).toBe(old);
  });

  it('a new edit after an undo clears the redo list', () => {
    const app = createAppStore();
    app.getState().addStep('moving-average');
    app.getState().addStep('savitzky-golay');
    app.getState().undo();
    expect(app.getState().future).toHaveLength(1);
    app.getState().addStep('despike');
    expect(app.getState().future).toEqual([]);
    app.getState().redo();
    expect(app.getState().recipe.steps.map((s) => s.step)).toEqual(['moving-average', 'despike']);
  });

  it('edits that change nothing leave no history: unknown step, same value, bad move, unknown uid; undo and redo with nothing to do are harmless', () => {
    const app = createAppStore();
    app.getState().undo();
    app.getState().redo();
    app.getState().addStep('moving-average');
    const r = app.getState().recipe;
    const uid = r.steps[0].uid;
    app.getState().addStep('no-such-step');
    app.getState().setParam(uid, 'window', r.steps[0].params.window);
    app.getState().moveStep(0, 0);
    app.getState().moveStep(0, 5);
    app.getState().moveStep(-1, 0);
    app.getState().toggleStep('no-such-uid');
    app.getState().setParam('no-such-uid', 'window', 9);
    expect(app.getState().recipe).toBe(r);
    expect(app.getState().past).toHaveLength(1);
    expect(app.getState().future).toHaveLength(0);
  });

  it('keeps at most 200 undo steps, the newest', () => {
    const app = createAppStore();
    app.getState().addStep('moving-average');
    const uid = app.getState().recipe.steps[0].uid;
    for (let w = 0; w < 250; w++) app.getState().setParam(uid, 'window', 3 + 2 * w);
    expect(app.getState().past).toHaveLength(200);
    // The oldest kept is the recipe before the 51st edit of 251 (window 3 + 2·49).
    expect(app.getState().past[0].steps[0].params.window).toBe(101);
  });

  it('replacing the recipe keeps steps only (the settings live in the settings slice), as one undo step, as a copy', () => {
    const app = createAppStore();
    const loaded = emptyRecipe();
    loaded.steps.push(makeRecipeStep(stepDefinition('moving-average')!, { window: 7 }));
    const withSettings = recipeWithAnalysis(loaded, DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS);
    app.getState().replaceRecipe(withSettings);
    const r = app.getState().recipe;
    expect(r.analysis).toBeUndefined();
    expect(r.steps.map((s) => [s.step, s.params.window])).toEqual([['moving-average', 7]]);
    expect(r.steps[0]).not.toBe(loaded.steps[0]);
    loaded.steps[0].params.window = 99;
    expect(app.getState().recipe.steps[0].params.window).toBe(7);
    app.getState().undo();
    expect(app.getState().recipe.steps).toEqual([]);
  });
});

describe('stackHistoryOf', () => {
  it('gives the same objects; keep limits the undo list to the newest and the redo list to the next ones', () => {
    const app = createAppStore();
    for (const id of ['moving-average', 'savitzky-golay', 'despike', 'moving-average']) app.getState().addStep(id);
    app.getState().undo();
    app.getState().undo();
    const s = app.getState();
    const all = stackHistoryOf(s);
    expect(all.recipe).toBe(s.recipe);
    expect(all.past).toBe(s.past);
    expect(all.future).toBe(s.future);
    expect(Object.keys(all).sort()).toEqual([...STACK_HISTORY_KEYS].sort());
    const one = stackHistoryOf(s, 1);
    expect(one.past).toEqual([s.past.at(-1)]);
    expect(one.future).toEqual([s.future[0]]);
    expect(stackHistoryOf(s, 0)).toEqual({ recipe: s.recipe, past: [], future: [] });
  });
});
