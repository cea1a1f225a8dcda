/** Issue 17: report fields and the matching of a hand change's reason to its peak row. */
import { describe, expect, test } from 'vitest';
import { cleanReportFields, reasonFor, reportFieldPairs } from '../../../src/core/export/report-fields.ts';
import type { Peak } from '../../../src/core/measure/peak-types.ts';

const peak = (p: Partial<Peak>) => ({ x: 5, fwhm: 0.2, origin: 'detected', ...p }) as unknown as Peak;

describe('report fields', () => {
  test('filled fields in the page order, trimmed; empty ones left out; odd saved values become empty', () => {
    expect(reportFieldPairs({ analyst: ' A. Chemist ', sample: '', instrument: 'LC-2', run: '   ' })).toEqual([['Analyst', 'A. Chemist'], ['Instrument', 'LC-2']]);
    expect(reportFieldPairs(null)).toEqual([]);
    expect(cleanReportFields({ analyst: 'x'.repeat(500), sample: 3, run: null })).toEqual({ analyst: 'x'.repeat(200), sample: '', instrument: '', run: '' });
  });

  test('a reason goes to the row of its own kind within half the FWHM (or one sample); the nearest wins', () => {
    const reasons = [
      { kind: 'removed' as const, x: 5.08, reason: 'carry-over' },
      { kind: 'removed' as const, x: 5.02, reason: 'nearer' },
      { kind: 'added' as const, x: 5, reason: 'wrong kind' },
      { kind: 'bounds' as const, x: 7, reason: 'elsewhere' },
    ];
    expect(reasonFor(peak({ removedByUser: true }), reasons)).toBe('nearer');
    expect(reasonFor(peak({ removedByUser: true, x: 5.15 }), reasons)).toBe('carry-over'); // 0.07 away, within 0.1
    expect(reasonFor(peak({ removedByUser: true, x: 5.3 }), reasons)).toBe(''); // 0.22 away: beyond half the FWHM
    expect(reasonFor(peak({ x: 7, fwhm: 0, boundsByUser: true }), reasons, 0.01)).toBe('elsewhere'); // no width: one sample
    expect(reasonFor(peak({}), reasons)).toBe(''); // no hand change, no reason
  });
});
