/**
 * The fit panel's service: builds a fit request from the store and sends it
 * to the computation worker as its own job (issue 18). Holds no state.
 */
import { startsInRegion } from '../../core/measure/fit/starts.ts';
import type { Peak } from '../../core/measure/peak-types.ts';
import { useApp } from '../../state/store.ts';
import type { FitRequest } from '../../worker/fit-job.ts';
import { getBackend } from '../../state/service.ts';
import { currentResult } from '../../state/selectors.ts';

/** The region a fit would use: the marked range, else the zoomed x-range; null when neither is set. */
export function fitRegion(): [number, number] | null {
  const s = useApp.getState();
  return s.markedRange ?? s.xRange ?? null;
}

/** The region around the selected peak and its overlapping neighbours: their bounds plus one half-height width each side. */
export function regionAroundPeak(peaks: readonly Peak[], x: number): [number, number] | null {
  const p = peaks.find((q) => Math.abs(q.x - x) < 1e-12);
  if (!p) return null;
  let from = p.start, to = p.end;
  // Neighbours sharing a valley belong to the same overlap.
  for (const q of peaks) if (q !== p && q.end >= from && q.start <= to && !q.removedByUser) { from = Math.min(from, q.start); to = Math.max(to, q.end); }
  return [from - p.fwhm, to + p.fwhm];
}

/** Fit the region now; the result is kept in the store (or the problem shown). */
export async function requestFit(): Promise<void> {
  const s = useApp.getState();
  const region = fitRegion();
  if (!s.sampleId) return;
  if (!region) { s.setFitError('Mark a region first: press “Mark a range” and drag across the plot, zoom to the region, or use the selected peak.'); return; }
  const blank = s.traces.find((t) => s.roles[t.id] === 'blank');
  const peaks = currentResult(s)?.peaks ?? [];
  const request: FitRequest = {
    sampleId: s.sampleId,
    blankId: blank?.id,
    scanIds: s.traces.filter((t) => s.roles[t.id] === 'scan').map((t) => t.id),
    recipe: s.recipe,
    alternatives: s.alternatives,
    settings: { ...s.fitChoices, from: region[0], to: region[1] },
    starts: startsInRegion(peaks, region[0], region[1]),
  };
  s.setFitBusy(true);
  s.setFitError(null);
  try {
    const outcome = await getBackend().fit(request);
    const now = useApp.getState();
    if (!outcome.ok) now.setFitError(outcome.message);
    else now.addFit({ sampleId: request.sampleId, madeAt: new Date().toISOString(), stackKey: JSON.stringify(request.recipe.steps), result: outcome.result });
  } catch (e) {
    useApp.getState().setFitError(`The fit stopped: ${e instanceof Error ? e.message : String(e)}`);
  } finally {
    useApp.getState().setFitBusy(false);
  }
}
