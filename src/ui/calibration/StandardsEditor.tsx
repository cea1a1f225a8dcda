/**
 * Issue 21: the standards: traces whose role is "standard", and the known
 * amount of each named peak in each, typed into the grid, pasted from a
 * spreadsheet, or read from a CSV (standard,<name> (<unit>),…).
 */
import { useRef, useState } from 'react';
import { readStandardsCsv } from '../../core/calibration/standards.ts';
import { tableProblemText } from '../../core/calibration/table-text.ts';
import { standardKeyOf } from '../../core/calibration/trace-keys.ts';
import { useApp } from '../../state/store.ts';
import { loadBytes } from '../../state/service.ts';
import { emptyStandards, withAmount, withUnit } from './standards-edit.ts';

export function StandardsEditor() {
  const traces = useApp((s) => s.traces);
  const roles = useApp((s) => s.roles);
  const named = useApp((s) => s.namedPeaks);
  const table = useApp((s) => s.standardsTable);
  const busy = useApp((s) => s.standardsBusy);
  const standardPeaks = useApp((s) => s.standardPeaks);
  const { setStandardsTable, notify } = useApp.getState();
  const amountsInput = useRef<HTMLInputElement>(null);
  const filesInput = useRef<HTMLInputElement>(null);
  const [paste, setPaste] = useState('');
  const standards = traces.filter((t) => roles[t.id] === 'standard');
  const names = named.peaks.map((p) => p.name);
  const t = table ?? emptyStandards(names);
  const columns = [...names, ...t.names.filter((n) => !names.includes(n))];

  const read = (text: string, fileName: string) => {
    const r = readStandardsCsv(text, fileName);
    if (!r.ok) { notify('error', `${fileName}: the amounts were not read`, [...r.problems.map(tableProblemText), 'The amounts table is unchanged.']); return false; }
    setStandardsTable(r.table);
    notify('info', `Amounts read from ${fileName}`, [`${r.table.rows.length} standard(s), ${r.table.names.length} named peak(s).`, ...r.notices]);
    return true;
  };

  const loadStandards = async (files: File[]) => {
    // Every trace of a standard's file is a standard (a file holds at most 200 traces).
    for (const f of files) await loadBytes(new Uint8Array(await f.arrayBuffer()), f.name, { roles: new Array(200).fill('standard') });
  };

  return (
    <div data-testid="standards">
      <h3>Standards</h3>
      <div className="row small">
        <button type="button" onClick={() => filesInput.current?.click()}>Load standard runs…</button>
        <input ref={filesInput} type="file" multiple className="sr-only" data-testid="standard-files-input" aria-label="Load standard runs"
          onChange={(e) => { const f = Array.from(e.target.files ?? []); e.target.value = ''; void loadStandards(f); }} />
        <button type="button" onClick={() => amountsInput.current?.click()}>Load amounts…</button>
        <input ref={amountsInput} type="file" accept=".csv,.txt,text/csv" className="sr-only" data-testid="amounts-input" aria-label="Load the standards' amounts (CSV)"
          onChange={(e) => { const f = e.target.files?.[0]; e.target.value = ''; if (f) void f.text().then((x) => read(x, f.name)); }} />
        {busy && <span className="muted">measuring the standards…</span>}
      </div>
      {standards.length === 0 && <p className="muted small">No trace is a standard. Load standard runs here, or set a loaded trace’s role to “standard” in the trace list.</p>}
      {(standards.length > 0 || t.rows.length > 0) && columns.length > 0 && (
        <div className="table-wrap" tabIndex={0} role="region" aria-label="Known amounts of the standards (scrolls)">
          <table className="data" data-testid="amounts-table">
            <caption className="sr-only">Known amount of each named peak in each standard</caption>
            <thead>
              <tr>
                <th scope="col">Standard</th>
                {columns.map((n) => (
                  <th scope="col" key={n}>{n} <input className="unit-input" aria-label={`Amount unit of ${n}`} placeholder="unit" size={5} value={t.units[t.names.indexOf(n)] ?? ''} onChange={(e) => setStandardsTable(withUnit(t, n, e.target.value))} /></th>
                ))}
                <th scope="col">Peaks measured</th>
              </tr>
            </thead>
            <tbody>
              {[...new Set([...standards.map((s) => standardKeyOf(s, t)), ...t.rows.map((r) => r.standard)])].map((key) => {
                const row = t.rows.find((r) => r.standard === key);
                const trace = standards.find((s) => standardKeyOf(s, t) === key);
                const sp = trace ? standardPeaks[trace.id] : undefined;
                return (
                  <tr key={key}>
                    <th scope="row">{key}</th>
                    {columns.map((n) => {
                      const k = t.names.indexOf(n);
                      const v = row && k >= 0 ? row.amounts[k] : null;
                      return (
                        <td key={n}><input type="number" step="any" min="0" size={6} aria-label={`Amount of ${n} in ${key}`} value={v === null ? '' : v}
                          onChange={(e) => setStandardsTable(withAmount(t, key, n, e.target.value === '' || !Number.isFinite(e.target.valueAsNumber) ? null : e.target.valueAsNumber))} /></td>
                      );
                    })}
                    <td>{!trace ? <span className="flag flag-below-detection">no trace loaded</span> : !sp ? '…' : sp.ok ? `${sp.peaks.filter((p) => !p.removedByUser).length} peaks` : <span title={sp.problem}>not measured</span>}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      <details className="small">
        <summary>Paste amounts from a spreadsheet</summary>
        <p className="muted">First row: standard, then one column per named peak with its unit in brackets, e.g. “standard, Orchard Red (mg/L)”; one row per standard trace (its file name).</p>
        <textarea rows={4} cols={60} aria-label="Pasted amounts" value={paste} onChange={(e) => setPaste(e.target.value)} />
        <div><button type="button" disabled={!paste.trim()} onClick={() => { if (read(paste, 'pasted cells')) setPaste(''); }}>Read the pasted cells</button></div>
      </details>
    </div>
  );
}
