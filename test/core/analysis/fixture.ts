// A seeded invented trace for the analysis stage tests: two Gaussians (σ = 0.15
// and 0.1 x-units, heights 10 and 0.8) on a sloped line with white noise σ = 0.1.
import { createTrace, type Trace } from '../../../src/core/trace.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { emptyRecipe, makeRecipeStep, type Recipe } from '../../../src/core/method.ts';
import { stepDefinition } from '../../../src/core/steps/registry.ts';

export const NOISE_SIGMA = 0.1;

export function synthetic(seed: number, n = 2000): Trace {
  const rng = makeRng(seed);
  const x = Array.from({ length: n }, (_, i) => i * 0.01);
  const y = x.map((t) => 1 + 0.2 * t + 10 * Math.exp(-0.5 * ((t - 7) / 0.15) ** 2) + 0.8 * Math.exp(-0.5 * ((t - 14) / 0.1) ** 2) + NOISE_SIGMA * rng.normal());
  return createTrace({ id: `syn-${seed}`, name: 'syn', x, y, source: { fileName: 'syn.csv', sha256: '0'.repeat(64), rowsRead: n, rowsSkipped: 0 } });
}

/** A recipe of the given steps (id and parameters), defaults filled in. */
export function recipeOf(...steps: [string, Record<string, unknown>][]): Recipe {
  const r = emptyRecipe();
  for (const [id, p] of steps) r.steps.push(makeRecipeStep(stepDefinition(id)!, p as never));
  return r;
}
