import { useRef, useState } from 'react';
import Plotly from 'plotly.js-strict-dist-min';
import type { BatchError, BatchProgress } from '../../core/export/batch.ts';
import { zipBaseName } from '../../core/export/names.ts';
import { cleanedTraceCsv, recipeOneLine } from '../../core/export/cleaned-csv.ts';
import { peakTableCsv, peakTableTsv } from '../../core/export/peak-csv.ts';
import { reportHtml, type ExportConfirmation, type LossLedgerLike } from '../../core/export/report-html.ts';
import { CAUTION, TOOL_LABEL } from '../../core/export/version.ts';
import { lossCounts, lossSummaryLines } from '../../core/export/loss-summary.ts';
import { REPORT_FIELD_LABELS, type HandChangeKind } from '../../core/export/report-fields.ts';
import { analysisSummary, summaryJson } from '../../core/export/summary.ts';
import { CSV_DIGIT_CHOICES, type CsvDecimal, type CsvDelimiter } from '../../core/io/csv-write.ts';
import { jcampFromTrace } from '../../core/io/jcamp-write.ts';
import { analysisOf, parseRecipeText, recipeStepsOnly, recipeToJson, recipeWithAnalysis } from '../../core/method.ts';
import { STEP_REGISTRY } from '../../core/steps/registry.ts';
import { useApp } from '../../state/store.ts';
import { downloadBlob, downloadCsv, downloadText } from './download.ts';
import { useCalibrationView } from '../calibration/derive.ts';
import { clearSession, SESSION_UNDO_STEPS } from '../../state/session-db.ts';
import { SessionFileControls } from './SessionFileControls.tsx';
import { markDrawn } from '../draw-health.ts';
import { exportExtras } from '../fit/export-extras.ts';
import { getBackend } from '../../state/service.ts';
import { currentResult } from '../../state/selectors.ts';
import { exactResult, exactSignal } from '../../worker/bridge.ts';

type Guarded = 'cleaned' | 'peaks' | 'report' | 'print' | 'summary';

interface Props {
  /** The main plot's element (for pictures); the first figure on the page is used when it gives none. */
  getFigure?: () => HTMLElement | null;
}

const CHANGE_WORDS: Record<HandChangeKind, string> = { added: 'Peak added', removed: 'Peak removed', bounds: 'Start and end set' };

const DELIMITERS: { value: CsvDelimiter; label: string }[] = [
  { value: ',', label: 'comma' },
  { value: ';', label: 'semicolon' },
  { value: '\t', label: 'tab' },
];

/**
 * Print the report: it is put in a hidden frame of this page (the report's
 * own policy still forbids scripts in it) and the browser's print dialog
 * opens on that frame; the frame is replaced by the next print.
 */
function printHtml(html: string): void {
  document.querySelector('iframe[data-testid="print-frame"]')?.remove();
  const frame = document.createElement('iframe');
  frame.dataset.testid = 'print-frame';
  frame.title = 'Report for printing';
  frame.setAttribute('aria-hidden', 'true');
  frame.style.cssText = 'position:fixed;right:0;bottom:0;width:0;height:0;border:0;visibility:hidden';
  frame.addEventListener('load', () => { frame.contentWindow?.focus(); frame.contentWindow?.print(); }, { once: true });
  frame.srcdoc = html;
  document.body.appendChild(frame);
}

function stamp(d: Date): string {
  return d.toISOString().replace(/[:]/g, '-').replace(/\.\d+Z$/, 'Z');
}

/** Results out: files, clipboard, pictures, recipes, batches, and starting over. */
export function ExportPanel({ getFigure }: Props) {
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const result = useApp((s) => currentResult(s));
  const stack = useApp((s) => s.recipe);
  const noiseSettings = useApp((s) => s.noiseSettings);
  const peakSettings = useApp((s) => s.peakSettings);
  // The method as saved and written into every export: the steps and the analysis settings.
  // Issue 21: the named peaks and calibration settings are saved with the method; the report gets the calibration.
  const namedPeaks = useApp((s) => s.namedPeaks);
  const calibrationSettings = useApp((s) => s.calibrationSettings);
  const calibration = useCalibrationView();
  const recipe = recipeWithAnalysis(stack, noiseSettings, peakSettings, { namedPeaks: namedPeaks.peaks.length ? namedPeaks : null, calibration: namedPeaks.peaks.length ? calibrationSettings : null });
  // Issue 17: the report's fields and the reasons for hand changes, written into every export.
  const fields = useApp((s) => s.reportFields);
  const reasons = useApp((s) => s.handReasons);
  const decisions = useApp((s) => s.decisions);
  const sessionProblem = useApp((s) => s.sessionProblem);
  const savedAt = useApp((s) => s.sessionSavedAt);
  const savePending = useApp((s) => s.sessionPending);
  const offlineReady = useApp((s) => s.offlineReady);
  const [delimiter, setDelimiter] = useState<CsvDelimiter>(',');
  const [decimal, setDecimal] = useState<CsvDecimal>('.');
  // Issue 17: full precision unless the user asks for fewer significant digits (stated in each CSV's header).
  const [digits, setDigits] = useState<number | undefined>(undefined);
  const csv = { delimiter, decimal, digits };
  const [pending, setPending] = useState<Guarded | null>(null);
  const [confirmation, setConfirmation] = useState<ExportConfirmation | null>(null);
  const [progress, setProgress] = useState<BatchProgress | null>(null);
  const [batchErrors, setBatchErrors] = useState<BatchError[]>([]);
  const [askStartOver, setAskStartOver] = useState(false);
  const recipeInput = useRef<HTMLInputElement>(null);
  const batchInput = useRef<HTMLInputElement>(null);
  // Exports wait until every stage of the newest analysis has landed (issue 16): never a mix of old and new figures.
  const settled = useApp((s) => s.pending.length === 0);
  const ready = !!(sample && result && settled);
  // Lost or weakened features (exports ask for a confirmation when there are any) and the ledger, from the loss check.
  const losses = result?.loss?.currentWarnings ?? [];
  const lossItems = result?.loss?.currentItems ?? [];
  const lossSummary = lossSummaryLines(lossItems, losses, sample?.xUnit ?? '');
  const counts = lossCounts(lossItems);
  // Issue 17: one confirmation per export session; it holds while the list of losses stays the same (a change of processing asks again).
  const stillConfirmed = !!confirmation && confirmation.sentences.length === losses.length && confirmation.sentences.every((t, i) => t === losses[i]);
  const ledgerOut: LossLedgerLike | null = result?.loss?.ledger ?? null;
  const stem = sample ? zipBaseName(sample.source.fileName) : 'trace';

  // Every hand change the decisions hold, with its reason (kept by kind and the decision's x).
  const handChanges: { kind: HandChangeKind; x: number }[] = [
    ...decisions.added.map((x) => ({ kind: 'added' as const, x })),
    ...decisions.removed.map((x) => ({ kind: 'removed' as const, x })),
    ...(decisions.bounds ?? []).map((b) => ({ kind: 'bounds' as const, x: b.x })),
  ];
  const reasonOf = (kind: HandChangeKind, x: number) => reasons.find((r) => r.kind === kind && r.x === x)?.reason ?? '';

  const notify = (kind: 'info' | 'warning' | 'error', title: string, lines: string[] = []) => useApp.getState().notify(kind, title, lines);
  const fail = (what: string, e: unknown) => notify('error', `${what} could not be made`, [e instanceof Error ? e.message : String(e)]);
  const figureElement = (): HTMLElement | null => getFigure?.() ?? document.querySelector<HTMLElement>('[data-testid="figure"]');

  const exportNow = async (kind: Guarded, confirmed: ExportConfirmation | null) => {
    const shown = result;
    if (!sample || !shown) return;
    const now = new Date();
    try {
      // Series longer than the plot needs stay in the worker: the export asks for them whole (worker/series.ts).
      const result = await exactResult(getBackend(), shown);
      const add = exportExtras(sample, result, calibration?.exp ?? null); // issue 18: fits and figure columns; issue 21: amounts
      if (kind === 'cleaned') {
        downloadCsv(cleanedTraceCsv({ trace: sample, result, recipe, registry: STEP_REGISTRY, options: csv, now }), `${stem}-cleaned.csv`);
      } else if (kind === 'peaks') {
        downloadCsv(peakTableCsv({ trace: sample, result, recipe, registry: STEP_REGISTRY, options: csv, now, extra: add.extra, extraComments: add.lines, reasons }), `${stem}-peaks.csv`);
      } else if (kind === 'summary') {
        const summary = analysisSummary({ trace: sample, result, method: recipe, registry: STEP_REGISTRY, inputFile: sample.source.fileName, fits: add.fits, fields, reasons });
        downloadText(summaryJson(summary), `${stem}-summary.json`, 'application/json');
      } else {
        // The plots are drawn by the core, as in the command line's report.
        const html = reportHtml({ trace: sample, result, recipe, registry: STEP_REGISTRY, ledger: ledgerOut, confirmation: confirmed, now, calibration: calibration?.exp ?? null, fits: add.fits, extra: add.extra, extraLines: add.lines, fields, reasons });
        if (kind === 'print') printHtml(html);
        else downloadText(html, `${stem}-report.html`, 'text/html;charset=utf-8');
      }
    } catch (e) {
      fail(kind === 'cleaned' ? 'The cleaned trace CSV' : kind === 'peaks' ? 'The peak table CSV' : kind === 'summary' ? 'The summary' : 'The report', e);
    }
  };

  const request = (kind: Guarded) => {
    if (losses.length > 0 && !stillConfirmed) { setPending(kind); return; }
    void exportNow(kind, losses.length > 0 ? confirmation : null);
  };

  const confirmPending = () => {
    if (!pending) return;
    const c: ExportConfirmation = { at: new Date(), sentences: [...losses], summary: lossSummary };
    setConfirmation(c);
    const kind = pending;
    setPending(null);
    void exportNow(kind, c);
  };

  const exportJcamp = async () => {
    if (!sample || !result) return;
    try {
      const processed = await exactSignal(getBackend(), result.processed);
      const text = jcampFromTrace(
        { x: processed.x, y: processed.y, xName: sample.xName, xUnit: sample.xUnit, yName: sample.yName, yUnit: sample.yUnit, name: `${sample.name} (processed)` },
        {
          $SOURCE_FILE: sample.source.fileName, $SOURCE_SHA256: sample.source.sha256, $PROCESSING_METHOD: recipeOneLine(recipe),
          $WRITTEN_BY: TOOL_LABEL, $WRITTEN_AT: new Date().toISOString(), $CAUTION: CAUTION,
        },
      );
      downloadText(text, `${stem}-cleaned.jdx`, 'chemical/x-jcamp-dx');
    } catch (e) { fail('The JCAMP-DX file', e); }
  };

  const copyPeaks = async () => {
    if (!sample || !result) return;
    try {
      await navigator.clipboard.writeText(peakTableTsv(sample, result, decimal, digits));
      notify('info', 'Peak table copied', [`${result.peaks.length} row(s) as tab-separated text${digits ? `, numbers to ${digits} significant digits` : ', numbers at full precision'}; paste into a spreadsheet.`]);
    } catch (e) { fail('The clipboard copy', e); }
  };

  const savePicture = async (format: 'png' | 'svg') => {
    const el = figureElement();
    if (!el) { notify('error', 'There is no plot to save yet'); return; }
    try { await Plotly.downloadImage(el, { format, filename: `${stem}-plot`, width: 1400, height: 700 }); } catch (e) { fail(`The ${format.toUpperCase()} picture`, e); }
  };

  const loadRecipe = async (file: File | undefined) => {
    if (!file) return;
    let text: string;
    try { text = await file.text(); } catch (e) { fail('Reading the processing method', e); return; }
    const check = parseRecipeText(text, STEP_REGISTRY);
    if (!check.ok) {
      notify('error', `${file.name}: the processing method was not loaded`, [...check.problems, 'The current step stack is unchanged.']);
      return;
    }
    const st = useApp.getState();
    const analysis = analysisOf(check.recipe);
    st.replaceRecipe(recipeStepsOnly(check.recipe));
    st.setNoiseSettings(analysis.noise);
    st.setPeakSettings(analysis.peaks);
    if (analysis.namedPeaks) st.setNamedPeaks(analysis.namedPeaks);
    if (analysis.calibration) st.setCalibrationSettings(analysis.calibration);
    notify('info', `Processing method loaded from ${file.name}`, [
      `${check.recipe.steps.length} step(s). Undo (Ctrl+Z) brings back the previous stack.`,
      check.recipe.analysis
        ? 'The noise and peak settings saved with it are in use (undo does not bring back the earlier ones).'
        : 'The file holds no noise and peak settings (saved before they were kept), so the defaults are in use (undo does not bring back the earlier ones).',
    ]);
  };

  const startBatch = async (list: File[]) => {
    if (!list.length) return;
    setBatchErrors([]);
    setProgress({ done: 0, total: list.length, file: '' });
    try {
      const files = [];
      for (const f of list) files.push({ name: f.name, bytes: new Uint8Array(await f.arrayBuffer()) });
      const st = useApp.getState();
      const now = new Date();
      // Issue 16: in the loading worker (a large file froze the page when run here); issue 21: with the calibration.
      const out = await getBackend().batch(files, recipe, { noise: st.noiseSettings, peaks: st.peakSettings, csv, now, calibration: calibration?.set ?? null }, setProgress);
      setBatchErrors(out.errors);
      downloadBlob(out.zip, `tracewright-batch-${stamp(now)}.zip`, 'application/zip');
      notify(out.errors.length ? 'warning' : 'info', `Batch of ${files.length} file(s) done`, out.errors.length ? [`${out.errors.length} problem(s); they are listed in the export panel and in problems.txt in the ZIP.`] : ['Every file was processed.']);
    } catch (e) {
      fail('The batch', e);
    } finally {
      setProgress(null);
    }
  };

  const startOver = async () => {
    const r = await clearSession();
    if (!r.ok) { notify('error', 'Could not start over', [r.problem]); return; }
    markDrawn();
    window.location.reload();
  };

  return (
    <section className="panel export-panel" aria-labelledby="export-title" data-testid="export-panel">
      <h2 id="export-title">Results out</h2>
      <div className="row" style={{ margin: "6px 0" }}>
        <label>Delimiter{' '}
          <select value={delimiter} data-testid="csv-delimiter" onChange={(e) => {
            const d = e.target.value as CsvDelimiter;
            setDelimiter(d);
            if (d === ',' && decimal === ',') setDecimal('.');
          }}>
            {DELIMITERS.map((d) => <option key={d.label} value={d.value}>{d.label}</option>)}
          </select>
        </label>
        <label>Decimal sign{' '}
          <select value={decimal} data-testid="csv-decimal" onChange={(e) => {
            const d = e.target.value as CsvDecimal;
            setDecimal(d);
            // A decimal comma inside comma-separated cells would be ambiguous.
            if (d === ',' && delimiter === ',') setDelimiter(';');
          }}>
            <option value=".">point (1.5)</option>
            <option value=",">comma (1,5)</option>
          </select>
        </label>
        <label>Numbers in CSV files{' '}
          <select value={digits ?? 'full'} data-testid="csv-digits" onChange={(e) => setDigits(e.target.value === 'full' ? undefined : Number(e.target.value))}>
            <option value="full">full precision (reloads to the same numbers)</option>
            {CSV_DIGIT_CHOICES.map((d) => <option key={d} value={d}>{d} significant digits (for a report)</option>)}
          </select>
        </label>
      </div>
      <fieldset className="report-fields" data-testid="report-fields">
        <legend>For the report (kept with the session)</legend>
        <div className="row">
          {REPORT_FIELD_LABELS.map(([key, label]) => (
            <label key={key}>{label}{' '}
              <input type="text" value={fields[key]} maxLength={200} size={14} data-testid={`report-field-${key}`}
                onChange={(e) => useApp.getState().setReportField(key, e.target.value)} />
            </label>
          ))}
        </div>
        {handChanges.length > 0 && (
          <details data-testid="hand-changes" open={handChanges.some((c) => !reasonOf(c.kind, c.x))}>
            <summary>Hand changes and their reasons ({handChanges.filter((c) => reasonOf(c.kind, c.x)).length} of {handChanges.length} given)</summary>
            <ul className="small">
              {handChanges.map((c) => (
                <li key={`${c.kind}-${c.x}`}>
                  <label>{CHANGE_WORDS[c.kind]} at {Number(c.x.toPrecision(6))}{sample?.xUnit ? ` ${sample.xUnit}` : ''}:{' '}
                    <input type="text" value={reasonOf(c.kind, c.x)} maxLength={200} size={36} placeholder="reason"
                      onChange={(e) => useApp.getState().setHandReason(c.kind, c.x, e.target.value)} />
                  </label>
                </li>
              ))}
            </ul>
          </details>
        )}
      </fieldset>
      <div className="row" style={{ margin: "6px 0" }}>
        <button type="button" disabled={!ready} data-testid="export-cleaned-csv" onClick={() => request('cleaned')}>Cleaned trace (CSV)</button>
        <button type="button" disabled={!ready} data-testid="export-peaks-csv" onClick={() => request('peaks')}>Peak table (CSV)</button>
        <button type="button" disabled={!ready} data-testid="export-report" onClick={() => request('report')}>Report (HTML)</button>
        <button type="button" disabled={!ready} data-testid="print-report" onClick={() => request('print')}>Print the report…</button>
        <button type="button" disabled={!ready} data-testid="export-summary" onClick={() => request('summary')}>Summary (JSON)</button>
        <button type="button" disabled={!ready} data-testid="export-jcamp" onClick={() => void exportJcamp()}>Cleaned trace (JCAMP-DX)</button>
        <button type="button" disabled={!ready} onClick={() => void copyPeaks()}>Copy peak table</button>
        <button type="button" disabled={!ready} onClick={() => void savePicture('png')}>Plot as PNG</button>
        <button type="button" disabled={!ready} onClick={() => void savePicture('svg')}>Plot as SVG</button>
      </div>
      {pending && (
        <div role="alertdialog" aria-labelledby="loss-confirm-title" className="confirm-box" data-testid="loss-confirm" style={{ border: "1px solid var(--bad)", borderRadius: 6, padding: "6px 10px", margin: "6px 0" }}>
          <p id="loss-confirm-title"><strong>Compared with the raw trace, the processing changed {losses.length} finding{losses.length === 1 ? '' : 's'}</strong>
            {' '}<span className="small" data-testid="loss-counts">({counts.lost} lost, {counts.weakened} weakened, {counts.appeared} only after processing{losses.length > lossItems.length ? '; plus changes within the noise range' : ''})</span></p>
          <ul data-testid="loss-summary">{lossSummary.map((t, i) => <li key={i}>{t}</li>)}</ul>
          {lossItems.length > 0 && (
            <details className="small"><summary>All {losses.length} sentences</summary><ul>{losses.map((t, i) => <li key={i}>{t}</li>)}</ul></details>
          )}
          <p className="small">Confirm once for this export session: the exports that follow use this confirmation until the processing changes. The time and this list are written into the report.</p>
          <div className="row" style={{ margin: "6px 0" }}>
            <button type="button" className="primary" onClick={confirmPending}>Export anyway</button>
            <button type="button" onClick={() => setPending(null)}>Cancel</button>
          </div>
        </div>
      )}
      {confirmation && (
        <p className="small muted" data-testid="loss-confirmed">
          {stillConfirmed ? 'Confirmed' : 'Last confirmed'} at {confirmation.at instanceof Date ? confirmation.at.toLocaleTimeString() : confirmation.at}: {confirmation.sentences.length} lost, weakened or new finding(s) acknowledged{stillConfirmed ? '; further exports use this confirmation' : '; the processing has changed since, so the next export asks again'}.
        </p>
      )}
      <div className="row" style={{ margin: "6px 0" }}>
        <button type="button" data-testid="save-recipe" onClick={() => downloadText(`${recipeToJson(recipe)}\n`, 'tracewright-method.json', 'application/json')}>Save processing method</button>
        <button type="button" onClick={() => recipeInput.current?.click()}>Load processing method…</button>
        <input ref={recipeInput} type="file" accept=".json,application/json" className="sr-only" data-testid="recipe-input" aria-label="Load a processing method file"
          onChange={(e) => { const f = e.target.files?.[0]; e.target.value = ''; void loadRecipe(f); }} />
        <button type="button" disabled={!!progress} onClick={() => batchInput.current?.click()}>Run the processing method on many files…</button>
        <input ref={batchInput} type="file" multiple className="sr-only" data-testid="batch-input" aria-label="Files for a batch"
          onChange={(e) => { const files = Array.from(e.target.files ?? []); e.target.value = ''; void startBatch(files); }} />
      </div>
      {progress && (
        <div className="row" data-testid="batch-progress">
          <progress max={progress.total} value={progress.done} aria-label="Batch progress" />
          <span className="small">{progress.done} of {progress.total}{progress.file ? ` (last: ${progress.file})` : ''}</span>
        </div>
      )}
      {batchErrors.length > 0 && (
        <div role="status" data-testid="batch-errors">
          <p className="small"><strong>Files with problems in the last batch:</strong></p>
          <ul className="small">{batchErrors.map((e, i) => <li key={i}><strong>{e.file}</strong>: {e.message}</li>)}</ul>
        </div>
      )}
      <div className="row" style={{ margin: "6px 0" }}>
        <SessionFileControls />
        <span className="small muted" data-testid="session-status" data-pending={savePending ? 'true' : 'false'}>
          {sessionProblem ? 'Session: not kept in this browser (see the message at the top); save it to a file.'
            : savedAt ? `Session: kept in this browser, last saved ${new Date(savedAt).toLocaleTimeString()}${savePending ? ' (saving the latest changes…)' : ''}, with the last ${SESSION_UNDO_STEPS} undo steps.`
              : 'Session: not saved yet.'}
          {offlineReady ? ' The page also opens without its server (a copy is kept in this browser).' : ''}
        </span>
      </div>
      <div className="row" style={{ margin: "6px 0" }}>
        {askStartOver ? (
          <>
            <span className="small">Empty the saved session (traces, stack, decisions) and reload the page?</span>
            <button type="button" className="danger" data-testid="start-over-confirm" onClick={() => void startOver()}>Yes, start over</button>
            <button type="button" onClick={() => setAskStartOver(false)}>Keep my session</button>
          </>
        ) : (
          <button type="button" data-testid="start-over" onClick={() => setAskStartOver(true)}>Start over…</button>
        )}
      </div>
      <p className="hint">Every file carries the input’s SHA-256, the processing method, the tool version and the time. Files are made in this browser; nothing is uploaded.</p>
    </section>
  );
}
