/**
 * Issue 21 wiring helper left here: the page's edits of the amounts table
 * (src/ui/calibration/standards-edit.ts). The other cases moved to the own
 * test files of trace-keys, export/calibration-csv, export/peak-names and
 * export/report-calibration, with the shared calibration in wiring-fixture.ts.
 */
import { describe, expect, test } from 'vitest';
import { emptyStandards, withAmount, withUnit } from '../../../src/ui/calibration/standards-edit.ts';

describe('the page\'s edits of the amounts table', () => {
  test('a cell adds its row and column; a unit sets one column; the input is unchanged', () => {
    const t0 = emptyStandards(['A']);
    const t1 = withAmount(t0, 's1.csv', 'B', 2);
    expect(t0.rows).toEqual([]);
    expect(t1.names).toEqual(['A', 'B']);
    expect(t1.rows).toEqual([{ standard: 's1.csv', line: null, amounts: [null, 2] }]);
    expect(withAmount(t1, 's1.csv', 'B', null).rows[0].amounts).toEqual([null, null]);
    expect(withUnit(t1, 'B', ' mg/L ').units).toEqual(['', 'mg/L']);
  });
});


