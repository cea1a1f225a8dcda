import type { LedgerCell } from '../core/measure/loss-matching.ts';
import { ledgerFitNote, type LedgerFitNote } from '../core/measure/fit/ledger-fit.ts';
import { useLedgerFits } from './fit/ledger-fits.ts';
import { useApp } from '../state/store.ts';
import { presetAlternative, PRESETS } from './alternatives.ts';
import { num } from './format.ts';
import { FLAG_TEXT } from '../core/measure/snr-words.ts';
import { ALTERNATIVE_COLOURS } from './palette.ts';
import { MAX_ALTERNATIVES } from '../core/analysis/index.ts';
import { currentResult } from '../state/selectors.ts';
import { DISPLAY_CAPS } from '../state/display-caps.ts';
import { WindowedTable } from './WindowedTable.tsx';

function standingText(c: LedgerCell): string {
  if (!c.found) return 'lost';
  return `${c.standing === 'lost' ? 'lost' : FLAG_TEXT[c.standing]}, S/N ${num(c.snr, 3)}`;
}

function pct(v: number | null, signed = false): string {
  if (v === null) return '—';
  const s = v.toFixed(Math.abs(v) < 10 ? 1 : 0);
  return `${signed && v > 0 ? '+' : ''}${s} %`;
}

/** Sentences listed on the page at most (the report holds every one). */

/** The ledger cell of a feature inside a fitted region (issue 18): the count in a few words, the whole sentence on hover. */
function FitCell({ note }: { note: LedgerFitNote | null }) {
  return <td className={`small${note?.fewer ? ' down' : ''}`} data-testid="ledger-fit" title={note?.text}>{note?.brief ?? 'not in a fitted region'}</td>;
}

/** The loss check: alternatives side by side, the survival ledger, window advice. */
export function LossPanel() {
  const loss = useApp((s) => (currentResult(s)?.loss ?? null));
  const resultSeq = useApp((s) => s.stageSeq.loss);
  const provisional = useApp((s) => s.pending.includes('loss'));
  const alternatives = useApp((s) => s.alternatives);
  const recipe = useApp((s) => s.recipe);
  const showAlt = useApp((s) => s.showAlternatives);
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const noiseRowsOn = useApp((s) => s.ledgerNoiseLevel);
  const { addAlternatives, removeAlternative, setShowAlternatives, setLedgerNoiseLevel, notify } = useApp.getState();
  const selected = useApp((s) => s.selectedPeakX);
  /** Issue 17: select the feature (the focused view under the plot shows it) and zoom the plot to it. */
  const focusOn = (x: number, cells: readonly LedgerCell[]) => {
    useApp.getState().selectPeak(x);
    const w = Math.max(...cells.map((c) => c.fwhm ?? 0));
    if (w > 0) useApp.getState().setXRange([x - 6 * w, x + 6 * w]);
    setTimeout(() => document.querySelector('[data-testid="focus-view"]')?.scrollIntoView?.({ block: 'nearest' }), 50);
  };
  const xu = sample?.xUnit ?? '';
  const full = alternatives.length >= MAX_ALTERNATIVES;
  const rows = loss ? loss.ledger.rows : [];
  const fits = useLedgerFits(); // issue 18: a column when a region fit compared the versions
  const fitColumn = fits.some((f) => f.result.processing);
  const hidden = loss ? loss.noiseLevelRows : 0;
  // Thousands of rows would stall the page; crossed rows first, then by position.
  const shown = rows.length <= DISPLAY_CAPS.ledgerRows ? rows : [...rows.filter((r) => r.crossed), ...rows.filter((r) => !r.crossed)].slice(0, DISPLAY_CAPS.ledgerRows).sort((a, b) => a.position - b.position);
  const isSelected = (r: (typeof rows)[number]) => selected !== null && Math.abs(selected - r.position) <= r.tolerance;
  const selectedRow = shown.findIndex(isSelected);
  return (
    <section className="panel" aria-labelledby="loss-title" data-testid="loss-panel" data-result-seq={resultSeq} data-provisional={provisional ? 'true' : undefined}>
      <div className="panel-head">
        <h2 id="loss-title">What each choice keeps</h2>
        <label className="switch"><input type="checkbox" checked={showAlt} onChange={(e) => setShowAlternatives(e.target.checked)} /> overlay alternatives</label>
      </div>
      <p className="small muted" data-testid="loss-header">
        Compare the raw trace, the current stack and up to {MAX_ALTERNATIVES} alternative stacks, measured with the same noise and peak settings.
        {' '}{loss ? loss.ledger.rule : 'Features are matched by apex position; each feature’s changes are against the least-processed column that has it (the raw trace when found there).'}
        {' '}Click a row, a peak on the plot or a row of the peak table to see that feature under each choice side by side.
      </p>
      {provisional && <p className="small provisional" data-testid="loss-provisional">Provisional: the comparison below is from before the latest change; the loss check is being worked out again.</p>}
      <div className="row preset-row">
        <span className="small">Add:</span>
        {PRESETS.map((p) => (
          <button key={p.label} type="button" disabled={full} onClick={() => {
            const alt = presetAlternative(recipe, p);
            if (alt && addAlternatives([alt]) === 0) notify('info', `“${alt.label}” is already in the comparison.`);
          }}>{p.label}</button>
        ))}
      </div>
      {alternatives.length > 0 && (
        <ul className="alt-list">
          {alternatives.map((a, i) => {
            const o = loss?.outcomes.find((x) => x.id === a.id);
            return (
              <li key={a.id}>
                <span className="chip" style={{ background: ALTERNATIVE_COLOURS[i % ALTERNATIVE_COLOURS.length] }} aria-hidden="true" />
                <strong>{a.label}</strong>
                {o && <span className="small"> · σ {num(o.noiseSigma)} · {o.peakCount} peaks · {o.diagnostics ? o.diagnostics.verdict : 'nothing removed'}</span>}
                {o?.problems.map((p, k) => <span key={k} className="small warn-text"> · {p}</span>)}
                <button type="button" className="link danger" onClick={() => removeAlternative(a.id)} aria-label={`Remove alternative ${a.label}`}>remove</button>
              </li>
            );
          })}
        </ul>
      )}
      {loss && loss.narrowestFwhmPoints === null && recipe.steps.some((s) => s.enabled && (s.step === 'moving-average' || s.step === 'savitzky-golay')) && (
        <p className="small muted">No window advice: it is taken from the narrowest quantifiable peak of the raw trace, and there is none (noise bumps are narrow by nature and would make every window look too wide).</p>
      )}
      {loss && loss.advice.length > 0 && (
        <div className="advice">
          <h3>Window advice</h3>
          <p className="small muted">Narrowest quantifiable peak: half-height width {num(loss.narrowestFwhmPoints, 3)} points on the raw trace.</p>
          <ul>
            {loss.advice.map((a) => (
              <li key={a.uid} className={a.advice.warning ? 'warn-text' : ''}>
                {a.stepLabel}: window = {a.advice.ratio.toFixed(2)} × that width; a Gaussian that narrow keeps {(100 * a.advice.expectedHeightKept).toFixed(1)} % of its height.
                {a.advice.warning ? ` ${a.advice.warning}` : ''} <span className="muted">({a.advice.rule})</span>
              </li>
            ))}
          </ul>
        </div>
      )}
      {loss && (
        <>
          {loss.currentWarnings.length > 0 ? (
            <div className="notice notice-warning" data-testid="loss-warnings">
              <strong>The current stack loses or weakens {loss.currentWarnings.length} feature{loss.currentWarnings.length === 1 ? '' : 's'}:</strong>
              <ul>{loss.currentWarnings.map((s, i) => <li key={i}>{s}</li>)}</ul>
            </div>
          ) : (
            <p className="verdict ok">No feature found on the raw trace at or above the detection limit is lost or weakened by the current stack.</p>
          )}
          {loss.ledger.sentences.length > 0 && (
            <details>
              <summary>{loss.ledger.sentences.length} change{loss.ledger.sentences.length === 1 ? '' : 's'} across all columns</summary>
              <ul className="small">{loss.ledger.sentences.slice(0, DISPLAY_CAPS.ledgerSentences).map((s, i) => <li key={i}>{s}</li>)}</ul>
              {loss.ledger.sentences.length > DISPLAY_CAPS.ledgerSentences && <p className="small muted">… and {loss.ledger.sentences.length - DISPLAY_CAPS.ledgerSentences} more; the report lists every one.</p>}
            </details>
          )}
          <label className="switch small">
            <input type="checkbox" checked={noiseRowsOn} onChange={(e) => setLedgerNoiseLevel(e.target.checked)} data-testid="ledger-noise-toggle" />
            {' '}also list noise-level features (below the detection limit in every column)
          </label>
          <WindowedTable
            label="Ledger table (scrolls)" className="data ledger" testId="ledger" keys={shown.map((r) => String(r.position))}
            columns={1 + loss.ledger.alternatives.length + (fitColumn ? 1 : 0)}
            reveal={selectedRow >= 0 ? selectedRow : null}
            head={<>
              <caption className="sr-only">Survival of each feature under each processing choice</caption>
              <thead>
                <tr aria-rowindex={1}>
                  <th scope="col">Feature at{xu ? ` (${xu})` : ''}</th>
                  {loss.ledger.alternatives.map((a) => <th scope="col" key={a.id}>{a.label}</th>)}
                  {fitColumn && <th scope="col">Peak count by region fit</th>}
                </tr>
              </thead>
            </>}
            row={(k, attrs) => {
              const r = shown[k];
              return (
                <tr
                  {...attrs}
                  key={r.position}
                  className={`${r.crossed ? 'crossed' : ''} ${isSelected(r) ? 'selected' : ''}`}
                  onClick={() => focusOn(r.position, r.cells)}
                  tabIndex={0}
                  onKeyDown={(e) => { if (e.key === 'Enter') focusOn(r.position, r.cells); }}
                  aria-label={`Feature at ${num(r.position, 5)}; press Enter to see it under each choice`}
                >
                  <th scope="row">{num(r.position, 5)}</th>
                  {r.cells.map((c, i) => (
                    <td key={i} className={`cell-${c.found ? c.standing : 'lost'} ${c.crossed === 'down' ? 'down' : ''}`}>
                      <div>{standingText(c)}</div>
                      {i > r.firstFoundIn && c.heightKept !== null && (
                        <div className="small muted">height {pct(c.heightKept)} · width {pct(c.widthChange, true)} · shift {num(c.apexShiftPoints, 2)} pt · area {pct(c.areaChange, true)}</div>
                      )}
                    </td>
                  ))}
                  {fitColumn && <FitCell note={ledgerFitNote(r.position, fits)} />}
                </tr>
              );
            }}
          />
          {shown.length < rows.length && <p className="small muted">Showing {shown.length} of {rows.length} rows (every row where a limit is crossed first). The report lists every sentence.</p>}
          {hidden > 0 && !loss.noiseLevelShown && <p className="small muted">{hidden} noise-level candidate{hidden === 1 ? '' : 's'} (below the detection limit in every column) left out of the ledger; tick the box above to list them.</p>}
        </>
      )}
      {!loss && <p className="muted">Add a step or an alternative to see what each choice keeps.</p>}
    </section>
  );
}
