import { useMemo } from 'react';
import type { PlotData, PlotLayout } from 'plotly.js-strict-dist-min';
import { dropLineWords, fittedPeakFor } from '../../core/export/fit-export.ts';
import type { FitJobResult } from '../../core/measure/fit/job.ts';
import { MAX_PEAKS } from '../../core/measure/fit/region.ts';
import { SHAPE_KINDS, SHAPES, type ShapeKind } from '../../core/measure/fit/shapes.ts';
import { axisLabel } from '../../core/trace.ts';
import { useApp } from '../../state/store.ts';
import type { KeptFit } from '../../state/fit-slice.ts';
import { num } from '../format.ts';
import { COLOURS } from '../palette.ts';
import { PlotlyFigure } from '../PlotlyFigure.tsx';
import { fitRegion, regionAroundPeak, requestFit } from './fit-service.ts';
import { currentResult } from '../../state/selectors.ts';

/** Component fills: Okabe–Ito colours at low opacity, each with a line of its own dash so colour is never the only cue. */
const COMPONENT = [
  { line: '#0072B2', fill: 'rgba(0,114,178,0.22)', dash: 'solid' },
  { line: '#D55E00', fill: 'rgba(213,94,0,0.22)', dash: 'dash' },
  { line: '#009E73', fill: 'rgba(0,158,115,0.22)', dash: 'dot' },
  { line: '#CC79A7', fill: 'rgba(204,121,167,0.22)', dash: 'dashdot' },
];

const SHAPE_WORDS: Record<ShapeKind, string> = {
  gaussian: 'Gaussian',
  lorentzian: 'Lorentzian',
  'pseudo-voigt': 'pseudo-Voigt',
  emg: 'exponentially modified Gaussian (tailing)',
};

const arr = (a: Float64Array) => Array.from(a);
const pm = (v: { value: number; se: number }, d = 4) => `${num(v.value, d)} ± ${Number.isFinite(v.se) ? num(v.se, 2) : 'n/a'}`;

/** The other fit of the decisive comparison (k + 1 when k was chosen, k when k + 1 was). */
function otherFit(r: FitJobResult) {
  const d = r.decisive;
  if (!d) return null;
  return d.smaller.peaks.length === r.count ? d.larger : d.smaller;
}

function FitPlot({ kept, xTitle, yTitle }: { kept: KeptFit; xTitle: string; yTitle: string }) {
  const r = kept.result;
  const c = r.fit.curves;
  const other = otherFit(r);
  const data = useMemo<PlotData[]>(() => {
    const x = arr(c.x);
    const base = arr(c.baseline);
    const out: PlotData[] = [];
    c.components.forEach((comp, k) => {
      const st = COMPONENT[k % COMPONENT.length];
      out.push({ type: 'scatter', mode: 'lines', x, y: base, line: { width: 0 }, hoverinfo: 'skip', showlegend: false, xaxis: 'x', yaxis: 'y' });
      out.push({ type: 'scatter', mode: 'lines', name: `peak ${k + 1}`, x, y: arr(comp).map((v, j) => v + base[j]), fill: 'tonexty', fillcolor: st.fill, line: { color: st.line, width: 1.5, dash: st.dash }, xaxis: 'x', yaxis: 'y' });
    });
    out.push({ type: 'scatter', mode: 'markers', name: `data (${r.fittedLabel})`, x, y: arr(c.y), marker: { color: COLOURS.raw, size: 3 }, xaxis: 'x', yaxis: 'y' });
    out.push({ type: 'scatter', mode: 'lines', name: 'local baseline', x, y: base, line: { color: COLOURS.baseline, width: 1.5, dash: 'dash' }, xaxis: 'x', yaxis: 'y' });
    out.push({ type: 'scatter', mode: 'lines', name: `fit, ${r.count} peak${r.count === 1 ? '' : 's'}`, x, y: arr(c.fitted), line: { color: COLOURS.ink, width: 2 }, xaxis: 'x', yaxis: 'y' });
    out.push({ type: 'scatter', mode: 'lines', name: `residual, ${r.count} peak${r.count === 1 ? '' : 's'}`, x, y: arr(c.residual), line: { color: COLOURS.residual, width: 1.2 }, xaxis: 'x', yaxis: 'y2' });
    if (other && other.curves.x.length === c.x.length) {
      out.push({ type: 'scatter', mode: 'lines', name: `residual, ${other.peaks.length} peak${other.peaks.length === 1 ? '' : 's'}`, x: arr(other.curves.x), y: arr(other.curves.residual), line: { color: '#56B4E9', width: 1.2, dash: 'dot' }, xaxis: 'x', yaxis: 'y2' });
    }
    return out;
  }, [c, r, other]);
  const layout = useMemo<PlotLayout>(() => ({
    autosize: true,
    height: 440,
    margin: { l: 70, r: 20, t: 30, b: 80 },
    showlegend: true,
    legend: { orientation: 'h', y: -0.16, x: 0, yanchor: 'top', traceorder: 'normal' },
    hovermode: 'closest',
    xaxis: { title: { text: xTitle }, anchor: 'y2', gridcolor: COLOURS.grid, zeroline: false },
    yaxis: { title: { text: yTitle }, domain: [0.34, 1], gridcolor: COLOURS.grid, zeroline: false },
    yaxis2: { title: { text: 'data − fit' }, domain: [0, 0.26], gridcolor: COLOURS.grid, zeroline: true, zerolinecolor: '#b0b6bd' },
    paper_bgcolor: '#ffffff',
    plot_bgcolor: '#ffffff',
    font: { family: 'system-ui, sans-serif', size: 12, color: COLOURS.ink },
  }), [xTitle, yTitle]);
  return <PlotlyFigure data={data} layout={layout} className="fit-plot" label={`Fit of ${r.fittedLabel} trace from ${num(r.settings.from)} to ${num(r.settings.to)}: data, fitted peaks shaded, residuals below`} testId="fit-figure" pictureName="tracewright-fit" drawnTag={String(kept.id)} />;
}

/** Fit a region: how many peaks the data support, each fitted peak with standard errors, and whether the processing keeps that count. */
export function FitPanel() {
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const result = useApp((s) => currentResult(s));
  const choices = useApp((s) => s.fitChoices);
  const allFits = useApp((s) => s.fits);
  const shownId = useApp((s) => s.shownFitId);
  const busy = useApp((s) => s.fitBusy);
  const error = useApp((s) => s.fitError);
  const stackKey = useApp((s) => JSON.stringify(s.recipe.steps));
  useApp((s) => s.markedRange);
  useApp((s) => s.xRange);
  const selectedX = useApp((s) => s.selectedPeakX);
  const measureOn = useApp((s) => s.peakSettings.measureOn);
  const { setFitChoices, removeFit, showFit, setMarkedRange } = useApp.getState();
  if (!sample) return null;
  const fits = allFits.filter((f) => f.sampleId === sample.id);
  const kept = fits.find((f) => f.id === shownId) ?? fits.at(-1) ?? null;
  const region = fitRegion();
  const xu = sample.xUnit ? ` ${sample.xUnit}` : '';
  const xTitle = axisLabel(sample.xName, sample.xUnit);
  const yTitle = axisLabel(sample.yName, sample.yUnit);
  const r = kept?.result ?? null;
  const outOfDate = !!(kept && r && r.settings.on === 'processed' && kept.stackKey !== stackKey);
  const k = r?.fit.peaks.length ?? 0;
  return (
    <section className="panel fit-panel" aria-labelledby="fit-title" data-testid="fit-panel">
      <div className="panel-head">
        <h2 id="fit-title">Fit a region: how many peaks?</h2>
      </div>
      <p className="small">
        Region: {region ? <strong data-testid="fit-region">{num(region[0], 5)} – {num(region[1], 5)}{xu}</strong> : <em>none yet</em>}
        {' '}(the marked range, else the zoomed view; press “Mark a range” above the plot and drag across it).
        {selectedX !== null && result && (
          <> {' '}<button type="button" className="link" onClick={() => { const g = regionAroundPeak(result.peaks, selectedX); if (g) setMarkedRange(g); }}>use the selected peak and its overlapping neighbours</button></>
        )}
      </p>
      <div className="row small">
        <label>Fit the{' '}
          <select value={choices.on} data-testid="fit-on" onChange={(e) => setFitChoices({ on: e.target.value as 'raw' | 'processed' })}>
            <option value="raw">raw trace</option>
            <option value="processed">processed trace</option>
          </select>
        </label>
        <label>Peak shape{' '}
          <select value={choices.shape} data-testid="fit-shape" onChange={(e) => setFitChoices({ shape: e.target.value as ShapeKind })}>
            {SHAPE_KINDS.map((kind) => <option key={kind} value={kind}>{SHAPE_WORDS[kind]}</option>)}
          </select>
        </label>
        <label>Local baseline{' '}
          <select value={choices.baseline} data-testid="fit-baseline" onChange={(e) => setFitChoices({ baseline: e.target.value as 'line' | 'quadratic' })}>
            <option value="line">straight</option>
            <option value="quadratic">quadratic</option>
          </select>
        </label>
        <label>Try up to{' '}
          <select value={choices.maxPeaks} data-testid="fit-max" onChange={(e) => setFitChoices({ maxPeaks: Number(e.target.value) })}>
            {Array.from({ length: MAX_PEAKS }, (_, i) => i + 1).map((n) => <option key={n} value={n}>{n} peak{n === 1 ? '' : 's'}</option>)}
          </select>
        </label>
        <button type="button" className="primary" disabled={busy || !region} data-testid="fit-run" onClick={() => void requestFit()}>{busy ? 'Fitting…' : 'Fit the region'}</button>
      </div>
      {error && <p className="step-problem" role="alert" data-testid="fit-error">{error}</p>}
      {fits.length > 1 && (
        <div className="row small" role="group" aria-label="Kept fits">
          <span>Fits kept:</span>
          {fits.map((f, i) => (
            <span key={f.id}>
              <button type="button" className="link" aria-pressed={kept?.id === f.id} onClick={() => showFit(f.id)}>{i + 1}: {num(f.result.settings.from, 4)}–{num(f.result.settings.to, 4)}, {f.result.count} peak{f.result.count === 1 ? '' : 's'}</button>
            </span>
          ))}
        </div>
      )}
      {kept && r && (
        <div data-testid="fit-result" data-count={r.count}>
          <p className="verdict ok" data-testid="fit-decision"><strong>{r.lead}</strong> <span style={{ fontWeight: 'normal' }}>{r.statement.slice(r.lead.length).trim()}</span></p>
          {outOfDate && <p className="small muted">This fit of the processed trace was made with an earlier step stack; fit again to update it.</p>}
          {r.steps.length > 0 && (
            <p className="small" data-testid="fit-figures">
              Figures of each step (only BIC on the effective points decides; F and AIC are shown as figures, their nominal levels do not hold for an added peak):{' '}
              {r.steps.map((st, i) => (
                <span key={i}>{i ? '; ' : ''}{st.smaller} vs {st.larger}: ΔBIC {num(st.deltaBic, 3)}, ΔAIC {num(st.deltaAic, 3)}, F {num(st.fStatistic, 3)} ({st.supported ? 'extra peak supported' : 'extra peak not supported'})</span>
              ))}.
            </p>
          )}
          <FitPlot kept={kept} xTitle={xTitle} yTitle={yTitle} />
          <div className="table-wrap" tabIndex={0} role="region" aria-label="Fitted peaks (scrolls)">
            <table className="data" data-testid="fit-table">
              <caption className="sr-only">Fitted peaks with standard errors, beside the peak table's drop-line areas</caption>
              <thead>
                <tr>
                  <th scope="col">Peak</th>
                  <th scope="col">Shape</th>
                  <th scope="col">Position{xu ? ` (${sample.xUnit})` : ''}</th>
                  <th scope="col" title="Apex height above the fitted local baseline">Height</th>
                  <th scope="col">FWHM</th>
                  <th scope="col">Fitted area</th>
                  <th scope="col" title="Correlation between this peak's fitted area and the next peak's, from the covariance: near ±1 means the data cannot split the area between them">Area corr. with next</th>
                  <th scope="col" title={result ? `The peak table's area of the row whose half-height crossings hold this apex: drop line (${dropLineWords(result)}) on the ${measureOn} trace` : ''}>Drop-line area *</th>
                </tr>
              </thead>
              <tbody>
                {r.fit.peaks.map((q, j) => {
                  const corr = j + 1 < k ? r.fit.areaCorrelation[j * k + j + 1] : null;
                  const row = result?.peaks.find((p) => !p.removedByUser && fittedPeakFor(p, [{ madeAt: kept.madeAt, result: r }])?.peakNumber === j + 1);
                  return (
                    <tr key={j}>
                      <td>{j + 1}</td>
                      <td>{SHAPES[q.shape].label}</td>
                      <td>{pm(q.position, 5)}</td>
                      <td>{pm(q.height)}</td>
                      <td>{pm(q.fwhm)}</td>
                      <td><strong>{pm(q.area)}</strong></td>
                      <td>{corr === null ? '—' : num(corr, 3)}</td>
                      <td>{row ? num(row.area) : <span className="muted">no table row</span>}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          <p className="small muted">* The peak table’s area for the row whose half-height crossings hold the fitted apex, measured by drop line ({result ? dropLineWords(result) : 'perpendicular drop'}) on the {measureOn} trace. Near ±1, the area correlation says the data cannot split the area between the two neighbours.</p>
          {!r.processing && <p className="small muted" data-testid="fit-processing-none">No processing step and no alternatives to compare with: add steps, or alternatives in the loss check, to see whether each still supports this count.</p>}
          {r.processing && (
            <div data-testid="fit-processing">
              <p className="small"><strong>Does the processing keep this count?</strong> {r.processing.summary}</p>
              <ul className="small">{r.processing.rows.map((row, i) => <li key={i} data-same={row.sameAsReference === null ? 'unknown' : String(row.sameAsReference)}>{row.statement}</li>)}</ul>
            </div>
          )}
          <details className="small">
            <summary>How this fit was made, and whether its assumptions held</summary>
            <p>{r.fit.method} Standard errors: covariance scaled by the residual variance (as SciPy’s curve_fit), assuming independent errors of one variance. {r.ms} ms in the worker.</p>
            <ul>{r.fit.assumptions.map((a, i) => <li key={i}>{a.name}: {a.held === null ? 'not checked' : a.held ? 'held' : 'did not hold'}. {a.detail}</li>)}</ul>
          </details>
          <p className="small"><button type="button" className="link danger" onClick={() => removeFit(kept.id)}>forget this fit</button> <span className="muted">Kept fits go into the peak table CSV (fitted area columns) and the report.</span></p>
        </div>
      )}
      {!kept && !error && <p className="hint">A model answers what smoothing cannot: fit the region with one, two, three or four peak shapes on a local baseline and let the information criterion say how many the data support.</p>}
    </section>
  );
}
