import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { findLocalMaxima, peakProminences, peakWidths, selectByDistance } from '../../../src/core/measure/peak-detection.ts';

// Values computed by SciPy (version recorded in the file) with the committed
// script test/reference/make_peaks.py.
interface RefTrace {
  name: string;
  y: number[];
  maxima: number[];
  prominences: number[];
  leftBases: number[];
  rightBases: number[];
  wlen: number;
  prominencesWlen: number[];
  leftBasesWlen: number[];
  rightBasesWlen: number[];
  widths05: { widths: number[]; heights: number[]; left: number[]; right: number[] };
  widths10: { widths: number[]; heights: number[]; left: number[]; right: number[] };
  minProminence: number;
  distance: number;
  distanceTieFree: boolean;
  findPeaksProminenceDistance: number[];
  findPeaksProminence: number[];
  prominenceThenDistance: number[];
  prominenceThenDistanceTieFree: boolean;
  minWidthSamples: number;
  findPeaksProminenceWidth: number[];
  distance3Maxima: number[] | null;
}
interface Ref {
  scipy: string;
  numpy: string;
  small: {
    triangle: { peaks: number[]; prominences: number[]; leftBases: number[]; rightBases: number[]; w05: number[][]; w10: number[][] };
    prominences: number[];
    distance3: number[];
    distance2: number[];
    plateau5: number[];
    plateau4: number[];
  };
  traces: RefTrace[];
}
const ref = JSON.parse(readFileSync(new URL('../../reference/peaks.json', import.meta.url), 'utf8')) as Ref;

const TOL = 1e-9;
function expectClose(actual: ArrayLike<number>, expected: number[]): void {
  expect(actual.length).toBe(expected.length);
  for (let i = 0; i < expected.length; i++) {
    if (Math.abs(actual[i] - expected[i]) > TOL * Math.max(1, Math.abs(expected[i]))) {
      expect.fail(`entry ${i}: ${actual[i]} vs SciPy ${expected[i]}`);
    }
  }
}

/** SciPy find_peaks order: maxima, distance, prominence, width (scipy/signal/_peak_finding.py). */
function findPeaksLikeScipy(y: Float64Array, opts: { prominence?: number; distance?: number; width?: number }): number[] {
  let peaks = findLocalMaxima(y);
  if (opts.distance !== undefined) peaks = selectByDistance(peaks, y, opts.distance);
  if (opts.prominence === undefined && opts.width === undefined) return Array.from(peaks);
  const pd = peakProminences(y, peaks);
  let keep = Array.from(peaks, (_, k) => k);
  if (opts.prominence !== undefined) keep = keep.filter((k) => pd.prominences[k] >= (opts.prominence as number));
  if (opts.width !== undefined) {
    const sub = keep.map((k) => peaks[k]);
    const w = peakWidths(y, sub, 0.5, {
      prominences: Float64Array.from(keep, (k) => pd.prominences[k]),
      leftBases: Int32Array.from(keep, (k) => pd.leftBases[k]),
      rightBases: Int32Array.from(keep, (k) => pd.rightBases[k]),
    });
    keep = keep.filter((_, t) => w.widths[t] >= (opts.width as number));
  }
  return keep.map((k) => peaks[k]);
}

describe('small published examples (REFERENCES.md peaks table, SciPy)', () => {
  it('triangle [0,1,3,7,3,1,0]: peak 3, prominence 7, bases 0 and 6, widths 1.75 and 6.0', () => {
    const y = Float64Array.of(0, 1, 3, 7, 3, 1, 0);
    const p = findLocalMaxima(y);
    expect(Array.from(p)).toEqual([3]);
    const pd = peakProminences(y, p);
    expect(Array.from(pd.prominences)).toEqual([7]);
    expect([pd.leftBases[0], pd.rightBases[0]]).toEqual([0, 6]);
    const w05 = peakWidths(y, p, 0.5, pd);
    expect(w05.widths[0]).toBeCloseTo(1.75, 12);
    expect(w05.leftIps[0]).toBeCloseTo(2.125, 12);
    expect(w05.rightIps[0]).toBeCloseTo(3.875, 12);
    expect(peakWidths(y, p, 1.0, pd).widths[0]).toBeCloseTo(6.0, 12);
    // And the same numbers as SciPy printed them into peaks.json.
    expect(Array.from(w05.widths)).toEqual(ref.small.triangle.w05[0]);
  });

  it('plateaus: [0,1,1,1,0] → 2, [0,1,1,0] → 1 (middle, rounded down)', () => {
    expect(Array.from(findLocalMaxima([0, 1, 1, 1, 0]))).toEqual([2]);
    expect(Array.from(findLocalMaxima([0, 1, 1, 0]))).toEqual([1]);
    expect(ref.small.plateau5).toEqual([2]);
    expect(ref.small.plateau4).toEqual([1]);
  });

  it('first and last samples are never maxima; a plateau running to the end is not a peak', () => {
    expect(Array.from(findLocalMaxima([5, 1, 2, 1, 5]))).toEqual([2]);
    expect(Array.from(findLocalMaxima([0, 1, 2, 2, 2]))).toEqual([]);
    expect(Array.from(findLocalMaxima([1, 2]))).toEqual([]);
  });

  it('prominences of [0,2,1,5,1,3,0] at 1, 3, 5 are 1, 5, 2', () => {
    const y = [0, 2, 1, 5, 1, 3, 0];
    expect(Array.from(peakProminences(y, [1, 3, 5]).prominences)).toEqual([1, 5, 2]);
  });

  it('distance rule on [0,5,0,4,0,6,0]: 3 → [1,5], 2 → [1,3,5]', () => {
    const y = [0, 5, 0, 4, 0, 6, 0];
    const p = findLocalMaxima(y);
    expect(Array.from(selectByDistance(p, y, 3))).toEqual([1, 5]);
    expect(Array.from(selectByDistance(p, y, 2))).toEqual([1, 3, 5]);
  });

  it('refuses impossible arguments with a sentence', () => {
    expect(() => peakProminences([0, 1, 0], [5])).toThrow(/not a sample/);
    expect(() => peakProminences([0, 1, 0], [1], 1)).toThrow(/more than 1/);
    expect(() => selectByDistance([1], [0, 1, 0], 0.5)).toThrow(/at least 1/);
    expect(() => peakWidths([0, 1, 0], [1], -1, peakProminences([0, 1, 0], [1]))).toThrow(/0 or more/);
  });
});

describe(`seeded reference traces against SciPy ${ref.scipy} / NumPy ${ref.numpy}`, () => {
  for (const t of ref.traces) {
    describe(t.name, () => {
      const y = Float64Array.from(t.y);

      it('local maxima match find_peaks() exactly', () => {
        expect(Array.from(findLocalMaxima(y))).toEqual(t.maxima);
      });

      it('prominences and bases match peak_prominences (sweep and walk agree)', () => {
        const pd = peakProminences(y, t.maxima);
        expect(Array.from(pd.leftBases)).toEqual(t.leftBases);
        expect(Array.from(pd.rightBases)).toEqual(t.rightBases);
        expectClose(pd.prominences, t.prominences);
        // Fewer than 32 peaks take the walking path: check it on a slice in reverse order.
        const some = t.maxima.slice(0, 20).reverse();
        const pw = peakProminences(y, some);
        expect(Array.from(pw.leftBases)).toEqual(t.leftBases.slice(0, 20).reverse());
        expect(Array.from(pw.rightBases)).toEqual(t.rightBases.slice(0, 20).reverse());
        expectClose(pw.prominences, t.prominences.slice(0, 20).reverse());
        // The sweep on unsorted input (all peaks, reversed).
        const rev = peakProminences(y, [...t.maxima].reverse());
        expect(Array.from(rev.leftBases)).toEqual([...t.leftBases].reverse());
      });

      it(`prominences with wlen = ${t.wlen} match`, () => {
        const pd = peakProminences(y, t.maxima, t.wlen);
        expect(Array.from(pd.leftBases)).toEqual(t.leftBasesWlen);
        expect(Array.from(pd.rightBases)).toEqual(t.rightBasesWlen);
        expectClose(pd.prominences, t.prominencesWlen);
      });

      it('peak_widths at rel_height 0.5 and 1.0 match', () => {
        const pd = peakProminences(y, t.maxima);
        for (const [r, exp] of [[0.5, t.widths05], [1.0, t.widths10]] as const) {
          const w = peakWidths(y, t.maxima, r, pd);
          expectClose(w.widths, exp.widths);
          expectClose(w.widthHeights, exp.heights);
          expectClose(w.leftIps, exp.left);
          expectClose(w.rightIps, exp.right);
        }
      });

      it('find_peaks with prominence, with prominence + width, and with distance', () => {
        expect(findPeaksLikeScipy(y, { prominence: t.minProminence })).toEqual(t.findPeaksProminence);
        expect(findPeaksLikeScipy(y, { prominence: t.minProminence, width: t.minWidthSamples })).toEqual(t.findPeaksProminenceWidth);
        if (t.distanceTieFree) {
          expect(findPeaksLikeScipy(y, { prominence: t.minProminence, distance: t.distance })).toEqual(t.findPeaksProminenceDistance);
          expect(findPeaksLikeScipy(y, { distance: 3 })).toEqual(t.distance3Maxima);
        }
        if (t.prominenceThenDistanceTieFree) {
          const p = Int32Array.from(t.findPeaksProminence);
          expect(Array.from(selectByDistance(p, y, t.distance))).toEqual(t.prominenceThenDistance);
        }
      });
    });
  }

  it('at least three traces were free of height ties, so the distance rule was really compared', () => {
    expect(ref.traces.filter((t) => t.distanceTieFree).length).toBeGreaterThanOrEqual(3);
  });
});
