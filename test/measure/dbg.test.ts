import { it } from 'vitest';
import { readFileSync } from 'node:fs';
import { loadFile } from '../../src/core/io/load.ts';
import { analyse } from '../../src/core/analyse.ts';
import { PipelineCache } from '../../src/core/pipeline.ts';
import { emptyRecipe, makeRecipeStep } from '../../src/core/recipe.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import { PRESETS, presetAlternative } from '../../src/ui/alternatives.ts';
it('dbg', () => {
  const r = loadFile(new Uint8Array(readFileSync('public/demo/demo-sample.csv')), 'demo-sample.csv');
  if (!r.ok) throw new Error('x');
  const t = r.traces[0];
  const cache = new PipelineCache();
  const sg = makeRecipeStep(STEP_REGISTRY.find((d) => d.id === 'savitzky-golay')!);
  for (const w of [11, 41, 11]) {
    const rec = emptyRecipe(); rec.steps.push({ ...sg, params: { ...sg.params, window: w } });
    const alts = PRESETS.map((p) => presetAlternative(rec, p)!);
    const t0 = performance.now();
    const res = analyse({ sampleId: t.id, scanIds: [], recipe: rec, alternatives: alts }, new Map([[t.id, t]]), STEP_REGISTRY, cache);
    console.log('W', w, (performance.now() - t0).toFixed(0), 'ms', res.noise!.carried!.gain, res.noise!.sigma.sigma);
  }
});
