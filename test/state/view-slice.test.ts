/**
 * src/state/view-slice.ts on a fresh store each: zoom per trace, what is
 * drawn, the plot's click modes (which exclude each other) and the selected
 * peak. Properties of the slice's own definition.
 */
import { describe, expect, it } from 'vitest';
import { createAppStore } from '../../src/state/store.ts';

describe('view slice: the plot’s click modes and the selected peak', () => {
  it('add-peak, mark and measure modes exclude each other', () => {
    const app = createAppStore();
    app.getState().setAddPeakMode(true);
    expect(app.getState().addPeakMode).toBe(true);
    app.getState().setMarkMode(true);
    expect(app.getState()).toMatchObject({ markMode: true, addPeakMode: false });
    app.getState().setAddPeakMode(true);
    expect(app.getState()).toMatchObject({ markMode: false, addPeakMode: true });
    app.getState().setMeasureMode(true);
    expect(app.getState()).toMatchObject({ measureMode: true, addPeakMode: false });
    // Naming peaks by a click (calibration slice) also ends the add-peak mode.
    app.getState().setAddPeakMode(true);
    app.getState().setNamePickMode(true);
    expect(app.getState()).toMatchObject({ namePickMode: true, addPeakMode: false });
  });

  it('turning measuring off leaves the add-peak mode as it was', () => {
    const app = createAppStore();
    app.getState().setAddPeakMode(true);
    app.getState().setMeasureMode(false);
    expect(app.getState()).toMatchObject({ measureMode: false, addPeakMode: true });
  });

  it('selects a peak by its x and clears it', () => {
    const app = createAppStore();
    expect(app.getState().selectedPeakX).toBeNull();
    app.getState().selectPeak(4.3);
    expect(app.getState().selectedPeakX).toBe(4.3);
    app.getState().selectPeak(null);
    expect(app.getState().selectedPeakX).toBeNull();
  });
});

describe('view slice: zoom', () => {
  it('starts on the full range, raw trace drawn, y following the zoom', () => {
    const s = createAppStore().getState();
    expect(s).toMatchObject({ xRange: null, showRaw: true, showUid: null, yFitsView: true, markedRange: null, zooms: {} });
  });

  it('each trace keeps its own zoom: leaving one keeps its range, coming back restores it, a trace never zoomed shows all', () => {
    const app = createAppStore();
    app.getState().setXRange([2, 3]);
    app.getState().switchZoom('a', 'b');
    expect(app.getState().xRange).toBeNull();
    expect(app.getState().zooms).toEqual({ a: [2, 3] });
    app.getState().setXRange([5, 7]);
    app.getState().switchZoom('b', 'a');
    expect(app.getState().xRange).toEqual([2, 3]);
    expect(app.getState().zooms).toEqual({ a: [2, 3], b: [5, 7] });
    // Leaving a trace shown in full forgets its old zoom.
    app.getState().setXRange(null);
    app.getState().switchZoom('a', 'b');
    expect(app.getState().zooms).toEqual({ b: [5, 7] });
    expect(app.getState().xRange).toEqual([5, 7]);
    // No trace to show: full range.
    app.getState().switchZoom('b', null);
    expect(app.getState().xRange).toBeNull();
  });

  it('what is drawn and the marked range are set as given', () => {
    const app = createAppStore();
    app.getState().setShowRaw(false);
    app.getState().setShowUid('u1');
    app.getState().setYFitsView(false);
    app.getState().setMarkedRange([1, 2]);
    app.getState().setHandNote({ kind: 'refused', text: 'no peak near' });
    expect(app.getState()).toMatchObject({ showRaw: false, showUid: 'u1', yFitsView: false, markedRange: [1, 2], handNote: { kind: 'refused', text: 'no peak near' } });
  });
});
