/**
 * Issue 21: the named-peak table and calibration settings saved in the
 * method's "analysis" block. Files without them (version 1, and version 2
 * before issue 21) load as before; a saved table round-trips; a bad table
 * refuses the whole method with the problem named.
 */
import { describe, expect, test } from 'vitest';
import { readFileSync } from 'node:fs';
import { readNamedPeaksCsv } from '../../../src/core/calibration/named-peaks.ts';
import { defaultCalibrationSettings } from '../../../src/core/calibration/settings.ts';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS } from '../../../src/core/analysis/index.ts';
import { analysisOf, emptyRecipe, parseRecipeText, recipeToJson, recipeWithAnalysis } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';

const table = (() => {
  const r = readNamedPeaksCsv(readFileSync('public/demo/demo-named-peaks.csv', 'utf8'), 'demo-named-peaks.csv');
  if (!r.ok) throw new Error('demo table');
  return r.table;
})();

describe('named peaks in the saved method', () => {
  test('a method saved before issue 21 (no namedPeaks) and a version-1 method still load, with no named peaks', () => {
    const old = parseRecipeText(readFileSync('test/fixtures/calibration/demo-method.json', 'utf8'), STEP_REGISTRY);
    expect(old.ok).toBe(true);
    if (old.ok) expect(analysisOf(old.recipe).namedPeaks).toBeUndefined();
    const v1 = parseRecipeText(JSON.stringify({ format: 'tracewright-recipe', version: 1, steps: [] }), STEP_REGISTRY);
    expect(v1.ok).toBe(true);
    const v2 = parseRecipeText(recipeToJson(recipeWithAnalysis(emptyRecipe(), DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS)), STEP_REGISTRY);
    expect(v2.ok && analysisOf(v2.recipe).namedPeaks).toBeUndefined();
    // Without named peaks the saved text has no such member (the text of older methods is unchanged).
    expect(recipeToJson(recipeWithAnalysis(emptyRecipe(), DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS))).not.toContain('namedPeaks');
  });

  test('the table and the settings round-trip through the saved text', () => {
    const settings = { ...defaultCalibrationSettings(), weighting: '1/x' as const, model: 'line' as const };
    const text = recipeToJson(recipeWithAnalysis(emptyRecipe(), DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, { namedPeaks: table, calibration: settings }));
    const back = parseRecipeText(text, STEP_REGISTRY);
    expect(back.ok).toBe(true);
    if (!back.ok) return;
    expect(analysisOf(back.recipe).namedPeaks).toEqual(table);
    expect(analysisOf(back.recipe).calibration).toMatchObject({ weighting: '1/x', model: 'line' });
    expect(recipeToJson(back.recipe)).toBe(text);
  });

  test('a bad named-peak table refuses the method, naming the problem', () => {
    const doc = JSON.parse(recipeToJson(recipeWithAnalysis(emptyRecipe(), DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, { namedPeaks: table })));
    doc.analysis.namedPeaks.peaks[1].window = -1;
    const r = parseRecipeText(JSON.stringify(doc), STEP_REGISTRY);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems.join(' ')).toMatch(/Named peaks: .*Meadow Gold.*window/);
    doc.analysis.extra = 1;
    const r2 = parseRecipeText(JSON.stringify(doc), STEP_REGISTRY);
    expect(!r2.ok && r2.problems.join(' ')).toMatch(/unknown member "extra"/);
  });
});
