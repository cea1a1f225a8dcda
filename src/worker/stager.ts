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
import { isShareOffer, type Pause } from '../core/analysis/pause.ts';
import type { CandidateShare, SharedJob } from '../core/measure/peak-table.ts';

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

/** Starts a share of detection work on another thread, or answers undefined (then the stage does it itself). */
export type Sharer = (share: CandidateShare) => SharedJob | undefined;

/**
 * Run the stages. Offers of work (pause.ts) are answered by `sharer` (none: the stage does the work itself);
 * while a stage waits for such a job, stale() is asked every {@link PAUSE_AFTER_MS}, so a newer request
 * stops the wait too (closing the generator cancels the job).
 */
export async function runStages(stages: Generator<StageUpdate | Pause, void, SharedJob | undefined>, post: (u: StageUpdate) => void, stale: () => boolean, sharer?: Sharer): Promise<'done' | 'cancelled'> {
  try {
    let since = performance.now();
    let answer: SharedJob | undefined;
    for (;;) {
      if (stale()) return 'cancelled';
      const next = stages.next(answer);
      answer = undefined;
      if (next.done) return 'done';
      const v = next.value;
      if (v === undefined) {
        // A pause inside a stage: let queued messages in only when enough work went by.
        if (performance.now() - since < PAUSE_AFTER_MS) continue;
      } else if (isShareOffer(v)) {
        answer = sharer?.(v.share);
        continue;
      } else if (v instanceof Promise) {
        if (await settledOrStale(v, stale)) return 'cancelled';
        since = performance.now();
        continue;
      } else {
        post(v);
      }
      await macrotask();
      since = performance.now();
    }
  } finally {
    stages.return();
  }
}

/** Wait for p; true as soon as stale() says a newer request came (asked every PAUSE_AFTER_MS meanwhile). */
async function settledOrStale(p: Promise<void>, stale: () => boolean): Promise<boolean> {
  let settled = false;
  void p.then(() => { settled = true; }, () => { settled = true; });
  while (!settled) {
    if (stale()) return true;
    await Promise.race([p.catch(() => undefined), new Promise<void>((resolve) => setTimeout(resolve, PAUSE_AFTER_MS))]);
  }
  return false;
}
