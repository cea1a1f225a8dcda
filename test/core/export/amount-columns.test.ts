/**
 * Amounts in the per-trace exports (src/core/export/amount-columns.ts): the
 * same numbers as the calibration export's sample (one source for every export),
 * on the rows of the named peaks only.
 */
import { describe, expect, test } from 'vitest';
import { amountPeakColumns, amountSummary, joinExtraColumns } from '../../../src/core/export/amount-columns.ts';
import type { Peak } from '../../../src/core/measure/peak-types.ts';
import { exp } from '../calibration/wiring-fixture.ts';

const sample = exp.samples[0];
const peak = {} as Peak;

describe('amountPeakColumns', () => {
  test('header names the level; the named row gets amount, interval, unit and marks; an unnamed row is empty', () => {
    const cols = amountPeakColumns(sample, ['A', null, 'B'], 0.95)!;
    expect(cols.header).toEqual(['amount', 'amount interval low (95 %)', 'amount interval high (95 %)', 'amount unit', 'amount marks']);
    const a = sample.amounts.find((v) => v.name === 'A')!;
    expect(cols.cells(peak, 0)).toEqual([a.amount, a.interval!.low, a.interval!.high, 'mg/L', a.flags.join('; ')]);
    expect(cols.cells(peak, 1)).toEqual(['', '', '', '', '']);
    // B was not found in the sample: no amount, and why.
    expect(cols.cells(peak, 2)).toEqual(['', '', '', 'mg/L', 'no amount: not found']);
    expect(amountPeakColumns(null, [], 0.95)).toBeNull();
  });

  test('joinExtraColumns puts two sets side by side; either may be missing', () => {
    const a = { header: ['p'], cells: () => [1] };
    const b = { header: ['q', 'r'], cells: () => [2, 3] };
    const j = joinExtraColumns(a, b)!;
    expect(j.header).toEqual(['p', 'q', 'r']);
    expect(j.cells(peak, 0)).toEqual([1, 2, 3]);
    expect(joinExtraColumns(null, b)).toBe(b);
    expect(joinExtraColumns(a, null)).toBe(a);
  });
});

describe('amountSummary', () => {
  test('one entry per named peak with the export\'s numbers, null where there is none (JSON-safe)', () => {
    const s = amountSummary(sample, 0.95);
    expect(s.map((e) => e.name)).toEqual(['A', 'B']);
    const a = sample.amounts[0];
    expect(s[0]).toEqual({ name: 'A', status: 'measured', amount: a.amount, low: a.interval!.low, high: a.interval!.high, level: 0.95, unit: 'mg/L', flags: [...a.flags] });
    expect(s[1]).toMatchObject({ name: 'B', amount: null, low: null, high: null });
    expect(JSON.parse(JSON.stringify(s))).toEqual(s);
  });
});
