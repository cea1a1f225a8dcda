import { useState } from 'react';
import type { Trace, TraceRole } from '../core/trace.ts';
import { useApp } from '../state/store.ts';

const ROLE_LABELS: Record<TraceRole, string> = {
  sample: 'sample (processed)',
  blank: 'blank',
  scan: 'repeated scan',
  standard: 'standard (known amounts)',
  ignore: 'set aside',
};

/** Above this many traces only the rows in view are drawn (a wide file gives up to 200 per file). */
export const VIRTUAL_FROM = 40;
/** Height of one row in the long list with its 6 px gap, pixels (fixed, so the rows in view follow from the scroll position). */
const ROW = 58;
/** Height of the list's window, pixels (matches .trace-list max-height). */
const VIEW = 330;
/** Rows drawn beyond the window at each end, so scrolling shows no gap. */
const SPARE = 6;

/** Loaded traces and what each one is. Long lists draw only the rows in view. */
export function TraceList() {
  const traces = useApp((s) => s.traces);
  const [scrollTop, setScrollTop] = useState(0);
  const virtual = traces.length > VIRTUAL_FROM;
  const first = virtual ? Math.max(0, Math.floor(scrollTop / ROW) - SPARE) : 0;
  const last = virtual ? Math.min(traces.length, Math.ceil((scrollTop + VIEW) / ROW) + SPARE) : traces.length;
  return (
    <section className="panel" aria-labelledby="traces-title">
      <h2 id="traces-title">Traces{traces.length > 0 ? <span className="muted small"> ({traces.length.toLocaleString('en')})</span> : null}</h2>
      {traces.length === 0 && <p className="muted">Nothing loaded.</p>}
      <ul
        className={`trace-list${virtual ? ' trace-list-virtual' : ''}`}
        data-testid="trace-list"
        onScroll={virtual ? (e) => setScrollTop(e.currentTarget.scrollTop) : undefined}
      >
        {virtual && first > 0 && <li aria-hidden="true" style={{ height: first * ROW }} className="trace-spacer" />}
        {traces.slice(first, last).map((t) => <TraceRow key={t.id} trace={t} virtual={virtual} />)}
        {virtual && last < traces.length && <li aria-hidden="true" style={{ height: (traces.length - last) * ROW }} className="trace-spacer" />}
      </ul>
    </section>
  );
}

function TraceRow({ trace: t, virtual }: { trace: Trace; virtual: boolean }) {
  const role = useApp((s) => s.roles[t.id]);
  const setRole = useApp((s) => s.setRole);
  const removeTrace = useApp((s) => s.removeTrace);
  return (
    <li className={`trace-item role-${role}`} style={virtual ? { height: ROW - 6 } : undefined}>
      <div className="trace-text">
        <div className="trace-name" title={`${t.source.fileName}\nSHA-256 ${t.source.sha256}`}>{t.name}</div>
        <div className="trace-meta">{t.x.length.toLocaleString('en')} points{t.source.rowsSkipped ? ` · ${t.source.rowsSkipped} rows skipped` : ''}</div>
      </div>
      <div className="row trace-controls">
        <label className="sr-only" htmlFor={`role-${t.id}`}>Role of {t.name}</label>
        <select id={`role-${t.id}`} value={role ?? 'ignore'} onChange={(e) => setRole(t.id, e.target.value as TraceRole)}>
          {(Object.keys(ROLE_LABELS) as TraceRole[]).map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
        </select>
        <button type="button" className="link danger" onClick={() => removeTrace(t.id)} aria-label={`Unload ${t.name}`}>unload</button>
      </div>
    </li>
  );
}
