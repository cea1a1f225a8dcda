import type { StateCreator } from 'zustand';
import { cloneParams, emptyRecipe, makeRecipeStep, recipeStepsOnly, type Recipe } from '../core/method.ts';
import { stepDefinition } from '../core/steps/registry.ts';
import type { ParamValue } from '../core/steps/types.ts';
import type { AppState } from './store.ts';

export interface RecipeSlice {
  recipe: Recipe;
  past: Recipe[];
  future: Recipe[];
  addStep: (stepId: string) => void;
  removeStep: (uid: string) => void;
  moveStep: (from: number, to: number) => void;
  toggleStep: (uid: string) => void;
  setParam: (uid: string, key: string, value: ParamValue) => void;
  replaceRecipe: (recipe: Recipe) => void;
  undo: () => void;
  redo: () => void;
}

const HISTORY = 200;

/** The step stack with its undo history (oldest first) and redo steps (next first): what session persistence keeps of this slice. */
export type StackHistory = Pick<RecipeSlice, 'recipe' | 'past' | 'future'>;

/** The fields {@link StackHistory} names, for watching them change. */
export const STACK_HISTORY_KEYS = ['recipe', 'past', 'future'] as const satisfies readonly (keyof RecipeSlice)[];

/** The stack and its history as kept (same objects, nothing copied); `keep` limits the undo and redo steps to the newest of each. */
export function stackHistoryOf(s: StackHistory, keep = Infinity): StackHistory {
  return keep === Infinity
    ? { recipe: s.recipe, past: s.past, future: s.future }
    : { recipe: s.recipe, past: keep > 0 ? s.past.slice(-keep) : [], future: s.future.slice(0, keep) };
}

function copyRecipe(r: Recipe): Recipe {
  return { ...r, steps: r.steps.map((s) => ({ ...s, params: cloneParams(s.params) })) };
}

export const createRecipeSlice: StateCreator<AppState, [], [], RecipeSlice> = (set) => {
  /** Every edit goes through here so undo and redo cover all of them. */
  const edit = (change: (r: Recipe) => Recipe | null) => set((s) => {
    const next = change(copyRecipe(s.recipe));
    if (!next) return {};
    return { recipe: next, past: [...s.past, s.recipe].slice(-HISTORY), future: [] };
  });
  return {
    recipe: emptyRecipe(),
    past: [],
    future: [],
    addStep: (stepId) => edit((r) => {
      const def = stepDefinition(stepId);
      if (!def) return null;
      r.steps.push(makeRecipeStep(def));
      return r;
    }),
    removeStep: (uid) => edit((r) => ({ ...r, steps: r.steps.filter((s) => s.uid !== uid) })),
    moveStep: (from, to) => edit((r) => {
      if (from === to || from < 0 || to < 0 || from >= r.steps.length || to >= r.steps.length) return null;
      const [moved] = r.steps.splice(from, 1);
      r.steps.splice(to, 0, moved);
      return r;
    }),
    toggleStep: (uid) => edit((r) => {
      const s = r.steps.find((x) => x.uid === uid);
      if (!s) return null;
      s.enabled = !s.enabled;
      return r;
    }),
    setParam: (uid, key, value) => edit((r) => {
      const s = r.steps.find((x) => x.uid === uid);
      if (!s || JSON.stringify(s.params[key]) === JSON.stringify(value)) return null;
      s.params[key] = value;
      return r;
    }),
    // The stack holds steps only; the noise and peak settings live in the settings slice.
    replaceRecipe: (recipe) => edit(() => copyRecipe(recipeStepsOnly(recipe))),
    undo: () => set((s) => {
      if (!s.past.length) return {};
      return { recipe: s.past[s.past.length - 1], past: s.past.slice(0, -1), future: [s.recipe, ...s.future] };
    }),
    redo: () => set((s) => {
      if (!s.future.length) return {};
      return { recipe: s.future[0], future: s.future.slice(1), past: [...s.past, s.recipe] };
    }),
  };
};
