import { beforeEach, describe, expect, it } from 'vitest';
import { service } from '../../../src/state/service.ts';
import { useApp } from '../../../src/state/store.ts';
import { HandReasonField } from '../../../src/ui/export/HandReasonField.tsx';
import { demoBytes, elements, html, resetStore, text, tree } from '../harness.ts';

// src/ui/export/HandReasonField.tsx: after a hand change, ask for a short reason; block nothing.
beforeEach(() => resetStore());

describe('HandReasonField', () => {
  it('nothing without a hand change', () => {
    expect(html(HandReasonField)).toBe('');
  });
  it('asks about the change made, at its x with the trace’s unit; “Later” while the reason is empty', async () => {
    await service.loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv');
    useApp.getState().setLastHandChange({ kind: 'removed', x: 4.3000001234 });
    const t = text(html(HandReasonField));
    expect(t).toBe('Why remove the peak at 4.3 min? Later');
    useApp.getState().setLastHandChange({ kind: 'bounds', x: 6 });
    expect(text(html(HandReasonField))).toContain('Why move the start or end of the peak at 6 min?');
  });
  it('a reason typed is kept for that change and shown; the button then keeps it and closes the field', async () => {
    useApp.getState().setLastHandChange({ kind: 'added', x: 2.6 });
    const input = elements(tree(HandReasonField)).find((e) => e.type === 'input')!;
    expect(input.props.placeholder).toBe('a short reason, kept in every export');
    (input.props.onChange as (e: unknown) => void)({ target: { value: 'shoulder seen in the blank-subtracted trace' } });
    expect(useApp.getState().handReasons).toEqual([expect.objectContaining({ kind: 'added', x: 2.6, reason: 'shoulder seen in the blank-subtracted trace' })]);
    const h = html(HandReasonField);
    expect(h).toContain('value="shoulder seen in the blank-subtracted trace"');
    expect(text(h)).toContain('Keep this reason');
    const form = elements(tree(HandReasonField)).find((e) => e.type === 'form')!;
    (form.props.onSubmit as (e: unknown) => void)({ preventDefault() {} });
    expect(useApp.getState().lastHandChange).toBeNull();
    expect(useApp.getState().handReasons).toHaveLength(1); // closing keeps the reason
  });
});
