/**
 * Reading the store the same way everywhere. The store may still hold the
 * result of a sample the user has just left (a new analysis is on its way):
 * every panel asks here, so none shows figures of another trace.
 */
import type { AnalyseResult } from '../core/analysis/index.ts';
import type { AppState } from './store.ts';

/** The worker's result for the sample now chosen, or null while there is none (or it belongs to another trace). */
export function currentResult(s: Pick<AppState, 'result' | 'sampleId'>): AnalyseResult | null {
  return s.result && s.result.sampleId === s.sampleId ? s.result : null;
}

/** Some fields of {@link currentResult}, picked by `pick` (for shallow-compared selectors), or null. */
export function withCurrent<T>(s: Pick<AppState, 'result' | 'sampleId'>, pick: (r: AnalyseResult) => T): T | null {
  const r = currentResult(s);
  return r ? pick(r) : null;
}
