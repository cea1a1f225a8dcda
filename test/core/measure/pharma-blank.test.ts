/**
 * Issue 20: 2H/h takes h from the blank processed by the same stack as the
 * sample. With sample and blank carrying noise of the same kind (white, same
 * σ, independent seeds), h measured on the processed blank must equal, on
 * the mean of 200 realisations within 5 %, the range of the sample's own
 * processed noise measured directly over a window of the same width at the
 * same place. After smoothing the samples in the window are correlated, so
 * Tippett's d₂ (the expected range of n independent normal values, e.g.
 * Tippett 1925, from memory) does not convert that range to σ: the check
 * compares ranges with ranges, measured the same way.
 */
import { describe, expect, it } from 'vitest';
import { analyse, DEFAULT_PEAK_SETTINGS } from '../../../src/core/analysis/index.ts';
import { runPipeline } from '../../../src/core/pipeline.ts';
import { emptyRecipe, makeRecipeStep } from '../../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../../src/core/steps/registry.ts';
import { createTrace } from '../../../src/core/trace.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

const N = 1200;
const src = { fileName: 'p.csv', sha256: '0'.repeat(64), rowsRead: N, rowsSkipped: 0 };
const xs = Array.from({ length: N }, (_, i) => i * 0.1);
const clean = xs.map((t) => 40 * Math.exp(-0.5 * ((t - 60) / 2) ** 2));

function rangeOver(x: Float64Array, y: Float64Array, from: number, to: number): { h: number; points: number } {
  let mn = Infinity, mx = -Infinity, points = 0;
  for (let i = 0; i < x.length; i++) if (x[i] >= from && x[i] <= to) { points++; mn = Math.min(mn, y[i]); mx = Math.max(mx, y[i]); }
  return { h: mx - mn, points };
}

describe('2H/h with h from the processed blank', () => {
  it('Savitzky–Golay 41/2: h on the processed blank equals the range of the same processed noise measured directly (mean of 200, within 5 %)', () => {
    const recipe = emptyRecipe();
    recipe.steps.push(makeRecipeStep(stepDefinition('savitzky-golay')!, { window: 41, order: 2 }));
    let hBlank = 0, hDirect = 0, hRaw = 0, count = 0;
    for (let r = 0; r < 200; r++) {
      const rs = makeRng(9100 + r), rb = makeRng(19100 + r);
      const sample = createTrace({ name: `s${r}`, x: xs, y: clean.map((v) => v + rs.normal()), source: src });
      const blank = createTrace({ name: `b${r}`, x: xs, y: xs.map(() => rb.normal()), source: src });
      const res = analyse({
        sampleId: sample.id, blankId: blank.id, scanIds: [], recipe,
        peaks: { ...DEFAULT_PEAK_SETTINGS, snrDefinition: 'pharmacopoeial', minSnr: 5 },
      }, new Map([[sample.id, sample], [blank.id, blank]]), STEP_REGISTRY);
      const p = res.peaks.find((q) => Math.abs(q.x - 60) < 1);
      expect(p?.pharmaNoise?.source).toBe('blank');
      const pn = p!.pharmaNoise!;
      // The sample's own processed noise: P(sample) − P(clean), the stack being linear.
      const ps = runPipeline({ x: sample.x, y: sample.y }, sample.id, recipe, STEP_REGISTRY).final.y;
      const pc = runPipeline({ x: sample.x, y: Float64Array.from(clean) }, 'clean', recipe, STEP_REGISTRY).final.y;
      const noise = ps.map((v, i) => v - pc[i]);
      // The same width and place as h's window (its centre is the sample's apex).
      const direct = rangeOver(sample.x, noise, pn.from, pn.to);
      expect(direct.points).toBe(pn.points);
      hBlank += pn.h; hDirect += direct.h; count++;
      hRaw += rangeOver(blank.x, blank.y, pn.from, pn.to).h;
    }
    const ratio = hBlank / hDirect;
    console.log(`SG 41/2, 200 seeds: mean h on processed blank ${(hBlank / count).toFixed(4)}, direct range of processed noise ${(hDirect / count).toFixed(4)} (ratio ${ratio.toFixed(4)}); the raw blank would give ${(hRaw / count).toFixed(4)}`);
    expect(Math.abs(ratio - 1)).toBeLessThan(0.05);
    // The raw blank (the old behaviour) reads several times larger: the check can fail.
    expect(hRaw / hBlank).toBeGreaterThan(2);
  }, 120_000);

  it('without a blank h comes from the trace itself and is labelled so (a deviation from the pharmacopoeial procedure)', () => {
    const rs = makeRng(5);
    const sample = createTrace({ name: 's', x: xs, y: clean.map((v) => v + rs.normal()), source: src });
    const recipe = emptyRecipe();
    recipe.steps.push(makeRecipeStep(stepDefinition('moving-average')!, { window: 5 }));
    const res = analyse({ sampleId: sample.id, scanIds: [], recipe, peaks: { ...DEFAULT_PEAK_SETTINGS, snrDefinition: 'pharmacopoeial' } }, new Map([[sample.id, sample]]), STEP_REGISTRY);
    expect(res.peaks.find((q) => Math.abs(q.x - 60) < 1)?.pharmaNoise?.source).toBe('trace itself');
  });
});
