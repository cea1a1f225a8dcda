/**
 * Region fits and the figures of chromatography in the exports (issue 18):
 * extra peak table columns (fitted area beside the drop-line area, and the
 * optional figures), the report's fit section with its plots, and the
 * summary's `fits` field. The page and the command line call the same code.
 */
import type { AnalyseResult } from '../analysis/index.ts';
import { FIGURE_FORMULAS, chromatographicFigures, type ChromatographicFigureName, type FigureValue, type PeakChromatographicFigures } from '../measure/figures.ts';
import type { FitJobResult } from '../measure/fit/job.ts';
import { SHAPES } from '../measure/fit/shapes.ts';
import type { Peak } from '../measure/peak-types.ts';
import type { Signal } from '../steps/types.ts';
import { escapeText } from './html-text.ts';
import { svgLinePlot, type PlotSeries } from './plot-svg.ts';

/** A fit as the exports need it (the page's kept fits have this shape). */
export interface FitForExport {
  madeAt: string;
  result: FitJobResult;
  /** True when the step stack changed since a fit of the processed trace was made. */
  outOfDate?: boolean;
}

/** Extra columns appended to the peak table: header cells and one row of cells per peak (same order as the result's peaks). */
export interface ExtraPeakColumns {
  header: string[];
  cells: (peak: Peak, index: number) => (string | number)[];
}

/** The figures the optional columns show, in order (retention factor and selectivity only with a dead time). */
export const FIGURE_COLUMNS: readonly ChromatographicFigureName[] = ['retentionTime', 'tailing', 'asymmetry', 'plates', 'resolution'];
export const DEAD_TIME_COLUMNS: readonly ChromatographicFigureName[] = ['retentionFactor', 'selectivity'];

/** Header words of each figure column (the formula is in FIGURE_FORMULAS). */
export const FIGURE_HEADERS: Record<ChromatographicFigureName, string> = {
  retentionTime: 'retention time t_R',
  height: 'height H',
  width50: 'width at 50 %',
  width10: 'width at 10 %',
  width5: 'width at 5 %',
  tailing: 'tailing factor T (5 %)',
  asymmetry: 'asymmetry factor As (10 %)',
  plates: 'plate number N (half height)',
  resolution: 'resolution R_s to the previous peak',
  retentionFactor: 'retention factor k',
  selectivity: 'selectivity α to the previous peak',
};

/** The figure columns in use for a dead time (or none). */
export function figureColumnsFor(deadTime: number | null | undefined): ChromatographicFigureName[] {
  return deadTime !== null && deadTime !== undefined && deadTime > 0 ? [...FIGURE_COLUMNS, ...DEAD_TIME_COLUMNS] : [...FIGURE_COLUMNS];
}

/**
 * The figures of every peak not removed by hand, against each peak's own
 * bounds and straight baseline from the peak table, in order of retention
 * time ("previous peak" is the one eluting before). Keyed by the peak's
 * index in `peaks`.
 * @param measured the trace the peak table was measured on (its sample indices)
 */
export function peakFigures(measured: Signal, peaks: readonly Peak[], deadTime?: number | null): Map<number, PeakChromatographicFigures> {
  const order = peaks.map((p, i) => ({ p, i })).filter(({ p }) => !p.removedByUser && p.endIndex > p.startIndex && p.endIndex < measured.x.length).sort((a, b) => a.p.x - b.p.x);
  const input = order.map(({ p }) => {
    const slope = (p.baselineEnd - p.baselineStart) / (p.end - p.start);
    return { start: p.startIndex, end: p.endIndex, baseline: { slope, intercept: p.baselineStart - slope * p.start } };
  });
  const rows = chromatographicFigures(measured.x, measured.y, input, deadTime && deadTime > 0 ? { deadTime } : {});
  const out = new Map<number, PeakChromatographicFigures>();
  order.forEach(({ i }, k) => out.set(i, rows[k]));
  return out;
}

/** A figure for a table cell: the number, or the words for why there is none. */
export function figureCell(v: FigureValue | undefined): string | number {
  if (!v) return '';
  if (v.status === 'ok' && v.value !== null) return v.value;
  return v.status === 'not-measurable' ? 'not measurable' : 'not applicable';
}

/** The fitted peak that stands for a table row: the nearest fitted apex inside the row's half-height crossings (one fit per row, the newest wins). */
export function fittedPeakFor(peak: Peak, fits: readonly FitForExport[]): { fit: FitForExport; fitNumber: number; peakNumber: number } | null {
  let best: { fit: FitForExport; fitNumber: number; peakNumber: number; d: number } | null = null;
  fits.forEach((fit, f) => {
    fit.result.fit.peaks.forEach((q, k) => {
      const x = q.position.value;
      if (!(x >= peak.leftHalf && x <= peak.rightHalf)) return;
      const d = Math.abs(x - peak.x);
      if (!best || d < best.d || (d === best.d && f > best.fitNumber - 1)) best = { fit, fitNumber: f + 1, peakNumber: k + 1, d };
    });
  });
  if (!best) return null;
  const b = best as { fit: FitForExport; fitNumber: number; peakNumber: number };
  return { fit: b.fit, fitNumber: b.fitNumber, peakNumber: b.peakNumber };
}

/** How the table's area is measured, in a few words (for the column beside the fitted area). */
export function dropLineWords(result: AnalyseResult): string {
  const split = result.peakOptions?.split ?? 'perpendicular-drop';
  return split === 'valley-to-valley' ? 'valley to valley' : 'perpendicular drop';
}

export interface PeakColumnOptions {
  result: AnalyseResult;
  /** The trace the peaks were measured on; needed for the figures. */
  measured?: Signal;
  fits?: readonly FitForExport[];
  /** Figure columns when given (null or absent: no figure columns). */
  figures?: { deadTime?: number | null } | null;
  /** "(x unit)"-style suffixes for headers. */
  xUnitSuffix?: string;
  areaUnitSuffix?: string;
}

/**
 * The extra peak table columns: for each row the fitted area with its
 * standard error and which fit it came from (when fits are given), and the
 * figures of chromatography (when asked for).
 */
export function extraPeakColumns(o: PeakColumnOptions): ExtraPeakColumns | null {
  const fits = o.fits ?? [];
  const header: string[] = [];
  const parts: ((p: Peak, i: number) => (string | number)[])[] = [];
  if (fits.length) {
    const au = o.areaUnitSuffix ?? '';
    header.push(`fitted area${au}`, `fitted area standard error${au}`, 'fitted area: which fit', 'table area: method');
    const method = `drop line (${dropLineWords(o.result)})`;
    parts.push((p) => {
      const hit = fittedPeakFor(p, fits);
      if (!hit) return ['', '', 'not in a fitted region', method];
      const q = hit.fit.result.fit.peaks[hit.peakNumber - 1];
      const s = hit.fit.result.settings;
      return [q.area.value, Number.isFinite(q.area.se) ? q.area.se : '', `fit ${hit.fitNumber}, peak ${hit.peakNumber} of ${hit.fit.result.count} (${SHAPES[q.shape].label}, ${hit.fit.result.fittedLabel} trace, ${s.from}–${s.to})${hit.fit.outOfDate ? ', made with an earlier stack' : ''}`, method];
    });
  }
  if (o.figures && o.measured) {
    const names = figureColumnsFor(o.figures.deadTime);
    const xu = o.xUnitSuffix ?? '';
    for (const n of names) header.push(n === 'retentionTime' ? `${FIGURE_HEADERS[n]}${xu}` : FIGURE_HEADERS[n]);
    const figs = peakFigures(o.measured, o.result.peaks, o.figures.deadTime);
    parts.push((_p, i) => names.map((n) => figureCell(figs.get(i)?.[n])));
  }
  if (!header.length) return null;
  return { header, cells: (p, i) => parts.flatMap((f) => f(p, i)) };
}

/** Comment lines naming each figure's formula (for the CSV and the report). */
export function figureFormulaLines(deadTime?: number | null): string[] {
  const lines = figureColumnsFor(deadTime).map((n) => `${FIGURE_HEADERS[n]}: ${FIGURE_FORMULAS[n].formula}.`);
  lines.push('Widths at 5 %, 10 % and 50 % of the height against the peak\'s own straight baseline; "not measurable" where a neighbour or the peak\'s bounds cut that level before the trace reaches it.');
  if (deadTime && deadTime > 0) lines.push(`Dead time t_M = ${deadTime} (entered by the user).`);
  else lines.push('Retention factor and selectivity need the dead time t_M; none was entered.');
  return lines;
}

/** One line per fit for CSV comments: region, shape, baseline, count and the decision, and whether each processing keeps the count (the loss check). */
export function fitCommentLines(fits: readonly FitForExport[]): string[] {
  return fits.map((f, i) => `Fit ${i + 1}: ${f.result.fittedLabel} trace, ${f.result.settings.from} to ${f.result.settings.to}; ${f.result.count} peak(s). ${f.result.statement}${f.outOfDate ? ' (Made with an earlier step stack.)' : ''}${f.result.processing ? ` Processing check: ${f.result.processing.summary}` : ''}`);
}

const FIT_COLOURS = ['#0072B2', '#D55E00', '#009E73', '#CC79A7'];

const fmt = (v: number) => (Number.isFinite(v) ? String(Number(v.toPrecision(6))) : 'not a finite number');
const withSe = (v: { value: number; se: number }) => `${fmt(v.value)} ± ${Number.isFinite(v.se) ? fmt(v.se) : 'not available'}`;

/**
 * The report's section on region fits: per fit the decision and the
 * criterion, the figures (F and AIC as figures only), a plot of the data
 * with the fitted total, baseline and each peak, the residuals, the fitted
 * peaks with standard errors and neighbour area correlations, the
 * processing check and the assumptions. HTML, every text escaped.
 */
export function fitReportSection(fits: readonly FitForExport[], xLabel: string, yLabel: string): string {
  const s: string[] = ['<h2>Region fits</h2>'];
  if (!fits.length) {
    s.push('<p class="muted" data-role="fits">No region was fitted.</p>');
    return s.join('\n');
  }
  s.push('<p>Each region was fitted with a sum of peak shapes on a local baseline by damped least squares (Levenberg–Marquardt). The count is chosen by comparing k with k + 1 peaks by the Bayesian information criterion on the effective number of independent points; the F statistic and AIC are shown as figures only (their nominal levels do not hold for an added peak). Standard errors come from the covariance scaled by the residual variance and assume independent errors.</p>');
  fits.forEach((f, i) => {
    const r = f.result, fit = r.fit, c = fit.curves;
    s.push(`<h3>Fit ${i + 1}: ${escapeText(r.fittedLabel)} trace, ${fmt(r.settings.from)} to ${fmt(r.settings.to)}</h3>`);
    s.push(`<div data-role="fit"><p><strong>${escapeText(r.statement)}</strong></p>`);
    if (f.outOfDate) s.push('<p class="muted">Made with an earlier step stack than the one in this report.</p>');
    s.push(`<p class="muted">${escapeText(fit.method)} Made at ${escapeText(f.madeAt)}.</p>`);
    if (r.steps.length) {
      s.push('<table><thead><tr><th>compared</th><th>decision (criterion named)</th><th>ΔBIC on effective points (decides)</th><th>ΔAIC (figure only)</th><th>F (figure only)</th></tr></thead><tbody>');
      for (const st of r.steps) s.push(`<tr><td>${st.smaller} vs ${st.larger}</td><td>${st.supported ? 'extra peak supported' : 'extra peak not supported'}; ${escapeText(st.criterion)}</td><td>${fmt(st.deltaBic)}</td><td>${fmt(st.deltaAic)}</td><td>${fmt(st.fStatistic)}</td></tr>`);
      s.push('</tbody></table>');
    }
    const series: PlotSeries[] = [
      { x: c.x, y: c.y, colour: '#8d969e', label: 'data' },
      { x: c.x, y: c.fitted, colour: '#1d2329', label: 'fitted total' },
      { x: c.x, y: c.baseline, colour: '#a0700b', label: 'local baseline', dash: true },
    ];
    c.components.forEach((comp, k) => {
      const y = new Float64Array(comp.length);
      for (let j = 0; j < comp.length; j++) y[j] = comp[j] + c.baseline[j];
      series.push({ x: c.x, y, colour: FIT_COLOURS[k % FIT_COLOURS.length], label: `peak ${k + 1}` });
    });
    s.push(`<figure>${svgLinePlot(series, xLabel, yLabel, `Fit ${i + 1}: ${r.count} peak(s)`)}<figcaption>Data, fitted total, local baseline and each fitted peak drawn on the baseline.</figcaption></figure>`);
    const res: PlotSeries[] = [{ x: c.x, y: c.residual, colour: '#D55E00', label: `residual, ${r.count} peak(s)` }];
    const d = r.decisive;
    if (d) {
      const other = d.smaller.peaks.length === r.count ? d.larger : d.smaller;
      if (other.curves.x.length === c.x.length) res.push({ x: other.curves.x, y: other.curves.residual, colour: '#56B4E9', label: `residual, ${other.peaks.length} peak(s)`, dash: true });
    }
    s.push(`<figure>${svgLinePlot(res, xLabel, yLabel, `Fit ${i + 1}: residuals (data − fit)`)}<figcaption>Residual of the chosen fit${d ? ' and of the count it was compared with' : ''}.</figcaption></figure>`);
    const k = fit.peaks.length;
    const rows = fit.peaks.map((q, j) => {
      const corr = j + 1 < k ? fit.areaCorrelation[j * k + j + 1] : NaN;
      return `<tr><td>${j + 1}</td><td>${escapeText(SHAPES[q.shape].label)}</td><td>${withSe(q.position)}</td><td>${withSe(q.height)}</td><td>${withSe(q.fwhm)}</td><td>${withSe(q.area)}</td><td>${j + 1 < k ? (Number.isFinite(corr) ? fmt(corr) : 'not available') : '—'}</td></tr>`;
    });
    s.push(`<table><caption>Fitted peaks (value ± standard error)</caption><thead><tr><th>peak</th><th>shape</th><th>position</th><th>height above the baseline</th><th>FWHM</th><th>area</th><th>area correlation with the next peak</th></tr></thead><tbody>${rows.join('')}</tbody></table>`);
    if (r.processing) {
      s.push(`<p data-role="fit-processing"><strong>Does each processing still support the same count?</strong> ${escapeText(r.processing.summary)}</p>`);
      s.push(`<ul>${r.processing.rows.map((row) => `<li>${escapeText(row.statement)}</li>`).join('')}</ul>`);
    }
    s.push(`<ul>${fit.assumptions.map((a) => `<li>${escapeText(a.name)}: ${a.held === null ? 'not checked' : a.held ? 'held' : 'did not hold'}. ${escapeText(a.detail)}</li>`).join('')}</ul></div>`);
  });
  return s.join('\n');
}

/** The summary JSON's `fits` field: per fit the region, settings, decision and each peak with standard errors (every number finite or null). */
export function fitSummary(fits: readonly FitForExport[]): Record<string, unknown>[] {
  const n = (v: number) => (Number.isFinite(v) ? v : null);
  return fits.map((f) => ({
    trace: f.result.fittedLabel,
    from: n(f.result.settings.from),
    to: n(f.result.settings.to),
    shape: f.result.settings.shape,
    baseline: f.result.settings.baseline,
    count: f.result.count,
    decision: f.result.statement,
    criterion: f.result.decisive?.criterion ?? null,
    peaks: f.result.fit.peaks.map((q) => ({
      position: n(q.position.value), positionSe: n(q.position.se), height: n(q.height.value), heightSe: n(q.height.se),
      fwhm: n(q.fwhm.value), fwhmSe: n(q.fwhm.se), area: n(q.area.value), areaSe: n(q.area.se),
    })),
    processing: f.result.processing ? f.result.processing.rows.map((row) => ({ label: row.label, count: row.count, same: row.sameAsReference })) : null,
    // Added (loss check): the sentence, e.g. "2 peaks supported by the fit on raw, not after 7-point average (1)."
    processingSummary: f.result.processing ? f.result.processing.summary : null,
    outOfDate: f.outOfDate === true,
  }));
}
