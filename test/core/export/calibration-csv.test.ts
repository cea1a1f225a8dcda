/**
 * The calibration CSVs (src/core/export/calibration-csv.ts) drawn from one
 * calibration of invented standards: every figure reaches the text unchanged
 * (moved from test/core/calibration/wiring.test.ts; the numbers themselves are
 * checked against references in calibrate.test.ts and regression.test.ts).
 */
import { describe, expect, test } from 'vitest';
import { amountsCsv, calibrationTableCsv } from '../../../src/core/export/calibration-csv.ts';
import { exp } from '../calibration/wiring-fixture.ts';

describe('calibration CSVs and the report\'s equation', () => {
  test('every standard of every named peak is a row with the curve\'s coefficients, as in the export object', () => {
    const csv = calibrationTableCsv(exp, { delimiter: ',', decimal: '.' });
    const lines = csv.split('\r\n').filter((l) => l && !l.startsWith('#'));
    expect(lines).toHaveLength(1 + 12);
    const a = exp.calibrations[0];
    const slope = a.coefficients.find((k) => k.power === 1)!;
    expect(lines[1]).toContain(`,${slope.value},${slope.standardError},`);
    expect(csv).toContain('# Caution: ');
  });

  test('the amounts CSV gives amount, interval and limits; a missing peak says so', () => {
    const csv = amountsCsv(exp, { delimiter: ',', decimal: '.' });
    const a = exp.samples[0].amounts[0];
    expect(csv).toContain(`sample.csv,A,measured,1,${a.response},${a.amount},${a.interval!.low},${a.interval!.high},mg/L`);
    expect(csv).toMatch(/sample\.csv,B,not-found/);
    // The invented response 3·2.5 + 0.1 reads back near 2.5 (the fitted line is within the scatter of 3x + 0.1).
    expect(Math.abs((a.amount as number) - 2.5)).toBeLessThan(0.05);
  });
});

describe('the CSVs read back', () => {
  test('with semicolons and decimal commas every amount reads back to the same number (full precision)', () => {
    const csv = amountsCsv(exp, { delimiter: ';', decimal: ',' });
    const line = csv.split('\r\n').find((l) => l.startsWith('sample.csv;A;'))!;
    const cells = line.split(';');
    const a = exp.samples[0].amounts[0];
    expect(Number(cells[5].replace(',', '.'))).toBe(a.amount);
    expect(Number(cells[6].replace(',', '.'))).toBe(a.interval!.low);
    expect(Number(cells[7].replace(',', '.'))).toBe(a.interval!.high);
  });
});
