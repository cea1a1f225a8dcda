import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { HeldTraces } from '../../../src/worker/held-traces.ts';
import { sha256Hex } from '../../../src/core/io/sha256.ts';
import { emptyRecipe, makeRecipeStep, type Recipe } from '../../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../../src/core/steps/registry.ts';
import type { Trace } from '../../../src/core/trace.ts';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS } from '../../../src/core/analysis/index.ts';

const hashOf = (t: Trace) => `${sha256Hex(new Uint8Array(t.x.buffer, t.x.byteOffset, t.x.byteLength))}/${sha256Hex(new Uint8Array(t.y.buffer, t.y.byteOffset, t.y.byteLength))}`;

describe('raw data is never changed', () => {
  it('a full session of edits through the engine leaves every loaded trace bit-identical (SHA-256 of x and y)', async () => {
    const engine = new HeldTraces();
    const traces: Trace[] = [];
    for (const f of ['demo-sample.csv', 'demo-blank.csv', 'demo-scan-1.csv', 'demo-scan-2.csv']) {
      const r = await engine.load(new Uint8Array(readFileSync(`public/demo/${f}`)), f, undefined, () => undefined);
      if (!r.ok) throw new Error(`${f} did not load`);
      traces.push(...r.traces);
    }
    const before = traces.map(hashOf);
    engine.setInputs(traces);
    const [sample, blank, s1, s2] = traces;
    // Every registered step, one at a time and all together, with alternatives, a quiet range,
    // hand decisions, a step that cannot run (window larger than the trace) and troughs.
    const recipes: Recipe[] = STEP_REGISTRY.map((d) => ({ ...emptyRecipe(), steps: [makeRecipeStep(d)] }));
    const all = emptyRecipe();
    for (const d of STEP_REGISTRY) all.steps.push(makeRecipeStep(d));
    all.steps.push(makeRecipeStep(stepDefinition('moving-average')!, { window: 99999 }));
    recipes.push(all);
    for (const recipe of recipes) {
      const res = engine.analyse({
        sampleId: sample.id, blankId: blank.id, scanIds: [s1.id, s2.id], recipe,
        noise: { ...DEFAULT_NOISE_SETTINGS, method: 'rms', quietRange: [9.2, 9.8] },
        peaks: { ...DEFAULT_PEAK_SETTINGS, negative: recipe === all },
        decisions: { added: [6.35], removed: [4.3] },
        alternatives: [{ id: 'a', label: 'all steps', recipe: all }],
        showUid: recipe.steps[0]?.uid,
      });
      expect(res.processed.y.length).toBeGreaterThan(0);
    }
    // The oversized window is reported on its own step; the others ran.
    const last = engine.analyse({ sampleId: sample.id, blankId: blank.id, scanIds: [s1.id], recipe: all });
    expect(last.runs[last.runs.length - 1].status).toBe('error');
    expect(last.runs.filter((r) => r.status === 'ok').length).toBeGreaterThan(5);
    expect(traces.map(hashOf)).toEqual(before);
  });
});
