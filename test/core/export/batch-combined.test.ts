/**
 * The batch's combined table (src/core/export/batch-combined.ts): peaks matched
 * across files, mean, SD (n − 1) and %RSD = 100·SD/|mean| computed here by hand;
 * below-detection and removed peaks left out; the window said in the comments.
 * (batch.test.ts checks the same table through the whole batch export.)
 */
import { describe, expect, test } from 'vitest';
import { batchCombinedCsv, defaultMatchWindow, type CombinedRun } from '../../../src/core/export/batch-combined.ts';
import type { Peak } from '../../../src/core/measure/peak-types.ts';

const peak = (x: number, area: number, fwhm = 0.1, flag: Peak['flag'] = 'quantifiable', removedByUser = false) => ({ x, area, fwhm, flag, removedByUser }) as unknown as Peak;
const runs: CombinedRun[] = [
  { name: 'a.csv', peaks: [peak(2.00, 10), peak(4.00, 5, 0.2), peak(3, 1, 0.05, 'below-detection')] },
  { name: 'b.csv', peaks: [peak(2.02, 12), peak(4.01, 5.5, 0.2), peak(5, 9, 0.1, 'quantifiable', true)] },
  { name: 'c.csv', peaks: [peak(1.99, 11)] },
];
const opts = { delimiter: ',' as const, decimal: '.' as const };

function rows(csv: string): string[][] {
  return csv.split('\r\n').filter((l) => l && !l.startsWith('#')).map((l) => l.split(','));
}

describe('defaultMatchWindow', () => {
  test('half the median half-height width of the kept peaks; null with none', () => {
    // Kept widths 0.1, 0.2, 0.1, 0.2, 0.1 → median 0.1 → 0.05.
    expect(defaultMatchWindow(runs)).toBeCloseTo(0.05, 15);
    expect(defaultMatchWindow([{ name: 'x', peaks: [peak(1, 1, 0.1, 'below-detection')] }])).toBeNull();
  });
});

describe('batchCombinedCsv', () => {
  test('two matched peaks with mean, SD and %RSD by hand; the file without the second one named', () => {
    const csv = batchCombinedCsv(runs, opts, ['# head']);
    const r = rows(csv);
    expect(r).toHaveLength(3);
    const first = r[1];
    expect(first[1]).toBe('3');
    const areas = [10, 12, 11], mean = 11, sd = Math.sqrt(areas.reduce((s, v) => s + (v - mean) ** 2, 0) / 2);
    expect(Number(first[6])).toBeCloseTo(mean, 12);
    expect(Number(first[7])).toBeCloseTo(sd, 12);
    expect(Number(first[8])).toBeCloseTo((100 * sd) / mean, 10);
    const rt = [2.0, 2.02, 1.99], rtMean = (2.0 + 2.02 + 1.99) / 3;
    expect(Number(first[3])).toBeCloseTo(rtMean, 12);
    expect(Number(first[4])).toBeCloseTo(Math.sqrt(rt.reduce((s, v) => s + (v - rtMean) ** 2, 0) / 2), 12);
    expect(r[2][1]).toBe('2');
    expect(r[2][2]).toBe('c.csv');
    // The below-detection peak at 3 and the removed one at 5 start no group.
    expect(csv).not.toMatch(/,3,1,|: 5,/);
    expect(csv).toMatch(/Matching window: ±0\.05 x-units, half the median half-height width/);
  });

  test('a window given is said to be given; nothing to combine is said in a comment', () => {
    expect(batchCombinedCsv(runs, opts, [], 0.2)).toMatch(/±0\.2 x-units, as given/);
    const none = batchCombinedCsv([{ name: 'x', peaks: [] }], opts, []);
    expect(none).toMatch(/nothing to combine/);
    expect(rows(none)).toHaveLength(1);
  });
});
