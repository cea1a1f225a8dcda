/**
 * Which standards row a trace is (src/core/calibration/trace-keys.ts): full
 * name, file name, then column name (moved from wiring.test.ts).
 */
import { describe, expect, test } from 'vitest';
import { standardKeyOf, traceKeys } from '../../../src/core/calibration/trace-keys.ts';
import { amounts } from './wiring-fixture.ts';

describe('which standards row a trace is', () => {
  const trace = { name: 'run-07.csv: Absorbance', source: { fileName: 'run-07.csv' } } as Parameters<typeof traceKeys>[0];
  test('full name, file name, then column name; the full name when the table has none', () => {
    expect(traceKeys(trace)).toEqual(['run-07.csv: Absorbance', 'run-07.csv', 'Absorbance']);
    expect(standardKeyOf(trace, { ...amounts, rows: [{ standard: 'run-07.csv', line: 2, amounts: [1, 1] }] })).toBe('run-07.csv');
    expect(standardKeyOf(trace, { ...amounts, rows: [{ standard: 'Absorbance', line: 2, amounts: [1, 1] }] })).toBe('Absorbance');
    expect(standardKeyOf(trace, null)).toBe('run-07.csv: Absorbance');
  });
});
