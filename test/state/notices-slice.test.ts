/**
 * src/state/notices-slice.ts on a fresh store each (zustand's testing advice:
 * one store per test): notices newest first, at most DISPLAY_CAPS.noticesKept,
 * dismissed by id, ids unique across stores. Properties of the slice's own
 * definition; no outside source is needed.
 */
import { describe, expect, it } from 'vitest';
import { DISPLAY_CAPS } from '../../src/state/display-caps.ts';
import { createAppStore } from '../../src/state/store.ts';

describe('notices slice', () => {
  it('keeps the newest first, at most DISPLAY_CAPS.noticesKept, and dismisses by id', () => {
    const app = createAppStore();
    for (let i = 0; i < DISPLAY_CAPS.noticesKept + 5; i++) app.getState().notify('info', `n${i}`);
    const { notices } = app.getState();
    expect(notices).toHaveLength(DISPLAY_CAPS.noticesKept);
    expect(notices[0].title).toBe(`n${DISPLAY_CAPS.noticesKept + 4}`);
    // The five oldest dropped off, the rest kept in order.
    expect(notices.at(-1)!.title).toBe('n5');
    app.getState().notify('error', 'with a button', ['line'], { label: 'Do it', key: 'k1' });
    const top = app.getState().notices[0];
    expect(top).toMatchObject({ kind: 'error', lines: ['line'], action: { label: 'Do it', key: 'k1' } });
    app.getState().dismissNotice(top.id);
    expect(app.getState().notices.some((n) => n.id === top.id)).toBe(false);
    expect(app.getState().notices).toHaveLength(DISPLAY_CAPS.noticesKept - 1);
  });

  it('a notice without lines or a button has an empty list of lines and no action field', () => {
    const app = createAppStore();
    app.getState().notify('warning', 'plain');
    const n = app.getState().notices[0];
    expect(n).toEqual({ id: n.id, kind: 'warning', title: 'plain', lines: [] });
    expect('action' in n).toBe(false);
  });

  it('ids are unique, also across stores, so dismissing in one store never touches another', () => {
    const a = createAppStore(), b = createAppStore();
    a.getState().notify('info', 'a1');
    b.getState().notify('info', 'b1');
    a.getState().notify('info', 'a2');
    const ids = [...a.getState().notices, ...b.getState().notices].map((n) => n.id);
    expect(new Set(ids).size).toBe(3);
    b.getState().dismissNotice(a.getState().notices[0].id);
    expect(b.getState().notices.map((n) => n.title)).toEqual(['b1']);
    expect(a.getState().notices.map((n) => n.title)).toEqual(['a2', 'a1']);
  });

  it('dismissing an id that is not there changes nothing', () => {
    const app = createAppStore();
    app.getState().notify('info', 'stays');
    const before = app.getState().notices;
    app.getState().dismissNotice(-1);
    expect(app.getState().notices).toEqual(before);
  });
});
