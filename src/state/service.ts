/**
 * The page's service layer: wires a store to the computation backend. It
 * loads files, sends traces to the worker once, and asks for a fresh
 * analysis whenever the inputs or the step stack change (latest request
 * wins). It holds no state the store should hold. {@link createService}
 * takes the store (a test gives it a fresh one and the in-process
 * backend); the page uses {@link service}, made over the app's store.
 */
import { applyStage, STAGES, type AnalyseRequest, type AnalyseResult } from '../core/analysis/index.ts';
import { sizeProblem, unexpectedLoadProblem } from '../core/io/guards.ts';
import type { LoadOptions, LoadProblem, LoadReport, LoadResult } from '../core/io/types.ts';
import type { Trace, TraceRole } from '../core/trace.ts';
import type { StoreApi } from 'zustand';
import { currentResult } from './selectors.ts';
import { useApp, type AppState } from './store.ts';
import { SNAP_POINTS, snapHandPeak } from '../core/measure/hand-peak.ts';
import { exactSignal, inProcessBackend, LatestOnly, workerBackend, type ComputeBackend } from '../worker/bridge.ts';
import { DISPLAY_CAPS } from './display-caps.ts';

/** One file read: its traces and load report. */
type Loaded = Extract<LoadResult, { ok: true }>;

function describeLoad(result: Loaded): string[] {
  const r = result.report;
  const lines = [`${r.format}; ${r.rowsRead} rows read, ${r.skipped.length} skipped; SHA-256 ${r.sha256.slice(0, 16)}…`];
  for (const n of r.notices) lines.push(n);
  const shown = r.skipped.slice(0, DISPLAY_CAPS.skippedLinesNamed);
  for (const s of shown) lines.push(`Line ${s.line} skipped: ${s.reason}${s.text ? ` (“${s.text}”)` : ''}`);
  if (r.skipped.length > shown.length) lines.push(`… and ${r.skipped.length - shown.length} more skipped rows (all are in the load report).`);
  return lines;
}

/** True for a trace of the invented demo run (by its file name). */
export function isDemoTrace(t: { source: { fileName: string } }): boolean {
  return DEMO_FILES.some((d) => d.file === t.source.fileName);
}

export const DEMO_FILES = [
  { file: 'demo-sample.csv', role: 'sample' as TraceRole },
  { file: 'demo-blank.csv', role: 'blank' as TraceRole },
  ...Array.from({ length: 8 }, (_, i) => ({ file: `demo-scan-${i + 1}.csv`, role: 'scan' as TraceRole })),
];

interface LoadBytesOptions {
  roles?: TraceRole[];
  replace?: boolean;
  /** No "Loaded …" notice (a problem's notice is still given). */
  quiet?: boolean;
  /** How numbers are written, when the user said so. */
  numberFormat?: LoadOptions['numberFormat'];
  /** Read the file again (for a second try with what the user said); absent for the demo. */
  reread?: () => Promise<Uint8Array>;
}

/** Makes the computation backend; `onProblem` hears what goes wrong outside any job. */
export type BackendFactory = (onProblem: (title: string, lines: string[]) => void) => ComputeBackend;

/** The page's backend: the computation worker where there is one, else the same core in this thread. */
export const defaultBackend: BackendFactory = (onProblem) => (typeof Worker !== 'undefined'
  ? workerBackend(() => new Worker(new URL('../worker/worker.ts', import.meta.url), { type: 'module', name: 'tracewright-compute' }), onProblem)
  : inProcessBackend());

/** The next animation frame where there is one (the page), else the next turn of the event loop (Node tests). */
const nextFrame = (f: () => void): void => {
  if (typeof requestAnimationFrame === 'function') requestAnimationFrame(f);
  else setTimeout(f, 0);
};

/** The service over one store. */
export function createService(store: StoreApi<AppState>, makeBackend: BackendFactory = defaultBackend) {
  /** A loader's problem as a notice: file, line, what is wrong, what to do; nothing the user had is changed. */
  const notifyProblem = (e: LoadProblem, action?: { label: string; key: string }): void =>
    store.getState().notify('error', `${e.fileName}${e.line ? `, line ${e.line}` : ''}: ${e.problem}`, [e.advice, 'Nothing already loaded was changed.'], action);

  let backend: ComputeBackend | null = null;
  let scheduler: LatestOnly | null = null;

  /** The one computation backend (the fit panel sends its jobs through it too). */
  function getBackend(): ComputeBackend {
    if (!backend) {
      // What goes wrong in a worker outside any job the page waits for is a notice, never dropped.
      backend = makeBackend((title, lines) => store.getState().notify('error', title, lines));
      scheduler = new LatestOnly(backend);
    }
    return backend;
  }

  /** Issue 21: one analysis outside the latest-only queue (the standards' peaks); the worker runs it in turn. */
  async function analyseTrace(request: AnalyseRequest): Promise<AnalyseResult> {
    let result: AnalyseResult | null = null;
    // A side job: it does not cancel the sample's analysis, and the sample's edits do not cancel it (issue 16's order).
    await getBackend().analyse(request, (u) => { result = applyStage(result, u); }, true);
    if (!result) throw new Error('The analysis of a standard gave no result.');
    return result;
  }


  /** Counts demo loads and opened files; a demo load stops when the count moves on (issue 17). */
  let demoRun = 0;
  /** The count of the newest demo load (an older one overtaken by it says nothing). */
  let latestDemo = 0;

  /** What notices offer to do, by key (functions stay out of the store). */
  const noticeActions = new Map<string, () => void>();
  let actionCount = 0;

  /** Run the action a notice offers (its button). */
  function runNoticeAction(key: string): void {
    const run = noticeActions.get(key);
    noticeActions.delete(key);
    run?.();
  }


  /**
   * Read one file's bytes in the load worker: its traces and load report, or
   * null when it cannot be read (its notice given). The store is not changed
   * here; a notice offering to say how numbers are written reads the file
   * again and adds it as {@link loadBytes} does, with `opts`' roles.
   */
  async function parseBytes(bytes: Uint8Array, fileName: string, opts: LoadBytesOptions = {}): Promise<Loaded | null> {
    const tooLarge = sizeProblem(bytes.byteLength, fileName);
    if (tooLarge) { notifyProblem(tooLarge); return null; }
    store.getState().setLoading({ fileName, fraction: 0 });
    try {
      const options = opts.numberFormat ? { numberFormat: opts.numberFormat } : undefined;
      const result = await getBackend().load(bytes, fileName, options, (fraction) => store.getState().setLoading({ fileName, fraction }));
      if (result.ok) return result;
      const e = result.error;
      // The page may ask what the file cannot say (how its numbers are written); the answer loads it again.
      let action: { label: string; key: string } | undefined;
      const settle = e.settle, reread = opts.reread;
      if (settle && reread) {
        const key = `settle-${++actionCount}`;
        noticeActions.set(key, () => {
          void reread().then(
            (again) => loadBytes(again, fileName, { ...opts, numberFormat: settle.numberFormat }),
            (err: Error) => store.getState().notify('error', `${fileName}: the browser could not read the file again`, [err.message]),
          );
        });
        action = { label: settle.label, key };
      }
      notifyProblem(e, action);
      return null;
    } catch (e) {
      notifyProblem(unexpectedLoadProblem(fileName, e));
      return null;
    } finally {
      store.getState().setLoading(null);
    }
  }

  /** Load one file's bytes; on success its first trace becomes the sample unless roles say otherwise. */
  async function loadBytes(bytes: Uint8Array, fileName: string, opts: LoadBytesOptions = {}): Promise<boolean> {
    const result = await parseBytes(bytes, fileName, opts);
    if (!result) return false;
    store.getState().addTraces(result.traces, result.report, { roles: opts.roles, replace: opts.replace });
    if (opts.quiet) return true;
    const n = result.traces.length;
    // The title names the file and the count; the traces themselves are in the trace list (60 names in a title help nobody).
    const title = n === 1 ? `Loaded ${result.traces[0].name}` : `Loaded ${fileName}: ${n.toLocaleString('en')} traces`;
    store.getState().notify(result.report.skipped.length ? 'warning' : 'info', title, describeLoad(result));
    return true;
  }


  /**
   * Load files the user dropped or picked. The first file that loads gives the
   * sample (its first trace); later files are loaded set aside, and a notice says
   * so. The user's own file sets the whole demo aside in one change, which the
   * notice offers to undo.
   */
  async function openFiles(files: readonly File[]): Promise<void> {
    // The user's own files win over a demo still arriving: that demo adds nothing (loadDemo).
    demoRun += 1;
    const before = store.getState();
    const rolesBefore = { ...before.roles };
    const sampleBefore = before.sampleId;
    const demoInUse = before.traces.filter((t) => isDemoTrace(t) && before.roles[t.id] !== 'ignore').map((t) => t.id);
    let sampleFile: string | null = null;
    const laterFiles: string[] = [];
    for (const f of files) {
      const tooLarge = sizeProblem(f.size, f.name);
      if (tooLarge) { notifyProblem(tooLarge); continue; }
      let bytes: Uint8Array;
      try {
        bytes = new Uint8Array(await f.arrayBuffer());
      } catch (e) {
        store.getState().notify('error', `${f.name}: the browser could not read the file`, [(e as Error).message]);
        continue;
      }
      const ok = await loadBytes(bytes, f.name, { roles: sampleFile ? ['ignore'] : undefined, reread: () => f.arrayBuffer().then((b) => new Uint8Array(b)) });
      if (ok) { if (sampleFile === null) sampleFile = f.name; else laterFiles.push(f.name); }
    }
    if (sampleFile === null) return;
    const app = store.getState();
    if (laterFiles.length) {
      app.notify('info', `Opened ${laterFiles.length + 1} files: ${sampleFile} is the sample`, [
        `The first file opened gives the sample. ${laterFiles.join(', ')} ${laterFiles.length === 1 ? 'is' : 'are'} loaded and set aside: choose another sample, a blank or repeated scans in the trace list.`,
      ]);
    }
    if (demoInUse.length) {
      const aside: Record<string, TraceRole> = {};
      for (const id of demoInUse) if (app.roles[id] !== undefined) aside[id] = 'ignore';
      app.setRoles(aside);
      const newIds = app.traces.filter((t) => !(t.id in rolesBefore)).map((t) => t.id);
      const key = `demo-back-${++actionCount}`;
      noticeActions.set(key, () => {
        const s = store.getState();
        const back: Record<string, TraceRole> = {};
        for (const [id, role] of Object.entries(rolesBefore)) if (s.roles[id] !== undefined) back[id] = role;
        for (const id of newIds) if (s.roles[id] !== undefined) back[id] = 'ignore';
        s.setRoles(back, sampleBefore && s.roles[sampleBefore] !== undefined ? sampleBefore : null);
        s.notify('info', 'The demo is back as it was', ['Its sample, blank and scans have their roles again; your file stays loaded, set aside.']);
      });
      app.notify('info', `The demo is set aside: ${demoInUse.length} trace${demoInUse.length === 1 ? '' : 's'} (its sample, blank and repeated scans)`, [
        'They stay loaded with the role “set aside”, so nothing of the demo is subtracted from your trace or averaged with it. Give any of them a role again in the trace list, or undo this in one step.',
      ], { label: 'Undo: put the demo back', key });
    }
  }


  /**
   * Load the invented demo run: sample, blank and eight repeated scans, each
   * file read as the user's would be, then all of them put in the store in one
   * change replacing what was there (one analysis, one save; issue 16). A file of the
   * user's opened meanwhile wins: the demo then adds nothing.
   */
  async function loadDemo(): Promise<void> {
    const base = new URL('demo/', document.baseURI);
    const run = ++demoRun;
    latestDemo = run;
    // The ten files are fetched at once and read in the load worker in turn (one round trip each, overlapping).
    const reads = await Promise.all(DEMO_FILES.map(async (d) => {
      try {
        const res = await fetch(new URL(d.file, base));
        if (!res.ok) throw new Error(`HTTP ${res.status}`);
        const bytes = new Uint8Array(await res.arrayBuffer());
        return run === demoRun ? await parseBytes(bytes, d.file) : null;
      } catch (e) {
        store.getState().notify('error', `The demo file ${d.file} could not be fetched`, [(e as Error).message]);
        return null;
      }
    }));
    const traces: Trace[] = [], reports: LoadReport[] = [], roles: TraceRole[] = [];
    reads.forEach((read, k) => {
      // The file's first trace takes the demo's role; any other column of it is set aside, as loadBytes would.
      read?.traces.forEach((t, i) => { traces.push(t); reports.push(read.report); roles.push(i === 0 ? DEMO_FILES[k].role : 'ignore'); });
    });
    const app = store.getState();
    // A file of the user's opened while the demo was arriving wins (it is never replaced); a newer demo load says its own.
    if (run !== demoRun) {
      if (latestDemo === run) app.notify('info', 'The demo was not loaded', ['A file of your own was opened while the demo was arriving; the demo added nothing, your file is as you opened it.']);
      return;
    }
    if (!traces.length) { app.notify('error', 'The demo was not loaded', ['None of its files could be read (each one\'s notice says why). Nothing already loaded was changed.']); return; }
    app.addTraces(traces, reports, { roles, replace: true });
    app.notify('info', `Demo loaded: an invented teaching-rig run (${traces.length} traces)`, ['A sample, its blank and eight repeated scans: synthetic data made by scripts/make-demo.mjs, with the true peaks in public/demo/demo-truth.json. Drop your own file to replace the sample.']);
  }

  function buildRequest(): AnalyseRequest | null {
    const s = store.getState();
    if (!s.sampleId) return null;
    const blank = s.traces.find((t) => s.roles[t.id] === 'blank');
    return {
      sampleId: s.sampleId,
      blankId: blank?.id,
      scanIds: s.traces.filter((t) => s.roles[t.id] === 'scan').map((t) => t.id),
      recipe: s.recipe,
      showUid: s.showUid,
      noise: s.noiseSettings,
      peaks: s.peakSettings,
      decisions: s.decisions,
      alternatives: s.alternatives,
      ledgerNoiseLevel: s.ledgerNoiseLevel,
    };
  }

  let scheduled = false;
  /** Ask for a new analysis on the next frame (several changes in one frame make one request). */
  function requestAnalysis(): void {
    if (scheduled) return;
    scheduled = true;
    nextFrame(() => {
      scheduled = false;
      const req = buildRequest();
      if (!req) { store.getState().setResult(null); return; }
      getBackend();
      store.getState().setBusy(true);
      // Until each stage lands, what it sets is shown as provisional (the figures of the previous request).
      store.getState().setPending(STAGES.filter((s) => s !== 'alternative' || (req.alternatives?.length ?? 0) > 0));
      scheduler!.run(req, (update) => {
        const st = store.getState();
        if (update.sampleId === st.sampleId) st.takeStage(update);
      }).then(
        (done) => {
          if (done === null) return;
          store.getState().setBusy(false);
        },
        (e: Error) => { store.getState().setComputeError(e.message); store.getState().setBusy(false); },
      );
    });
  }

  /** Start watching the store. Call once at start-up. */
  function startController(): () => void {
    let lastTraces = store.getState().traces;
    const unsub = store.subscribe((s, prev) => {
      // Issue 17: each trace keeps its own zoom; a trace not zoomed before opens at full range.
      if (s.sampleId !== prev.sampleId) s.switchZoom(prev.sampleId, s.sampleId);
      if (s.traces !== lastTraces) {
        lastTraces = s.traces;
        getBackend().setInputs(s.traces);
        requestAnalysis();
        return;
      }
      if (s.recipe !== prev.recipe || s.sampleId !== prev.sampleId || s.roles !== prev.roles || s.showUid !== prev.showUid
        || s.noiseSettings !== prev.noiseSettings || s.peakSettings !== prev.peakSettings || s.decisions !== prev.decisions || s.alternatives !== prev.alternatives || s.ledgerNoiseLevel !== prev.ledgerNoiseLevel) requestAnalysis();
    });
    return unsub;
  }

  function cancelLoad(): void {
    backend?.cancelLoad();
    store.getState().setLoading(null);
    store.getState().notify('warning', 'Loading cancelled', ['Nothing already loaded was changed.']);
  }

  /**
   * Issue 17: a click in "add a peak" mode. The click moves to the nearest top
   * of the trace the peaks are measured on (within SNAP_POINTS samples) and is
   * kept as a decision there, or is refused; either way the plot says so.
   */
  async function addPeakByHand(at: number): Promise<void> {
    const s = store.getState();
    const sample = s.traces.find((t) => t.id === s.sampleId);
    const result = currentResult(s);
    if (!sample || !result) { s.setHandNote({ kind: 'refused', text: 'The trace is still being measured; click again when the peak table shows.' }); return; }
    // The exact processed trace (fetched from the worker when it stayed there, worker/series.ts).
    const on = s.peakSettings.measureOn === 'raw' ? { x: sample.x, y: sample.y } : await exactSignal(getBackend(), result.processed);
    const taken = result.peaks.filter((p) => !p.removedByUser).map((p) => p.x);
    const place = snapHandPeak(on.x, on.y, at, { negative: s.peakSettings.negative, taken, xUnit: sample.xUnit });
    if (!place.ok) { s.setHandNote({ kind: 'refused', text: `Peak not added: ${place.reason}` }); return; }
    s.addPeakAt(place.x);
    const u = sample.xUnit ? ` ${sample.xUnit}` : '';
    s.setHandNote({ kind: 'added', text: `Peak added at the ${s.peakSettings.negative ? 'bottom' : 'top'} x = ${Number(place.x.toPrecision(6))}${u}${place.moved ? ` (the click at ${Number(at.toPrecision(6))}${u} was moved to the nearest ${s.peakSettings.negative ? 'bottom' : 'top'}, at most ${SNAP_POINTS} points away)` : ''}. It is kept as a decision and marked “added by hand”.` });
  }

  return { getBackend, analyseTrace, runNoticeAction, loadBytes, openFiles, loadDemo, requestAnalysis, startController, cancelLoad, addPeakByHand };
}

export type Service = ReturnType<typeof createService>;

/** The page's service, over the app's store. */
export const service: Service = createService(useApp);
export const { getBackend, analyseTrace, runNoticeAction, loadBytes, openFiles, loadDemo, requestAnalysis, startController, cancelLoad, addPeakByHand } = service;
