import { useApp } from '../state/store.ts';
import { SessionFileControls } from './export/SessionFileControls.tsx';
import { resumeSession, saveStoredSessionToFile, startWithoutSession } from './startup.ts';

/** Said once when the browser does not keep the session; the page goes on working in memory. */
export function SessionBanner() {
  const problem = useApp((s) => s.sessionProblem);
  const dismissed = useApp((s) => s.sessionProblemDismissed);
  const dismiss = useApp((s) => s.dismissSessionProblem);
  if (!problem || dismissed) return null;
  return (
    <div className="notice notice-warning session-banner" role="alert" data-testid="session-problem">
      <div className="notice-head">
        <strong>Your work is not being kept in this browser</strong>
        <button type="button" className="link" onClick={dismiss} aria-label="Dismiss the message about keeping the session">dismiss</button>
      </div>
      <p>{problem} Everything still works in this page. To keep your work past a reload, save the session as a file; open it again here or in another browser.</p>
      <div className="row"><SessionFileControls /></div>
    </div>
  );
}

/** Asked at start when the session restored last time did not draw. */
export function StartChoice() {
  const choice = useApp((s) => s.startChoice);
  if (!choice) return null;
  return (
    <div className="notice notice-warning start-choice" role="alertdialog" aria-labelledby="start-choice-title" data-testid="start-choice">
      <strong id="start-choice-title">Last time, your saved session could not be drawn</strong>
      <p>What failed: “{choice.message}” ({new Date(choice.at).toLocaleString()}). The session has not been restored this time, so it cannot stop the page again unless you choose to restore it.</p>
      <div className="row">
        <button type="button" onClick={() => void resumeSession()}>Restore it anyway</button>
        <button type="button" onClick={() => void saveStoredSessionToFile()}>Save it to a file</button>
        <button type="button" className="primary" onClick={() => void startWithoutSession()}>Start without it</button>
      </div>
      <p className="small muted">Starting without it opens the demo; the saved session is replaced the next time the page saves, so save it to a file first if you may want it.</p>
    </div>
  );
}
