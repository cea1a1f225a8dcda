// A page-side bridge over a stand-in worker, for tests of what the page does with the worker's messages
// (ledger-columns, transfer-columns, series, and the page's ui/plot-exact): what the bridge posts is kept in
// `posted`; `answer` hands it a message as if the worker had sent it.
import { workerBackend, type ComputeBackend } from '../../src/worker/bridge.ts';
import type { ToWorker } from '../../src/worker/api.ts';

export interface FakeWorker {
  backend: ComputeBackend;
  /** Every message the bridge posted, in order. */
  posted: ToWorker[];
  /** Hand the bridge one message as the worker would (structured-cloned, as a real postMessage copies it; tests may send a partial message). */
  answer(msg: object): void;
}

export function fakeWorker(): FakeWorker {
  const posted: ToWorker[] = [];
  let worker: { onmessage: ((ev: MessageEvent) => void) | null } | null = null;
  const backend = workerBackend(() => {
    worker = { onmessage: null, postMessage: (m: ToWorker) => posted.push(m), terminate: () => undefined, onerror: null, onmessageerror: null } as unknown as typeof worker;
    return worker as unknown as Worker;
  });
  return {
    backend,
    posted,
    answer(msg) {
      if (!worker?.onmessage) throw new Error('The bridge has made no worker yet.');
      worker.onmessage({ data: structuredClone(msg) } as MessageEvent);
    },
  };
}
