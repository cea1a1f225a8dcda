/**
 * src/state/store.ts: createAppStore gives a fresh, independent store with
 * every slice, and the store holds data only (its comment: "never a Worker
 * or a plot"), checked as: every field that is not an action survives
 * structuredClone (the HTML standard's structured clone refuses functions,
 * DOM nodes and workers). Each slice's own actions are in its own test file.
 */
import { describe, expect, it } from 'vitest';
import { createTrace } from '../../src/core/trace.ts';
import { createAppStore, useApp } from '../../src/state/store.ts';

const report = { fileName: 'a.csv', sha256: '0'.repeat(64), format: 'test', rowsRead: 5, skipped: [], notices: [], metadata: {} };
const mk = (name: string) => createTrace({ name, x: [0, 1, 2, 3, 4], y: [1, 2, 3, 2, 1], source: { fileName: name, sha256: '0'.repeat(64), rowsRead: 5, rowsSkipped: 0 } });

const data = (s: object) => Object.fromEntries(Object.entries(s).filter(([, v]) => typeof v !== 'function'));

describe('store', () => {
  it('every slice is in the store: a field or action of each', () => {
    const s = createAppStore().getState();
    // inputs, notices, recipe, results, view, settings, session, calibration, fit, report
    for (const k of ['addTraces', 'notify', 'undo', 'takeStage', 'switchZoom', 'addPeakAt', 'setSessionProblem', 'addNamedPeak', 'addFit', 'setReportField'] as const) {
      expect(typeof s[k], k).toBe('function');
    }
  });

  it('two stores made by createAppStore share nothing; the app’s own store is another one', () => {
    const a = createAppStore(), b = createAppStore();
    a.getState().addTraces([mk('one')], report);
    a.getState().addStep('moving-average');
    a.getState().notify('info', 'only in a');
    expect(b.getState().traces).toEqual([]);
    expect(b.getState().recipe.steps).toEqual([]);
    expect(b.getState().notices).toEqual([]);
    expect(useApp.getState().traces).toEqual([]);
    // Initial values are not shared objects either: the fresh store's state equals, but is not, the other's.
    expect(data(createAppStore().getState())).toEqual(data(b.getState()));
    expect(createAppStore().getState().noiseSettings).not.toBe(b.getState().noiseSettings);
  });

  it('holds data only: every field that is not an action can be structured-cloned, before and after use', () => {
    const app = createAppStore();
    expect(() => structuredClone(data(app.getState()))).not.toThrow();
    app.getState().addTraces([mk('one')], report);
    app.getState().addStep('savitzky-golay');
    app.getState().notify('error', 'x', ['y'], { label: 'Retry', key: 'k' });
    const clone = structuredClone(data(app.getState())) as Record<string, unknown>;
    expect(clone.notices).toEqual(app.getState().notices);
    expect(clone.recipe).toEqual(app.getState().recipe);
  });
});
