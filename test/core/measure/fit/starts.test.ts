// Starting peaks for a region fit from the peak table (src/core/measure/fit/starts.ts):
// the definition in the module (rows not removed, apex inside the region, positive
// height and width, largest first, at most MAX_PEAKS).
import { describe, expect, it } from 'vitest';
import { startsInRegion } from '../../../../src/core/measure/fit/starts.ts';
import { MAX_PEAKS } from '../../../../src/core/measure/fit/region.ts';
import type { Peak } from '../../../../src/core/measure/peak-types.ts';

const row = (x: number, height: number, fwhm = 0.2, removedByUser = false) => ({ x, height, fwhm, removedByUser }) as unknown as Peak;

describe('startsInRegion', () => {
  it('keeps rows with their apex inside [from, to] (ends included), largest first', () => {
    const peaks = [row(1, 5), row(2, 3), row(3, 9), row(4, 1), row(5, 7)];
    expect(startsInRegion(peaks, 2, 4)).toEqual([
      { position: 3, height: 9, fwhm: 0.2 }, { position: 2, height: 3, fwhm: 0.2 }, { position: 4, height: 1, fwhm: 0.2 },
    ]);
  });

  it('leaves out removed rows, dips, zero widths, and keeps at most MAX_PEAKS', () => {
    const peaks = [row(2, 5, 0.2, true), row(2.1, -3), row(2.2, 4, 0), ...Array.from({ length: MAX_PEAKS + 2 }, (_, k) => row(2.5 + 0.1 * k, 1 + k))];
    const s = startsInRegion(peaks, 2, 4);
    expect(s).toHaveLength(MAX_PEAKS);
    expect(s.map((p) => p.height)).toEqual(Array.from({ length: MAX_PEAKS }, (_, k) => MAX_PEAKS + 2 - k));
    expect(startsInRegion(peaks, 10, 20)).toEqual([]);
  });

  it('does not reorder the table it is given', () => {
    const peaks = [row(1, 1), row(2, 2)];
    startsInRegion(peaks, 0, 3);
    expect(peaks.map((p) => p.x)).toEqual([1, 2]);
  });
});
