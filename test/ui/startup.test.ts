import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { useApp } from '../../src/state/store.ts';
import { resetStore } from './harness.ts';

// src/ui/startup.ts: what the page does when it opens. The saved session
// (IndexedDB), the demo fetch, the draw-health note and the download are
// replaced by stand-ins that record what was asked of them.
const calls: string[] = [];
let saved = false;
let restoreOk = false;
let problem: { state: 'restoring' | 'failed'; at: string; message?: string } | null = null;
let loadOutcome: unknown = null;
vi.mock('../../src/state/session-db.ts', () => ({
  hasSavedSession: async () => saved,
  restoreSession: async () => { calls.push('restore'); return restoreOk; },
  startSessionAutosave: () => { autosaves++; calls.push('autosave'); return () => {}; },
  loadSession: async () => loadOutcome,
}));
vi.mock('../../src/state/service.ts', () => ({ loadDemo: async () => { calls.push('demo'); } }));
vi.mock('../../src/ui/draw-health.ts', () => ({
  lastDrawProblem: () => problem,
  markDrawn: () => calls.push('drawn'),
  markRestoring: () => calls.push('restoring'),
}));
const downloads: { text: string; name: string; type: string }[] = [];
vi.mock('../../src/ui/export/download.ts', () => ({ downloadText: (text: string, name: string, type: string) => downloads.push({ text, name, type }) }));

// One import for the file (as the page): the module starts autosave once, for its whole life.
const fresh = async () => import('../../src/ui/startup.ts');
let autosaves = 0;
const steps = () => calls.filter((c) => c !== 'autosave');

beforeEach(() => { resetStore(); calls.length = 0; downloads.length = 0; saved = false; restoreOk = false; problem = null; loadOutcome = null; });
afterEach(() => { vi.useRealTimers(); });

describe('sessionFileName', () => {
  it('names the file by the UTC time, without characters file systems refuse (":") or milliseconds', async () => {
    const { sessionFileName } = await fresh();
    expect(sessionFileName(new Date('2026-12-03T09:05:07.123Z'))).toBe('tracewright-session-2026-12-03T09-05-07Z.json');
  });
});

describe('startUp', () => {
  it('no saved session: the demo, autosave started before it, drawing noted as fine', async () => {
    const { startUp } = await fresh();
    await startUp();
    expect(calls).toEqual(['restore', 'autosave', 'drawn', 'demo']); // the first start in this file: autosave starts here
    expect(useApp.getState().startChoice).toBeNull();
  });
  it('a saved session after a failed drawing: nothing is restored, the page asks first with what failed', async () => {
    saved = true;
    problem = { state: 'failed', at: '2026-12-03T09:00:00Z', message: 'Plotly: bad axis' };
    const { startUp } = await fresh();
    await startUp();
    expect(calls).toEqual([]);
    expect(useApp.getState().startChoice).toEqual({ message: 'Plotly: bad axis', at: '2026-12-03T09:00:00Z' });
  });
  it('a restore that never drew: the question says the page stopped before drawing', async () => {
    saved = true;
    problem = { state: 'restoring', at: 't' };
    await (await fresh()).startUp();
    expect(useApp.getState().startChoice?.message).toBe('the page stopped before the restored session was drawn');
  });
  it('a saved session and no problem: restored (noted as restoring first), no demo', async () => {
    saved = true;
    restoreOk = true;
    useApp.setState({ sampleId: 't1' });
    await (await fresh()).startUp();
    expect(steps()).toEqual(['restoring', 'restore']);
  });
});

describe('startWithoutSession', () => {
  it('clears the question, opens the demo; autosave starts once however often it is called', async () => {
    useApp.getState().setStartChoice({ message: 'x', at: 'y' });
    const m = await fresh();
    await m.startWithoutSession();
    await m.resumeSession();
    expect(useApp.getState().startChoice).toBeNull();
    expect(autosaves).toBe(1); // over every start in this file
    expect(calls.filter((c) => c === 'demo')).toHaveLength(2);
  });
});

describe('saveStoredSessionToFile', () => {
  it('no saved session: an error notice that says so, and no download', async () => {
    await (await fresh()).saveStoredSessionToFile();
    expect(useApp.getState().notices[0]).toMatchObject({ kind: 'error', title: 'The saved session could not be read', lines: ['There is no saved session.'] });
    expect(downloads).toEqual([]);
  });
  it('a damaged saved session: its problem is shown', async () => {
    loadOutcome = { ok: false, problem: 'The stored session is from a newer version.' };
    await (await fresh()).saveStoredSessionToFile();
    expect(useApp.getState().notices[0].lines).toEqual(['The stored session is from a newer version.']);
  });
});
