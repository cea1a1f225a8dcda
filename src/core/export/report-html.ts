/**
 * The report: one self-contained HTML file a reviewer can open offline and
 * print to PDF. Issue 17: a one-page A4 summary comes first (the caution,
 * the report fields, the input's name and SHA-256, the plot, the
 * processing method in words, σ and its method, a peak table that fits the
 * page, what the processing lost, the residual verdict); the full detail
 * follows after a page break (the processing method as JSON, what each
 * step said, the noise, the whole peak table in parts that fit the page
 * width, hand changes and their reasons, fits, calibration, the loss
 * ledger and the user's export confirmation, the replaced points).
 *
 * Safety: every piece of text that came from a file or the user is escaped
 * for HTML; the file has no scripts and no external addresses, and a
 * Content-Security-Policy meta tag forbids both in case anything slipped
 * through. Plot images are accepted only as PNG or SVG data and are shown
 * through <img>, where an SVG cannot run scripts or fetch anything.
 */
import type { AnalyseResult } from '../analysis/index.ts';
import { recipeInWords, recipeToJson, type Recipe, type Registry } from '../method.ts';
import { axisLabel, type Trace } from '../trace.ts';
import { escapeText } from './html-text.ts';
import { fitReportSection, type ExtraPeakColumns, type FitForExport } from './fit-export.ts';
import { PLOT_MAX_MARKERS, svgLinePlot, type PlotMarker, type PlotSeries } from './plot-svg.ts';

export { escapeHtml, escapeText } from './html-text.ts';
import { CAUTION, exportTime, TOOL_LABEL, TOOL_NAME } from './version.ts';
import { namedPeakLines, peakNamingOf, withNameColumn } from './peak-names.ts';
import { calibrationReportSection } from './report-calibration.ts';
import type { CalibrationExport } from '../calibration/export.ts';
import { ledgerFitLines } from '../measure/fit/ledger-fit.ts';
import { areaPercents, noiseSentence, peakDecisionText, peakMethodLines, peakTableRows } from './peak-csv.ts';
import { FLAG_TEXT, SNR_SHORT } from '../measure/snr-words.ts';
import { reasonFor, reportFieldPairs, type HandReason, type ReportFields } from './report-fields.ts';
import { lossSummaryLines } from './loss-summary.ts';

/** What the loss check hands over; only the sentences are written (rows are kept for later use). */
export interface LossLedgerLike {
  sentences: readonly string[];
  rows?: readonly unknown[];
}

/** The user's confirmation, before exporting, that they saw the lost or weakened features. */
export interface ExportConfirmation {
  /** When the user confirmed. */
  at: Date | string;
  /** The sentences they were shown. */
  sentences: readonly string[];
  /** Issue 17: the short form they were shown first (top items per kind, then counts); absent before. */
  summary?: readonly string[];
}

export interface ReportInput {
  trace: Trace;
  result: AnalyseResult;
  recipe: Recipe;
  registry: Registry;
  /** Default: the result's own loss check ledger, when it has one. */
  ledger?: LossLedgerLike | null;
  confirmation?: ExportConfirmation | null;
  now: Date;
  /** Tool name and version; default {@link TOOL_LABEL}. */
  version?: string;
  /** Issue 21: the calibration and this trace's amounts (samples holds this trace only), when standards were given. */
  calibration?: CalibrationExport | null;
  /** Issue 18: region fits (a section of their own), extra peak table columns and the lines explaining them. */
  fits?: readonly FitForExport[];
  extra?: ExtraPeakColumns | null;
  extraLines?: readonly string[];
  /** Issue 17: analyst, sample, instrument and run, as filled in the page (empty ones are left out). */
  fields?: ReportFields | null;
  /** Issue 17: the reasons given for hand changes. */
  reasons?: readonly HandReason[] | null;
}

/** Most replaced points listed one by one; the rest are counted. */
export const REPORT_MAX_EVENTS = 2000;

/** Written where a number belongs but the value is not finite (an overflow, or no value): never "NaN" or "Infinity". */
const NOT_FINITE = 'not a finite number';

/** Significant digits of the numbers in the detail and on the summary page (stated in the report). */
export const REPORT_DIGITS = 6;
export const SUMMARY_DIGITS = 4;
/** Most peak rows on the summary page (the highest S/N and every hand change; the detail has all). */
export const SUMMARY_MAX_PEAKS = 12;
/** Most columns in one part of the detail's peak table, so each part fits an A4 page's width. */
export const DETAIL_MAX_COLUMNS = 8;

/** Numbers for reading: `digits` significant figures (the CSV exports hold every digit). */
function fmt(v: unknown, digits = REPORT_DIGITS): string {
  if (v === null || v === undefined || v === '') return '—';
  if (typeof v !== 'number') return escapeText(v);
  if (!Number.isFinite(v)) return NOT_FINITE;
  const a = Math.abs(v);
  if (a !== 0 && (a < 1e-4 || a >= 1e7)) return v.toExponential(digits - 1);
  return String(Number(v.toPrecision(digits)));
}

function list(items: readonly string[]): string {
  return items.length ? `<ul>${items.map((s) => `<li>${escapeText(s)}</li>`).join('')}</ul>` : '<p class="muted">None.</p>';
}

/** A table cell: a value that is not a finite number leaves the cell empty (counted for the note under the table). */
function tableCell(c: unknown, count: { empty: number }, digits: number): string {
  if (typeof c === 'number' && !Number.isFinite(c)) { count.empty++; return '<td class="empty"></td>'; }
  return `<td${typeof c === 'number' ? ' class="num"' : ''}>${fmt(c, digits)}</td>`;
}

function table(rows: readonly (readonly unknown[])[], caption?: string, digits = REPORT_DIGITS, role = ''): string {
  if (!rows.length) return '';
  const [head, ...body] = rows;
  const count = { empty: 0 };
  const cells = body.map((r) => `<tr>${r.map((c) => tableCell(c, count, digits)).join('')}</tr>`).join('');
  const note = count.empty
    ? `<p class="muted" data-role="empty-cells">${count.empty} cell${count.empty === 1 ? ' is' : 's are'} empty because the value was not a finite number (an overflow, a division by zero, or no value there).</p>`
    : '';
  return `<table${role ? ` data-role="${role}"` : ''}>${caption ? `<caption>${escapeText(caption)}</caption>` : ''}<thead><tr>${head.map((h) => `<th scope="col">${escapeText(h)}</th>`).join('')}</tr></thead><tbody>${cells}</tbody></table>${note}`;
}

function definitionList(pairs: readonly [string, unknown][]): string {
  return `<dl>${pairs.map(([k, v]) => `<dt>${escapeText(k)}</dt><dd>${typeof v === 'number' ? fmt(v) : escapeText(v)}</dd>`).join('')}</dl>`;
}

const CSS = `
@page{size:A4;margin:12mm}
body{font:14px/1.45 system-ui,-apple-system,"Segoe UI",sans-serif;color:#1d2329;max-width:1000px;margin:24px auto;padding:0 18px}
h1{font-size:22px;margin:0 0 6px}h2{font-size:17px;margin:26px 0 8px;border-bottom:1px solid #ccd3da;padding-bottom:3px}
.caution{border:2px solid #b36b00;background:#fff4e0;padding:10px 14px;font-weight:600;margin:12px 0}
table{border-collapse:collapse;width:100%;font-size:12.5px;margin:6px 0}th,td{border:1px solid #ccd3da;padding:3px 6px;text-align:left;vertical-align:top;overflow-wrap:break-word}
td.num{text-align:right;white-space:nowrap;overflow-wrap:normal}
th{background:#eef2f5}caption{text-align:left;font-style:italic;padding:2px 0}
dl{display:grid;grid-template-columns:max-content 1fr;gap:2px 14px;margin:6px 0}dt{font-weight:600}dd{margin:0;overflow-wrap:anywhere}
pre{background:#f4f6f8;border:1px solid #ccd3da;padding:8px;white-space:pre-wrap;overflow-wrap:anywhere;font-size:12px}
.muted{color:#5b6670}.hash{font-family:ui-monospace,monospace;overflow-wrap:anywhere}
figure{margin:10px 0}figure img,svg.plot{max-width:100%;height:auto;border:1px solid #ccd3da;box-sizing:border-box}
figcaption{font-size:12px;color:#5b6670}.confirm{border:1px solid #5b6670;padding:8px 12px;background:#f4f6f8}
.summary h2{font-size:14px;margin:10px 0 4px}.summary p,.summary ul,.summary ol{margin:3px 0}.summary li{margin:0}
.summary table{font-size:11px}.summary th,.summary td{padding:1px 4px}.summary figure{margin:4px 0}
.summary dl{grid-template-columns:max-content 1fr max-content 1fr;font-size:12px}.summary .caution{padding:6px 10px;margin:6px 0}
.detail{break-before:page;page-break-before:always;border-top:3px double #ccd3da;margin-top:30px}
@media print{body{margin:0;padding:0;max-width:none;font-size:10pt}h2{break-after:avoid}figure,tr,.caution,dl{break-inside:avoid}
.summary{font-size:9pt;line-height:1.3}.summary h1{font-size:15pt}.summary table{font-size:8pt}.detail{border-top:0;margin-top:0}
.detail table{font-size:8pt}a{color:inherit;text-decoration:none}.caution{-webkit-print-color-adjust:exact;print-color-adjust:exact}}
`;

/** The table split into parts of at most `max` columns, each repeating the first (the row number), so each fits a page's width. */
function columnParts(rows: readonly (readonly unknown[])[], max: number): (readonly unknown[])[][] {
  if (!rows.length || rows[0].length <= max) return [rows.map((r) => r.slice())];
  const per = max - 1;
  const parts: (readonly unknown[])[][] = [];
  for (let c = 1; c < rows[0].length; c += per) parts.push(rows.map((r) => [r[0], ...r.slice(c, c + per)]));
  return parts;
}

/**
 * The summary page's peak table: row number (as in the detail), name when
 * named, apex, height, area, area %, FWHM, S/N, status, and the hand change
 * with its reason; at most {@link SUMMARY_MAX_PEAKS} rows (every hand change
 * and the highest S/N), in x order.
 */
function summaryPeakRows(trace: Trace, result: AnalyseResult, names: readonly (string | null)[] | null, reasons: readonly HandReason[] | null | undefined): { rows: unknown[][]; shown: number } {
  const xu = trace.xUnit ? ` (${trace.xUnit})` : '';
  const yu = trace.yUnit ? ` (${trace.yUnit})` : '';
  const def = result.peakOptions?.snrDefinition ?? 'rms';
  const shares = areaPercents(result.peaks);
  const step = trace.x.length > 1 ? Math.abs(trace.x[trace.x.length - 1] - trace.x[0]) / (trace.x.length - 1) : 0;
  const idx = result.peaks.map((_, i) => i);
  let pick = idx;
  if (idx.length > SUMMARY_MAX_PEAKS) {
    const hand = idx.filter((i) => peakDecisionText(result.peaks[i]) !== '');
    const rest = idx.filter((i) => peakDecisionText(result.peaks[i]) === '').sort((a, b) => (result.peaks[b].snr ?? -Infinity) - (result.peaks[a].snr ?? -Infinity));
    pick = [...hand, ...rest].slice(0, SUMMARY_MAX_PEAKS).sort((a, b) => a - b);
  }
  const areaUnit = trace.xUnit || trace.yUnit ? ` (${trace.yUnit || 'y-units'} × ${trace.xUnit || 'x-units'})` : '';
  const head = ['#', ...(names ? ['name'] : []), `apex${xu}`, `height${yu}`, `area${areaUnit}`, 'area %', `FWHM${xu}`, `S/N (${SNR_SHORT[def]})`, 'status', 'hand change'];
  const rows: unknown[][] = [head];
  for (const i of pick) {
    const p = result.peaks[i];
    const why = reasonFor(p, reasons, step);
    const hand = peakDecisionText(p);
    rows.push([i + 1, ...(names ? [names[i] ?? ''] : []), p.x, p.height, p.area, shares[i] ?? '', p.fwhm, p.snr ?? '', FLAG_TEXT[p.flag], hand ? `${hand}${why ? `: ${why}` : ' (no reason given)'}` : '']);
  }
  return { rows, shown: pick.length };
}

/**
 * The report as one HTML document (UTF-8, inline CSS, no scripts, no
 * external requests, a print stylesheet).
 *
 * Plots: two SVG plots drawn by the core from the data (raw and processed
 * with the baseline and the peaks of the table; the residual), the same
 * whether the page or the command line writes the report.
 *
 * @throws RangeError when there is no analysed trace or `now` is not a valid date.
 */
export function reportHtml(input: ReportInput): string {
  const { trace, result, recipe, registry, confirmation, now } = input;
  if (!trace || !result) throw new RangeError('There is no analysed trace to report yet; load a trace and wait for the analysis.');
  const ledger: LossLedgerLike | null = input.ledger ?? result.loss?.ledger ?? null;
  const version = input.version ?? TOOL_LABEL;
  const when = exportTime(now);
  const xLabel = axisLabel(trace.xName, trace.xUnit);
  const yLabel = axisLabel(trace.yName, trace.yUnit);
  const naming = peakNamingOf(recipe, result.peaks); // issue 21: named peaks carry their name on the plot and in the table
  const s: string[] = [];
  s.push('<!DOCTYPE html><html lang="en"><head><meta charset="utf-8">');
  s.push('<meta http-equiv="Content-Security-Policy" content="default-src \'none\'; img-src data:; style-src \'unsafe-inline\'">');
  s.push('<meta name="viewport" content="width=device-width, initial-scale=1">');
  s.push(`<title>${escapeText(`${TOOL_NAME} report: ${trace.source.fileName}`)}</title><style>${CSS}</style></head><body>`);

  // ---- The summary: one A4 page.
  s.push('<section class="summary" data-role="summary-page">');
  s.push(`<h1>${escapeText(`${TOOL_NAME} report: ${trace.name}`)}</h1>`);
  s.push(`<p class="caution" role="note" data-role="caution">${escapeText(CAUTION)}</p>`);
  const fieldPairs = reportFieldPairs(input.fields);
  s.push(`<div data-role="report-fields">${definitionList([
    ...fieldPairs,
    ['Input file', trace.source.fileName],
    ['Written', `${when} (UTC) by ${version}`],
  ]).replace('</dl>', `<dt>Input SHA-256</dt><dd class="hash">${escapeText(trace.source.sha256)}</dd></dl>`)}</div>`);
  if (!fieldPairs.length) s.push('<p class="muted">Analyst, sample, instrument and run were not filled in.</p>');

  const series: PlotSeries[] = [
    { x: trace.x, y: trace.y, colour: '#8d969e', label: 'raw' },
    { x: result.processed.x, y: result.processed.y, colour: '#1f5fa8', label: 'processed' },
  ];
  if (result.baseline && result.baseline.length === result.processed.x.length) {
    series.push({ x: result.processed.x, y: result.baseline, colour: '#a0700b', label: 'fitted baseline', dash: true });
  }
  // Peaks removed by hand are not marked; numbers are the rows of the peak table.
  const markers: PlotMarker[] = [];
  result.peaks.forEach((p, i) => { if (!p.removedByUser) markers.push({ x: p.x, y: p.y, label: naming?.names[i] ? `${i + 1} ${naming.names[i]}` : String(i + 1), below: p.height < 0, weight: Math.abs(p.snr ?? 0) }); });
  const cut = markers.length > PLOT_MAX_MARKERS ? ` Only the first ${PLOT_MAX_MARKERS} of ${markers.length} peaks are marked.` : '';
  s.push(`<figure>${svgLinePlot(series, xLabel, yLabel, 'Raw and processed trace', markers)}<figcaption>Raw and processed trace; numbers are rows of the peak table; lines thinned to the lowest and highest value per drawn column.${cut}</figcaption></figure>`);

  s.push('<h2>Processing method</h2>');
  s.push(`<ol data-role="method-words">${recipeInWords(recipe, registry).map((w) => `<li>${escapeText(w.replace(/^\d+\.\s*/, ''))}</li>`).join('')}</ol>`);

  s.push('<h2>Noise and peaks</h2>');
  const lim = result.peakOptions?.limits;
  const def = result.peakOptions?.snrDefinition ?? 'rms';
  if (result.noise) {
    const n = result.noise.sigma;
    // The method's name and whether its assumptions held; its description is in the detail's Noise section.
    s.push(`<p data-role="sigma">Noise σ = ${fmt(n.sigma, SUMMARY_DIGITS)}${trace.yUnit ? ` ${escapeText(trace.yUnit)}` : ''}, method ${escapeText(n.method)}, over ${fmt(n.points)} points${n.assumptionsHeld === false ? '; an assumption did not hold or a fallback was used (see Noise in the detail)' : n.assumptionsHeld ? '; its assumptions held' : ''}.</p>`);
  } else {
    s.push('<p data-role="sigma">Noise was not measured.</p>');
  }
  if (lim) s.push(`<p>${escapeText(`S/N ${SNR_SHORT[def]}; detection limit S/N ${lim.detection}, quantitation limit S/N ${lim.quantitation}.`)}</p>`);
  const sum = summaryPeakRows(trace, result, naming?.names ?? null, input.reasons);
  if (sum.rows.length > 1) {
    const more = result.peaks.length > sum.shown ? `; ${sum.shown} of ${result.peaks.length} rows shown (every hand change, then the highest S/N), all are in the detail` : '';
    s.push(table(sum.rows, `Peaks (${SUMMARY_DIGITS} significant digits${more})`, SUMMARY_DIGITS, 'summary-peaks'));
  } else {
    s.push('<p>No peaks pass the thresholds.</p>');
  }

  s.push('<h2>What the processing changed</h2>');
  const lossLines = confirmation?.summary?.length ? confirmation.summary
    : result.loss ? lossSummaryLines(result.loss.currentItems ?? [], result.loss.currentWarnings, trace.xUnit) : null;
  if (lossLines === null) s.push('<p class="muted">No comparison with the raw trace was made for this report.</p>');
  else if (!lossLines.length) s.push('<p>Against the raw trace, no feature was lost or weakened and none appears only after processing.</p>');
  else s.push(`<div data-role="loss-summary">${list(lossLines)}</div>`);
  if (confirmation) {
    const at = confirmation.at instanceof Date ? exportTime(confirmation.at) : String(confirmation.at);
    s.push(`<p data-role="confirmation-note"><strong>Export confirmed at ${escapeText(at)}</strong> after being shown these changes (every sentence is in the detail).</p>`);
  }
  if (result.diagnostics) s.push(`<p>Residual check: <strong>${escapeText(result.diagnostics.verdict)}</strong></p>`);
  s.push(`<p class="muted">Numbers on this page: ${SUMMARY_DIGITS} significant digits; in the detail: ${REPORT_DIGITS}; the CSV exports hold every digit unless fewer were chosen.</p>`);
  s.push('</section>');

  // ---- The detail, after a page break.
  s.push('<section class="detail" data-role="detail">');
  s.push('<h2>Input and this report</h2>');
  s.push(definitionList([
    ...fieldPairs,
    ['Input file', trace.source.fileName],
    ['Trace', trace.name],
    ['Rows read / skipped', `${trace.source.rowsRead} / ${trace.source.rowsSkipped}`],
    ['Points', `${trace.x.length} raw, ${result.processed.x.length} processed`],
    ['x axis', xLabel],
    ['y axis', yLabel],
    ['Written by', version],
    ['Written at (UTC)', when],
  ]).replace('</dl>', `<dt>Input SHA-256</dt><dd class="hash">${escapeText(trace.source.sha256)}</dd></dl>`));
  const meta = Object.entries(trace.metadata);
  if (meta.length) {
    s.push(table([['Label from the file', 'Value'], ...meta.map(([k, v]) => [k, v])], 'Metadata kept from the input file, as read'));
  }

  if (result.residual.y.length) {
    s.push('<h2>Residual plot</h2>');
    s.push(`<figure>${svgLinePlot([{ x: result.residual.x, y: result.residual.y, colour: '#6d4391', label: 'raw − processed' }], xLabel, yLabel, 'Residual')}<figcaption>Residual: what the processing removed (raw − processed).</figcaption></figure>`);
  }

  s.push('<h2>Processing method</h2>');
  s.push(`<ol>${recipeInWords(recipe, registry).map((w) => `<li>${escapeText(w.replace(/^\d+\.\s*/, ''))}</li>`).join('')}</ol>`);
  s.push(`<p>As JSON (load this into ${escapeText(TOOL_NAME)} to redo the processing):</p><pre data-role="recipe-json">${escapeText(recipeToJson(recipe))}</pre>`);

  s.push('<h2>What each step did</h2>');
  if (result.runs.length) {
    s.push(table([
      ['#', 'step', 'status', 'points out', 'points replaced', 'message and notes', 'figures'],
      ...result.runs.map((r, i) => {
        const label = registry.find((d) => d.id === r.step)?.label ?? r.step;
        const words = [r.message, ...r.notes].filter((t): t is string => !!t).join(' ');
        const figs = r.figures ? Object.entries(r.figures).map(([k, v]) => `${k} = ${fmt(v)}`).join('; ') : '';
        return [i + 1, label, r.status === 'ok' ? 'applied' : r.status === 'off' ? 'switched off' : 'not applied', r.points, r.eventCount, words, figs];
      }),
    ]));
  } else {
    s.push('<p>No processing steps: the raw trace is used as loaded.</p>');
  }

  s.push('<h2>Residual checks</h2>');
  if (result.residualNote) s.push(`<p>${escapeText(result.residualNote)}</p>`);
  const d = result.diagnostics;
  if (d) {
    s.push(`<p data-role="residual-verdict"><strong>${escapeText(d.verdict)}</strong></p>`);
    s.push(definitionList([
      ['Points', d.n],
      ['RMS of the residual', d.rms],
      ['Lag-1 autocorrelation', `${fmt(d.lag1)} (white noise stays within ±${fmt(d.lag1Threshold)})`],
      ['Runs about the median', `${d.runs.runs} (expected ${fmt(d.runs.expected)}, z = ${fmt(d.runs.z)}, p = ${fmt(d.runs.p)})`],
    ]));
  } else {
    s.push('<p>No processing step ran, so nothing was removed.</p>');
  }

  s.push('<h2>Noise</h2>');
  if (result.noise) {
    const n = result.noise;
    const pairs: [string, unknown][] = [
      ['Method', n.sigma.method],
      ['Description', n.sigma.description],
      ['Noise figure', n.sigma.sigma],
      ['Points used', n.sigma.points],
    ];
    if (n.sigma.from !== undefined && n.sigma.to !== undefined) pairs.push(['Window (x)', `${fmt(n.sigma.from)} to ${fmt(n.sigma.to)}${n.sigma.clipped ? ' (cut by the trace end)' : ''}`]);
    if (n.rawSigma && n.rawSigma !== n.sigma) pairs.push(['Same estimate on the raw trace', noiseSentence(n.rawSigma)]);
    if (n.peakToPeak) pairs.push(['Peak-to-peak in the quiet range', noiseSentence(n.peakToPeak)]);
    s.push(definitionList(pairs));
    if (n.notes.length) s.push(list(n.notes));
  } else {
    s.push('<p>Noise was not measured.</p>');
  }

  s.push('<h2>Peaks</h2>');
  s.push(list([...peakMethodLines(result), ...(input.extraLines ?? [])]));
  const rows = withNameColumn(peakTableRows(trace, result, true, input.extra, input.reasons), naming);
  if (rows.length > 1) {
    // The whole table in parts of a few columns, each repeating the row number, so every part fits the page's width.
    const parts = columnParts(rows, DETAIL_MAX_COLUMNS);
    parts.forEach((part, k) => s.push(table(part, `Peak table${parts.length > 1 ? `, part ${k + 1} of ${parts.length}` : ''} (${REPORT_DIGITS} significant digits; the peak table CSV holds every digit)`, REPORT_DIGITS, 'peak-table')));
  } else s.push('<p>No peaks pass the thresholds.</p>');
  if (naming) s.push(`<div data-role="named-peaks">${list(namedPeakLines(naming, trace.xUnit))}</div>`);
  if (input.calibration) s.push(calibrationReportSection(input.calibration, result));

  // Only when fits were made, so the page's report without fits stays the command line's.
  if (input.fits?.length) s.push(fitReportSection(input.fits, xLabel, yLabel));

  s.push('<h2>What the processing may have lost</h2>');
  if (ledger && ledger.sentences.length) s.push(`<div data-role="loss-ledger">${list(ledger.sentences)}</div>`);
  else s.push(`<p class="muted">${ledger ? 'The comparison found no lost or weakened features.' : 'No comparison with alternative processing was made for this report.'}</p>`);
  // Issue 18: ledger rows inside a fitted region, with the fit's count on each version.
  const fitLines = input.fits?.length && ledger?.rows ? ledgerFitLines(ledger.rows.map((r) => (r as { position?: number }).position ?? NaN).filter(Number.isFinite), input.fits) : [];
  if (fitLines.length) s.push(`<div data-role="ledger-fits"><p>Does each processing still support the peak count of the region fit?</p>${list(fitLines)}</div>`);
  if (confirmation) {
    const at = confirmation.at instanceof Date ? exportTime(confirmation.at) : String(confirmation.at);
    s.push(`<div class="confirm" data-role="confirmation"><p><strong>Export confirmed at ${escapeText(at)}</strong> after being shown:</p>${list(confirmation.summary?.length ? confirmation.summary : confirmation.sentences)}${confirmation.summary?.length ? `<p>Every sentence behind that summary:</p>${list(confirmation.sentences)}` : ''}</div>`);
  }

  s.push('<h2>Replaced points</h2>');
  if (result.events.length) {
    const shown = result.events.slice(0, REPORT_MAX_EVENTS);
    s.push(`<p>${result.events.length} point(s) were replaced by despiking; none was removed silently.</p>`);
    s.push(table([['point #', 'x', 'original y', 'replacement y'], ...shown.map((e) => [e.index + 1, e.x, e.original, e.replacement])]));
    if (result.events.length > shown.length) s.push(`<p>… and ${result.events.length - shown.length} more.</p>`);
  } else {
    s.push('<p>No points were replaced.</p>');
  }

  s.push(`<h2>About this report</h2><p>Written by ${escapeText(version)} at ${escapeText(when)} (UTC). The processing ran in the browser on the user’s computer; the input file was not uploaded anywhere.</p>`);
  s.push(`<p class="caution" role="note">${escapeText(CAUTION)}</p>`);
  s.push('</section>');
  s.push('</body></html>\n');
  return s.join('\n');
}
