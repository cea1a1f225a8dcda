/**
 * src/state/report-slice.ts on a fresh store each: the report's fields and
 * one reason per hand change, cut to FIELD_MAX_CHARS; an empty reason clears
 * it. Properties of the slice's own definition.
 */
import { describe, expect, it } from 'vitest';
import { EMPTY_REPORT_FIELDS, FIELD_MAX_CHARS } from '../../src/core/export/report-fields.ts';
import { createAppStore } from '../../src/state/store.ts';

describe('report slice', () => {
  it('fields start empty (a copy of the empty set), change one at a time and are cut to FIELD_MAX_CHARS', () => {
    const app = createAppStore();
    expect(app.getState().reportFields).toEqual(EMPTY_REPORT_FIELDS);
    expect(app.getState().reportFields).not.toBe(EMPTY_REPORT_FIELDS);
    app.getState().setReportField('analyst', 'A. Chemist');
    app.getState().setReportField('run', 'x'.repeat(FIELD_MAX_CHARS + 50));
    expect(app.getState().reportFields).toEqual({ ...EMPTY_REPORT_FIELDS, analyst: 'A. Chemist', run: 'x'.repeat(FIELD_MAX_CHARS) });
    expect(EMPTY_REPORT_FIELDS.analyst).toBe('');
  });

  it('one reason per hand change (kind and x); a new reason replaces the old; empty or blank text removes it', () => {
    const app = createAppStore();
    app.getState().setHandReason('added', 4.3, 'first');
    app.getState().setHandReason('removed', 4.3, 'other kind, same x');
    app.getState().setHandReason('added', 4.3, 'second');
    expect(app.getState().handReasons).toEqual([
      { kind: 'removed', x: 4.3, reason: 'other kind, same x' },
      { kind: 'added', x: 4.3, reason: 'second' },
    ]);
    app.getState().setHandReason('added', 4.3, '   ');
    expect(app.getState().handReasons).toEqual([{ kind: 'removed', x: 4.3, reason: 'other kind, same x' }]);
    app.getState().setHandReason('bounds', 1, 'y'.repeat(FIELD_MAX_CHARS + 1));
    expect(app.getState().handReasons.at(-1)!.reason).toHaveLength(FIELD_MAX_CHARS);
  });

  it('typing a reason leaves the decisions alone (the same object: no new analysis is asked for)', () => {
    const app = createAppStore();
    app.getState().addPeakAt(2);
    const decisions = app.getState().decisions;
    app.getState().setHandReason('added', 2, 'shoulder on the main peak');
    expect(app.getState().decisions).toBe(decisions);
    expect(app.getState().handReasons).toEqual([{ kind: 'added', x: 2, reason: 'shoulder on the main peak' }]);
  });

  it('the hand change waiting for its reason is set and cleared', () => {
    const app = createAppStore();
    expect(app.getState().lastHandChange).toBeNull();
    app.getState().setLastHandChange({ kind: 'bounds', x: 2 });
    expect(app.getState().lastHandChange).toEqual({ kind: 'bounds', x: 2 });
    app.getState().setLastHandChange(null);
    expect(app.getState().lastHandChange).toBeNull();
  });
});
