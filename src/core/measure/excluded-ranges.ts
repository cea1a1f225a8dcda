/**
 * Ranges left out of peak finding (issue 17): a solvent front, an injection
 * artefact. The trace is not changed; a peak found with its apex inside an
 * excluded range is simply not listed. Peaks added by hand are the user's
 * own decision and are kept wherever they are.
 */
import type { Peak } from './peak-types.ts';

/** An excluded x-range, [from, to] in x-units with from ≤ to. */
export type ExcludedRange = readonly [number, number];

/** True when x lies in one of the ranges (ends included). */
export function inExcludedRange(x: number, ranges: readonly ExcludedRange[]): boolean {
  for (const [a, b] of ranges) if (x >= Math.min(a, b) && x <= Math.max(a, b)) return true;
  return false;
}

/** The detected peaks whose apex lies outside every excluded range (a new array; the input is not changed). */
export function withoutExcluded(peaks: readonly Peak[], ranges: readonly ExcludedRange[] | undefined): Peak[] {
  if (!ranges || ranges.length === 0) return peaks.slice();
  return peaks.filter((p) => p.origin === 'added-by-user' || !inExcludedRange(p.x, ranges));
}

/** One sentence for exports: which ranges were left out of peak finding, or null when none were. */
export function excludedRangesSentence(ranges: readonly ExcludedRange[] | undefined): string | null {
  if (!ranges || ranges.length === 0) return null;
  const list = ranges.map(([a, b]) => `${Math.min(a, b)} to ${Math.max(a, b)}`).join('; ');
  return `Excluded from peak finding (x-units; the trace itself is unchanged, peaks with their apex inside are not listed, peaks added by hand are kept): ${list}.`;
}

/** Merge a new range into a list: overlapping or touching ranges become one, sorted by start. */
export function addExcludedRange(ranges: readonly ExcludedRange[] | undefined, r: ExcludedRange): [number, number][] {
  const all = [...(ranges ?? []), r].map(([a, b]) => [Math.min(a, b), Math.max(a, b)] as [number, number]).sort((p, q) => p[0] - q[0]);
  const out: [number, number][] = [];
  for (const [a, b] of all) {
    const last = out[out.length - 1];
    if (last && a <= last[1]) last[1] = Math.max(last[1], b);
    else out.push([a, b]);
  }
  return out;
}
