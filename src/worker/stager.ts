/**
 * Runs a staged analysis: after each stage's update is handed on, and at the
 * pauses inside a long stage (peak detection yields `undefined` every few
 * milliseconds, core/analysis/pause.ts) once {@link PAUSE_AFTER_MS} of work
 * has passed since the last yield, it yields to the event loop with a
 * macrotask, so a newer request that arrived meanwhile is seen,
 * and stops when `stale()` says a newer request has come. A drag thus never
 * waits for more than about that long of stale work, even inside one stage.
 */
import type { StageUpdate } from '../core/analysis/index.ts';

/** Work (ms) between two yields to the event loop inside a stage. */
export const PAUSE_AFTER_MS = 30;

/**
 * One macrotask: messages already queued for this thread run before it. A message through a fresh
 * MessageChannel where there is one (the posted-message task source, in order behind the page's messages,
 * and not slowed to 4 ms as nested timers are, nor sleeping the thread); a timer otherwise.
 */
export function macrotask(): Promise<void> {
  if (typeof MessageChannel === 'undefined') return new Promise((resolve) => setTimeout(resolve, 0));
  return new Promise((resolve) => {
    const ch = new MessageChannel();
    ch.port1.onmessage = () => { ch.port1.close(); resolve(); };
    ch.port2.postMessage(null);
  });
}

export async function runStages(stages: Generator<StageUpdate | undefined, void, void>, post: (u: StageUpdate) => void, stale: () => boolean): Promise<'done' | 'cancelled'> {
  try {
    let since = performance.now();
    for (;;) {
      if (stale()) return 'cancelled';
      const next = stages.next();
      if (next.done) return 'done';
      if (next.value === undefined) {
        // A pause inside a stage: let queued messages in only when enough work went by.
        if (performance.now() - since < PAUSE_AFTER_MS) continue;
      } else {
        post(next.value);
      }
      await macrotask();
      since = performance.now();
    }
  } finally {
    stages.return();
  }
}
