/** Issue 17: the one loss confirmation per export session lists the strongest few of each kind, then counts. */
import { describe, expect, test } from 'vitest';
import type { LossItem } from '../../../src/core/analysis/result.ts';
import { lossCounts, lossSummaryLines } from '../../../src/core/export/loss-summary.ts';
import { areaPercents } from '../../../src/core/export/peak-csv.ts';
import type { Peak } from '../../../src/core/measure/peak-types.ts';

const item = (kind: LossItem['kind'], x: number, snr: number | null): LossItem => ({ kind, x, snr, sentence: `${kind} at ${x}` });

describe('loss summary', () => {
  test('per kind: count, the three strongest by S/N, then how many more; sentences not tied to one feature follow', () => {
    const items = [item('lost', 1, 4), item('lost', 2, 40), item('weakened', 3, 12), item('lost', 4, 7), item('lost', 5, 5.5), item('appeared', 6, null)];
    const noiseSum = 'Within the noise range (below S/N 4.1, which pure noise of this length reaches about once) 7 detectable features are lost or weakened; the ledger lists them.';
    const lines = lossSummaryLines(items, [...items.map((i) => i.sentence), noiseSum], 'min');
    expect(lines).toEqual([
      'Lost: 4 features, the 3 strongest at 2.0000 min (S/N 40.0 raw), at 4.0000 min (S/N 7.0 raw), at 5.0000 min (S/N 5.5 raw), and 1 more.',
      'Weakened: 1 feature, at 3.0000 min (S/N 12.0 raw).',
      'Appear only after processing: 1 feature, at 6.0000 min.',
      noiseSum,
    ]);
    expect(lossCounts(items)).toEqual({ lost: 4, weakened: 1, appeared: 1 });
  });

  test('a result made before the items existed: every warning is shown as it is', () => {
    expect(lossSummaryLines([], ['a', 'b'])).toEqual(['a', 'b']);
  });

  test('area % of the peaks kept sums to 100; a row removed by hand has none', () => {
    const p = (area: number, removedByUser = false) => ({ area, removedByUser }) as unknown as Peak;
    const shares = areaPercents([p(1), p(3), p(5, true), p(4)]);
    expect(shares[2]).toBeNull();
    expect(shares[0]! + shares[1]! + shares[3]!).toBeCloseTo(100, 12);
    expect(shares[1]).toBeCloseTo(37.5, 12); // 3 / 8, by hand
  });
});
