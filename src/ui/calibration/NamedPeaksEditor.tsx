/**
 * Issue 21: the named-peak table: name, expected position and window
 * (± half-width), filled by clicking peaks on the plot, typed, or read from
 * a CSV file; which named peaks the sample lacks.
 */
import { useRef } from 'react';
import { MATCH_RULES, readNamedPeaksCsv, validateNamedPeakTable, type MatchRule } from '../../core/calibration/named-peaks.ts';
import { tableProblemText } from '../../core/calibration/table-text.ts';
import { useApp } from '../../state/store.ts';
import { useSampleNaming } from './derive.ts';

export function NamedPeaksEditor() {
  const table = useApp((s) => s.namedPeaks);
  const pick = useApp((s) => s.namePickMode);
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const { setNamePickMode, updateNamedPeak, removeNamedPeak, setNamedPeaks, setMatchRule, notify } = useApp.getState();
  const naming = useSampleNaming();
  const fileInput = useRef<HTMLInputElement>(null);
  const check = validateNamedPeakTable(table);
  const xu = table.xUnit || sample?.xUnit || '';
  const u = xu ? ` (${xu})` : '';

  const loadFile = async (f: File | undefined) => {
    if (!f) return;
    const r = readNamedPeaksCsv(await f.text(), f.name, { rule: table.rule });
    if (!r.ok) { notify('error', `${f.name}: the named peaks were not loaded`, [...r.problems.map(tableProblemText), 'The named-peak table is unchanged.']); return; }
    setNamedPeaks(r.table);
    notify('info', `Named peaks loaded from ${f.name}`, [`${r.table.peaks.length} named peak(s).`, ...r.warnings, ...r.notices]);
  };

  return (
    <div data-testid="named-peaks">
      <h3>Named peaks</h3>
      <div className="row small">
        <button type="button" aria-pressed={pick} onClick={() => setNamePickMode(!pick)}>{pick ? 'Naming: click a peak on the plot' : 'Name a peak by clicking it'}</button>
        <button type="button" onClick={() => fileInput.current?.click()}>Load named peaks…</button>
        <input ref={fileInput} type="file" accept=".csv,.txt,text/csv" className="sr-only" data-testid="named-peaks-input" aria-label="Load named peaks from a CSV file"
          onChange={(e) => { const f = e.target.files?.[0]; e.target.value = ''; void loadFile(f); }} />
        <label htmlFor="match-rule">Several peaks in a window: take the</label>
        <select id="match-rule" value={table.rule} onChange={(e) => setMatchRule(e.target.value as MatchRule)}>
          {MATCH_RULES.map((r) => <option key={r} value={r}>{r === 'nearest' ? 'nearest to the expected position' : 'tallest'}</option>)}
        </select>
      </div>
      {table.peaks.length === 0 ? (
        <p className="muted small">No named peaks. Click “Name a peak by clicking it” and then a peak on the plot, or load a CSV with the columns name, position and window.</p>
      ) : (
        <div className="table-wrap" tabIndex={0} role="region" aria-label="Named peaks (scrolls)">
        <table className="data" data-testid="named-peak-table">
          <thead><tr><th scope="col">Name</th><th scope="col">Expected position{u}</th><th scope="col">Window ±{u}</th><th scope="col">In this sample</th><th scope="col" /></tr></thead>
          <tbody>
            {table.peaks.map((p, i) => {
              const m = naming?.matches[i];
              return (
                <tr key={i}>
                  <td><input aria-label={`Name of named peak ${i + 1}`} value={p.name} onChange={(e) => updateNamedPeak(i, { name: e.target.value })} /></td>
                  <td><input aria-label={`Expected position of ${p.name}`} type="number" step="any" value={Number.isFinite(p.position) ? p.position : ''} onChange={(e) => updateNamedPeak(i, { position: e.target.valueAsNumber })} /></td>
                  <td><input aria-label={`Window of ${p.name}`} type="number" step="any" min="0" value={Number.isFinite(p.window) ? p.window : ''} onChange={(e) => updateNamedPeak(i, { window: e.target.valueAsNumber })} /></td>
                  <td title={m?.note ?? ''}>{!m ? '—' : m.peakIndex === null ? <span className="flag flag-below-detection">missing</span> : `found at ${m.x?.toPrecision(5)}${m.candidates > 1 ? ` (${m.candidates} in window)` : ''}`}</td>
                  <td><button type="button" className="link danger" onClick={() => removeNamedPeak(i)} aria-label={`Remove named peak ${p.name}`}>remove</button></td>
                </tr>
              );
            })}
          </tbody>
        </table>
        </div>
      )}
      {check.problems.map((p) => <p key={p} className="step-problem" role="alert">{p}</p>)}
      {check.warnings.map((p) => <p key={p} className="small">{p}</p>)}
      {naming && <p className="small" data-testid="missing-named">{naming.missing.length ? <>Missing in this sample: <strong>{naming.missing.join(', ')}</strong>.</> : 'Every named peak was found in this sample.'} {naming.ruleInWords}</p>}
    </div>
  );
}
