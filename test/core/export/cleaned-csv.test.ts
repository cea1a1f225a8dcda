import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { strToU8 } from 'fflate';
import type { AnalyseResult } from '../../../src/core/analysis/index.ts';
import { cleanedTraceCsv } from '../../../src/core/export/cleaned-csv.ts';
import { CAUTION } from '../../../src/core/export/version.ts';
import { loadFile } from '../../../src/core/io/load.ts';
import { emptyRecipe, recipeToJson } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { createTrace } from '../../../src/core/trace.ts';
import { analysed, inventedTrace, looksLikeFormula, readCsv, recipeOf, splitCsvLine } from './helpers.ts';

const NOW = new Date(Date.UTC(2024, 4, 6, 7, 8, 9));

describe('cleaned trace CSV', () => {
  test('columns read back to exactly the numbers of the analysis, with provenance in the header', () => {
    const trace = inventedTrace();
    const recipe = recipeOf('savitzky-golay', 'baseline');
    const result = analysed(trace, recipe);
    expect(result.baseline).toBeDefined();
    const xBefore = trace.x.slice(), yBefore = trace.y.slice(), pBefore = result.processed.y.slice();
    const text = cleanedTraceCsv({ trace, result, recipe, registry: STEP_REGISTRY, options: { delimiter: ',', decimal: '.' }, now: NOW });
    const { comments, header, body, num } = readCsv(text, ',', '.');
    expect(header).toEqual(['Time (min)', 'raw Signal (mAU)', 'processed Signal (mAU)', 'residual raw minus processed (mAU)', 'fitted baseline (mAU)']);
    expect(body.length).toBe(trace.x.length);
    body.forEach((row, i) => {
      expect(num(row[0])).toBe(trace.x[i]);
      expect(num(row[1])).toBe(trace.y[i]);
      expect(num(row[2])).toBe(result.processed.y[i]);
      expect(num(row[3])).toBe(result.residual.y[i]);
      expect(num(row[4])).toBe(result.baseline![i]);
    });
    expect(comments).toContain(`# Input SHA-256: ${trace.source.sha256}`);
    expect(comments).toContain('# Input file: run.csv');
    expect(comments).toContain(`# Caution: ${CAUTION}`);
    expect(comments).toContain('# Written at: 2024-05-06T07:08:09.000Z');
    expect(comments).toContain('# Written by: Tracewright 0.1.0');
    const json = comments.find((c) => c.startsWith('# Processing method (JSON): '))!.slice('# Processing method (JSON): '.length);
    expect(JSON.parse(json)).toEqual(JSON.parse(recipeToJson(recipe)));
    expect(comments.filter((c) => c.startsWith('# Processing method in words: ')).length).toBe(2);
    // Nothing handed to the export changed.
    expect(trace.x).toEqual(xBefore);
    expect(trace.y).toEqual(yBefore);
    expect(result.processed.y).toEqual(pBefore);
  });

  test('a step that changes the grid (boxcar) gives interpolated raw values, said in the header', () => {
    const trace = inventedTrace();
    const recipe = recipeOf('boxcar');
    const result = analysed(trace, recipe);
    expect(result.processed.x.length).toBeLessThan(trace.x.length);
    const text = cleanedTraceCsv({ trace, result, recipe, registry: STEP_REGISTRY, options: { delimiter: ';', decimal: ',' }, now: NOW });
    const { comments, header, body, num } = readCsv(text, ';', ',');
    expect(header[1]).toBe('raw Signal interpolated linearly onto the processed x (mAU)');
    expect(header).toHaveLength(4);
    expect(comments.some((c) => c.includes('interpolated linearly onto the processed x values'))).toBe(true);
    expect(body.length).toBe(result.processed.x.length);
    // raw (interpolated) − processed is the residual the analysis formed; same arithmetic, so exact.
    body.forEach((row, i) => expect(num(row[1]) - num(row[2])).toBe(result.residual.y[i]));
  });

  test('round trip through the page loader: random finite doubles in every column come back identical (fast-check)', () => {
    const finite = fc.double({ noNaN: true, noDefaultInfinity: true });
    fc.assert(fc.property(
      fc.uniqueArray(finite, { minLength: 5, maxLength: 40, comparator: (a, b) => a === b || (a === 0 && b === 0) }),
      fc.array(finite, { minLength: 160, maxLength: 160 }),
      fc.constantFrom(
        { delimiter: ',' as const, decimal: '.' as const },
        { delimiter: ';' as const, decimal: ',' as const },
        { delimiter: '\t' as const, decimal: '.' as const },
      ),
      (xs, values, options) => {
        const x = Float64Array.from([...xs].sort((a, b) => a - b));
        const n = x.length;
        const col = (k: number) => Float64Array.from(values.slice(k * 40, k * 40 + n));
        const trace = createTrace({ name: 'p', x, y: col(0), source: { fileName: 'p.csv', sha256: '0'.repeat(64), rowsRead: n, rowsSkipped: 0 } });
        // The writer reads only these parts of an analysis; filled with random doubles, not computed,
        // so the check is about the text and not about what the analysis does with extreme values.
        const result = {
          sampleId: trace.id, processed: { x, y: col(1) }, residual: { x, y: col(2) }, baseline: col(3),
          diagnostics: null, runs: [], events: [], noise: null, peaks: [], peakOptions: null, loss: null, ms: 0,
        } as unknown as AnalyseResult;
        const recipe = emptyRecipe();
        const text = cleanedTraceCsv({ trace, result, recipe, registry: STEP_REGISTRY, options, now: NOW });
        const back = loadFile(strToU8(text), 'back.csv');
        expect(back.ok).toBe(true);
        if (!back.ok) return;
        // The loader gives one trace per y column: raw, processed, residual, baseline.
        expect(back.traces).toHaveLength(4);
        expect(Array.from(back.traces[0].x)).toEqual(Array.from(x));
        for (let k = 0; k < 4; k++) expect(Array.from(back.traces[k].y)).toEqual(Array.from(col(k)));
      },
    ), { numRuns: 80, seed: 20240506 });
  });

  test('hostile file name and metadata cannot become a spreadsheet formula (OWASP CSV injection)', () => {
    const hostile = '=HYPERLINK("x"),+1+2,-2+cmd,@SUM(A1),\tTAB,\rCR.csv';
    for (const delimiter of [',', ';', '\t'] as const) {
      const trace = inventedTrace({ fileName: hostile, metadata: { '=owner': '@evil,-1+1', 'Operator\tname': '+cmd|calc' } });
      const recipe = recipeOf('moving-average');
      const result = analysed(trace, recipe);
      const text = cleanedTraceCsv({ trace, result, recipe, registry: STEP_REGISTRY, options: { delimiter, decimal: '.' }, now: NOW });
      for (const line of text.split(/\r\n/)) {
        // A spreadsheet splits every line at the delimiter, comment lines too.
        for (const cell of splitCsvLine(line, delimiter)) expect(looksLikeFormula(cell.replace(/^[ "]+/, '')), JSON.stringify([delimiter, line, cell])).toBe(false);
      }
      expect(text).toContain('File metadata: Operator name = +cmd|calc');
      if (delimiter === ',') expect(text).toContain(",'-1+1");
      // Negative numbers stay numbers.
      expect(text).toMatch(/(^|[,;\t])-\d/m);
    }
  });

  test('decimal comma with comma delimiter is refused with a sentence', () => {
    const trace = inventedTrace();
    const recipe = emptyRecipe();
    const result = analysed(trace, recipe);
    expect(() => cleanedTraceCsv({ trace, result, recipe, registry: STEP_REGISTRY, options: { delimiter: ',', decimal: ',' }, now: NOW })).toThrow(/semicolon or tab/);
  });
});
