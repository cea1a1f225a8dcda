import { beforeEach, describe, expect, it } from 'vitest';
import { currentResult } from '../../../src/state/selectors.ts';
import { useApp } from '../../../src/state/store.ts';
import { pickNamedPeakAt } from '../../../src/ui/calibration/pick.ts';
import { loadDemoSample, resetStore } from '../harness.ts';

// src/ui/calibration/pick.ts: a click while naming makes the nearest live
// peak a named peak. Peaks are the invented demo's (public/demo/demo-truth.json:
// centres 1.2, 2.6, 4.3, 6.0 (+ shoulder 6.35), 8.5 min).
beforeEach(() => resetStore());

describe('pickNamedPeakAt', () => {
  it('no measured peak: a warning that says what to do, nothing named', () => {
    pickNamedPeakAt(4.3);
    const n = useApp.getState().notices[0];
    expect(n).toMatchObject({ kind: 'warning', title: 'No peak to name here' });
    expect(n.lines[0]).toContain('adjust the peak settings');
    expect(useApp.getState().namedPeaks.peaks).toEqual([]);
  });

  it('names the nearest live peak "Peak 1" at its apex with its FWHM as window, in the sample’s x unit', async () => {
    await loadDemoSample();
    const peak = currentResult(useApp.getState())!.peaks.find((p) => Math.abs(p.x - 4.3) < 0.05)!;
    pickNamedPeakAt(4.2); // a click a little off the apex
    const t = useApp.getState().namedPeaks;
    expect(t.peaks).toEqual([{ name: 'Peak 1', position: peak.x, window: peak.fwhm }]);
    expect(t.xUnit).toBe('min'); // demo-truth.json x.unit
    expect(Math.abs(t.peaks[0].position - 4.3)).toBeLessThan(0.02); // the true centre, within two samples
  });

  it('a second click inside a named window is refused with a note; another peak gets the next free number', async () => {
    await loadDemoSample();
    pickNamedPeakAt(4.3);
    pickNamedPeakAt(4.31);
    expect(useApp.getState().namedPeaks.peaks).toHaveLength(1);
    const n = useApp.getState().notices[0];
    expect(n.kind).toBe('info');
    const x = useApp.getState().namedPeaks.peaks[0].position;
    expect(n.title).toBe(`The peak at ${x.toPrecision(5)} already lies in a named peak's window`); // five significant digits
    useApp.getState().updateNamedPeak(0, { name: 'peak 2' }); // the user took "Peak 2" (any case)
    pickNamedPeakAt(1.2);
    expect(useApp.getState().namedPeaks.peaks.map((p) => p.name)).toEqual(['peak 2', 'Peak 3']);
  });

  it('a peak removed by hand is never named', async () => {
    await loadDemoSample();
    const s = useApp.getState();
    const r = currentResult(s)!;
    const i = r.peaks.findIndex((p) => Math.abs(p.x - 1.2) < 0.05);
    useApp.setState({ result: { ...r, peaks: r.peaks.map((p, k) => (k === i ? { ...p, removedByUser: true } : p)) } });
    pickNamedPeakAt(1.2);
    expect(Math.abs(useApp.getState().namedPeaks.peaks[0].position - 1.2)).toBeGreaterThan(0.5);
  });
});
