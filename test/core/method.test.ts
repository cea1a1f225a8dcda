/**
 * The saved method's analysis settings (recipe version 2): saved with the
 * steps, read back the same, defaults for files without them, version 1
 * files still readable, every bad setting named.
 */
import { describe, expect, test } from 'vitest';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS } from '../../src/core/analysis/index.ts';
import { analysisOf, emptyRecipe, makeRecipeStep, parseRecipeText, recipeStepsOnly, recipeToJson, recipeWithAnalysis, RECIPE_VERSION } from '../../src/core/method.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';

const sg = STEP_REGISTRY.find((d) => d.id === 'savitzky-golay')!;

function parse(doc: unknown) {
  return parseRecipeText(JSON.stringify(doc), STEP_REGISTRY);
}

describe('analysis settings in the saved method', () => {
  test('saved and read back unchanged, in a fixed order, with the steps', () => {
    const steps = emptyRecipe();
    steps.steps.push(makeRecipeStep(sg, { window: 15 }));
    const peaks = { ...DEFAULT_PEAK_SETTINGS, snrDefinition: 'pharmacopoeial' as const, detectionLimit: 2, quantitationLimit: 12, minWidth: 0.02, negative: true };
    const method = recipeWithAnalysis(steps, { method: 'rms', quietRange: [-0.5, 1.25] }, peaks);
    const text = recipeToJson(method);
    const back = parseRecipeText(text, STEP_REGISTRY);
    expect(back.ok).toBe(true);
    if (!back.ok) return;
    expect(back.recipe.version).toBe(RECIPE_VERSION);
    expect(back.recipe.analysis).toEqual({ noise: { method: 'rms', quietRange: [-0.5, 1.25] }, peaks });
    expect(back.recipe.steps).toEqual(method.steps);
    expect(recipeToJson(back.recipe)).toBe(text);
    // The same settings given in another key order write the same text.
    const shuffled = Object.fromEntries(Object.entries(peaks).reverse()) as typeof peaks;
    expect(recipeToJson(recipeWithAnalysis(steps, { method: 'rms', quietRange: [-0.5, 1.25] }, shuffled))).toBe(text);
  });

  test('a version 1 file (steps only) still loads; its analysis settings are the defaults', () => {
    const r = parse({ format: 'tracewright-recipe', version: 1, steps: [{ step: 'savitzky-golay', params: { window: 9 } }] });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.recipe.analysis).toBeUndefined();
    expect(analysisOf(r.recipe)).toEqual({ noise: DEFAULT_NOISE_SETTINGS, peaks: DEFAULT_PEAK_SETTINGS });
    expect(r.recipe.steps[0].params.window).toBe(9);
  });

  test('settings left out of the file take their defaults', () => {
    const r = parse({ format: 'tracewright-recipe', version: 2, steps: [], analysis: { peaks: { minSnr: 4 } } });
    expect(r.ok && r.recipe.analysis).toEqual({ noise: DEFAULT_NOISE_SETTINGS, peaks: { ...DEFAULT_PEAK_SETTINGS, minSnr: 4 } });
  });

  test('steps without uids get the same uids on every load, so exports of one file are reproducible', () => {
    const doc = { format: 'tracewright-recipe', version: 1, steps: [{ step: 'savitzky-golay' }, { step: 'moving-average' }] };
    const a = parse(doc), b = parse(doc);
    expect(a.ok && b.ok).toBe(true);
    if (!a.ok || !b.ok) return;
    expect(a.recipe.steps.map((s) => s.uid)).toEqual(['step-1', 'step-2']);
    expect(recipeToJson(a.recipe)).toBe(recipeToJson(b.recipe));
  });

  test('every bad setting is named; nothing is half-loaded', () => {
    const r = parse({
      format: 'tracewright-recipe', version: 2, steps: [],
      analysis: {
        noise: { method: 'guess', quietRange: [2, 1], colour: 'red' },
        peaks: { detectionLimit: 0, snrDefinition: 'loudness', negative: 'yes', minWidth: -1, extra: 1 },
        plots: {},
      },
    });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems).toEqual([
      'Analysis settings: unknown member "plots" (expected "noise", "peaks", "namedPeaks" and "calibration").',
      'Noise method must be one of auto, rms, blank.',
      'Quiet range must be null or [from, to] in x-units with from < to.',
      'Analysis settings (noise): unknown setting "colour".',
      'Analysis settings (peaks): Detection limit S/N must be between 1 and 100; got 0.',
      'Analysis settings (peaks): S/N definition must be one of rms, pharmacopoeial, region.',
      'Analysis settings (peaks): Look for dips must be true or false.',
      'Analysis settings (peaks): Smallest half-height width (x-units, 0 = 2.5 sample spacings) must be between 0 and 1000000000; got -1.',
      'Analysis settings (peaks): unknown setting "extra".',
    ]);
    expect(parse({ format: 'tracewright-recipe', version: 2, steps: [], analysis: [] }).ok).toBe(false);
    const proto = parseRecipeText('{"format":"tracewright-recipe","version":2,"steps":[],"analysis":{"peaks":{"__proto__":{"minSnr":1}}}}', STEP_REGISTRY);
    expect(proto.ok ? 'loaded' : proto.problems).toEqual(['Analysis settings (peaks): unknown setting "__proto__".']);
    expect(({} as Record<string, unknown>).minSnr).toBeUndefined();
  });

  test('a file from a newer version is refused, not read in part', () => {
    const r = parse({ format: 'tracewright-recipe', version: RECIPE_VERSION + 1, steps: [] });
    expect(r.ok ? '' : r.problems[0]).toMatch(/newer version of Tracewright/);
  });

  test('the page keeps steps only in its stack', () => {
    const m = recipeWithAnalysis(emptyRecipe(), DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS);
    expect(recipeStepsOnly(m)).toEqual({ format: 'tracewright-recipe', version: RECIPE_VERSION, steps: [] });
    expect(JSON.parse(recipeToJson(emptyRecipe()))).toEqual({ format: 'tracewright-recipe', version: RECIPE_VERSION, steps: [] });
  });
});
