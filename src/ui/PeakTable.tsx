import { useState } from 'react';
import { useShallow } from 'zustand/react/shallow';
import type { Peak, PeakMark } from '../core/measure/peak-types.ts';
import { noiseBumpSentence } from '../core/measure/noise-bumps.ts';
import { sigmaProvisional } from '../core/analysis/result.ts';
import { BOUND_TEXT, MARK_TEXT, SPLIT_TEXT } from '../core/export/peak-csv.ts';
import { useApp } from '../state/store.ts';
import { FLAG_WORDS, num, SNR_WORDS } from './format.ts';
import { useNameOfPeak } from './calibration/derive.ts';
import { FigureControls, usePeakExtras } from './fit/peak-extras.tsx';

const MAX_ROWS = 500;

/** Marks in two or three words for the table; the full sentence is in the cell's title, the CSV and the report. */
const MARK_SHORT: Record<PeakMark, string> = {
  'appears-only-after-processing': 'only after processing',
  'possibly-saturated': 'flat top',
  'thinly-sampled': 'thin',
  'also-in-blank': 'in blank',
};

/** S/N for ordering: not measured sorts last. */
const snrOf = (p: Peak) => p.snr ?? -Infinity;

/**
 * At most MAX_ROWS rows: the user's decisions always, then the highest S/N
 * (never the first by position: on a long noisy trace those are noise).
 */
function pickRows(all: readonly Peak[]): Peak[] {
  const mine = (p: Peak) => p.origin === 'added-by-user' || p.removedByUser === true;
  const rest = all.filter((p) => !mine(p)).sort((a, b) => snrOf(b) - snrOf(a));
  return [...all.filter(mine), ...rest].slice(0, MAX_ROWS);
}

/** The peak table: a real table with headers; a click on a row zooms to the peak. */
export function PeakTable() {
  // Only the fields shown: earlier stages of a newer request do not re-render the table.
  const result = useApp(useShallow((s) => (s.result && s.result.sampleId === s.sampleId
    ? { peaks: s.result.peaks, peakOptions: s.result.peakOptions, peakProblem: s.result.peakProblem, noiseBumps: s.result.noiseBumps }
    : null)));
  const resultSeq = useApp((s) => s.stageSeq.peaks);
  const provisional = useApp((s) => s.pending.includes('peaks'));
  const sigmaWaiting = useApp((s) => sigmaProvisional(s.pending, s.result?.noise ?? null)); // issue 14
  const bumpsPending = useApp((s) => s.pending.includes('bumps'));
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const selected = useApp((s) => s.selectedPeakX);
  const addPeakMode = useApp((s) => s.addPeakMode);
  const decisions = useApp((s) => s.decisions);
  const { selectPeak, setXRange, removePeakAt, restorePeakAt, setAddPeakMode, clearDecisions } = useApp.getState();
  const [orderChoice, setOrderChoice] = useState<'x' | 'snr' | null>(null);
  const names = useNameOfPeak(); // issue 21
  const extras = usePeakExtras(); // issue 18: optional figure and fitted-area columns
  if (!result || !sample) return null;
  const all = result.peaks;
  // A long noisy trace can hold thousands of candidates; the page shows at most MAX_ROWS (the user's decisions and
  // the highest S/N), ordered by S/N when capped unless the user asks for position. The peak CSV holds every one.
  const capped = all.length > MAX_ROWS;
  const order = orderChoice ?? (capped ? 'snr' : 'x');
  const shown = capped ? pickRows(all) : all.slice();
  const peaks = order === 'snr' ? shown.sort((a, b) => snrOf(b) - snrOf(a) || a.x - b.x) : shown.sort((a, b) => a.x - b.x);
  const def = result.peakOptions?.snrDefinition ?? 'rms';
  const xu = sample.xUnit ? ` (${sample.xUnit})` : '';
  const yu = sample.yUnit ? ` (${sample.yUnit})` : '';
  // Issue 17: the area's unit is y-unit × x-unit.
  const areaUnit = sample.yUnit || sample.xUnit ? ` (${sample.yUnit || 'y-units'}·${sample.xUnit || 'x-units'})` : '';
  const counts = { q: 0, d: 0, b: 0 };
  for (const p of all) if (!p.removedByUser) { if (p.flag === 'quantifiable') counts.q++; else if (p.flag === 'detectable') counts.d++; else counts.b++; }
  const lim = result.peakOptions?.limits;
  // Issue 17: area % of the summed area of every kept peak (the CSV-wide total, not only the rows shown).
  let totalArea = 0;
  for (const p of all) if (!p.removedByUser) totalArea += p.area;
  return (
    <section className="panel" aria-labelledby="peaks-title" data-testid="peak-panel" data-result-seq={resultSeq} data-provisional={provisional || bumpsPending ? 'true' : undefined} data-snr-provisional={provisional || sigmaWaiting ? 'true' : undefined}>
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
        {' '}S/N column: <strong>{SNR_WORDS[def]}</strong>.
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
      </div>
      <div className="table-wrap" tabIndex={0} role="region" aria-label="Peak table (scrolls)">
        <table className="data" data-testid="peak-table">
          <caption className="sr-only">Peaks found on the {result.peakOptions ? 'measured' : ''} trace with their measures; S/N by {SNR_WORDS[def]}</caption>
          <thead>
            <tr>
              <th scope="col">#</th>
              {names.size > 0 && <th scope="col">Name</th>}
              <th scope="col">Apex{xu}</th>
              <th scope="col">Height{yu}</th>
              <th scope="col">Prominence{yu}</th>
              <th scope="col">FWHM{xu}</th>
              <th scope="col">Area{areaUnit}</th>
              <th scope="col" title="Each peak's area as a share of the summed area of every peak kept in the table (all rows, not only those shown; removed peaks left out)">Area %</th>
              <th scope="col">Bounds{xu}</th>
              <th scope="col">S/N ({def === 'rms' ? 'H/σ' : def === 'pharmacopoeial' ? '2H/h' : 'mean/SD'})</th>
              <th scope="col">Status and marks</th>
              <th scope="col">H/σ</th>
              <th scope="col">2H/h</th>
              <th scope="col">Decision</th>
              {extras.headers.map((h) => <th scope="col" key={h.key} title={h.title}>{h.label}</th>)}
            </tr>
          </thead>
          <tbody>
            {peaks.map((p, i) => (
              <tr
                key={`${p.index}-${p.origin}-${p.removedByUser ? 'r' : 'k'}`}
                className={`${selected !== null && Math.abs(selected - p.x) < 1e-12 ? 'selected' : ''} ${p.removedByUser ? 'removed' : ''}`}
                onClick={() => {
                  selectPeak(p.x);
                  const pad = Math.max(p.fwhm * 3, (p.end - p.start) * 0.5);
                  setXRange([p.start - pad, p.end + pad]);
                }}
                tabIndex={0}
                onKeyDown={(e) => { if (e.key === 'Enter') (e.currentTarget as HTMLElement).click(); }}
                aria-label={`Peak ${i + 1} at ${num(p.x)}; press Enter to zoom to it`}
              >
                <td>{i + 1}</td>
                {names.size > 0 && <td className="peak-name">{names.get(p) ?? ''}</td>}
                <td>{num(p.x, 5)}</td>
                <td>{num(p.height)}</td>
                <td>{num(p.prominence)}</td>
                <td>{num(p.fwhm)}</td>
                <td>{num(p.area)}</td>
                <td>{p.removedByUser || !(totalArea > 0) ? '—' : num((100 * p.area) / totalArea, 3)}</td>
                <td title={`start: ${BOUND_TEXT[p.startKind]}; end: ${BOUND_TEXT[p.endKind]}${p.split !== 'none' ? `; shared valley split by ${SPLIT_TEXT[p.split]}` : ''}`}>{num(p.start, 4)} – {num(p.end, 4)}</td>
                <td><strong>{num(p.snr, 3)}</strong></td>
                <td className="marks" title={[...p.marks.map((m) => (m === 'also-in-blank' && p.blankHeight !== undefined ? `${MARK_TEXT[m]}; the blank's height there ${num(p.blankHeight)}` : MARK_TEXT[m])), p.note ?? ''].filter(Boolean).join('; ')}>
                  <span className={`flag flag-${p.flag}`}>{FLAG_WORDS[p.flag]}</span>
                  {p.marks.map((m) => <span key={m} className={`mark mark-${m}`}>{MARK_SHORT[m]}{m === 'also-in-blank' && p.blankHeight !== undefined ? ` (height ${num(p.blankHeight)})` : ''}</span>)}
                  {p.note && <span className="mark">see note</span>}
                </td>
                <td>{num(p.snrRms, 3)}</td>
                <td title={p.pharmaNoise ? `h = ${num(p.pharmaNoise.h)} over ${p.pharmaNoise.points} points of ${p.pharmaNoise.source}` : ''}>{num(p.snrPharma, 3)}{p.pharmaNoise?.source === 'trace itself' ? '*' : ''}</td>
                <td>
                  {p.removedByUser ? (
                    <>removed by hand <button type="button" className="link" onClick={(e) => { e.stopPropagation(); restorePeakAt(p.x, Math.max(p.fwhm, 1e-12)); }}>restore</button></>
                  ) : (
                    <>{p.origin === 'added-by-user' ? 'added by hand ' : ''}{p.boundsByUser ? 'start and end set by hand ' : ''}<button type="button" className="link danger" onClick={(e) => { e.stopPropagation(); removePeakAt(p.origin === 'added-by-user' ? decisions.added.reduce((best, a) => (Math.abs(a - p.x) < Math.abs(best - p.x) ? a : best), decisions.added[0]) : p.x); }} aria-label={`Remove peak ${i + 1}`}>remove</button></>
                  )}
                </td>
                {extras.cells(p, all.indexOf(p)).map((c, j) => <td key={`x${j}`}>{c}</td>)}
              </tr>
            ))}
            {peaks.length === 0 && <tr><td colSpan={13} className="muted">No peaks pass the thresholds.</td></tr>}
          </tbody>
        </table>
      </div>
      <p className="hint">
        Height: apex above the peak’s own local baseline, a straight line between the trace’s levels at its start and end (drawn for the selected peak). Start and end: where the trace is back at the baseline, or a valley shared with a neighbour (split by {SPLIT_TEXT[result.peakOptions?.split ?? 'perpendicular-drop']}); hover a start or end for why. FWHM: the peak’s own width at half that height. Area: above the local baseline between start and end (trapezoid rule).
        {' '}2H/h: h is the noise range {peaks.some((p) => p.pharmaNoise?.source === 'trace itself') ? 'of the trace itself (*), because no blank is loaded: a deviation from the pharmacopoeial method' : 'of the blank, processed by the same steps as the sample'} over {result.peakOptions?.pharmacopoeialMultiplier ?? 5} × FWHM centred on each peak.
      </p>
    </section>
  );
}
