import { Fragment, useState, type ReactNode } from 'react';
import { useShallow } from 'zustand/react/shallow';
import type { Peak, PeakMark } from '../core/measure/peak-types.ts';
import { noiseBumpSentence } from '../core/measure/noise-bumps.ts';
import { sigmaProvisional, snrProvisional } from '../core/analysis/result.ts';
import { BOUND_TEXT, MARK_TEXT, SPLIT_TEXT } from '../core/export/peak-csv.ts';
import { useApp } from '../state/store.ts';
import { num } from './format.ts';
import { FLAG_TEXT, SNR_NAME, SNR_SHORT } from '../core/measure/snr-words.ts';
import { useNameOfPeak } from './calibration/derive.ts';
import { FigureControls, usePeakExtras } from './fit/peak-extras.tsx';
import { withCurrent } from '../state/selectors.ts';
import { xUnits } from '../core/units.ts';
import { DISPLAY_CAPS } from '../state/display-caps.ts';
import { peakTableRows, tableTotals } from '../worker/peak-rank.ts';
import { WindowedTable } from './WindowedTable.tsx';


/** One column of the peak table (issue 17); `fixed` columns are always shown. */
interface PeakColumn { key: string; label: string; title?: string; fixed?: boolean; className?: string; cell: (p: Peak, i: number) => ReactNode }

/** Optional columns shown until the user hides them; the others start in each row's details (the table then fits a 1,280-pixel window). */
const DEFAULT_SHOWN = new Set(['height', 'area', 'area-pct']);
const COLUMNS_KEY = 'tracewright.peak-columns';

function readColumnPrefs(): Record<string, boolean> {
  try {
    const v: unknown = JSON.parse(localStorage.getItem(COLUMNS_KEY) ?? '{}');
    if (!v || typeof v !== 'object' || Array.isArray(v)) return {};
    return Object.fromEntries(Object.entries(v as Record<string, unknown>).filter(([, b]) => typeof b === 'boolean')) as Record<string, boolean>;
  } catch {
    return {}; // storage blocked or unreadable: the defaults
  }
}

/** Marks in two or three words for the table; the full sentence is in the cell's title, the CSV and the report. */
const MARK_SHORT: Record<PeakMark, string> = {
  'appears-only-after-processing': 'only after processing',
  'possibly-saturated': 'flat top',
  'thinly-sampled': 'thin',
  'also-in-blank': 'in blank',
};

/** S/N for ordering: not measured sorts last. */
const snrOf = (p: Peak) => p.snr ?? -Infinity;

/** The peak table: a real table with headers; a click on a row zooms to the peak. */
export function PeakTable() {
  // Only the fields shown: earlier stages of a newer request do not re-render the table.
  const result = useApp(useShallow((s) => withCurrent(s, (r) => ({ peaks: r.peaks, peakOptions: r.peakOptions, peakProblem: r.peakProblem, noiseBumps: r.noiseBumps }))));
  const resultSeq = useApp((s) => s.stageSeq.peaks);
  const provisional = useApp((s) => s.pending.includes('peaks'));
  const sigmaWaiting = useApp((s) => sigmaProvisional(s.pending, s.result?.noise ?? null)); // issue 14
  const snrWaiting = useApp((s) => snrProvisional(s.pending, s.result?.noise ?? null));
  const bumpsPending = useApp((s) => s.pending.includes('bumps'));
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const selected = useApp((s) => s.selectedPeakX);
  const addPeakMode = useApp((s) => s.addPeakMode);
  const decisions = useApp((s) => s.decisions);
  const { selectPeak, setXRange, removePeakAt, restorePeakAt, setAddPeakMode, clearDecisions } = useApp.getState();
  const [orderChoice, setOrderChoice] = useState<'x' | 'snr' | null>(null);
  const [colPrefs, setColPrefs] = useState<Record<string, boolean>>(readColumnPrefs);
  const [openRows, setOpenRows] = useState<ReadonlySet<string>>(new Set());
  const toggleColumn = (key: string, on: boolean) => {
    const next = { ...colPrefs, [key]: on };
    setColPrefs(next);
    try { localStorage.setItem(COLUMNS_KEY, JSON.stringify(next)); } catch { /* not remembered where storage is blocked */ }
  };
  const toggleRow = (key: string) => setOpenRows((old) => { const n = new Set(old); if (n.has(key)) n.delete(key); else n.add(key); return n; });
  const names = useNameOfPeak(); // issue 21
  const extras = usePeakExtras(); // issue 18: optional figure and fitted-area columns
  if (!result || !sample) return null;
  const all = result.peaks;
  // A long noisy trace can hold thousands of candidates; the page shows at most DISPLAY_CAPS.peakRows (the user's decisions and
  // the highest S/N), ordered by S/N when capped unless the user asks for position. The peak CSV holds every one.
  const capped = all.length > DISPLAY_CAPS.peakRows;
  const order = orderChoice ?? (capped ? 'snr' : 'x');
  // The user's decisions and the highest S/N, ranked by the worker (worker/peak-rank.ts).
  const shown = capped ? peakTableRows(all, DISPLAY_CAPS.peakRows).slice() : all.slice();
  const peaks = order === 'snr' ? shown.sort((a, b) => snrOf(b) - snrOf(a) || a.x - b.x) : shown.sort((a, b) => a.x - b.x);
  const def = result.peakOptions?.snrDefinition ?? 'rms';
  const xu = sample.xUnit ? ` (${sample.xUnit})` : '';
  const yu = sample.yUnit ? ` (${sample.yUnit})` : '';
  // Issue 17: the area's unit is y-unit × x-unit.
  const areaUnit = sample.yUnit || sample.xUnit ? ` (${sample.yUnit || 'y-units'}·${sample.xUnit || 'x-units'})` : '';
  // Counted over every row (by the worker when it sent them: the page then reads only the rows shown).
  const totals = tableTotals(all);
  const counts = { q: totals.quantifiable, d: totals.detectable, b: totals.below };
  const lim = result.peakOptions?.limits;
  // Issue 17: area % of the summed area of every kept peak (the CSV-wide total, not only the rows shown).
  const totalArea = totals.area;
  const removeThis = (p: Peak) => removePeakAt(p.origin === 'added-by-user' ? decisions.added.reduce((best, a) => (Math.abs(a - p.x) < Math.abs(best - p.x) ? a : best), decisions.added[0]) : p.x);
  // Issue 17: columns as a list; the optional ones can be shown or hidden (remembered), the hidden ones are in each row's details.
  const columns: PeakColumn[] = [
    { key: 'n', label: '#', fixed: true, cell: (_p, i) => i + 1 },
    ...(names.size > 0 ? [{ key: 'name', label: 'Name', fixed: true, className: 'peak-name', cell: (p: Peak) => names.get(p) ?? '' }] : []),
    { key: 'apex', label: `Apex${xu}`, fixed: true, cell: (p) => num(p.x, 5) },
    { key: 'height', label: `Height${yu}`, cell: (p) => num(p.height) },
    { key: 'prominence', label: `Prominence${yu}`, cell: (p) => num(p.prominence) },
    { key: 'fwhm', label: `FWHM${xu}`, cell: (p) => num(p.fwhm) },
    { key: 'area', label: `Area${areaUnit}`, cell: (p) => num(p.area) },
    { key: 'area-pct', label: 'Area %', title: 'Each peak’s area as a share of the summed area of every peak kept in the table (all rows, not only those shown; removed peaks left out)', cell: (p) => (p.removedByUser || !(totalArea > 0) ? '—' : num((100 * p.area) / totalArea, 3)) },
    { key: 'bounds', label: `Start – end${xu}`, cell: (p) => <span title={`start: ${BOUND_TEXT[p.startKind]}; end: ${BOUND_TEXT[p.endKind]}${p.split !== 'none' ? `; shared valley split by ${SPLIT_TEXT[p.split]}` : ''}`}>{num(p.start, 4)} – {num(p.end, 4)}</span> },
    { key: 'snr', label: `S/N (${SNR_SHORT[def]})`, fixed: true, cell: (p) => <strong>{num(p.snr, 3)}</strong> },
    {
      key: 'status', label: 'Status and marks', fixed: true, className: 'marks',
      cell: (p) => (
        <span title={[...p.marks.map((m) => (m === 'also-in-blank' && p.blankHeight !== undefined ? `${MARK_TEXT[m]}; the blank's height there ${num(p.blankHeight)}` : MARK_TEXT[m])), p.note ?? ''].filter(Boolean).join('; ')}>
          <span className={`flag flag-${p.flag}`}>{FLAG_TEXT[p.flag]}</span>
          {p.marks.map((m) => <span key={m} className={`mark mark-${m}`}>{MARK_SHORT[m]}{m === 'also-in-blank' && p.blankHeight !== undefined ? ` (height ${num(p.blankHeight)})` : ''}</span>)}
          {p.note && <span className="mark">see note</span>}
        </span>
      ),
    },
    { key: 'snr-rms', label: SNR_SHORT.rms, cell: (p) => num(p.snrRms, 3) },
    { key: 'snr-pharma', label: SNR_SHORT.pharmacopoeial, cell: (p) => <span title={p.pharmaNoise ? `h = ${num(p.pharmaNoise.h)} over ${p.pharmaNoise.points} points of ${p.pharmaNoise.source}` : ''}>{num(p.snrPharma, 3)}{p.pharmaNoise?.source === 'trace itself' ? '*' : ''}</span> },
    {
      key: 'decision', label: 'Decision', fixed: true, className: 'decision',
      cell: (p, i) => (p.removedByUser ? (
        <>removed by hand <button type="button" className="link" onClick={(e) => { e.stopPropagation(); restorePeakAt(p.x, xUnits(Math.max(p.fwhm, 1e-12))); }}>restore</button></>
      ) : (
        <>{p.origin === 'added-by-user' ? 'added by hand ' : ''}{p.boundsByUser ? 'start and end set by hand ' : ''}<button type="button" className="link danger" onClick={(e) => { e.stopPropagation(); removeThis(p); }} aria-label={`Remove peak ${i + 1}`}>remove</button></>
      )),
    },
    ...extras.headers.map((h, j) => ({ key: `x-${h.key}`, label: h.label, title: h.title, cell: (p: Peak) => extras.cells(p, all.indexOf(p))[j] })),
  ];
  const optional = columns.filter((c) => !c.fixed);
  const isShown = (c: PeakColumn) => c.fixed === true || (colPrefs[c.key] ?? (DEFAULT_SHOWN.has(c.key) || c.key.startsWith('x-')));
  const visible = columns.filter(isShown);
  const hiddenCols = columns.filter((c) => !isShown(c));
  // Issue 16: rows keyed by the peak, never by position (focus stays with the peak after a re-sort); an open
  // detail row is a row of its own for assistive technology, so the rows after it count one more.
  const keys = peaks.map((p) => `${p.index}-${p.origin}-${p.removedByUser ? 'r' : 'k'}`);
  const openBefore = new Array<number>(peaks.length + 1).fill(0);
  for (let i = 0; i < peaks.length; i++) openBefore[i + 1] = openBefore[i] + (openRows.has(keys[i]) ? 1 : 0);
  const selectedRow = selected === null ? -1 : peaks.findIndex((p) => Math.abs(selected - p.x) < 1e-12);
  return (
    <section className="panel" aria-labelledby="peaks-title" data-testid="peak-panel" data-result-seq={resultSeq} data-provisional={provisional || bumpsPending ? 'true' : undefined} data-snr-provisional={snrWaiting ? 'true' : undefined}>
      <div className="panel-head">
        <h2 id="peaks-title">Peaks</h2>
        <div className="row">
          <button type="button" aria-pressed={addPeakMode} onClick={() => setAddPeakMode(!addPeakMode)}>{addPeakMode ? 'Adding: click the trace' : 'Add a peak by clicking'}</button>
          {(decisions.added.length > 0 || decisions.removed.length > 0 || (decisions.bounds?.length ?? 0) > 0) && <button type="button" className="link" onClick={clearDecisions}>undo all hand edits</button>}
        </div>
      </div>
      {provisional && <p className="small provisional" data-testid="peaks-provisional">Provisional: these rows are from before the latest change; the new table is being worked out.{sigmaWaiting && ' S/N provisional: σ is still being carried through the steps.'}</p>}
      {result.peakProblem && <p className="step-problem" role="alert">{result.peakProblem}</p>}
      <p className="small" data-testid="peak-summary">
        {counts.q} quantifiable (S/N ≥ {lim?.quantitation}), {counts.d} detected but not quantifiable ({lim?.detection} ≤ S/N &lt; {lim?.quantitation}), {counts.b} below the detection limit (kept, marked).
        {' '}S/N column: <strong>{SNR_NAME[def]}</strong>.
        {capped && <> Showing the {peaks.length} of {all.length} candidates with the highest S/N (and every hand decision); the peak table CSV holds every one. Raise the smallest S/N or prominence to thin the list.</>}
      </p>
      {bumpsPending && !provisional && <p className="small provisional" data-testid="noise-bumps-pending">Counting how many bumps pure noise would give with these settings…</p>}
      {result.noiseBumps && !bumpsPending && (
        <p className="small" data-testid="noise-bumps" title={result.noiseBumps.method}>
          {noiseBumpSentence(result.noiseBumps)}{' '}
          <span className="muted">(Simulated with these settings; hover for how.)</span>
        </p>
      )}
      <div className="row small">
        <label htmlFor="peak-order">Order rows by</label>
        <select id="peak-order" value={order} onChange={(e) => setOrderChoice(e.target.value as 'x' | 'snr')}>
          <option value="x">position</option>
          <option value="snr">S/N, highest first</option>
        </select>
        <FigureControls />
        <details className="column-chooser" data-testid="column-chooser">
          <summary>Columns…</summary>
          <fieldset>
            <legend className="small">Show in the table (the others are in each row’s details; remembered in this browser)</legend>
            {optional.map((c) => (
              <label key={c.key} className="switch small">
                <input type="checkbox" checked={isShown(c)} onChange={(e) => toggleColumn(c.key, e.target.checked)} data-testid={`col-${c.key}`} /> {c.label}
              </label>
            ))}
          </fieldset>
        </details>
      </div>
      <WindowedTable
        label="Peak table (scrolls)" className="data peaks" testId="peak-table" keys={keys} columns={visible.length + 1}
        rowIndex={(i) => i + 2 + openBefore[i]} rowCount={peaks.length + 1 + openBefore[peaks.length]} reveal={selectedRow >= 0 ? selectedRow : null}
        head={<>
          <caption className="sr-only">Peaks found on the {result.peakOptions ? 'measured' : ''} trace with their measures; S/N by {SNR_NAME[def]}</caption>
          <thead>
            <tr aria-rowindex={1}>
              {visible.map((c) => <th scope="col" key={c.key} title={c.title} data-col={c.key}>{c.label}</th>)}
              <th scope="col" data-col="details" title="Open a row’s details: the columns not shown and why its start and end are where they are">Details</th>
            </tr>
          </thead>
        </>}
        row={(i, attrs) => {
          const p = peaks[i];
          const key = keys[i];
          const open = openRows.has(key);
          return (
            <Fragment key={key}>
              <tr
                {...attrs}
                className={`${selected !== null && Math.abs(selected - p.x) < 1e-12 ? 'selected' : ''} ${p.removedByUser ? 'removed' : ''}`}
                onClick={() => {
                  selectPeak(p.x);
                  const pad = Math.max(p.fwhm * 3, (p.end - p.start) * 0.5);
                  setXRange([p.start - pad, p.end + pad]);
                  setTimeout(() => document.querySelector('[data-testid="focus-view"]')?.scrollIntoView?.({ block: 'nearest' }), 50); // issue 17
                }}
                tabIndex={0}
                onKeyDown={(e) => { if (e.key === 'Enter' && e.target === e.currentTarget) (e.currentTarget as HTMLElement).click(); }}
                aria-label={`Peak ${i + 1} at ${num(p.x)}; press Enter to zoom to it`}
              >
                {visible.map((c) => <td key={c.key} data-col={c.key} className={c.className}>{c.cell(p, i)}</td>)}
                <td className="expander">
                  <button type="button" className="link" aria-expanded={open} aria-label={`${open ? 'Hide' : 'Show'} the details of peak ${i + 1}`} onClick={(e) => { e.stopPropagation(); toggleRow(key); }} data-testid="row-details">{open ? '▾' : '▸'}</button>
                </td>
              </tr>
              {open && (
                <tr className="detail-row" data-testid="peak-detail" aria-rowindex={attrs['aria-rowindex'] + 1}>
                  <td colSpan={visible.length + 1}>
                    <dl className="peak-detail">
                      {hiddenCols.map((c) => <div key={c.key}><dt>{c.label}</dt><dd>{c.cell(p, i)}</dd></div>)}
                      <div><dt>Why these start and end</dt><dd>start: {BOUND_TEXT[p.startKind]}; end: {BOUND_TEXT[p.endKind]}{p.split !== 'none' ? `; shared valley split by ${SPLIT_TEXT[p.split]}` : ''}</dd></div>
                      {p.marks.length > 0 && <div><dt>Marks</dt><dd>{p.marks.map((m) => MARK_TEXT[m]).join('; ')}</dd></div>}
                      {p.note && <div><dt>Note</dt><dd>{p.note}</dd></div>}
                    </dl>
                  </td>
                </tr>
              )}
            </Fragment>
          );
        }}
        empty={<tr><td colSpan={visible.length + 1} className="muted">No peaks pass the thresholds.</td></tr>}
      />
      <p className="hint">
        Height: apex above the peak’s own local baseline, a straight line between the trace’s levels at its start and end (drawn for the selected peak). Start and end: where the trace is back at the baseline, or a valley shared with a neighbour (split by {SPLIT_TEXT[result.peakOptions?.split ?? 'perpendicular-drop']}); hover them, or open a row’s details, for why. FWHM: the peak’s own width at half that height. Area: above the local baseline from start to end (trapezoid rule). The ▸ at the end of a row opens the columns not shown; “Columns…” chooses which are shown.
        {' '}2H/h: h is the noise range {peaks.some((p) => p.pharmaNoise?.source === 'trace itself') ? 'of the trace itself (*), because no blank is loaded: a deviation from the pharmacopoeial method' : 'of the blank, processed by the same steps as the sample'} over {result.peakOptions?.pharmacopoeialMultiplier ?? 5} × FWHM centred on each peak.
      </p>
    </section>
  );
}
