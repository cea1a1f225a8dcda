// Batch combiner: mean, sample SD (n − 1) and %RSD per matched peak, against NumPy
// (np.mean, np.std(ddof=1); test/reference/make_fit.py, values in fit.json).
import { describe, expect, it } from 'vitest';
import { combineBatchPeaks } from '../../../src/core/measure/batch-figures.ts';
import type { BatchCombination, BatchRun } from '../../../src/core/measure/batch-figures.ts';
import { fitRef, relErr } from './ref.ts';

const { rt, area, stats } = fitRef.batch;
function combine(r: BatchRun[], window: number): BatchCombination {
  const out = combineBatchPeaks(r, window);
  if (!out.ok) throw new Error(out.message);
  return out.combination;
}

const runs: BatchRun[] = [0, 1, 2, 3].map((f) => ({
  name: `run-${f + 1}.csv`,
  // Peaks listed late-first in odd files: the order inside a file must not matter.
  peaks: (f % 2 ? [1, 0] : [0, 1]).map((g) => ({ retentionTime: rt[g][f], area: area[g][f] })),
}));

describe(`batch combiner (NumPy ${fitRef.numpy})`, () => {
  it('matches peaks by retention time and gives mean and %RSD of retention time and area', () => {
    const out = combine(runs, 0.1);
    expect(out.groups.length).toBe(2);
    out.groups.forEach((g, i) => {
      expect(g.members.length).toBe(4);
      expect(g.missing).toEqual([]);
      expect(relErr(g.retentionTime.mean, stats[i].rt.mean)).toBeLessThan(1e-14);
      expect(relErr(g.retentionTime.sd as number, stats[i].rt.sd)).toBeLessThan(1e-12);
      expect(relErr(g.retentionTime.rsdPercent as number, stats[i].rt.rsd)).toBeLessThan(1e-12);
      expect(relErr(g.area.mean, stats[i].area.mean)).toBeLessThan(1e-14);
      expect(relErr(g.area.rsdPercent as number, stats[i].area.rsd)).toBeLessThan(1e-12);
    });
    expect(out.notes[0]).toMatch(/within ±0.1/);
  });
  it('a peak missing from one file and an extra peak in another', () => {
    const more: BatchRun[] = [
      ...runs.slice(0, 3),
      { name: 'run-4.csv', peaks: [{ retentionTime: 5.01, area: 100 }, { retentionTime: 9.2, area: 3 }] },
    ];
    const out = combine(more, 0.1);
    expect(out.groups.map((g) => g.members.length)).toEqual([4, 3, 1]);
    expect(out.groups[1].missing).toEqual(['run-4.csv']);
    expect(out.groups[2].retentionTime.sd).toBeNull();
    expect(out.groups[2].area.rsdPercent).toBeNull();
  });
  it('two peaks of one file within one window go to different groups, and the ambiguity is noted', () => {
    const out = combine(
      [
        { name: 'a', peaks: [{ retentionTime: 5.0, area: 1 }, { retentionTime: 5.05, area: 2 }] },
        { name: 'b', peaks: [{ retentionTime: 5.04, area: 2.1 }, { retentionTime: 5.01, area: 1.1 }] },
      ],
      0.1,
    );
    expect(out.groups.map((g) => g.members.map((m) => m.area))).toEqual([[1, 1.1], [2, 2.1]]);
    expect(out.notes.some((n) => /ambiguous/.test(n))).toBe(true);
  });
  it('a window that is not a positive number is refused', () => {
    expect(combineBatchPeaks(runs, 0)).toEqual({ ok: false, message: expect.stringMatching(/positive number/) });
    expect(combineBatchPeaks(runs, NaN).ok).toBe(false);
  });
});
