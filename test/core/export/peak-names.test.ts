/**
 * Names of peaks in the exports (src/core/export/peak-names.ts): a name column
 * after "peak #", and the found and missing named peaks in words (moved from
 * test/core/calibration/wiring.test.ts).
 */
import { describe, expect, test } from 'vitest';
import { emptyNamedPeakTable } from '../../../src/core/calibration/named-peaks.ts';
import { namedPeakLines, peakNamingOf, withNameColumn } from '../../../src/core/export/peak-names.ts';
import { defaultAnalysis, emptyRecipe } from '../../../src/core/method.ts';
import type { Peak } from '../../../src/core/measure/peak-types.ts';
import { named, samples } from '../calibration/wiring-fixture.ts';

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

describe('peakNamingOf', () => {
  test('no naming without a named-peak table; with one, the peak inside A\'s window (1 ± 0.2) is A and B is missing', () => {
    const peaks = [{ x: 1.05, height: 2, area: 3 }, { x: 5, height: 1, area: 1 }] as unknown as Peak[];
    expect(peakNamingOf(undefined, peaks)).toBeNull();
    expect(peakNamingOf(emptyRecipe(), peaks)).toBeNull();
    const method = { ...emptyRecipe(), analysis: { ...defaultAnalysis(), namedPeaks: named } };
    const naming = peakNamingOf(method, peaks)!;
    expect(withNameColumn([['peak #', 'apex'], [1, 1.05], [2, 5]], naming)).toEqual([['peak #', 'name', 'apex'], [1, 'A', 1.05], [2, '', 5]]);
    expect(naming.missing).toEqual(['B']);
  });
});
