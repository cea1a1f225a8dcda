// The notices and view slices and the current-result selector, each on a
// fresh store (zustand's testing advice: one store per test).
import { describe, expect, it } from 'vitest';
import type { AnalyseResult } from '../../src/core/analysis/index.ts';
import { DISPLAY_CAPS } from '../../src/state/display-caps.ts';
import { currentResult, withCurrent } from '../../src/state/selectors.ts';
import { createAppStore } from '../../src/state/store.ts';

describe('notices slice', () => {
  it('keeps the newest first, at most DISPLAY_CAPS.noticesKept, and dismisses by id', () => {
    const app = createAppStore();
    for (let i = 0; i < DISPLAY_CAPS.noticesKept + 5; i++) app.getState().notify('info', `n${i}`);
    const { notices } = app.getState();
    expect(notices).toHaveLength(DISPLAY_CAPS.noticesKept);
    expect(notices[0].title).toBe(`n${DISPLAY_CAPS.noticesKept + 4}`);
    app.getState().notify('error', 'with a button', ['line'], { label: 'Do it', key: 'k1' });
    const top = app.getState().notices[0];
    expect(top).toMatchObject({ kind: 'error', lines: ['line'], action: { label: 'Do it', key: 'k1' } });
    app.getState().dismissNotice(top.id);
    expect(app.getState().notices.some((n) => n.id === top.id)).toBe(false);
  });
});

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

describe('current result selector', () => {
  it('gives the result only while it belongs to the sample now chosen', () => {
    const result = { sampleId: 'a', peaks: [] } as unknown as AnalyseResult;
    expect(currentResult({ result, sampleId: 'a' })).toBe(result);
    expect(currentResult({ result, sampleId: 'b' })).toBeNull();
    expect(currentResult({ result: null, sampleId: 'a' })).toBeNull();
    expect(withCurrent({ result, sampleId: 'a' }, (r) => r.peaks)).toEqual([]);
    expect(withCurrent({ result, sampleId: 'b' }, (r) => r.peaks)).toBeNull();
  });
});
