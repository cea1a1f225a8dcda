/**
 * Issues 18 and 21 in the saved session: region fits (with their curves),
 * the named-peak table, the standards' amounts and the calibration settings
 * come back from the session file, the database record and the journal, bit
 * for bit; sessions saved before these were kept load as before; damaged
 * parts are left out with a note, never silently.
 */
import { describe, expect, test } from 'vitest';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS } from '../../src/core/analysis/index.ts';
import { readNamedPeaksCsv } from '../../src/core/calibration/named-peaks.ts';
import { defaultCalibrationSettings } from '../../src/core/calibration/settings.ts';
import { readStandardsCsv, standardsToJson } from '../../src/core/calibration/standards.ts';
import { runFitJob } from '../../src/core/measure/fit/job.ts';
import { emptyRecipe } from '../../src/core/method.ts';
import type { KeptFit } from '../../src/state/fit-slice.ts';
import { applySnapshot, mergeJournal, sessionFromRecords, sessionJournal, sessionMeta, type SessionSnapshot, type SessionStore } from '../../src/state/session-db.ts';
import { sessionFileText, sessionFromFileText } from '../../src/state/session-file.ts';
import { decodeTyped, encodeTyped, JOURNAL_FITS_MAX_CHARS } from '../../src/state/session-work.ts';
import { inventedTrace } from '../core/export/helpers.ts';
import type { AppState } from '../../src/state/store.ts';

function keptFit(sampleId: string, x: Float64Array, y: Float64Array): KeptFit {
  const out = runFitJob({
    settings: { from: 1.6, to: 2.4, on: 'raw', shape: 'gaussian', baseline: 'line', maxPeaks: 2 },
    raw: { label: 'raw', x, y }, alternatives: [{ label: '7-point average', x, y }],
  });
  if (!out.ok) throw new Error(out.message);
  return { id: 1, sampleId, madeAt: '2026-01-02T03:04:05.000Z', stackKey: '[]', result: out.result };
}

const named = readNamedPeaksCsv('name,position (min),window (min)\nFirst,2,0.1\nSecond,4,0.1\n', 'names.csv');
const standards = readStandardsCsv('standard,First (mg/L),Second (mg/L)\nstd-1.csv,1,2\nstd-2.csv,2,\n', 'amounts.csv');
if (!named.ok || !standards.ok) throw new Error('the invented tables must read');

function snapshot(): SessionSnapshot {
  const t = inventedTrace({ fileName: 'run.csv' });
  return {
    traces: [t], roles: { [t.id]: 'sample' }, sampleId: t.id, reports: {},
    recipe: emptyRecipe(), noiseSettings: DEFAULT_NOISE_SETTINGS, peakSettings: DEFAULT_PEAK_SETTINGS, decisions: { added: [], removed: [] },
    alternatives: [], past: [], future: [],
    fits: [keptFit(t.id, t.x, t.y)], fitChoices: { on: 'processed', shape: 'emg', baseline: 'quadratic', maxPeaks: 4 }, showFigures: true, deadTime: 0.75,
    namedPeaks: named.ok ? named.table : undefined, standardsTable: standards.ok ? standards.table : undefined,
    calibrationSettings: { ...defaultCalibrationSettings(), weighting: '1/x', model: 'line', confidence: 0.99 },
  };
}

/** Every Float64Array of `a` equals `b`'s bit for bit (Object.is: NaN and −0 too), and everything else is deep-equal. */
function expectSameFit(a: KeptFit, b: KeptFit) {
  expect(b.result.fit.curves.x).toBeInstanceOf(Float64Array);
  const arrays = (f: KeptFit) => [f.result.fit.curves.x, f.result.fit.curves.y, f.result.fit.curves.fitted, f.result.fit.curves.baseline, f.result.fit.curves.residual, ...f.result.fit.curves.components, f.result.fit.parameters, f.result.fit.areaCorrelation];
  const A = arrays(a), B = arrays(b);
  expect(B.length).toBe(A.length);
  A.forEach((arr, k) => {
    expect(B[k].length).toBe(arr.length);
    for (let i = 0; i < arr.length; i++) expect(Object.is(B[k][i], arr[i])).toBe(true);
  });
  expect(b.result.statement).toBe(a.result.statement);
  expect(b.result.processing).toEqual(a.result.processing);
  expect(b.result.fit.peaks).toEqual(a.result.fit.peaks);
}

describe('fits and calibration inputs in the saved session', () => {
  test('typed arrays and numbers JSON cannot hold survive the JSON form bit for bit', () => {
    const v = { a: Float64Array.from([NaN, -0, 5e-324, Infinity]), b: [NaN, -Infinity, 1.5], c: 'text', d: null };
    const back = decodeTyped(JSON.parse(JSON.stringify(encodeTyped(v)))) as typeof v;
    expect(back.a).toBeInstanceOf(Float64Array);
    [NaN, -0, 5e-324, Infinity].forEach((x, i) => expect(Object.is(back.a[i], x)).toBe(true));
    expect(back.b).toEqual([NaN, -Infinity, 1.5]);
    expect(back.c).toBe('text');
    expect(back.d).toBe(null);
  });

  test('session file: the fit with its curves, the fit choices, figure columns, dead time, named peaks, standards and calibration settings come back', () => {
    const s = snapshot();
    const out = sessionFromFileText(sessionFileText(s, new Date(0)), 'session.json');
    expect(out.ok, out.ok ? '' : out.problem).toBe(true);
    if (!out.ok) return;
    expect(out.notes).toEqual([]);
    const b = out.snapshot;
    expect(b.fits).toHaveLength(1);
    expectSameFit(s.fits![0], b.fits![0]);
    expect(b.fitChoices).toEqual(s.fitChoices);
    expect(b.showFigures).toBe(true);
    expect(b.deadTime).toBe(0.75);
    expect(b.namedPeaks).toEqual(s.namedPeaks);
    // The CSV line numbers are not kept (they served the messages when the file was read).
    expect(standardsToJson(b.standardsTable!)).toEqual(standardsToJson(s.standardsTable!));
    expect(b.calibrationSettings).toEqual(s.calibrationSettings);
  });

  test('database record: the same, through the structured record and the journal laid over it', () => {
    const s = snapshot();
    const meta = sessionMeta(s, 1, new Date(0), 4);
    const chunks = new Map<string, Float64Array>();
    for (const axis of ['x', 'y'] as const) for (let k = 0; k < meta.heads[0].chunks; k++) chunks.set([s.traces[0].id, axis, k].join('\u0000'), s.traces[0][axis].slice(k * 4, (k + 1) * 4));
    // A later edit (named peaks emptied, dead time changed) only in the journal: the journal wins member by member.
    const later: SessionSnapshot = { ...s, namedPeaks: { ...s.namedPeaks!, peaks: [] }, deadTime: null };
    const merged = mergeJournal(meta, sessionJournal(later, Date.now() + 1000));
    const out = sessionFromRecords(JSON.parse(JSON.stringify(merged.meta)), (key) => chunks.get(key.join('\u0000')));
    expect(out?.ok).toBe(true);
    if (!out?.ok) return;
    expectSameFit(s.fits![0], out.snapshot.fits![0]);
    expect(out.snapshot.namedPeaks?.peaks).toEqual([]);
    expect(out.snapshot.deadTime).toBe(null);
    expect(standardsToJson(out.snapshot.standardsTable!)).toEqual(standardsToJson(s.standardsTable!));
  });

  test('fits too large for the journal wait for the database save; the database generation’s fits are kept', () => {
    const s = snapshot();
    const t = s.traces[0];
    const big = Array.from({ length: 400 }, (_, i) => ({ ...s.fits![0], id: i + 1 }));
    expect(JSON.stringify(encodeTyped(big)).length).toBeGreaterThan(JOURNAL_FITS_MAX_CHARS);
    const journal = sessionJournal({ ...s, fits: big }, Date.now() + 1000);
    expect((journal.work as Record<string, unknown>).fits).toBeUndefined();
    expect((journal.work as Record<string, unknown>).namedPeaks).toBeDefined();
    const merged = mergeJournal(sessionMeta(s, 1, new Date(0)), journal);
    const out = sessionFromRecords(merged.meta, (key) => (key[2] === 0 ? t[key[1]] : undefined));
    expect(out?.ok && out.snapshot.fits?.length).toBe(1);
  });

  test('a session saved before fits and calibration inputs were kept loads as before; applying it empties the fits and leaves the calibration inputs', () => {
    const s = snapshot();
    const file = JSON.parse(sessionFileText(s, new Date(0)));
    delete file.meta.work;
    const out = sessionFromFileText(JSON.stringify(file), 'old.json');
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.notes).toEqual([]);
    for (const k of ['fits', 'fitChoices', 'showFigures', 'deadTime', 'namedPeaks', 'standardsTable', 'calibrationSettings'] as const) expect(out.snapshot[k]).toBeUndefined();
    let state = { fits: s.fits, namedPeaks: s.namedPeaks } as unknown as AppState;
    const store: SessionStore = { getState: () => state, setState: (p) => { state = { ...state, ...p }; }, subscribe: () => () => {} };
    applySnapshot(store, out.snapshot);
    expect(state.fits).toEqual([]);
    expect(state.namedPeaks).toBe(s.namedPeaks);
  });

  test('damaged parts are left out with a note naming them; fits of traces not restored are dropped', () => {
    const s = snapshot();
    const file = JSON.parse(sessionFileText(s, new Date(0)));
    const fit = file.meta.work.fits[0];
    file.meta.work.fits = [
      { ...fit, result: { ...fit.result, fit: { ...fit.result.fit, curves: { ...fit.result.fit.curves, residual: { $f64: 'AAAA' } } } } },
      { ...fit, id: 2, sampleId: 'gone' },
      { ...fit, id: 3, result: { ...fit.result, count: 7 } },
      fit,
    ];
    file.meta.work.standards = { format: 'tracewright-standards', version: 1, names: ['First'], units: ['mg/L'], rows: [{ standard: 'a', amounts: [-1] }] };
    file.meta.work.calibration = { format: 'tracewright-calibration-settings', version: 1, wobble: 1 };
    file.meta.work.deadTime = -2;
    file.meta.work.showFigures = 'yes';
    const out = sessionFromFileText(JSON.stringify(file), 'damaged.json');
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const notes = out.notes.join('\n');
    // The damaged base64 stops the whole fits list from decoding, which is said.
    expect(notes).toMatch(/region fits could not be read .*whole number of 8-byte values/);
    expect(notes).toMatch(/amounts of the standards could not be restored/);
    expect(notes).toMatch(/calibration settings could not be restored.*Unknown setting "wobble"/);
    expect(notes).toMatch(/saved dead time \(-2\) is not a positive number/);
    expect(notes).toMatch(/choice of figure columns could not be read/);
    expect(out.snapshot.deadTime).toBeUndefined();
    expect(out.snapshot.fits).toEqual([]);
    expect(out.snapshot.standardsTable).toBeUndefined();
    expect(out.snapshot.namedPeaks).toEqual(s.namedPeaks);

    file.meta.work.fits = [{ ...fit, id: 2, sampleId: 'gone' }, { ...fit, id: 3, result: { ...fit.result, count: 7 } }, fit];
    const again = sessionFromFileText(JSON.stringify(file), 'damaged.json');
    if (!again.ok) throw new Error(again.problem);
    expect(again.notes.join('\n')).toMatch(/Saved fit 2 was left out: its peak count does not match its curves/);
    expect(again.snapshot.fits!.map((f) => f.id)).toEqual([1]);
  });

  test('a named-peak table saved while being edited (a name not typed yet) comes back as it was, with a note', () => {
    const s = snapshot();
    const file = JSON.parse(sessionFileText({ ...s, namedPeaks: { ...s.namedPeaks!, peaks: [...s.namedPeaks!.peaks, { name: '', position: 5, window: 0.1 }] } }, new Date(0)));
    const out = sessionFromFileText(JSON.stringify(file), 'editing.json');
    if (!out.ok) throw new Error(out.problem);
    expect(out.snapshot.namedPeaks?.peaks).toHaveLength(3);
    expect(out.notes.join(' ')).toMatch(/saved while unfinished/);
  });
});
