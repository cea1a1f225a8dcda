/**
 * Issue 21 wiring helpers: which standards row a trace is (the page's edits
 * of the amounts table are in test/ui/calibration/standards-edit.test.ts), the name column of the exports, and the calibration
 * CSVs and report section drawn from one calibration of the demo standards
 * (the numbers themselves are checked against references in
 * calibrate.test.ts and regression.test.ts; here: that every figure reaches
 * the text unchanged).
 */
import { describe, expect, test } from 'vitest';
import { calibrate, quantifySamples } from '../../../src/core/calibration/calibrate.ts';
import { calibrationExport } from '../../../src/core/calibration/export.ts';
import { emptyNamedPeakTable, readNamedPeaksCsv } from '../../../src/core/calibration/named-peaks.ts';
import { defaultCalibrationSettings } from '../../../src/core/calibration/settings.ts';
import { readStandardsCsv } from '../../../src/core/calibration/standards.ts';
import { standardKeyOf, traceKeys } from '../../../src/core/calibration/trace-keys.ts';
import { amountsCsv, calibrationTableCsv } from '../../../src/core/export/calibration-csv.ts';
import { namedPeakLines, withNameColumn } from '../../../src/core/export/peak-names.ts';
import { curveEquation } from '../../../src/core/export/report-calibration.ts';

const named = (() => { const r = readNamedPeaksCsv('name,position,window\nA,1,0.2\nB,2,0.2\n', 't.csv'); if (!r.ok) throw new Error(); return r.table; })();
const amounts = (() => { const r = readStandardsCsv('standard,A (mg/L),B (mg/L)\ns1.csv,1,2\ns2.csv,1,2\ns3.csv,2,4\ns4.csv,2,4\ns5.csv,4,8\ns6.csv,4,8\n', 'a.csv'); if (!r.ok) throw new Error(); return r.table; })();
// Invented responses: A's area 3·amount + 0.1 with small scatter; B's area 0.5·amount with scatter.
const scatter = [0.01, -0.02, 0.015, -0.01, 0.02, -0.015];
const standardTraces = amounts.rows.map((r, i) => ({
  trace: r.standard,
  peaks: [{ x: 1.01, height: 1, area: 3 * (r.amounts[0] as number) + 0.1 + scatter[i] }, { x: 1.99, height: 1, area: 0.5 * (r.amounts[1] as number) - scatter[i] }],
}));
const set = calibrate({ namedPeaks: named, standards: amounts, standardTraces, settings: defaultCalibrationSettings() });
const samples = quantifySamples(set, [{ trace: 'sample.csv', peaks: [{ x: 1, height: 1, area: 3 * 2.5 + 0.1 }, { x: 5, height: 1, area: 1 }] }]);
const exp = calibrationExport(set, samples, '2026-12-02T00:00:00.000Z');

describe('which standards row a trace is', () => {
  const trace = { name: 'run-07.csv: Absorbance', source: { fileName: 'run-07.csv' } } as Parameters<typeof traceKeys>[0];
  test('full name, file name, then column name; the full name when the table has none', () => {
    expect(traceKeys(trace)).toEqual(['run-07.csv: Absorbance', 'run-07.csv', 'Absorbance']);
    expect(standardKeyOf(trace, { ...amounts, rows: [{ standard: 'run-07.csv', line: 2, amounts: [1, 1] }] })).toBe('run-07.csv');
    expect(standardKeyOf(trace, { ...amounts, rows: [{ standard: 'Absorbance', line: 2, amounts: [1, 1] }] })).toBe('Absorbance');
    expect(standardKeyOf(trace, null)).toBe('run-07.csv: Absorbance');
  });
});

describe('names in the exports', () => {
  test('a name column after "peak #", and the found and missing named peaks in words', () => {
    const naming = samples[0].naming;
    const rows = withNameColumn([['peak #', 'apex'], [1, 1], [2, 5]], naming);
    expect(rows).toEqual([['peak #', 'name', 'apex'], [1, 'A', 1], [2, '', 5]]);
    expect(withNameColumn([['peak #']], null)).toEqual([['peak #']]);
    const lines = namedPeakLines(naming, 'min');
    expect(lines.join('\n')).toMatch(/"A" \(expected 1 ± 0.2 min\): peak 1 at 1 min/);
    expect(lines.at(-1)).toBe('Missing named peaks: B.');
    expect(namedPeakLines(null, '')).toEqual([]);
    expect(emptyNamedPeakTable().peaks).toEqual([]);
  });
});

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

  test('the equation writes a negative term with a minus sign', () => {
    const c = { ...exp.calibrations[0], coefficients: [{ term: 'intercept' as const, power: 0, value: -0.018, standardError: 0.02 }, { term: 'slope' as const, power: 1, value: 0.39, standardError: 0.004 }] };
    expect(curveEquation(c)).toBe('response = 0.39 (± 0.004)·amount − 0.018 (± 0.02)');
  });
});
