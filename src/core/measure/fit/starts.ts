/**
 * Starting peaks for a region fit from the peak table (issue 18); the page
 * and the command line both start their fits from here.
 */
import type { Peak } from '../peak-types.ts';
import { MAX_PEAKS, type PeakStart } from './region.ts';

/** Starting peaks: the table's rows (not removed) with their apex inside the region, largest first, at most 4. */
export function startsInRegion(peaks: readonly Peak[], from: number, to: number): PeakStart[] {
  return peaks
    .filter((p) => !p.removedByUser && p.x >= from && p.x <= to && p.height > 0 && p.fwhm > 0)
    .sort((a, b) => b.height - a.height)
    .slice(0, MAX_PEAKS)
    .map((p) => ({ position: p.x, height: p.height, fwhm: p.fwhm }));
}
