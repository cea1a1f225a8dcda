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

/** Above this many traces the list offers a filter box and roles for every trace shown. */
const FILTER_FROM = 6;

/** The name a trace goes by in the list: its own column name when its file gave several traces, else its full name. */
function shortName(t: Trace, several: boolean): string {
  const prefix = `${t.source.fileName}: `;
  return several && t.name.startsWith(prefix) ? t.name.slice(prefix.length) : t.name;
}

/** Loaded traces and what each one is. Long lists draw only the rows in view. */
export function TraceList() {
  const allTraces = useApp((s) => s.traces);
  const sampleId = useApp((s) => s.sampleId);
  const [scrollTop, setScrollTop] = useState(0);
  const [filter, setFilter] = useState('');
  const perFile = new Map<string, number>();
  for (const t of allTraces) perFile.set(`${t.source.fileName}\n${t.source.sha256}`, (perFile.get(`${t.source.fileName}\n${t.source.sha256}`) ?? 0) + 1);
  const several = (t: Trace) => (perFile.get(`${t.source.fileName}\n${t.source.sha256}`) ?? 0) > 1;
  const needle = filter.trim().toLowerCase();
  const traces = needle ? allTraces.filter((t) => t.name.toLowerCase().includes(needle)) : allTraces;
  const virtual = traces.length > VIRTUAL_FROM;
  const first = virtual ? Math.max(0, Math.floor(scrollTop / ROW) - SPARE) : 0;
  const last = virtual ? Math.min(traces.length, Math.ceil((scrollTop + VIEW) / ROW) + SPARE) : traces.length;
  const shownOthers = traces.filter((t) => t.id !== sampleId);
  const setAll = (role: TraceRole) => {
    const changes: Record<string, TraceRole> = {};
    for (const t of shownOthers) changes[t.id] = role;
    useApp.getState().setRoles(changes);
  };
  return (
    <section className="panel" aria-labelledby="traces-title">
      <h2 id="traces-title">Traces{allTraces.length > 0 ? <span className="muted small"> ({allTraces.length.toLocaleString('en')})</span> : null}</h2>
      {allTraces.length === 0 && <p className="muted">Nothing loaded.</p>}
      {allTraces.length > FILTER_FROM && (
        <div className="trace-filter">
          <label htmlFor="trace-filter" className="small">Show traces whose name contains</label>
          <input id="trace-filter" type="search" value={filter} placeholder="part of a name" onChange={(e) => { setFilter(e.target.value); setScrollTop(0); }} data-testid="trace-filter" />
          <div className="row small">
            <span className="muted" data-testid="trace-filter-count">{needle ? `${traces.length} of ${allTraces.length} shown` : `all ${allTraces.length} shown`}</span>
            <button type="button" className="link" disabled={shownOthers.length === 0} onClick={() => setAll('scan')}>all shown are repeated scans</button>
            <button type="button" className="link" disabled={shownOthers.length === 0} onClick={() => setAll('ignore')}>set all shown aside</button>
          </div>
        </div>
      )}
      <ul
        className={`trace-list${virtual ? ' trace-list-virtual' : ''}`}
        data-testid="trace-list"
        onScroll={virtual ? (e) => setScrollTop(e.currentTarget.scrollTop) : undefined}
      >
        {virtual && first > 0 && <li aria-hidden="true" style={{ height: first * ROW }} className="trace-spacer" />}
        {traces.slice(first, last).map((t) => <TraceRow key={t.id} trace={t} virtual={virtual} label={shortName(t, several(t))} fromFile={several(t) ? t.source.fileName : null} />)}
        {virtual && last < traces.length && <li aria-hidden="true" style={{ height: (traces.length - last) * ROW }} className="trace-spacer" />}
      </ul>
      {needle && traces.length === 0 && <p className="muted small">No trace name contains “{filter.trim()}”.</p>}
    </section>
  );
}

function TraceRow({ trace: t, virtual, label, fromFile }: { trace: Trace; virtual: boolean; label: string; fromFile: string | null }) {
  const role = useApp((s) => s.roles[t.id]);
  const setRole = useApp((s) => s.setRole);
  const removeTrace = useApp((s) => s.removeTrace);
  return (
    <li className={`trace-item role-${role}`} style={virtual ? { height: ROW - 6 } : undefined}>
      <div className="trace-text">
        <div className="trace-name" title={`${t.name}\nSHA-256 ${t.source.sha256}`}>{label}</div>
        <div className="trace-meta">{fromFile ? `${fromFile} · ` : ''}{t.x.length.toLocaleString('en')} points{t.source.rowsSkipped ? ` · ${t.source.rowsSkipped} rows skipped` : ''}</div>
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
