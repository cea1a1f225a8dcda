/**
 * Runs a staged analysis one stage per task: after each stage's update is
 * handed on, it yields to the event loop with a macrotask (a timer), so a
 * newer request that arrived meanwhile is seen, and stops before the next
 * stage when `stale()` says a newer request has come (a drag then never
 * waits for more than one stage of stale work).
 */
import type { StageUpdate } from '../core/analysis/index.ts';

/** One macrotask: messages already queued for this thread run before it. */
export function macrotask(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}

export async function runStages(stages: Generator<StageUpdate, void, void>, post: (u: StageUpdate) => void, stale: () => boolean): Promise<'done' | 'cancelled'> {
  try {
    for (;;) {
      if (stale()) return 'cancelled';
      const next = stages.next();
      if (next.done) return 'done';
      post(next.value);
      await macrotask();
    }
  } finally {
    stages.return();
  }
}
