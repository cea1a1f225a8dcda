import { describe, expect, it } from 'vitest';
import { STANDARDS_FORMAT, STANDARDS_VERSION } from '../../../src/core/calibration/standards.ts';
import { emptyStandards, withAmount, withUnit } from '../../../src/ui/calibration/standards-edit.ts';

// src/ui/calibration/standards-edit.ts: the page's edits of the standards'
// amounts table; each returns a new table and leaves its input alone.
describe('emptyStandards', () => {
  it('one column per named peak, no unit yet, no rows, in the table format the loader reads', () => {
    const names = ['A', 'B'];
    const t = emptyStandards(names);
    expect(t).toEqual({ format: STANDARDS_FORMAT, version: STANDARDS_VERSION, names: ['A', 'B'], units: ['', ''], rows: [] });
    names.push('C');
    expect(t.names).toEqual(['A', 'B']); // a copy of the caller's list
  });
});

describe('withAmount / withUnit', () => {
  it('a cell adds its row and column; a unit sets one column; the input is unchanged', () => {
    const t0 = emptyStandards(['A']);
    const t1 = withAmount(t0, 's1.csv', 'B', 2);
    expect(t0.rows).toEqual([]);
    expect(t0.names).toEqual(['A']);
    expect(t1.names).toEqual(['A', 'B']);
    expect(t1.rows).toEqual([{ standard: 's1.csv', line: null, amounts: [null, 2] }]);
    expect(withAmount(t1, 's1.csv', 'B', null).rows[0].amounts).toEqual([null, null]);
    expect(t1.rows[0].amounts).toEqual([null, 2]);
    expect(withUnit(t1, 'B', ' mg/L ').units).toEqual(['', 'mg/L']);
  });
  it('a new column takes the first column’s unit and an empty cell in every existing row', () => {
    let t = withUnit(emptyStandards(['A']), 'A', 'µg/mL');
    t = withAmount(t, 's1', 'A', 1);
    t = withAmount(t, 's2', 'B', 5);
    expect(t.units).toEqual(['µg/mL', 'µg/mL']);
    expect(t.rows).toEqual([{ standard: 's1', line: null, amounts: [1, null] }, { standard: 's2', line: null, amounts: [null, 5] }]);
  });
  it('setting a cell of an existing row changes only that cell', () => {
    let t = withAmount(withAmount(emptyStandards(['A', 'B']), 's1', 'A', 1), 's2', 'B', 4);
    t = withAmount(t, 's1', 'B', 2);
    expect(t.rows.map((r) => r.amounts)).toEqual([[1, 2], [null, 4]]);
  });
  it('a unit for a peak not yet in the table adds its column (empty cells)', () => {
    const t = withUnit(withAmount(emptyStandards(['A']), 's1', 'A', 1), 'C', 'mg/L');
    expect(t.names).toEqual(['A', 'C']);
    expect(t.units).toEqual(['', 'mg/L']);
    expect(t.rows[0].amounts).toEqual([1, null]);
  });
});
