/**
 * What the page does when it opens: put the saved session back (or open the
 * demo), then keep the session as the user works. When the last restored
 * session did not draw, it asks first (StartChoice.tsx) instead of drawing
 * the same thing into the same failure again.
 */
import { useApp } from '../state/store.ts';
import { loadDemo } from '../state/service.ts';
import { lastDrawProblem, markDrawn, markRestoring } from './draw-health.ts';
import { downloadText } from './export/download.ts';
import { hasSavedSession, loadSession, restoreSession, startSessionAutosave } from '../state/session-db.ts';
import { sessionFileText } from '../state/session-file.ts';

let autosaveStarted = false;

function startAutosave(): void {
  if (autosaveStarted) return;
  autosaveStarted = true;
  startSessionAutosave(useApp);
}

/** First thing after the page is drawn. */
export async function startUp(): Promise<void> {
  const problem = lastDrawProblem();
  if (problem && await hasSavedSession()) {
    useApp.getState().setStartChoice({
      message: problem.state === 'failed' ? problem.message ?? 'the plot could not be drawn' : 'the page stopped before the restored session was drawn',
      at: problem.at,
    });
    return;
  }
  await resumeSession();
}

/** Restore the saved session (the demo when there is none) and start keeping edits. */
export async function resumeSession(): Promise<void> {
  useApp.getState().setStartChoice(null);
  if (await hasSavedSession()) markRestoring();
  const restored = await restoreSession(useApp).catch(() => false);
  // Autosave first, so a file dropped while the demo is still loading is kept too.
  startAutosave();
  if (!restored || !useApp.getState().sampleId) markDrawn();
  if (!restored) await loadDemo();
}

/** Leave the saved session unrestored: open the demo; the saved session is replaced by the next save. */
export async function startWithoutSession(): Promise<void> {
  useApp.getState().setStartChoice(null);
  markDrawn();
  startAutosave();
  await loadDemo();
}

/** Save the session the browser holds to a file, without restoring it into the page. */
export async function saveStoredSessionToFile(): Promise<void> {
  const out = await loadSession();
  if (!out || !out.ok) {
    useApp.getState().notify('error', 'The saved session could not be read', [out ? out.problem : 'There is no saved session.']);
    return;
  }
  downloadText(sessionFileText(out.snapshot, new Date()), sessionFileName(new Date()), 'application/json');
}

/** File name of a session file saved now. */
export function sessionFileName(now: Date): string {
  return `tracewright-session-${now.toISOString().replace(/[:]/g, '-').replace(/\.\d+Z$/, 'Z')}.json`;
}
