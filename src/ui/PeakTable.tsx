import type { Peak } from '../core/measure/peak-types.ts';
import { useApp } from '../state/store.ts';
import { FLAG_WORDS, num, SNR_WORDS } from './format.ts';

const MAX_ROWS = 500;

function pickRows(all: readonly Peak[]): Peak[] {
  const keep = (p: Peak) => p.flag === 'detectable' || p.flag === 'quantifiable' || p.origin === 'added-by-user' || p.removedByUser === true;
  const first = all.filter(keep);
  const rest = all.filter((p) => !keep(p)).sort((a, b) => (b.snr ?? 0) - (a.snr ?? 0));
  return [...first, ...rest].slice(0, MAX_ROWS).sort((a, b) => a.x - b.x);
}

/** The peak table: a real table with headers; a click on a row zooms to the peak. */
export function PeakTable() {
  const result = useApp((s) => (s.result && s.result.sampleId === s.sampleId ? s.result : null));
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const selected = useApp((s) => s.selectedPeakX);
  const addPeakMode = useApp((s) => s.addPeakMode);
  const decisions = useApp((s) => s.decisions);
  const { selectPeak, setXRange, removePeakAt, restorePeakAt, setAddPeakMode, clearDecisions } = useApp.getState();
  if (!result || !sample) return null;
  const all = result.peaks;
  // A long noisy trace can hold thousands of candidates; the page shows at most MAX_ROWS (the ones at or above
  // the detection limit and the user's decisions first). The peak CSV always holds every one.
  const peaks = all.length <= MAX_ROWS ? all : pickRows(all);
  const def = result.peakOptions?.snrDefinition ?? 'rms';
  const xu = sample.xUnit ? ` (${sample.xUnit})` : '';
  const yu = sample.yUnit ? ` (${sample.yUnit})` : '';
  const counts = { q: 0, d: 0, b: 0 };
  for (const p of all) if (!p.removedByUser) { if (p.flag === 'quantifiable') counts.q++; else if (p.flag === 'detectable') counts.d++; else counts.b++; }
  const lim = result.peakOptions?.limits;
  return (
    <section className="panel" aria-labelledby="peaks-title">
      <div className="panel-head">
        <h2 id="peaks-title">Peaks</h2>
        <div className="row">
          <button type="button" aria-pressed={addPeakMode} onClick={() => setAddPeakMode(!addPeakMode)}>{addPeakMode ? 'Adding: click the trace' : 'Add a peak by clicking'}</button>
          {(decisions.added.length > 0 || decisions.removed.length > 0) && <button type="button" className="link" onClick={clearDecisions}>undo all hand edits</button>}
        </div>
      </div>
      {result.peakProblem && <p className="step-problem" role="alert">{result.peakProblem}</p>}
      <p className="small" data-testid="peak-summary">
        {counts.q} quantifiable (S/N ≥ {lim?.quantitation}), {counts.d} detected but not quantifiable ({lim?.detection} ≤ S/N &lt; {lim?.quantitation}), {counts.b} below the detection limit (kept, marked).
        {' '}S/N column: <strong>{SNR_WORDS[def]}</strong>.
        {all.length > peaks.length && <> Showing {peaks.length} of {all.length} candidates (all at or above the detection limit first); the peak table CSV holds every one. Raise the smallest S/N or prominence to thin the list.</>}
      </p>
      <div className="table-wrap" tabIndex={0} role="region" aria-label="Peak table (scrolls)">
        <table className="data" data-testid="peak-table">
          <caption className="sr-only">Peaks found on the {result.peakOptions ? 'measured' : ''} trace with their measures; S/N by {SNR_WORDS[def]}</caption>
          <thead>
            <tr>
              <th scope="col">#</th>
              <th scope="col">Apex{xu}</th>
              <th scope="col">Height{yu}</th>
              <th scope="col">Prominence{yu}</th>
              <th scope="col">FWHM{xu}</th>
              <th scope="col">Area</th>
              <th scope="col">Bounds{xu}</th>
              <th scope="col">S/N ({def === 'rms' ? 'H/σ' : def === 'pharmacopoeial' ? '2H/h' : 'mean/SD'})</th>
              <th scope="col">H/σ</th>
              <th scope="col">2H/h</th>
              <th scope="col">Status</th>
              <th scope="col">Decision</th>
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
                <td>{num(p.x, 5)}</td>
                <td>{num(p.height)}</td>
                <td>{num(p.prominence)}</td>
                <td>{num(p.fwhm)}</td>
                <td>{num(p.area)}</td>
                <td>{num(p.start, 4)} – {num(p.end, 4)}</td>
                <td><strong>{num(p.snr, 3)}</strong></td>
                <td>{num(p.snrRms, 3)}</td>
                <td title={p.pharmaNoise ? `h = ${num(p.pharmaNoise.h)} over ${p.pharmaNoise.points} points of ${p.pharmaNoise.source}` : ''}>{num(p.snrPharma, 3)}{p.pharmaNoise?.source === 'trace itself' ? '*' : ''}</td>
                <td><span className={`flag flag-${p.flag}`}>{FLAG_WORDS[p.flag]}</span></td>
                <td>
                  {p.removedByUser ? (
                    <>removed by hand <button type="button" className="link" onClick={(e) => { e.stopPropagation(); restorePeakAt(p.x, Math.max(p.fwhm, 1e-12)); }}>restore</button></>
                  ) : (
                    <>{p.origin === 'added-by-user' ? 'added by hand ' : ''}<button type="button" className="link danger" onClick={(e) => { e.stopPropagation(); removePeakAt(p.origin === 'added-by-user' ? decisions.added.reduce((best, a) => (Math.abs(a - p.x) < Math.abs(best - p.x) ? a : best), decisions.added[0]) : p.x); }} aria-label={`Remove peak ${i + 1}`}>remove</button></>
                  )}
                </td>
              </tr>
            ))}
            {peaks.length === 0 && <tr><td colSpan={12} className="muted">No peaks pass the thresholds.</td></tr>}
          </tbody>
        </table>
      </div>
      <p className="hint">
        Height is above the straight line joining the peak’s bases; area is above that line between the integration bounds (trapezoid rule); FWHM is the width at half height.
        {' '}2H/h: h is the noise range {peaks.some((p) => p.pharmaNoise?.source === 'trace itself') ? 'of the trace itself (*), because no blank is loaded: a deviation from the pharmacopoeial method' : 'of the blank'} over {result.peakOptions?.pharmacopoeialMultiplier ?? 5} × FWHM centred on each peak.
      </p>
    </section>
  );
}
