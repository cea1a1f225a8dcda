/**
 * Wires the store to the computation backend: loads files, sends traces
 * once, and asks for a fresh analysis whenever the inputs or the recipe
 * change (latest request wins). Holds no state the store should hold.
 */
import { STAGES, type AnalyseRequest } from '../core/analysis/index.ts';
import { MAX_FILE_BYTES, type LoadOptions, type LoadResult } from '../core/io/types.ts';
import type { TraceRole } from '../core/trace.ts';
import { useApp } from '../state/store.ts';
import { inProcessBackend, LatestOnly, workerBackend, type ComputeBackend } from '../worker/bridge.ts';

let backend: ComputeBackend | null = null;
let scheduler: LatestOnly | null = null;

function getBackend(): ComputeBackend {
  if (!backend) {
    backend = typeof Worker !== 'undefined'
      ? workerBackend(() => new Worker(new URL('../worker/worker.ts', import.meta.url), { type: 'module', name: 'tracewright-compute' }))
      : inProcessBackend();
    scheduler = new LatestOnly(backend);
  }
  return backend;
}

function describeLoad(result: Extract<LoadResult, { ok: true }>): string[] {
  const r = result.report;
  const lines = [`${r.format}; ${r.rowsRead} rows read, ${r.skipped.length} skipped; SHA-256 ${r.sha256.slice(0, 16)}…`];
  for (const n of r.notices) lines.push(n);
  const shown = r.skipped.slice(0, 8);
  for (const s of shown) lines.push(`Line ${s.line} skipped: ${s.reason}${s.text ? ` (“${s.text}”)` : ''}`);
  if (r.skipped.length > shown.length) lines.push(`… and ${r.skipped.length - shown.length} more skipped rows (all are in the load report).`);
  return lines;
}

/** What notices offer to do, by key (functions stay out of the store). */
const noticeActions = new Map<string, () => void>();
let actionCount = 0;

/** Run the action a notice offers (its button). */
export function runNoticeAction(key: string): void {
  const run = noticeActions.get(key);
  noticeActions.delete(key);
  run?.();
}

interface LoadBytesOptions {
  roles?: TraceRole[];
  replace?: boolean;
  quiet?: boolean;
  /** How numbers are written, when the user said so. */
  numberFormat?: LoadOptions['numberFormat'];
  /** Read the file again (for a second try with what the user said); absent for the demo. */
  reread?: () => Promise<Uint8Array>;
}

/** Load one file's bytes; on success its first trace becomes the sample unless roles say otherwise. */
export async function loadBytes(bytes: Uint8Array, fileName: string, opts: LoadBytesOptions = {}): Promise<boolean> {
  const app = useApp.getState();
  if (bytes.byteLength > MAX_FILE_BYTES) {
    app.notify('error', `${fileName}: the file is too large (${(bytes.byteLength / 1048576).toFixed(0)} MB)`, [`The page holds files up to ${MAX_FILE_BYTES / 1048576} MB. Split the file or thin it before loading. Nothing already loaded was changed.`]);
    return false;
  }
  app.setLoading({ fileName, fraction: 0 });
  try {
    const options = opts.numberFormat ? { numberFormat: opts.numberFormat } : undefined;
    const result = await getBackend().load(bytes, fileName, options, (fraction) => useApp.getState().setLoading({ fileName, fraction }));
    if (!result.ok) {
      const e = result.error;
      // The page may ask what the file cannot say (how its numbers are written); the answer loads it again.
      let action: { label: string; key: string } | undefined;
      const settle = e.settle, reread = opts.reread;
      if (settle && reread) {
        const key = `settle-${++actionCount}`;
        noticeActions.set(key, () => {
          void reread().then(
            (again) => loadBytes(again, fileName, { ...opts, numberFormat: settle.numberFormat }),
            (err: Error) => useApp.getState().notify('error', `${fileName}: the browser could not read the file again`, [err.message]),
          );
        });
        action = { label: settle.label, key };
      }
      useApp.getState().notify('error', `${e.fileName}${e.line ? `, line ${e.line}` : ''}: ${e.problem}`, [e.advice, 'Nothing already loaded was changed.'], action);
      return false;
    }
    useApp.getState().addTraces(result.traces, result.report, { roles: opts.roles, replace: opts.replace });
    if (!opts.quiet) {
      const n = result.traces.length;
      const names = n <= 4 ? result.traces.map((t) => t.name).join(', ') : `${n} traces from ${fileName} (${result.traces[0].name} … ${result.traces[n - 1].name})`;
      useApp.getState().notify(result.report.skipped.length ? 'warning' : 'info', `Loaded ${names}`, describeLoad(result));
    }
    return true;
  } catch (e) {
    useApp.getState().notify('error', `${fileName}: could not be read`, [(e as Error).message, 'Nothing already loaded was changed.']);
    return false;
  } finally {
    useApp.getState().setLoading(null);
  }
}

/** Load files the user dropped or picked. */
export async function openFiles(files: readonly File[]): Promise<void> {
  for (const f of files) {
    if (f.size > MAX_FILE_BYTES) {
      useApp.getState().notify('error', `${f.name}: the file is too large (${(f.size / 1048576).toFixed(0)} MB)`, [`The page holds files up to ${MAX_FILE_BYTES / 1048576} MB. Nothing already loaded was changed.`]);
      continue;
    }
    let bytes: Uint8Array;
    try {
      bytes = new Uint8Array(await f.arrayBuffer());
    } catch (e) {
      useApp.getState().notify('error', `${f.name}: the browser could not read the file`, [(e as Error).message]);
      continue;
    }
    await loadBytes(bytes, f.name, { reread: () => f.arrayBuffer().then((b) => new Uint8Array(b)) });
  }
}

export const DEMO_FILES = [
  { file: 'demo-sample.csv', role: 'sample' as TraceRole },
  { file: 'demo-blank.csv', role: 'blank' as TraceRole },
  ...Array.from({ length: 8 }, (_, i) => ({ file: `demo-scan-${i + 1}.csv`, role: 'scan' as TraceRole })),
];

/** Load the invented demo run: sample, blank and eight repeated scans. */
export async function loadDemo(): Promise<void> {
  const base = new URL('demo/', document.baseURI);
  let first = true;
  for (const d of DEMO_FILES) {
    try {
      const res = await fetch(new URL(d.file, base));
      if (!res.ok) throw new Error(`HTTP ${res.status}`);
      const bytes = new Uint8Array(await res.arrayBuffer());
      await loadBytes(bytes, d.file, { roles: [d.role], replace: first, quiet: true });
      first = false;
    } catch (e) {
      useApp.getState().notify('error', `The demo file ${d.file} could not be fetched`, [(e as Error).message]);
    }
  }
  const n = useApp.getState().traces.length;
  useApp.getState().notify('info', `Demo loaded: an invented teaching-rig run (${n} traces)`, ['A sample, its blank and eight repeated scans: synthetic data made by scripts/make-demo.mjs, with the true peaks in public/demo/demo-truth.json. Drop your own file to replace the sample.']);
}

function buildRequest(): AnalyseRequest | null {
  const s = useApp.getState();
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
export function requestAnalysis(): void {
  if (scheduled) return;
  scheduled = true;
  requestAnimationFrame(() => {
    scheduled = false;
    const req = buildRequest();
    if (!req) { useApp.getState().setResult(null); return; }
    getBackend();
    useApp.getState().setBusy(true);
    // Until each stage lands, what it sets is shown as provisional (the figures of the previous request).
    useApp.getState().setPending(STAGES.filter((s) => s !== 'alternative' || (req.alternatives?.length ?? 0) > 0));
    scheduler!.run(req, (update) => {
      const st = useApp.getState();
      if (update.sampleId === st.sampleId) st.takeStage(update);
    }).then(
      (done) => {
        if (done === null) return;
        useApp.getState().setBusy(false);
      },
      (e: Error) => { useApp.getState().setComputeError(e.message); useApp.getState().setBusy(false); },
    );
  });
}

/** Start watching the store. Call once at start-up. */
export function startController(): () => void {
  let lastTraces = useApp.getState().traces;
  const unsub = useApp.subscribe((s, prev) => {
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

export function cancelLoad(): void {
  backend?.cancelLoad();
  useApp.getState().setLoading(null);
  useApp.getState().notify('warning', 'Loading cancelled', ['Nothing already loaded was changed.']);
}
