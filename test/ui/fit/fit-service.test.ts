import { beforeEach, describe, expect, it } from 'vitest';
import type { Peak } from '../../../src/core/measure/peak-types.ts';
import { useApp } from '../../../src/state/store.ts';
import { fitRegion, regionAroundPeak, requestFit } from '../../../src/ui/fit/fit-service.ts';
import { loadDemoSample, resetStore } from '../harness.ts';

// src/ui/fit/fit-service.ts: the fit panel's request, built from the store
// and run by the page's backend (in this thread here). Truth from
// public/demo/demo-truth.json: the large isolated peak at 4.3 min, height 8
// mAU above the drift, FWHM 0.188386 min.
beforeEach(() => resetStore());

describe('fitRegion', () => {
  it('the marked range first, else the zoomed range, else none', () => {
    expect(fitRegion()).toBeNull();
    useApp.getState().setXRange([1, 9]);
    expect(fitRegion()).toEqual([1, 9]);
    useApp.getState().setMarkedRange([4, 5]);
    expect(fitRegion()).toEqual([4, 5]);
  });
});

describe('regionAroundPeak', () => {
  const pk = (x: number, start: number, end: number, fwhm: number, removedByUser = false) => ({ x, start, end, fwhm, removedByUser }) as unknown as Peak;
  it('the peak’s bounds plus one half-height width each side', () => {
    expect(regionAroundPeak([pk(5, 4.5, 5.5, 0.2)], 5)).toEqual([4.3, 5.7]);
  });
  it('takes in live neighbours that share its bounds (an overlap), not a removed one or a separate one', () => {
    const peaks = [pk(5, 4.5, 5.5, 0.2), pk(5.8, 5.5, 6.2, 0.3), pk(3, 2.8, 4.5, 0.1, true), pk(8, 7.5, 8.5, 0.2)];
    const [from, to] = regionAroundPeak(peaks, 5)!;
    expect(from).toBeCloseTo(4.3, 12);
    expect(to).toBeCloseTo(6.4, 12);
  });
  it('no peak at that x: null', () => {
    expect(regionAroundPeak([pk(5, 4.5, 5.5, 0.2)], 5.1)).toBeNull();
  });
});

describe('requestFit', () => {
  it('without a region: the panel says how to mark one, and no fit is kept', async () => {
    await loadDemoSample();
    await requestFit();
    expect(useApp.getState().fitError).toMatch(/^Mark a region first/);
    expect(useApp.getState().fits).toEqual([]);
    expect(useApp.getState().fitBusy).toBe(false);
  });
  it('fits the demo’s isolated peak to its true position, height and width, and keeps the fit for this sample', async () => {
    await loadDemoSample();
    useApp.getState().setMarkedRange([3.8, 4.8]);
    useApp.getState().setFitChoices({ maxPeaks: 2 });
    await requestFit();
    const s = useApp.getState();
    expect(s.fitError).toBeNull();
    expect(s.fitBusy).toBe(false);
    expect(s.fits).toHaveLength(1);
    const f = s.fits[0];
    expect(f.sampleId).toBe(s.sampleId);
    expect(f.stackKey).toBe(JSON.stringify(s.recipe.steps));
    expect(f.result.count).toBe(1);
    const p = f.result.fit.peaks[0];
    expect(p.position.value).toBeCloseTo(4.3, 2);
    expect(Math.abs(p.height.value - 8) / 8).toBeLessThan(0.02); // noise SD 0.05 against height 8
    expect(Math.abs(p.fwhm.value - 0.188386) / 0.188386).toBeLessThan(0.03);
  });
  it('a region the core refuses: its message is shown, nothing kept', async () => {
    await loadDemoSample();
    useApp.getState().setMarkedRange([5, 5]);
    await requestFit();
    expect(useApp.getState().fitError).toBe('The region must run from a smaller to a larger x (got 5 to 5).');
    expect(useApp.getState().fits).toEqual([]);
  });
});
