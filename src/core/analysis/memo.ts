/**
 * Per-trace memos: what the edit of the current stack cannot change is
 * worked out once and kept, keyed by the trace's id and exactly the settings
 * it depends on (not by array identity, which a trace sent again defeats).
 *
 * A memo lives as long as the set of traces it was filled from: the worker's
 * engine clears it when the inputs change, and `analyse()` called without one
 * uses a fresh memo for that call alone. Each entry also keeps the y array it
 * was made from and is dropped when the trace under the id is another array,
 * so a reused id can never return another trace's figures.
 */
import type { Measured } from './stages/measure.ts';
import type { AlternativeOutcome } from './result.ts';
import type { Stepwise } from './pause.ts';

interface Entry<T> { y: Float64Array; value: T }

/** Most settings kept per trace and kind (a user trying thresholds back and forth). */
const PER_TRACE = 8;

class KeyedMemo<T> {
  private byTrace = new Map<string, Map<string, Entry<T>>>();

  get(traceId: string, y: Float64Array, key: string, make: () => T): T {
    const hit = this.find(traceId, y, key);
    if (hit) return hit.value;
    return this.keep(traceId, y, key, make());
  }

  /** {@link get} for a value made in steps (analysis/pause.ts); nothing is kept when the steps are dropped half-way. */
  *getStepwise(traceId: string, y: Float64Array, key: string, make: () => Stepwise<T>): Stepwise<T> {
    const hit = this.find(traceId, y, key);
    if (hit) return hit.value;
    return this.keep(traceId, y, key, yield* make());
  }

  private find(traceId: string, y: Float64Array, key: string): Entry<T> | undefined {
    const hit = this.byTrace.get(traceId)?.get(key);
    return hit && hit.y === y ? hit : undefined;
  }

  private keep(traceId: string, y: Float64Array, key: string, value: T): T {
    let m = this.byTrace.get(traceId);
    if (!m) { m = new Map(); this.byTrace.set(traceId, m); }
    if (!m.has(key) && m.size >= PER_TRACE) m.delete(m.keys().next().value as string);
    m.set(key, { y, value });
    return value;
  }

  clear(): void { this.byTrace.clear(); }
}

/** One alternative stack measured: the outcome before the loss check's verdict, and its peaks for the ledger. */
export interface AlternativeMeasured {
  outcome: AlternativeOutcome;
  measured: Measured;
}

export class AnalysisMemo {
  /** The raw trace measured with the user's settings (no hand decisions): the loss check's reference column. */
  readonly reference = new KeyedMemo<Measured>();
  /** Each alternative stack run and measured: it does not change while the current stack is edited. */
  readonly alternatives = new KeyedMemo<AlternativeMeasured>();

  clear(): void {
    this.reference.clear();
    this.alternatives.clear();
  }
}
