import type { Peak } from '../core/measure/peak-types.ts';

/**
 * Issue 17 (keys N and P): the next or previous peak by position from the
 * selected one, leaving out peaks removed by hand; from nothing selected, the
 * first (or last). Null when there is no other peak that way.
 */
export function nextPeak(peaks: readonly Peak[], selected: number | null, dir: 1 | -1): Peak | null {
  const live = peaks.filter((p) => !p.removedByUser).slice().sort((a, b) => a.x - b.x);
  if (!live.length) return null;
  if (selected === null) return dir === 1 ? live[0] : live[live.length - 1];
  if (dir === 1) return live.find((p) => p.x > selected + 1e-12) ?? null;
  for (let i = live.length - 1; i >= 0; i--) if (live[i].x < selected - 1e-12) return live[i];
  return null;
}
