/**
 * src/state/session-slice.ts on a fresh store each: how the session is kept.
 * The one rule with logic: a dismissed problem stays dismissed while the
 * same problem is set again, and comes back for a different one.
 */
import { describe, expect, it } from 'vitest';
import { createAppStore } from '../../src/state/store.ts';

describe('session slice', () => {
  it('starts with the session kept, nothing saved or pending, no question at start, no offline copy', () => {
    expect(createAppStore().getState()).toMatchObject({
      sessionProblem: null, sessionProblemDismissed: false, sessionSavedAt: null, sessionPending: false, startChoice: null, offlineReady: false,
    });
  });

  it('a dismissed problem stays dismissed when the same problem is set again, and comes back for a different one or after it cleared', () => {
    const app = createAppStore();
    app.getState().setSessionProblem('The browser refused storage.');
    app.getState().dismissSessionProblem();
    app.getState().setSessionProblem('The browser refused storage.');
    expect(app.getState().sessionProblemDismissed).toBe(true);
    app.getState().setSessionProblem('The disk is full.');
    expect(app.getState()).toMatchObject({ sessionProblem: 'The disk is full.', sessionProblemDismissed: false });
    app.getState().dismissSessionProblem();
    app.getState().setSessionProblem(null);
    expect(app.getState().sessionProblemDismissed).toBe(false);
    app.getState().setSessionProblem('The disk is full.');
    expect(app.getState().sessionProblemDismissed).toBe(false);
  });

  it('saved time, pending mark, the question at start and the offline copy are set as given', () => {
    const app = createAppStore();
    app.getState().setSessionSavedAt('2026-12-03T09:00:00.000Z');
    app.getState().setSessionPending(true);
    app.getState().setStartChoice({ message: 'The last session did not draw.', at: '2026-12-03T08:59:00.000Z' });
    app.getState().setOfflineReady(true);
    expect(app.getState()).toMatchObject({
      sessionSavedAt: '2026-12-03T09:00:00.000Z', sessionPending: true, offlineReady: true,
      startChoice: { message: 'The last session did not draw.', at: '2026-12-03T08:59:00.000Z' },
    });
    app.getState().setStartChoice(null);
    expect(app.getState().startChoice).toBeNull();
  });
});
