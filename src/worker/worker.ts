/// <reference lib="webworker" />
/**
 * Worker entry: receives traces once, then analysis and load jobs, and
 * posts results back with their arrays transferred.
 */
import type { FromWorker, ToWorker } from './protocol.ts';
import { Engine, transferablesOf } from './engine.ts';
import { cloneResultForTransfer } from './clone.ts';

const engine = new Engine();
const scope = self as unknown as DedicatedWorkerGlobalScope;

function post(msg: FromWorker, transfer: Transferable[] = []) {
  scope.postMessage(msg, transfer);
}

scope.onmessage = async (ev: MessageEvent<ToWorker>) => {
  const msg = ev.data;
  try {
    if (msg.type === 'inputs') {
      engine.setInputs(msg.traces);
    } else if (msg.type === 'analyse') {
      // Cached outputs must stay usable here, so send copies and transfer those.
      const result = cloneResultForTransfer(engine.analyse(msg.request));
      post({ type: 'result', jobId: msg.jobId, result }, transferablesOf(result));
    } else if (msg.type === 'load') {
      let last = 0;
      const result = await engine.load(msg.bytes, msg.fileName, msg.options, (fraction) => {
        const now = Date.now();
        if (now - last > 80) { last = now; post({ type: 'progress', jobId: msg.jobId, fraction }); }
      });
      post({ type: 'loaded', jobId: msg.jobId, result });
    }
  } catch (e) {
    const jobId = msg.type === 'inputs' ? -1 : msg.jobId;
    post({ type: 'failed', jobId, message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) });
  }
};
