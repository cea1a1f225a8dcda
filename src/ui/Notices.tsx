import { useApp } from '../state/store.ts';
import { cancelLoad, runNoticeAction } from '../state/service.ts';
import { DISPLAY_CAPS } from '../state/display-caps.ts';

/** Load reports, warnings and errors, newest first. */
export function Notices() {
  const notices = useApp((s) => s.notices);
  const dismiss = useApp((s) => s.dismissNotice);
  const loading = useApp((s) => s.loading);
  const computeError = useApp((s) => s.computeError);
  return (
    <section className="notices" aria-label="Notices" aria-live="polite">
      {loading && (
        <div className="notice notice-info" data-testid="loading">
          <strong>Reading {loading.fileName}…</strong>
          <progress max={1} value={loading.fraction} aria-label={`Reading ${loading.fileName}`} />
          <button type="button" className="link" onClick={cancelLoad}>cancel</button>
        </div>
      )}
      {computeError && <div className="notice notice-error" role="alert"><strong>Computation failed:</strong> {computeError}</div>}
      {notices.slice(0, DISPLAY_CAPS.noticesShown).map((n) => (
        <div key={n.id} className={`notice notice-${n.kind}`} role={n.kind === 'error' ? 'alert' : undefined} data-testid={`notice-${n.kind}`}>
          <div className="notice-head">
            <strong>{n.title}</strong>
            <button type="button" className="link" onClick={() => dismiss(n.id)} aria-label={`Dismiss notice: ${n.title}`}>dismiss</button>
          </div>
          {n.lines.length > 0 && (
            <ul>{n.lines.map((l, i) => <li key={i}>{l}</li>)}</ul>
          )}
          {n.action && (
            <button type="button" data-testid="notice-action" onClick={() => { const key = n.action!.key; dismiss(n.id); runNoticeAction(key); }}>{n.action.label}</button>
          )}
        </div>
      ))}
    </section>
  );
}
