import { beforeEach, describe, expect, it } from 'vitest';
import { useApp } from '../../src/state/store.ts';
import { SessionBanner, StartChoice } from '../../src/ui/SessionBanner.tsx';
import { button, html, press, resetStore, text, tree } from './harness.ts';

// src/ui/SessionBanner.tsx: the message when the browser does not keep the
// session, and the question at start when the last restore did not draw.
beforeEach(() => resetStore());

describe('SessionBanner', () => {
  it('nothing while the session is kept', () => {
    expect(html(SessionBanner)).toBe('');
  });
  it('names the problem, says the page still works and how to keep the work (a session file); an alert', () => {
    useApp.setState({ sessionProblem: 'The browser refused storage (private window).' });
    const h = html(SessionBanner);
    expect(h).toContain('role="alert"');
    const t = text(h);
    expect(t).toContain('Your work is not being kept in this browser');
    expect(t).toContain('The browser refused storage (private window). Everything still works in this page.');
    expect(t).toContain('Save session to a file'); // the session-file controls are offered right there
  });
  it('dismissed: gone', () => {
    useApp.setState({ sessionProblem: 'x' });
    press(tree(SessionBanner), 'Dismiss the message about keeping the session');
    expect(html(SessionBanner)).toBe('');
  });
});

describe('StartChoice', () => {
  it('nothing without a question', () => {
    expect(html(StartChoice)).toBe('');
  });
  it('says what failed and offers restore, save to a file, or start without it (the default)', () => {
    useApp.getState().setStartChoice({ message: 'Plotly could not draw a NaN axis', at: '2026-12-03T09:00:00Z' });
    const h = html(StartChoice);
    expect(h).toContain('role="alertdialog"');
    const t = text(h);
    expect(t).toContain('Last time, your saved session could not be drawn');
    expect(t).toContain('What failed: “Plotly could not draw a NaN axis”');
    expect(t).toContain('The session has not been restored this time');
    const node = tree(StartChoice);
    for (const b of ['Restore it anyway', 'Save it to a file']) expect(button(node, b).props.className).toBeUndefined();
    expect(button(node, 'Start without it').props.className).toBe('primary');
  });
});
