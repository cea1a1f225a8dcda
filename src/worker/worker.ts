/// <reference lib="webworker" />
/**
 * Worker entry: receives traces once, then analysis and load jobs, and
 * posts results back with their arrays transferred.
 */
import type { FromWorker, ThroughPort, ToWorker } from './protocol.ts';
import { Engine, transferablesOf } from './engine.ts';
import { cloneResultForTransfer } from './clone.ts';
import { runStages } from './stager.ts';
import { columnBuffers, toColumns } from './columns.ts';

const engine = new Engine();
const scope = self as unknown as DedicatedWorkerGlobalScope;
/** The port to the other worker (the same script runs as the loading and as the computation worker). */
let peer: MessagePort | null = null;
/** Analyses that came while traces named by the page were still on their way through the port. */
const deferred: ToWorker[] = [];
/** The newest analysis asked for: older ones stop between stages. */
let latestJob = 0;

function post(msg: FromWorker, transfer: Transferable[] = []) {
  scope.postMessage(msg, transfer);
}

function fromPeer(ev: MessageEvent<ThroughPort>) {
  if (ev.data?.type !== 'traces') return;
  engine.stage(ev.data.traces);
  while (!engine.incomplete && deferred.length) void handle(deferred.shift()!);
}

scope.onmessage = (ev: MessageEvent<ToWorker>) => {
  if (ev.data?.type === 'analyse' && !ev.data.side) latestJob = ev.data.jobId;
  void handle(ev.data);
};

async function handle(msg: ToWorker): Promise<void> {
  try {
    if (msg.type === 'port') {
      peer?.close();
      peer = msg.port;
      peer.onmessage = fromPeer;
    } else if (msg.type === 'inputs') {
      engine.setInputs(msg.traces, msg.keep);
      while (!engine.incomplete && deferred.length) void handle(deferred.shift()!);
    } else if ((msg.type === 'analyse' || msg.type === 'fit') && engine.incomplete) {
      deferred.push(msg);
      // Traces come through the port within moments of the page naming them; if not, the page is told and sends them itself.
      setTimeout(() => {
        const at = deferred.indexOf(msg);
        if (at < 0) return;
        deferred.splice(at, 1);
        post({ type: 'failed', jobId: msg.jobId, message: 'A loaded trace did not reach the computation worker.', missing: true });
      }, 5000);
    } else if (msg.type === 'analyse') {
      const t0 = Date.now();
      const jobId = msg.jobId;
      const outcome = await runStages(engine.stages(msg.request), (update) => {
        // Cached outputs must stay usable here, so send copies and transfer those; the peak table goes as columns.
        const { peaks, ...rest } = update.patch;
        const patch = cloneResultForTransfer(rest);
        const peakColumns = peaks ? toColumns(peaks as unknown as Record<string, unknown>[]) : undefined;
        post({ type: 'stage', jobId, update: { ...update, patch }, peakColumns }, [...transferablesOf(patch), ...(peakColumns ? columnBuffers(peakColumns) : [])]);
      }, () => !msg.side && latestJob !== jobId);
      post(outcome === 'done' ? { type: 'done', jobId, ms: Date.now() - t0 } : { type: 'cancelled', jobId });
    } else if (msg.type === 'fit') {
      // Issue 18: a fit's arrays are its own (not cached), so they are transferred as they are.
      const outcome = engine.fit(msg.request);
      post({ type: 'fitted', jobId: msg.jobId, outcome }, transferablesOf(outcome));
    } else if (msg.type === 'load') {
      let last = 0;
      const result = await engine.load(msg.bytes, msg.fileName, msg.options, (fraction) => {
        const now = Date.now();
        if (now - last > 80) { last = now; post({ type: 'progress', jobId: msg.jobId, fraction }); }
      });
      // The computation worker gets its own copy straight from here, and the page the originals, handed over
      // (copying 50 MB on the page's thread took 0.25-0.4 s there).
      if (result.ok && msg.share && peer) {
        const copies = result.traces.map((t) => ({ ...t, x: t.x.slice(), y: t.y.slice() }));
        const through: ThroughPort = { type: 'traces', traces: copies };
        peer.postMessage(through, copies.flatMap((t) => [t.x.buffer, t.y.buffer]));
      }
      post({ type: 'loaded', jobId: msg.jobId, result, shared: !!(result.ok && msg.share && peer) }, transferablesOf(result));
    }
  } catch (e) {
    const jobId = msg.type === 'inputs' || msg.type === 'port' ? -1 : msg.jobId;
    post({ type: 'failed', jobId, message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) });
  }
}
