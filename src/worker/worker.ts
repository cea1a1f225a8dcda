/// <reference lib="webworker" />
/**
 * Worker entry: receives traces once, then calls of the methods in
 * api.ts (analyses, fits, loads, batches), and posts results back with
 * their arrays transferred. Whatever goes wrong is posted as 'failed', never
 * dropped: with the call's id, or with none when the message belonged to no
 * call (the page then shows it as a notice).
 */
import type { Call, FromWorker, Method, ParamsOf, ProgressOf, ResultOf, ThroughPort, ToWorker } from './api.ts';
import { HeldTraces } from './held-traces.ts';
import { cloneResultForTransfer, columnBuffers, toColumns, transferablesOf } from './transfer.ts';
import { runStages } from './stager.ts';
import { releaseBigPlan } from '../core/numeric/fft.ts';
import { runBatch } from '../core/export/batch.ts';
import { SeriesStore } from './series.ts';
import { STEP_REGISTRY } from '../core/steps/registry.ts';
import { peakView as viewOf } from './peak-rank.ts';
import { ledgerBuffers, ledgerToColumns } from './ledger-columns.ts';
import type { Ledger } from '../core/measure/loss-matching.ts';

/** What stands in a stage's loss report for its ledger, which crosses as columns beside it. */
const NO_LEDGER: Ledger = { alternatives: [], rows: [], sentences: [], rule: '' };
import { DISPLAY_CAPS } from '../state/display-caps.ts';
import type { Peak } from '../core/measure/peak-types.ts';
import { DetectPartnerClient } from './detect-partner-client.ts';

const held = new HeldTraces();
/** Long series of the newest analyses, kept here so they need not cross to the page (series.ts). */
const series = new SeriesStore();
const scope = self as unknown as DedicatedWorkerGlobalScope;
/** The port to the other worker (the same script runs as the loading and as the computation worker). */
let peer: MessagePort | null = null;
/** Analyses and fits that came while traces named by the page were still on their way through the port. */
const deferred: Call[] = [];
/** A second thread that measures half of a long detection's candidates (started on first use; issue 16). */
const partner = new DetectPartnerClient(
  () => new Worker(new URL('./detect-partner.ts', import.meta.url), { type: 'module', name: 'tracewright-detect' }),
  (message) => post({ type: 'failed', jobId: null, message }),
);
/** The newest analysis asked for: older ones stop between stages and at pauses inside them. */
let latestJob = 0;

function post(msg: FromWorker, transfer: Transferable[] = []) {
  scope.postMessage(msg, transfer);
}

/** The answer to one call, typed by its method. */
function reply<M extends Method>(method: M, jobId: number, value: ResultOf<M>, transfer: Transferable[] = []) {
  post({ type: 'result', method, jobId, value } as FromWorker, transfer);
}

function progress<M extends Method>(method: M, jobId: number, p: ProgressOf<M>) {
  post({ type: 'progress', method, jobId, progress: p } as FromWorker);
}

function fromPeer(ev: MessageEvent<ThroughPort>) {
  if (ev.data?.type !== 'traces') return;
  held.stage(ev.data.traces);
  while (!held.incomplete && deferred.length) void call(deferred.shift()!);
}

scope.onmessage = (ev: MessageEvent<ToWorker>) => {
  const msg = ev.data;
  if (msg?.type === 'call' && msg.method === 'analyse' && !msg.params.side) latestJob = msg.jobId;
  void handle(msg);
};

scope.onmessageerror = () => {
  post({ type: 'failed', jobId: null, message: 'The computation worker received a message it could not read (the browser could not copy it across); the request was not carried out.' });
};

async function handle(msg: ToWorker): Promise<void> {
  try {
    if (msg.type === 'port') {
      peer?.close();
      peer = msg.port;
      peer.onmessage = fromPeer;
    } else if (msg.type === 'inputs') {
      held.setInputs(msg.traces, msg.keep);
      while (!held.incomplete && deferred.length) void call(deferred.shift()!);
    } else if (msg.type === 'call') {
      await call(msg);
    } else {
      throw new Error(`a message of unknown type ${JSON.stringify((msg as { type?: unknown } | null)?.type ?? null)}`);
    }
  } catch (e) {
    post({ type: 'failed', jobId: null, message: `The computation worker could not take in a message: ${e instanceof Error ? `${e.name}: ${e.message}` : String(e)}` });
  }
}

async function call(msg: Call): Promise<void> {
  const jobId = msg.jobId;
  try {
    if ((msg.method === 'analyse' || msg.method === 'fit') && held.incomplete) {
      deferred.push(msg);
      // Traces come through the port within moments of the page naming them; if not, the page is told and sends them itself.
      setTimeout(() => {
        const at = deferred.indexOf(msg);
        if (at < 0) return;
        deferred.splice(at, 1);
        post({ type: 'failed', jobId, message: 'A loaded trace did not reach the computation worker.', missing: true });
      }, 5000);
      return;
    }
    switch (msg.method) {
      case 'analyse': await analyse(jobId, msg.params); break;
      case 'fit': {
        // Issue 18: a fit's arrays are the fit's own (slices of the region).
        // Copied first all the same: an array the worker keeps (a trace's x, which cached outputs share) must never be detached.
        const outcome = cloneResultForTransfer(held.fit(msg.params));
        reply('fit', jobId, outcome, transferablesOf(outcome));
        break;
      }
      case 'load': await load(jobId, msg.params); break;
      case 'draw': {
        const drawn = series.draw(msg.params.refs, msg.params.view);
        reply('draw', jobId, drawn, drawn.flatMap((d) => [d.x.buffer as ArrayBuffer, d.y.buffer as ArrayBuffer]));
        break;
      }
      case 'slice': {
        const parts = series.slice(msg.params.refs, msg.params.from, msg.params.to);
        reply('slice', jobId, parts, parts.flatMap((d) => [d.x.buffer as ArrayBuffer, d.y.buffer as ArrayBuffer]));
        break;
      }
      case 'nearest': reply('nearest', jobId, series.nearest(msg.params.refs, msg.params.x)); break;
      case 'batch': {
        const { files, recipe, settings } = msg.params;
        const result = await runBatch(files, recipe, STEP_REGISTRY, settings, (p) => progress('batch', jobId, p));
        reply('batch', jobId, result, [result.zip.buffer]);
        break;
      }
      default:
        // A method this worker does not know (a page and worker from different builds): said, never left waiting.
        throw new Error(`This worker has no method "${String((msg as { method: unknown }).method)}".`);
    }
  } catch (e) {
    post({ type: 'failed', jobId, message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) });
  } finally {
    // A big FFT plan (42 MB for a frequency filter at 10⁶ points) is not kept between jobs (issue 16, heap).
    releaseBigPlan();
  }
}

async function analyse(jobId: number, params: ParamsOf<'analyse'>): Promise<void> {
  const t0 = Date.now();
  const outcome = await runStages(held.stages(params.request, !!params.side), (update) => {
    // Long series stay here (drawn for the page's view); cached outputs must stay usable, so the rest goes as
    // copies, transferred; the peak table goes as columns.
    // Side jobs (the standards' analyses) cross whole as before: only their peaks are used, and keeping their
    // series here would push out the sample's, which exports may still ask for.
    const thin = params.side ? { patch: update.patch, far: [] } : series.thin(update.patch, jobId);
    const { peaks, ...rest } = thin.patch;
    // The ledger crosses as columns too (ledger-columns.ts), not as an object per row and per cell.
    const ledgerColumns = rest.loss ? ledgerToColumns(rest.loss.ledger) : undefined;
    const patch = cloneResultForTransfer(rest.loss ? { ...rest, loss: { ...rest.loss, ledger: NO_LEDGER } } : rest);
    const peakColumns = peaks ? toColumns(peaks as unknown as Record<string, unknown>[]) : undefined;
    // The peak table's shown rows and the plot's markers ranked here, with the table's totals (issue 16: sorting
    // ~38,000 peaks took the page 70-150 ms per stage, and making every row as an object about as long).
    const peakView = peaks && !params.side ? viewOf(peaks as readonly Peak[], DISPLAY_CAPS.peakRows) : undefined;
    const far = thin.far.length ? thin.far : undefined;
    const drawn = thin.far.flatMap((f) => [f.drawn.x.buffer as ArrayBuffer, f.drawn.y.buffer as ArrayBuffer]);
    post({ type: 'stage', jobId, update: { ...update, patch }, peakColumns, peakView, ledgerColumns, far }, [...transferablesOf(patch), ...(peakColumns ? columnBuffers(peakColumns) : []), ...(ledgerColumns ? ledgerBuffers(ledgerColumns) : []), ...(peakView ? [peakView.rows.buffer as ArrayBuffer, peakView.markers.buffer as ArrayBuffer] : []), ...drawn]);
  }, () => !params.side && latestJob !== jobId, (share) => partner.start(share));
  reply('analyse', jobId, { outcome, ms: Date.now() - t0 });
}

async function load(jobId: number, params: ParamsOf<'load'>): Promise<void> {
  let last = 0;
  const result = await held.load(params.bytes, params.fileName, params.options, (fraction) => {
    const now = Date.now();
    if (now - last > 80) { last = now; progress('load', jobId, fraction); }
  });
  // The computation worker gets its own copy straight from here, and the page the originals, handed over
  // (copying 50 MB on the page's thread took 0.25-0.4 s there).
  const shared = !!(result.ok && params.share && peer);
  if (result.ok && shared && peer) {
    const copies = result.traces.map((t) => ({ ...t, x: t.x.slice(), y: t.y.slice() }));
    const through: ThroughPort = { type: 'traces', traces: copies };
    peer.postMessage(through, copies.flatMap((t) => [t.x.buffer, t.y.buffer]));
  }
  reply('load', jobId, { result, shared }, transferablesOf(result));
}
