/**
 * src/state/settings-slice.ts on a fresh store each: noise and peak settings
 * merged field by field, the user's decisions on peaks (added, removed,
 * hand bounds) with the reason each waits for, and the alternatives kept
 * for the loss check (no two with one label, at most MAX_ALTERNATIVES).
 * Properties of the slice's own definition.
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, MAX_ALTERNATIVES, type AlternativeRequest } from '../../src/core/analysis/index.ts';
import { emptyRecipe } from '../../src/core/method.ts';
import { createAppStore } from '../../src/state/store.ts';
import type { XUnits } from '../../src/core/units.ts';

const alt = (id: string, label = id): AlternativeRequest => ({ id, label, recipe: emptyRecipe() });

describe('settings slice: noise and peak settings', () => {
  it('start at the defaults, as copies; a change replaces only the fields given', () => {
    const app = createAppStore();
    expect(app.getState().noiseSettings).toEqual(DEFAULT_NOISE_SETTINGS);
    expect(app.getState().noiseSettings).not.toBe(DEFAULT_NOISE_SETTINGS);
    expect(app.getState().peakSettings).toEqual(DEFAULT_PEAK_SETTINGS);
    app.getState().setNoiseSettings({ method: 'rms', quietRange: [1, 2] });
    app.getState().setPeakSettings({ minSnr: 5 });
    expect(app.getState().noiseSettings).toEqual({ ...DEFAULT_NOISE_SETTINGS, method: 'rms', quietRange: [1, 2] });
    expect(app.getState().peakSettings).toEqual({ ...DEFAULT_PEAK_SETTINGS, minSnr: 5 });
    expect(DEFAULT_PEAK_SETTINGS.minSnr).not.toBe(5); // the defaults themselves are untouched
  });
});

describe('settings slice: decisions on peaks', () => {
  it('adding a peak records it and asks for its reason; removing it again undoes the addition and drops its reason', () => {
    const app = createAppStore();
    app.getState().addPeakAt(4.3);
    expect(app.getState().decisions).toEqual({ added: [4.3], removed: [] });
    expect(app.getState().lastHandChange).toEqual({ kind: 'added', x: 4.3 });
    app.getState().setHandReason('added', 4.3, 'shoulder seen in the blank-subtracted trace');
    app.getState().removePeakAt(4.3);
    expect(app.getState().decisions).toEqual({ added: [], removed: [] });
    expect(app.getState().handReasons).toEqual([]);
    expect(app.getState().lastHandChange).toBeNull();
  });

  it('removing a detected peak is kept as a decision; restoring it within the tolerance takes it and its reason back', () => {
    const app = createAppStore();
    app.getState().removePeakAt(6.0);
    app.getState().removePeakAt(8.0);
    expect(app.getState().decisions.removed).toEqual([6.0, 8.0]);
    expect(app.getState().lastHandChange).toEqual({ kind: 'removed', x: 8.0 });
    app.getState().setHandReason('removed', 6.0, 'artefact');
    app.getState().setHandReason('removed', 8.0, 'solvent front');
    app.getState().restorePeakAt(6.004, 0.005 as XUnits);
    expect(app.getState().decisions.removed).toEqual([8.0]);
    expect(app.getState().handReasons).toEqual([{ kind: 'removed', x: 8.0, reason: 'solvent front' }]);
    // Outside the tolerance nothing is restored.
    app.getState().restorePeakAt(8.1, 0.05 as XUnits);
    expect(app.getState().decisions.removed).toEqual([8.0]);
  });

  it('hand bounds: one pair per peak, in order start ≤ end, the newest replacing the older', () => {
    const app = createAppStore();
    app.getState().setPeakBounds(5, 5.4, 4.6);
    expect(app.getState().decisions.bounds).toEqual([{ x: 5, start: 4.6, end: 5.4 }]);
    expect(app.getState().lastHandChange).toEqual({ kind: 'bounds', x: 5 });
    app.getState().setPeakBounds(7, 6.8, 7.3);
    app.getState().setPeakBounds(5, 4.7, 5.2);
    expect(app.getState().decisions.bounds).toEqual([{ x: 7, start: 6.8, end: 7.3 }, { x: 5, start: 4.7, end: 5.2 }]);
  });

  it('clearing the decisions clears the reasons and the waiting question too', () => {
    const app = createAppStore();
    app.getState().addPeakAt(1);
    app.getState().removePeakAt(2);
    app.getState().setPeakBounds(3, 2.9, 3.1);
    app.getState().setHandReason('removed', 2, 'why');
    app.getState().clearDecisions();
    expect(app.getState()).toMatchObject({ decisions: { added: [], removed: [] }, handReasons: [], lastHandChange: null });
  });
});

describe('settings slice: alternatives for the loss check', () => {
  it('adds up to MAX_ALTERNATIVES, none with a label already kept, and says how many it added', () => {
    const app = createAppStore();
    expect(app.getState().addAlternatives([alt('a'), alt('b')])).toBe(2);
    expect(app.getState().addAlternatives([alt('c', 'a'), alt('d')])).toBe(1); // 'a' is already there by label
    const many = Array.from({ length: MAX_ALTERNATIVES + 3 }, (_, i) => alt(`m${i}`));
    expect(app.getState().addAlternatives(many)).toBe(MAX_ALTERNATIVES - 3);
    expect(app.getState().alternatives).toHaveLength(MAX_ALTERNATIVES);
    expect(app.getState().addAlternatives([alt('late')])).toBe(0);
    app.getState().removeAlternative('b');
    expect(app.getState().alternatives.map((a) => a.id)).not.toContain('b');
    expect(app.getState().alternatives).toHaveLength(MAX_ALTERNATIVES - 1);
  });

  it('shown by default; the ledger’s rows below the detection limit hidden by default', () => {
    const app = createAppStore();
    expect(app.getState()).toMatchObject({ showAlternatives: true, ledgerNoiseLevel: false });
    app.getState().setShowAlternatives(false);
    app.getState().setLedgerNoiseLevel(true);
    expect(app.getState()).toMatchObject({ showAlternatives: false, ledgerNoiseLevel: true });
  });
});
