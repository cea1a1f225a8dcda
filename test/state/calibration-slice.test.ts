/**
 * src/state/calibration-slice.ts on a fresh store each: the named-peak
 * table edited row by row (the table's format, unit and rule kept), the
 * calibration settings merged field by field, each named peak's own
 * settings added, merged and dropped. Properties of the slice's definition.
 */
import { describe, expect, it } from 'vitest';
import { emptyNamedPeakTable } from '../../src/core/calibration/named-peaks.ts';
import { defaultCalibrationSettings } from '../../src/core/calibration/settings.ts';
import { createAppStore } from '../../src/state/store.ts';

describe('calibration slice: named peaks', () => {
  it('starts with an empty table; rows are added, changed and removed by index; the table’s own fields stay', () => {
    const app = createAppStore();
    expect(app.getState().namedPeaks).toEqual(emptyNamedPeakTable());
    app.getState().setNamedPeaks(emptyNamedPeakTable('min', 'largest'));
    app.getState().addNamedPeak({ name: 'A', position: 2, window: 0.1 });
    app.getState().addNamedPeak({ name: 'B', position: 6, window: 0.2 });
    app.getState().updateNamedPeak(0, { position: 2.05 });
    expect(app.getState().namedPeaks.peaks).toEqual([{ name: 'A', position: 2.05, window: 0.1 }, { name: 'B', position: 6, window: 0.2 }]);
    app.getState().removeNamedPeak(0);
    expect(app.getState().namedPeaks).toEqual({ ...emptyNamedPeakTable('min', 'largest'), peaks: [{ name: 'B', position: 6, window: 0.2 }] });
    app.getState().setMatchRule('nearest');
    expect(app.getState().namedPeaks.rule).toBe('nearest');
    expect(app.getState().namedPeaks.peaks).toHaveLength(1);
  });

  it('an edit never changes the table object the store held before (the undo of a panel can keep it)', () => {
    const app = createAppStore();
    app.getState().addNamedPeak({ name: 'A', position: 2, window: 0.1 });
    const before = app.getState().namedPeaks;
    app.getState().updateNamedPeak(0, { name: 'A2' });
    app.getState().addNamedPeak({ name: 'C', position: 9, window: 0.3 });
    expect(before.peaks).toEqual([{ name: 'A', position: 2, window: 0.1 }]);
  });
});

describe('calibration slice: settings', () => {
  it('common settings merge field by field from the defaults', () => {
    const app = createAppStore();
    expect(app.getState().calibrationSettings).toEqual(defaultCalibrationSettings());
    app.getState().setCalibrationSettings({ throughOrigin: true });
    expect(app.getState().calibrationSettings).toEqual({ ...defaultCalibrationSettings(), throughOrigin: true });
  });

  it('a named peak’s own settings: added, merged with what it had, and dropped with null; other peaks’ untouched', () => {
    const app = createAppStore();
    app.getState().setPeakCalibration('A', { response: 'height' });
    app.getState().setPeakCalibration('B', { throughOrigin: true });
    app.getState().setPeakCalibration('A', { throughOrigin: true });
    const per = app.getState().calibrationSettings.perPeak;
    expect(per.find((p) => p.name === 'A')!.settings).toEqual({ response: 'height', throughOrigin: true });
    expect(per.find((p) => p.name === 'B')!.settings).toEqual({ throughOrigin: true });
    expect(per).toHaveLength(2);
    app.getState().setPeakCalibration('A', null);
    expect(app.getState().calibrationSettings.perPeak).toEqual([{ name: 'B', settings: { throughOrigin: true } }]);
  });
});

describe('calibration slice: standards', () => {
  it('standards’ peaks, the busy mark and the amounts table are set as given; picking names by click ends the add-peak mode', () => {
    const app = createAppStore();
    expect(app.getState()).toMatchObject({ standardsTable: null, standardPeaks: {}, standardsBusy: false, namePickMode: false });
    app.getState().setStandardPeaks({ s1: { ok: false, problem: 'no peaks' }, s2: { ok: true, peaks: [] } });
    app.getState().setStandardsBusy(true);
    expect(app.getState().standardPeaks.s1).toEqual({ ok: false, problem: 'no peaks' });
    expect(app.getState().standardsBusy).toBe(true);
    app.getState().setAddPeakMode(true);
    app.getState().setNamePickMode(true);
    expect(app.getState()).toMatchObject({ namePickMode: true, addPeakMode: false });
  });
});
