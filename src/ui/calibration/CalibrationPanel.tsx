/**
 * Issue 21: from peak to amount. Named peaks, standards with their known
 * amounts, the common calibration settings, one card per named peak, the
 * sample's amounts, and the calibration's exports.
 */
import { LIMIT_SIGMAS, RESPONSE_MEASURES, type LimitSigma, type ResponseMeasure } from '../../core/calibration/settings.ts';
import { calibrationExportJson } from '../../core/calibration/export.ts';
import { amountsCsv, calibrationTableCsv } from '../../core/export/calibration-csv.ts';
import { calNum, intervalText } from '../../core/export/report-calibration.ts';
import { zipBaseName } from '../../core/export/names.ts';
import { useApp } from '../../state/store.ts';
import { downloadCsv, downloadText } from '../export/download.ts';
import { CurveCard, FLAG_SHORT } from './CurveCard.tsx';
import { useCalibrationView } from './derive.ts';
import { NamedPeaksEditor } from './NamedPeaksEditor.tsx';
import { StandardsEditor } from './StandardsEditor.tsx';

const CONFIDENCES = [0.9, 0.95, 0.99];

export function CalibrationPanel() {
  const settings = useApp((s) => s.calibrationSettings);
  const named = useApp((s) => s.namedPeaks);
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const setSettings = useApp((s) => s.setCalibrationSettings);
  const view = useCalibrationView();
  const stem = sample ? zipBaseName(sample.source.fileName) : 'trace';
  const level = `${Math.round(settings.confidence * 1000) / 10} %`;

  return (
    <section className="panel" aria-labelledby="calibration-title" data-testid="calibration-panel">
      <div className="panel-head"><h2 id="calibration-title">From peak to amount</h2></div>
      <NamedPeaksEditor />
      <StandardsEditor />
      <h3>Calibration</h3>
      <div className="row small">
        <label>Response <select value={settings.response} onChange={(e) => setSettings({ response: e.target.value as ResponseMeasure })}>
          {RESPONSE_MEASURES.map((r) => <option key={r} value={r}>peak {r}</option>)}
        </select></label>
        <label>Internal standard <select value={settings.internalStandard ?? ''} onChange={(e) => setSettings({ internalStandard: e.target.value || null })}>
          <option value="">none</option>
          {named.peaks.map((p) => <option key={p.name} value={p.name}>{p.name}</option>)}
        </select></label>
        <label>σ for the limits in amount <select value={settings.limitSigma} onChange={(e) => setSettings({ limitSigma: e.target.value as LimitSigma })}>
          {LIMIT_SIGMAS.map((l) => <option key={l} value={l}>{l === 'residual' ? 'residual SD of the curve' : 'SD of the intercept'}</option>)}
        </select></label>
        <label>Confidence <select value={settings.confidence} onChange={(e) => setSettings({ confidence: Number(e.target.value) })}>
          {CONFIDENCES.map((c) => <option key={c} value={c}>{Math.round(c * 100)} %</option>)}
        </select></label>
      </div>
      {!view ? (
        <p className="muted small">Name the peaks and give the standards’ amounts to calibrate.</p>
      ) : (
        <>
          {[...view.set.problems, ...view.standardProblems].map((p) => <p key={p} className="step-problem" role="alert">{p}</p>)}
          <p className="small muted">{view.exp.modelChoiceRule} Limits in amount: DL = 3.3 σ/S and QL = 10 σ/S (ICH Q2(R1)), S the slope. Intervals: {view.exp.intervalMethod}</p>
          {view.sample && (
            <div className="table-wrap" tabIndex={0} role="region" aria-label="Amounts in this sample (scrolls)">
              <table className="data" data-testid="amounts-result">
                <caption>Amounts in {view.sample.trace}</caption>
                <thead><tr><th scope="col">Named peak</th><th scope="col">Amount</th><th scope="col">{level} interval</th><th scope="col">Unit</th><th scope="col">Marks</th></tr></thead>
                <tbody>
                  {view.sample.amounts.map((a) => {
                    const e = view.exp.samples[0]?.amounts.find((x) => x.name === a.name);
                    return (
                      <tr key={a.name} data-name={a.name}>
                        <td>{a.name}</td>
                        <td data-role="amount" data-value={e?.amount ?? ''}>{a.status === 'measured' ? calNum(e?.amount) : a.status === 'not-found' ? 'peak missing' : a.status}</td>
                        <td data-role="interval" data-low={e?.interval?.low ?? ''} data-high={e?.interval?.high ?? ''}>{e ? intervalText(e) : '—'}</td>
                        <td>{a.amountUnit}</td>
                        <td title={a.notes.join(' ')}>{a.flags.map((f) => <span key={f} className="mark">{FLAG_SHORT[f] ?? f}</span>)}{a.flags.length === 0 && a.status === 'measured' ? 'within the calibrated range' : ''}</td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
          )}
          <div className="row">
            <button type="button" data-testid="export-calibration-json" onClick={() => downloadText(calibrationExportJson(view.exp), `${stem}-calibration.json`, 'application/json')}>Calibration (JSON)</button>
            <button type="button" data-testid="export-calibration-csv" onClick={() => downloadCsv(calibrationTableCsv(view.exp, { delimiter: ',', decimal: '.' }), `${stem}-calibration-table.csv`)}>Calibration table (CSV)</button>
            <button type="button" data-testid="export-amounts-csv" onClick={() => downloadCsv(amountsCsv(view.exp, { delimiter: ',', decimal: '.' }), `${stem}-amounts.csv`)}>Amounts (CSV)</button>
          </div>
          <div className="curve-cards">
            {view.set.calibrations.map((c, i) => (
              <CurveCard key={c.name} cal={c} exp={view.exp.calibrations[i]} amount={view.sample?.amounts.find((a) => a.name === c.name) ?? null} />
            ))}
          </div>
        </>
      )}
    </section>
  );
}
