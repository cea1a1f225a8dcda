/**
 * Issue 13: exports wrote "NaN" or "Infinity" where a number belongs
 * (hundreds of times in some reports). A value that is not finite leaves
 * its cell empty and a note says how many and where.
 */
import { describe, expect, test } from 'vitest';
import { readFileSync } from 'node:fs';
import { cleanedTraceCsv } from '../../../src/core/export/cleaned-csv.ts';
import { peakTableCsv } from '../../../src/core/export/peak-csv.ts';
import { reportHtml } from '../../../src/core/export/report-html.ts';
import { emptyCellNote, writeCsv } from '../../../src/core/io/csv-write.ts';
import { loadFile } from '../../../src/core/io/load.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { analyse } from '../../../src/core/analysis/index.ts';
import { recipeOf } from './helpers.ts';

/** "NaN", "Infinity" or "-Infinity" standing as a word (not inside a longer word). */
const NON_FINITE_WORD = /(^|[^A-Za-z])(NaN|-?Infinity)([^A-Za-z]|$)/;

describe('cells that are not finite numbers', () => {
  test('writeCsv leaves them empty and adds one note with the count per column', () => {
    const text = writeCsv(
      [['x', 'y', 'z'], [1, NaN, 3], [2, Infinity, -Infinity], [3, 4, 5]],
      { delimiter: ',', decimal: '.', comments: ['made by a test'], newline: '\n' },
    );
    expect(text).toBe([
      '# made by a test',
      '# Numbers: full precision (the shortest text that reads back to exactly the same double, so reloading gives the same numbers).',
      '# Empty cells: 3 values were not a finite number (an overflow, a division by zero, or no value at that point) and are left empty: 2 in "y", 1 in "z".',
      'x,y,z', '1,,3', '2,,', '3,4,5', '',
    ].join('\n'));
    expect(NON_FINITE_WORD.test(text)).toBe(false);
    expect(emptyCellNote([['a'], [1]])).toBeNull();
    // A table without comment lines (the clipboard copy) still never holds the words.
    expect(writeCsv([[NaN, 1]], { delimiter: '\t', decimal: ',' })).toBe('\t1\r\n');
  });

  test('a trace near the largest double: cleaned trace, peak table and report hold no NaN or Infinity', () => {
    const loaded = loadFile(new Uint8Array(readFileSync('test/fixtures/hostile/huge-pair.csv')), 'huge-pair.csv');
    expect(loaded.ok).toBe(true);
    if (!loaded.ok) return;
    const trace = loaded.traces[0];
    const recipe = recipeOf('moving-average');
    // Noise as the RMS about a line over the whole trace: the squares of 1.5e308 overflow.
    const result = analyse({ sampleId: trace.id, scanIds: [], recipe, noise: { method: 'rms', quietRange: [0, 0.9] } }, new Map([[trace.id, trace]]), STEP_REGISTRY);
    // The analysis does meet values that are not finite here (squares of 1.5e308 overflow), so the exports are put to the test.
    const numbers = [result.noise?.sigma.sigma, ...result.peaks.flatMap((p) => [p.snrRms, p.snr, p.height, p.area])];
    expect(numbers.some((v) => typeof v === 'number' && !Number.isFinite(v)), JSON.stringify(numbers)).toBe(true);
    const now = new Date('2026-01-01T00:00:00Z');
    const csv = cleanedTraceCsv({ trace, result, recipe, registry: STEP_REGISTRY, options: { delimiter: ',', decimal: '.' }, now });
    const peaks = peakTableCsv({ trace, result, recipe, registry: STEP_REGISTRY, options: { delimiter: ';', decimal: ',' }, now });
    const html = reportHtml({ trace, result, recipe, registry: STEP_REGISTRY, now });
    for (const [name, text] of [['cleaned', csv], ['peaks', peaks], ['report', html]] as const) {
      const bad = text.split('\n').find((l) => NON_FINITE_WORD.test(l));
      expect(bad, `${name}: ${bad}`).toBeUndefined();
    }
    // The raw values themselves are written exactly.
    expect(csv).toContain(',1.5E+308,');
    expect(csv).toContain(',-1.5E+308,');
  });
});
