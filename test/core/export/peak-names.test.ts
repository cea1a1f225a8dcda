/**
 * Names of peaks in the exports (src/core/export/peak-names.ts): a name column
 * after "peak #", and the found and missing named peaks in words (moved from
 * test/core/calibration/wiring.test.ts).
 */
import { describe, expect, test } from 'vitest';
import { emptyNamedPeakTable } from '../../../src/core/calibration/named-peaks.ts';
import { namedPeakLines, withNameColumn } from '../../../src/core/export/peak-names.ts';
import { samples } from '../calibration/wiring-fixture.ts';

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
