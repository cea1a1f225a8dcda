import { useRef, useState } from 'react';
import { useApp } from '../../state/store.ts';
import { downloadText } from './download.ts';
import { applySnapshot, snapshotOf, workWords, type SessionSnapshot } from '../../state/session-db.ts';
import { sessionFileText, sessionFromFileText } from '../../state/session-file.ts';
import { sessionFileName } from '../startup.ts';

/**
 * Save the session to a file and open one again. Opening asks before it
 * replaces what is loaded, and a file that cannot be read changes nothing.
 */
export function SessionFileControls() {
  const input = useRef<HTMLInputElement>(null);
  const [pending, setPending] = useState<{ name: string; snapshot: SessionSnapshot; notes: string[] } | null>(null);
  const notify = useApp.getState().notify;

  const save = () => {
    const now = new Date();
    try {
      downloadText(sessionFileText(snapshotOf(useApp.getState()), now), sessionFileName(now), 'application/json');
    } catch (e) {
      notify('error', 'The session file could not be made', [(e as Error).message]);
    }
  };

  const open = async (file: File | undefined) => {
    if (!file) return;
    let text: string;
    try { text = await file.text(); } catch (e) { notify('error', `${file.name}: the browser could not read the file`, [(e as Error).message, 'Nothing was changed.']); return; }
    const out = sessionFromFileText(text, file.name);
    if (!out.ok) { notify('error', 'The session file was not opened', [out.problem, 'Nothing was changed.']); return; }
    if (out.snapshot.traces.length === 0) { notify('error', `${file.name}: the session holds no trace that could be read`, [...out.notes, 'Nothing was changed.']); return; }
    if (useApp.getState().traces.length === 0) { apply({ name: file.name, ...out }); return; }
    setPending({ name: file.name, snapshot: out.snapshot, notes: out.notes });
  };

  const apply = (p: { name: string; snapshot: SessionSnapshot; notes: string[] }) => {
    setPending(null);
    applySnapshot(useApp, p.snapshot);
    notify(p.notes.length ? 'warning' : 'info', `Session opened from ${p.name}`, [
      `${p.snapshot.traces.length} trace(s), the step stack with ${p.snapshot.past.length} undo step(s), settings, decisions with their reasons, report fields and alternatives${workWords(p.snapshot)}.`, ...p.notes,
    ]);
  };

  return (
    <>
      <button type="button" data-testid="save-session-file" onClick={save}>Save session to a file</button>
      <button type="button" onClick={() => input.current?.click()}>Open a saved session…</button>
      <input ref={input} type="file" accept=".json,application/json" className="sr-only" data-testid="session-file-input" aria-label="Open a saved session file"
        onChange={(e) => { const f = e.target.files?.[0]; e.target.value = ''; void open(f); }} />
      {pending && (
        <div role="alertdialog" aria-labelledby="session-replace-title" className="confirm-box" data-testid="session-replace">
          <p id="session-replace-title">Replace what is loaded now with the session in {pending.name} ({pending.snapshot.traces.length} trace(s))? Save the current session to a file first if you want to keep it.</p>
          <div className="row">
            <button type="button" className="primary" onClick={() => apply(pending)}>Replace</button>
            <button type="button" onClick={() => setPending(null)}>Cancel</button>
          </div>
        </div>
      )}
    </>
  );
}
