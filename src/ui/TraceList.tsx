import type { TraceRole } from '../core/trace.ts';
import { useApp } from '../state/store.ts';

const ROLE_LABELS: Record<TraceRole, string> = {
  sample: 'sample (processed)',
  blank: 'blank',
  scan: 'repeated scan',
  ignore: 'set aside',
};

/** Loaded traces and what each one is. */
export function TraceList() {
  const traces = useApp((s) => s.traces);
  const roles = useApp((s) => s.roles);
  const setRole = useApp((s) => s.setRole);
  const removeTrace = useApp((s) => s.removeTrace);
  return (
    <section className="panel" aria-labelledby="traces-title">
      <h2 id="traces-title">Traces</h2>
      {traces.length === 0 && <p className="muted">Nothing loaded.</p>}
      <ul className="trace-list">
        {traces.map((t) => (
          <li key={t.id} className={`trace-item role-${roles[t.id]}`}>
            <div className="trace-text">
              <div className="trace-name" title={`${t.source.fileName}\nSHA-256 ${t.source.sha256}`}>{t.name}</div>
              <div className="trace-meta">{t.x.length.toLocaleString('en')} points{t.source.rowsSkipped ? ` · ${t.source.rowsSkipped} rows skipped` : ''}</div>
            </div>
            <div className="row trace-controls">
              <label className="sr-only" htmlFor={`role-${t.id}`}>Role of {t.name}</label>
              <select id={`role-${t.id}`} value={roles[t.id] ?? 'ignore'} onChange={(e) => setRole(t.id, e.target.value as TraceRole)}>
                {(Object.keys(ROLE_LABELS) as TraceRole[]).map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
              </select>
              <button type="button" className="link danger" onClick={() => removeTrace(t.id)} aria-label={`Unload ${t.name}`}>unload</button>
            </div>
          </li>
        ))}
      </ul>
    </section>
  );
}
