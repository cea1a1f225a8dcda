/**
 * Issue 20: a sample peak that also stands in the blank at the same position
 * (carry-over, a ghost peak) is marked, with the blank's height beside it,
 * whether or not the blank was subtracted. Invented data; the blank's height
 * is checked against the height put in (within 3 σ of the processed noise).
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../../src/core/analysis/index.ts';
import { emptyRecipe, makeRecipeStep, type Recipe } from '../../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../../src/core/steps/registry.ts';
import { createTrace } from '../../../src/core/trace.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { peakTableRows } from '../../../src/core/export/peak-csv.ts';

const N = 1500;
const xs = Array.from({ length: N }, (_, i) => i * 0.05);
const g = (t: number, c: number, s: number, h: number) => h * Math.exp(-0.5 * ((t - c) / s) ** 2);
const src = { fileName: 'g.csv', sha256: '0'.repeat(64), rowsRead: N, rowsSkipped: 0 };
const rs = makeRng(11), rb = makeRng(12);
// Sample: peaks at 20 (height 10), 45 (height 6) and 60 (height 4); the blank carries 2.5 at 45 (carry-over).
const sample = createTrace({ name: 'sample', x: xs, y: xs.map((t) => 1 + g(t, 20, 0.3, 10) + g(t, 45, 0.3, 6) + g(t, 60, 0.4, 4) + 0.1 * rs.normal()), source: src });
const blank = createTrace({ name: 'blank', x: xs, y: xs.map((t) => 1 + g(t, 45, 0.3, 2.5) + 0.1 * rb.normal()), source: src });
const traces = new Map([[sample.id, sample], [blank.id, blank]]);

function recipeOf(...ids: string[]): Recipe {
  const r = emptyRecipe();
  for (const id of ids) r.steps.push(makeRecipeStep(stepDefinition(id)!, id === 'moving-average' ? { window: 5 } : {}));
  return r;
}

describe('ghost peaks', () => {
  for (const [label, recipe] of [['without subtracting the blank', recipeOf('moving-average')], ['after subtracting it', recipeOf('moving-average', 'blank-subtraction')], ['on the raw trace', recipeOf()]] as const) {
    it(`the peak that also stands in the blank is marked with the blank's height, ${label}`, () => {
      const r = analyse({ sampleId: sample.id, blankId: blank.id, scanIds: [], recipe }, traces, STEP_REGISTRY);
      const at = (x: number) => r.peaks.find((p) => Math.abs(p.x - x) < 0.3)!;
      expect(at(45).marks).toContain('also-in-blank');
      // The blank's own peak is 2.5 high; after a 5-point average of a σ = 0.3 x-unit (6-point) peak it keeps ≈ 98 %.
      expect(Math.abs(at(45).blankHeight! - 2.5 * 0.98)).toBeLessThan(0.15);
      expect(at(20).marks).not.toContain('also-in-blank');
      expect(at(60).marks).not.toContain('also-in-blank');
      expect(at(20).blankHeight).toBeUndefined();
      // The export carries it in its own column.
      const rows = peakTableRows(sample, r);
      const col = rows[0].findIndex((h) => String(h).startsWith('height in the blank at this position'));
      expect(col).toBeGreaterThan(0);
      const row45 = rows.find((row, i) => i > 0 && Math.abs(Number(row[1]) - 45) < 0.3)!;
      expect(row45[col]).toBe(at(45).blankHeight);
      expect(String(row45[rows[0].indexOf('marks')])).toContain('also in the blank at this position');
      const row20 = rows.find((row, i) => i > 0 && Math.abs(Number(row[1]) - 20) < 0.3)!;
      expect(row20[col]).toBe('');
    });
  }

  it('without a blank nothing is marked', () => {
    const r = analyse({ sampleId: sample.id, scanIds: [], recipe: recipeOf('moving-average') }, traces, STEP_REGISTRY);
    expect(r.peaks.some((p) => p.marks.includes('also-in-blank'))).toBe(false);
  });
});
