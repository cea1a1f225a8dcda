// Which blank the pharmacopoeial h comes from (src/core/measure/companion-noise.ts):
// the blank processed by the same stack as the measured trace (definition in the
// module comment: H and h must come from traces processed alike).
import { describe, expect, it } from 'vitest';
import { pharmacopoeialBlank } from '../../../src/core/measure/companion-noise.ts';
import { runPipeline } from '../../../src/core/pipeline.ts';
import { emptyRecipe, makeRecipeStep } from '../../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../../src/core/steps/registry.ts';
import { createTrace } from '../../../src/core/trace.ts';

const source = { fileName: 'made-in-test', sha256: '0'.repeat(64), rowsRead: 0, rowsSkipped: 0 };
const x = Float64Array.from({ length: 60 }, (_, i) => i);
const raw = { x, y: Float64Array.from(x, (v) => Math.sin(v)) };
const blank = createTrace({ id: 'b', name: 'blank', x, y: Float64Array.from(x, (v, i) => (i % 2 ? 1 : -1) + 0 * v), source });

describe('pharmacopoeialBlank', () => {
  it('nothing without a blank', () => {
    expect(pharmacopoeialBlank(raw, raw, {}, null)).toBeUndefined();
  });

  it('the raw blank when peaks are measured on the raw trace', () => {
    const b = pharmacopoeialBlank(raw, raw, { blank }, null)!;
    expect(b.fromBlank).toBe(true);
    expect(b.y).toBe(blank.y);
  });

  it('the blank processed by the stack when peaks are measured on the processed trace (its ±1 alternation is smoothed away)', () => {
    const recipe = emptyRecipe();
    recipe.steps.push(makeRecipeStep(stepDefinition('moving-average')!, { window: 5 } as never));
    const run = runPipeline(raw, 'r', recipe, STEP_REGISTRY, { blank });
    const b = pharmacopoeialBlank(run.final, raw, { blank }, { run })!;
    expect(b.y).toBe(run.companions.blank!.y);
    // A 5-point mean of a ±1 alternation is ±1/5 in the interior (by hand).
    expect(Math.abs(b.y[30])).toBeCloseTo(0.2, 12);
    expect(blank.y[30]).toBe(-1);
  });
});
