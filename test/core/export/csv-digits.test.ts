/**
 * Issue 17: CSVs keep full round-trip precision by default, and offer a
 * chosen number of significant digits for pasting into a report; the
 * header says which.
 */
import { describe, expect, test } from 'vitest';
import { strToU8 } from 'fflate';
import { cleanedTraceCsv } from '../../../src/core/export/cleaned-csv.ts';
import { peakTableCsv } from '../../../src/core/export/peak-csv.ts';
import { csvNumber, numbersLine } from '../../../src/core/io/csv-write.ts';
import { loadFile } from '../../../src/core/io/load.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { analysed, inventedTrace, readCsv, recipeOf } from './helpers.ts';

const NOW = new Date(Date.UTC(2024, 4, 6, 7, 8, 9));

describe('significant digits in CSV exports', () => {
  test('rounded numbers are the value to that many significant digits, without padding zeros', () => {
    // Hand-worked values (rounding half away from zero at these digits; ECMAScript toPrecision).
    expect(csvNumber(0.123456789, '.', 3)).toBe('0.123');
    expect(csvNumber(123456.789, '.', 4)).toBe('123500');
    expect(csvNumber(-2.5e-7, ',', 2)).toBe('-2,5E-7');
    expect(csvNumber(1.5, '.', 6)).toBe('1.5');
    expect(csvNumber(Math.PI)).toBe('3.141592653589793');
  });

  test('the default cleaned trace reloads to the same numbers; the header says full precision', () => {
    const trace = inventedTrace();
    const recipe = recipeOf('savitzky-golay');
    const result = analysed(trace, recipe);
    const text = cleanedTraceCsv({ trace, result, recipe, registry: STEP_REGISTRY, options: { delimiter: ',', decimal: '.' }, now: NOW });
    expect(text).toContain(`# ${numbersLine(undefined)}`);
    const back = loadFile(strToU8(text), 'back.csv');
    expect(back.ok).toBe(true);
    if (!back.ok) return;
    expect(Array.from(back.traces[0].x)).toEqual(Array.from(trace.x));
    expect(Array.from(back.traces[0].y)).toEqual(Array.from(trace.y));
    expect(Array.from(back.traces[1].y)).toEqual(Array.from(result.processed.y));
  });

  test('with 4 digits every number in the peak table is the full value rounded to 4 significant digits, and the header says so', () => {
    const trace = inventedTrace();
    const recipe = recipeOf('savitzky-golay');
    const result = analysed(trace, recipe);
    const full = readCsv(peakTableCsv({ trace, result, options: { delimiter: ';', decimal: ',' }, now: NOW }), ';', ',');
    const short = readCsv(peakTableCsv({ trace, result, options: { delimiter: ';', decimal: ',', digits: 4 }, now: NOW }), ';', ',');
    expect(short.comments).toContain(`# ${numbersLine(4)}`);
    expect(short.comments.join('\n')).toContain('4 significant digits');
    expect(short.body.length).toBe(full.body.length);
    let numbers = 0;
    full.body.forEach((row, i) => row.forEach((cell, k) => {
      const v = full.num(cell);
      if (cell === '' || !Number.isFinite(v)) return;
      numbers++;
      expect(short.num(short.body[i][k])).toBe(Number(v.toPrecision(4)));
    }));
    expect(numbers).toBeGreaterThan(20);
  });

  test('digits outside 1 to 17 are refused with a message', () => {
    const trace = inventedTrace();
    const recipe = recipeOf('savitzky-golay');
    const result = analysed(trace, recipe);
    expect(() => peakTableCsv({ trace, result, options: { delimiter: ',', decimal: '.', digits: 0 }, now: NOW })).toThrow(/Significant digits/);
    expect(() => peakTableCsv({ trace, result, options: { delimiter: ',', decimal: '.', digits: 2.5 }, now: NOW })).toThrow(/whole number/);
  });
});
