import { describe, expect, it } from 'vitest';
import { analyse, DEFAULT_PEAK_SETTINGS } from '../../../src/core/analysis/index.ts';
import { emptyRecipe, parseRecipeText, recipeToJson, recipeWithAnalysis, defaultAnalysis } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { createTrace } from '../../../src/core/trace.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { addExcludedRange, excludedRangesSentence, inExcludedRange } from '../../../src/core/measure/excluded-ranges.ts';
import { peakMethodLines } from '../../../src/core/export/peak-csv.ts';

// Issue 17: ranges excluded from peak finding. A tall narrow "solvent front" at x = 1 and two analyte peaks
// at 7 and 14 (invented; seeded noise σ = 0.1).
function trace() {
  const rng = makeRng(17);
  const x = Array.from({ length: 2000 }, (_, i) => i * 0.01);
  const y = x.map((t) => 40 * Math.exp(-0.5 * ((t - 1) / 0.05) ** 2) + 10 * Math.exp(-0.5 * ((t - 7) / 0.15) ** 2) + 3 * Math.exp(-0.5 * ((t - 14) / 0.1) ** 2) + 0.1 * rng.normal());
  return createTrace({ name: 'front', x, y, source: { fileName: 'front.csv', sha256: '0'.repeat(64), rowsRead: x.length, rowsSkipped: 0 } });
}

describe('ranges excluded from peak finding', () => {
  const t = trace();
  const traces = new Map([[t.id, t]]);
  const before = Array.from(t.y);
  const plain = analyse({ sampleId: t.id, scanIds: [], recipe: emptyRecipe(), peaks: { ...DEFAULT_PEAK_SETTINGS } }, traces, STEP_REGISTRY);
  const excl = analyse({ sampleId: t.id, scanIds: [], recipe: emptyRecipe(), peaks: { ...DEFAULT_PEAK_SETTINGS, excluded: [[0.5, 1.5]] } }, traces, STEP_REGISTRY);

  it('drops the peak inside the range and leaves every other peak with the same numbers', () => {
    expect(plain.peaks.some((p) => Math.abs(p.x - 1) < 0.05)).toBe(true);
    expect(excl.peaks.some((p) => p.x >= 0.5 && p.x <= 1.5)).toBe(false);
    const outside = plain.peaks.filter((p) => p.x < 0.5 || p.x > 1.5);
    expect(excl.peaks.map((p) => [p.x, p.height, p.area, p.snr])).toEqual(outside.map((p) => [p.x, p.height, p.area, p.snr]));
    expect(excl.peakOptions?.excluded).toEqual([[0.5, 1.5]]);
  });

  it('does not change the trace: raw, processed and noise are the same as without the range', () => {
    expect(Array.from(t.y)).toEqual(before);
    expect(Array.from(excl.processed.y)).toEqual(Array.from(plain.processed.y));
    expect(excl.noise!.sigma.sigma).toBe(plain.noise!.sigma.sigma);
  });

  it('keeps a peak added by hand inside the range (the user decided)', () => {
    const r = analyse({ sampleId: t.id, scanIds: [], recipe: emptyRecipe(), peaks: { ...DEFAULT_PEAK_SETTINGS, excluded: [[0.5, 1.5]] }, decisions: { added: [1], removed: [] } }, traces, STEP_REGISTRY);
    expect(r.peaks.some((p) => p.origin === 'added-by-user' && Math.abs(p.x - 1) < 0.1)).toBe(true);
  });

  it('is stated in the export header lines, and absent when there is none', () => {
    expect(peakMethodLines(excl).filter((l) => l.startsWith('Excluded from peak finding'))).toEqual([
      'Excluded from peak finding (x-units; the trace itself is unchanged, peaks with their apex inside are not listed, peaks added by hand are kept): 0.5 to 1.5.',
    ]);
    expect(peakMethodLines(plain).some((l) => l.startsWith('Excluded'))).toBe(false);
  });

  it('is kept with the processing method: saved, read back, and refused when malformed', () => {
    const a = defaultAnalysis();
    const saved = recipeToJson(recipeWithAnalysis(emptyRecipe(), a.noise, { ...a.peaks, excluded: [[0.5, 1.5], [18, 19]] }));
    const back = parseRecipeText(saved, STEP_REGISTRY);
    expect(back.ok && back.recipe.analysis?.peaks.excluded).toEqual([[0.5, 1.5], [18, 19]]);
    // None: not written at all, so methods saved before read the same.
    expect(recipeToJson(recipeWithAnalysis(emptyRecipe(), a.noise, a.peaks))).not.toContain('excluded');
    const doc = JSON.parse(saved);
    doc.analysis.peaks.excluded = [[0.5, 'x']];
    const bad = parseRecipeText(JSON.stringify(doc), STEP_REGISTRY);
    expect(bad.ok ? [] : bad.problems).toEqual(['Analysis settings (peaks): Ranges excluded from peak finding must be a list of [from, to] pairs of finite numbers.']);
  });

  it('merges overlapping ranges and tests membership with the ends included', () => {
    expect(addExcludedRange([[1, 2], [5, 6]], [1.5, 5.5])).toEqual([[1, 6]]);
    expect(addExcludedRange(undefined, [3, 2])).toEqual([[2, 3]]);
    expect(inExcludedRange(2, [[1, 2]])).toBe(true);
    expect(inExcludedRange(2.0001, [[1, 2]])).toBe(false);
    expect(excludedRangesSentence([])).toBeNull();
  });
});
