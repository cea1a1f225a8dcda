/**
 * Issue 21: one named peak's calibration: its own model and weights, the
 * curve with the standards and the sample, the residuals beneath, the test
 * that chose the curve (R² as a figure only), coefficients with standard
 * errors, each standard's back-calculated amount and % deviation, and the
 * limits in amount beside the S/N limits.
 */
import { useMemo } from 'react';
import type { PlotData, PlotLayout } from 'plotly.js-strict-dist-min';
import type { PeakCalibration, SampleAmount } from '../../core/calibration/calibrate.ts';
import { curveValue } from '../../core/calibration/regression.ts';
import type { ExportCalibration } from '../../core/calibration/export.ts';
import { MODEL_SETTINGS, type ModelSetting } from '../../core/calibration/settings.ts';
import { WEIGHTINGS, type Weighting } from '../../core/calibration/regression.ts';
import { calNum, curveEquation, intervalText } from '../../core/export/report-calibration.ts';
import { useApp } from '../../state/store.ts';
import { COLOURS } from '../palette.ts';
import { PlotlyFigure } from '../PlotlyFigure.tsx';
import { useSampleResult } from './derive.ts';

const WEIGHT_WORDS: Record<Weighting, string> = { none: 'none (equal)', '1/x': '1/x', '1/x2': '1/x²' };
const MODEL_WORDS: Record<ModelSetting, string> = { auto: 'line or quadratic, by test', line: 'straight line', quadratic: 'quadratic' };
export const FLAG_SHORT: Record<string, string> = {
  'extrapolated-below': 'below the lowest standard',
  'extrapolated-above': 'above the highest standard',
  'below-detection-limit': 'below DL',
  'below-quantitation-limit': 'below QL',
};

export function CurveCard({ cal, exp, amount }: { cal: PeakCalibration; exp: ExportCalibration; amount: SampleAmount | null }) {
  const own = useApp((s) => s.calibrationSettings.perPeak.find((p) => p.name === cal.name)?.settings ?? null);
  const setPeakCalibration = useApp((s) => s.setPeakCalibration);
  const result = useSampleResult();
  const u = cal.amountUnit ? ` ${cal.amountUnit}` : '';
  const fit = cal.fit;

  const data = useMemo<PlotData[]>(() => {
    if (!fit) return [];
    const used = cal.points.filter((p) => p.used);
    const hi = Math.max(fit.range.high, amount?.estimate?.amount ?? 0) * 1.08;
    const lo = cal.settings.throughOrigin ? 0 : Math.min(0, fit.range.low);
    const xs = Array.from({ length: 101 }, (_, i) => lo + ((hi - lo) * i) / 100);
    const traces: PlotData[] = [
      { type: 'scatter', mode: 'lines', name: 'curve', x: xs, y: xs.map((x) => curveValue(fit, x)), line: { color: COLOURS.processed, width: 2 }, xaxis: 'x', yaxis: 'y' },
      { type: 'scatter', mode: 'markers', name: 'standards', x: used.map((p) => p.amount), y: used.map((p) => p.response as number), marker: { color: COLOURS.ink, size: 8, symbol: 'circle' }, text: used.map((p) => p.standard), hoverinfo: 'x+y+text', xaxis: 'x', yaxis: 'y' },
      { type: 'scatter', mode: 'markers', name: 'residuals', showlegend: false, x: used.map((p) => p.amount), y: used.map((p) => p.residual as number), marker: { color: COLOURS.residual, size: 7 }, text: used.map((p) => p.standard), hoverinfo: 'x+y+text', xaxis: 'x', yaxis: 'y2' },
    ];
    const est = amount?.estimate;
    if (est && est.amount !== null && amount?.response !== null && amount?.response !== undefined) {
      const iv = est.interval;
      traces.push({
        type: 'scatter', mode: 'markers', name: 'this sample', x: [est.amount], y: [amount.response],
        error_x: iv && iv.low !== null && iv.high !== null ? { type: 'data', symmetric: false, array: [iv.high - est.amount], arrayminus: [est.amount - iv.low], color: COLOURS.peak, thickness: 2 } : undefined,
        marker: { color: COLOURS.peak, size: 11, symbol: 'diamond' }, xaxis: 'x', yaxis: 'y',
      } as PlotData);
    }
    return traces;
  }, [fit, cal, amount]);

  const layout = useMemo<PlotLayout>(() => ({
    autosize: true, height: 340, margin: { l: 64, r: 12, t: 34, b: 44 }, showlegend: true,
    legend: { orientation: 'h', y: 1.0, x: 0, yanchor: 'bottom' }, hovermode: 'closest',
    xaxis: { title: { text: `amount${u}` }, anchor: 'y2', gridcolor: COLOURS.grid, zeroline: true },
    yaxis: { title: { text: 'response' }, domain: [0.34, 1], gridcolor: COLOURS.grid },
    yaxis2: { title: { text: 'residual' }, domain: [0, 0.24], gridcolor: COLOURS.grid, zeroline: true, zerolinecolor: '#8d969e' },
    paper_bgcolor: '#ffffff', plot_bgcolor: '#ffffff', font: { family: 'system-ui, sans-serif', size: 11, color: COLOURS.ink },
  } as PlotLayout), [u]);

  const peak = amount?.peakIndex !== null && amount?.peakIndex !== undefined ? result?.peaks[amount.peakIndex] : undefined;
  const lim = result?.peakOptions?.limits;
  return (
    <article className="curve-card" data-testid={`curve-${cal.name}`}>
      <h4>{cal.name} <span className="muted small">response: {cal.responseInWords}</span></h4>
      <div className="row small">
        <label>Curve <select aria-label={`Curve of ${cal.name}`} value={own?.model ?? cal.settings.model} onChange={(e) => setPeakCalibration(cal.name, { model: e.target.value as ModelSetting })}>
          {MODEL_SETTINGS.map((m) => <option key={m} value={m}>{MODEL_WORDS[m]}</option>)}
        </select></label>
        <label>Weights <select aria-label={`Weights of ${cal.name}`} value={own?.weighting ?? cal.settings.weighting} onChange={(e) => setPeakCalibration(cal.name, { weighting: e.target.value as Weighting })}>
          {WEIGHTINGS.map((w) => <option key={w} value={w}>{WEIGHT_WORDS[w]}</option>)}
        </select></label>
        <label className="switch"><input type="checkbox" checked={own?.throughOrigin ?? cal.settings.throughOrigin} onChange={(e) => setPeakCalibration(cal.name, { throughOrigin: e.target.checked })} /> through the origin</label>
        {own && <button type="button" className="link" onClick={() => setPeakCalibration(cal.name, null)}>use the common settings</button>}
      </div>
      {cal.status !== 'calibrated' || !fit ? (
        <p className="step-problem" role="alert">Not calibrated: {cal.problem}</p>
      ) : (
        <>
          <PlotlyFigure data={data} layout={layout} className="curve-plot" label={`Calibration curve of ${cal.name} with its residuals`} testId={`curve-plot-${cal.name}`} pictureName={`calibration-${cal.name}`} />
          <p className="small" data-testid="curve-choice"><strong>{exp.model?.inWords}</strong>. {cal.choice?.sentence} R² = {calNum(exp.rSquared)} (a figure only; it did not choose the curve).</p>
          <p className="small">{curveEquation(exp)}; residual SD {calNum(exp.residualSd)} with {exp.residualDf} degrees of freedom; calibrated range {calNum(fit.range.low)} – {calNum(fit.range.high)}{u}.</p>
          <p className="small" data-testid="amount-limits">
            {cal.limits
              ? <>Detection limit <strong>{calNum(cal.limits.detection)}{u}</strong> and quantitation limit <strong>{calNum(cal.limits.quantitation)}{u}</strong> in amount ({cal.limits.method})</>
              : <>No limits in amount: {cal.limitsProblem}</>}
            {lim && <>; beside the S/N limits of this sample’s peak: detection S/N {lim.detection}, quantitation S/N {lim.quantitation}{peak ? `, this peak S/N ${calNum(peak.snr)}` : ''}.</>}
          </p>
          <div className="table-wrap" tabIndex={0} role="region" aria-label={`Standards of ${cal.name} (scrolls)`}>
          <table className="data small">
            <caption className="sr-only">Standards of {cal.name} read back through the curve</caption>
            <thead><tr><th scope="col">Standard</th><th scope="col">Known{u}</th><th scope="col">Response</th><th scope="col">Back-calculated{u}</th><th scope="col">Deviation (%)</th><th scope="col">Note</th></tr></thead>
            <tbody>
              {cal.points.map((p, i) => (
                <tr key={i} className={p.used ? '' : 'removed'}>
                  <td>{p.standard}</td><td>{calNum(p.amount)}</td><td>{calNum(p.response)}</td><td>{calNum(p.backCalculated)}</td><td>{calNum(p.deviationPercent)}</td><td>{p.note ?? (p.used ? '' : 'not in the fit')}</td>
                </tr>
              ))}
            </tbody>
          </table>
          </div>
        </>
      )}
      {amount && (
        <p className="small" data-testid={`amount-${cal.name}`}>
          This sample: {amount.status === 'measured' && amount.estimate
            ? <><strong>{calNum(amount.estimate.amount)}{u}</strong>, {Math.round((amount.estimate.interval?.level ?? 0.95) * 1000) / 10} % interval {intervalText({ interval: amount.estimate.interval ? { low: amount.estimate.interval.low, high: amount.estimate.interval.high, level: amount.estimate.interval.level } : null })}{u}</>
            : amount.status}
          {amount.flags.map((f) => <span key={f} className="mark">{FLAG_SHORT[f] ?? f}</span>)}
          {amount.notes.length > 0 && <span className="muted"> {amount.notes.join(' ')}</span>}
        </p>
      )}
    </article>
  );
}
