/// <reference lib="webworker" />
/**
 * The detection partner (issue 16): a second computation thread, started by
 * the computation worker, that measures the later part of a long peak
 * detection's candidates (45 %) while the worker measures the rest
 * (core/measure/peak-table.ts, `measureShareStepwise`). It keeps the last
 * few x grids it was sent, so a slider drag sends only the new y.
 * A cancel is seen at the pauses of the measuring loop.
 */
import { measureShareStepwise } from '../core/measure/peak-table.ts';
import { macrotask, PAUSE_AFTER_MS } from './stager.ts';
import { PARTNER_KEEPS_X, type FromPartner, type ToPartner } from './detect-partner-client.ts';

const scope = self as unknown as DedicatedWorkerGlobalScope;
/** x grids by id, oldest first (the client mirrors this list, so it knows which it need not send again). */
const grids = new Map<number, Float64Array>();
const cancelled = new Set<number>();

function post(msg: FromPartner): void {
  scope.postMessage(msg);
}

scope.onmessage = (ev: MessageEvent<ToPartner>) => {
  const msg = ev.data;
  if (msg.type === 'cancel') { cancelled.add(msg.job); return; }
  if (msg.x) {
    grids.set(msg.xId, msg.x);
    while (grids.size > PARTNER_KEEPS_X) grids.delete(grids.keys().next().value as number);
  }
  void measure(msg);
};

async function measure(msg: Extract<ToPartner, { type: 'share' }>): Promise<void> {
  const { job } = msg;
  try {
    const x = grids.get(msg.xId);
    if (!x) throw new Error(`the x grid ${msg.xId} was not sent`);
    const steps = measureShareStepwise({ x, y: msg.y, options: msg.options, index: msg.index, halfWidth: msg.halfWidth });
    let since = performance.now();
    for (;;) {
      if (cancelled.has(job)) { post({ type: 'cancelled', job }); return; }
      const r = steps.next();
      if (r.done) { post({ type: 'kept', job, at: r.value.at, measures: r.value.measures }); return; }
      if (performance.now() - since >= PAUSE_AFTER_MS) { await macrotask(); since = performance.now(); }
    }
  } catch (e) {
    post({ type: 'failed', job, message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) });
  } finally {
    cancelled.delete(job);
  }
}
