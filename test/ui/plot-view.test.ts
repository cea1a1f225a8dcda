import { describe, expect, it } from 'vitest';
import { lostFeatures, visibleYRange, type LostRowLike } from '../../src/ui/plot-view.ts';
import { makeRng } from '../../src/core/numeric/random.ts';

// Hand-computed cases (issue 17): y fits the drawn data inside the x-range only.
describe('visibleYRange', () => {
  const a = { x: [0, 1, 2, 3, 4], y: [10, 1, 2, 3, -50] };
  const b = { x: [1.5, 2.5], y: [4, 0], yaxis: 'y' };
  const r = { x: [0, 1, 2, 3, 4], y: [100, 100, 100, 100, 100], yaxis: 'y2' };
  it('takes the extremes of every series on the axis inside the range, padded by 6 % of the span', () => {
    // inside [1, 3]: a gives 1, 2, 3; b gives 4, 0 → 0 … 4, span 4, pad 0.24
    const got = visibleYRange([a, b, r], 1, 3)!;
    expect(got[0]).toBeCloseTo(-0.24, 12);
    expect(got[1]).toBeCloseTo(4.24, 12);
  });
  it('reads the other axis apart, and says null when nothing is in view', () => {
    // a flat series: span taken as 10 % of its level, 100 ± 0.06 × 10
    expect(visibleYRange([a, b, r], 1, 3, 'y2')).toEqual([99.4, 100.6]);
    expect(visibleYRange([a], 10, 20)).toBeNull();
  });
  it('leaves out hidden series', () => {
    expect(visibleYRange([{ ...a, visible: 'legendonly' as const }, b], 0, 4, 'y', 0)).toEqual([0, 4]);
  });
});

import { nearestPoint, slopeUnit, twoPointMeasure } from '../../src/ui/plot-view.ts';

// Hand-computed (issue 17): the readout takes the nearest sample in x, ties to the left.
describe('readout helpers', () => {
  const s = { name: 'raw', x: [0, 1, 2, 4], y: [5, 6, 7, 9] };
  it('finds the nearest sample', () => {
    expect(nearestPoint(s, 2.9)).toEqual({ x: 2, y: 7, index: 2 });
    expect(nearestPoint(s, 3)).toEqual({ x: 2, y: 7, index: 2 });
    expect(nearestPoint(s, 3.1)).toEqual({ x: 4, y: 9, index: 3 });
    expect(nearestPoint(s, -5)).toEqual({ x: 0, y: 5, index: 0 });
    expect(nearestPoint(s, 99)).toEqual({ x: 4, y: 9, index: 3 });
  });
  it('measures Δx, Δy and the slope with its unit', () => {
    expect(twoPointMeasure({ x: 1, y: 2 }, { x: 3, y: 8 })).toEqual({ dx: 2, dy: 6, slope: 3 });
    expect(twoPointMeasure({ x: 1, y: 2 }, { x: 1, y: 8 }).slope).toBeNull();
    expect(slopeUnit('mAU', 'min')).toBe('mAU/min');
    expect(slopeUnit('mV', 'ml/min')).toBe('mV/(ml/min)');
    expect(slopeUnit('', '')).toBe('');
  });
});

// Issue 16: rings on features some choice loses, at most LOST_RINGS, quantifiable first, then the highest S/N where first found.
describe('lostFeatures', () => {
  const cell = (found: boolean, snr: number | null, standing: string) => ({ found, snr, standing });
  it('keeps only features detectable where first found and lost in a later column (worked by hand)', () => {
    const rows: LostRowLike[] = [
      { position: 1, firstFoundIn: 0, cells: [cell(true, 12, 'quantifiable'), cell(false, null, 'not-found')] }, // lost: kept
      { position: 2, firstFoundIn: 0, cells: [cell(true, 2, 'below-detection'), cell(false, null, 'not-found')] }, // below S/N 3 first: not ringed
      { position: 3, firstFoundIn: 0, cells: [cell(true, 5, 'detectable'), cell(true, 4, 'detectable')] }, // never lost
      { position: 4, firstFoundIn: 1, cells: [cell(false, null, 'not-found'), cell(true, 6, 'detectable')] }, // born later, not lost after
      { position: 5, firstFoundIn: 0, cells: [cell(true, 4, 'detectable'), cell(true, 3.5, 'detectable'), cell(false, null, 'not-found')] }, // lost in the third
    ];
    expect(lostFeatures(rows).ringed.map((r) => r.position)).toEqual([1, 5]);
    expect(lostFeatures(rows).of).toBe(2);
    // Cut to one: the quantifiable loss (S/N 12) before the detectable one (S/N 4).
    expect(lostFeatures(rows, 1).ringed.map((r) => r.position)).toEqual([1]);
  });

  it('over the cap: exactly the cap, every quantifiable loss before any detectable one, S/N order within, ledger order kept (random ledgers)', () => {
    const rng = makeRng(61);
    for (let t = 0; t < 50; t++) {
      const rows: LostRowLike[] = Array.from({ length: 40 + Math.floor(rng.uniform() * 200) }, (_, i) => {
        const snr = 3 + 20 * rng.uniform();
        return { position: i, firstFoundIn: 0, cells: [cell(true, snr, snr >= 10 ? 'quantifiable' : 'detectable'), cell(rng.uniform() < 0.3, null, 'not-found')] };
      });
      const cap = 1 + Math.floor(rng.uniform() * 60);
      const { ringed, of } = lostFeatures(rows, cap);
      const lost = rows.filter((r) => !r.cells[1].found);
      expect(of).toBe(lost.length);
      expect(ringed).toHaveLength(Math.min(cap, lost.length));
      expect(ringed.map((r) => r.position)).toEqual([...ringed.map((r) => r.position)].sort((a, b) => a - b));
      const weakestKept = Math.min(...ringed.map((r) => (r.cells[0].standing === 'quantifiable' ? 1e12 : 0) + r.cells[0].snr!));
      for (const r of lost) if (!ringed.includes(r)) expect((r.cells[0].standing === 'quantifiable' ? 1e12 : 0) + r.cells[0].snr!).toBeLessThanOrEqual(weakestKept);
    }
  });
});

import { bornSquares, type BornPeakLike } from '../../src/ui/plot-view.ts';

describe('bornSquares', () => {
  const pk = (flag: string, snr: number | null, born: boolean): BornPeakLike => ({ flag, snr, marks: born ? ['appears-only-after-processing'] : [] });
  it('squares only peaks marked as appearing only after processing, never below the detection limit (worked by hand)', () => {
    const peaks = [pk('quantifiable', 40, true), pk('detectable', 5, false), pk('below-detection', 2, true), pk('detectable', 4, true), pk('detectable', 6, true)];
    expect(bornSquares(peaks).squared).toEqual([peaks[0], peaks[3], peaks[4]]);
    expect(bornSquares(peaks).of).toBe(3);
    // Cut to two: the quantifiable one, then the detectable with the higher S/N (6 before 4), in the order given.
    expect(bornSquares(peaks, 2).squared).toEqual([peaks[0], peaks[4]]);
  });

  it('over the cap: exactly the cap, every quantifiable one before any detectable, S/N order within, order kept (random tables)', () => {
    const rng = makeRng(62);
    for (let t = 0; t < 50; t++) {
      const peaks = Array.from({ length: 40 + Math.floor(rng.uniform() * 200) }, () => {
        const snr = 3 + 20 * rng.uniform();
        return pk(snr >= 10 ? 'quantifiable' : 'detectable', snr, rng.uniform() < 0.5);
      });
      const cap = 1 + Math.floor(rng.uniform() * 60);
      const { squared, of } = bornSquares(peaks, cap);
      const born = peaks.filter((p) => p.marks.length > 0);
      expect(of).toBe(born.length);
      expect(squared).toHaveLength(Math.min(cap, born.length));
      // Nothing left out outranks anything kept.
      const rank = (p: BornPeakLike) => (p.flag === 'quantifiable' ? 1e12 : 0) + (p.snr ?? 0);
      const kept = new Set(squared);
      const worstKept = Math.min(...squared.map(rank));
      for (const p of born) if (!kept.has(p)) expect(rank(p)).toBeLessThanOrEqual(worstKept);
      // The order given is kept.
      const idx = squared.map((p) => peaks.indexOf(p));
      expect(idx).toEqual([...idx].sort((a, b) => a - b));
    }
  });
});

import { replacedCrosses, REPLACED_CROSSES, type ReplacedLike } from '../../src/ui/plot-view.ts';

describe('replacedCrosses', () => {
  const ev = (x: number, original: number, replacement: number): ReplacedLike => ({ x, original, replacement });
  it('crosses the points in view, the largest changes first, in the order given (worked by hand)', () => {
    const events = [ev(1, 10, 0), ev(2, -3, 0), ev(3, 0, 7), ev(4, 1, 0.5), ev(9, 100, 0)];
    // In [1, 4]: changes 10, 3, 7, 0.5; the point at x = 9 is out of view.
    expect(replacedCrosses(events, 1, 4).of).toBe(4);
    expect(replacedCrosses(events, 1, 4).crossed).toEqual(events.slice(0, 4));
    // Cut to two: changes 10 and 7, kept in x order.
    expect(replacedCrosses(events, 1, 4, 2).crossed).toEqual([events[0], events[2]]);
    // Whole trace, cut to one: the change of 100.
    expect(replacedCrosses(events, -Infinity, Infinity, 1)).toEqual({ crossed: [events[4]], of: 5 });
    expect(REPLACED_CROSSES).toBeGreaterThan(0);
  });

  it('over the cap: exactly the cap, nothing left out changed more than anything kept, order kept (random lists)', () => {
    const rng = makeRng(63);
    for (let t = 0; t < 50; t++) {
      const events = Array.from({ length: 20 + Math.floor(rng.uniform() * 400) }, (_, i) => ev(i, rng.uniform() * 10, rng.uniform() < 0.2 ? 5 : rng.uniform() * 10));
      const from = rng.uniform() * 100, to = from + rng.uniform() * 400;
      const cap = 1 + Math.floor(rng.uniform() * 80);
      const { crossed, of } = replacedCrosses(events, from, to, cap);
      const inView = events.filter((e) => e.x >= from && e.x <= to);
      expect(of).toBe(inView.length);
      expect(crossed).toHaveLength(Math.min(cap, inView.length));
      const size = (e: ReplacedLike) => Math.abs(e.original - e.replacement);
      const kept = new Set(crossed);
      const least = Math.min(...crossed.map(size));
      for (const e of inView) if (!kept.has(e)) expect(size(e)).toBeLessThanOrEqual(least);
      const xs = crossed.map((e) => e.x);
      expect(xs).toEqual([...xs].sort((a, b) => a - b));
    }
  });
});
