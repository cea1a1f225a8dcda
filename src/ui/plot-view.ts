/**
 * What the trace plot shows in y when the user zooms in x (issue 17): the
 * smallest and largest y of the drawn series inside the x-range, with a
 * margin, so a shoulder fills the plot instead of staying a bump.
 */
export interface DrawnSeries {
  x?: ArrayLike<number>;
  y?: ArrayLike<number>;
  yaxis?: string;
  visible?: boolean | 'legendonly';
}

/** y-range of the series on `axis` between from and to (x-units), padded by `pad` of the span; null when nothing is in view. */
export function visibleYRange(series: readonly DrawnSeries[], from: number, to: number, axis = 'y', pad = 0.06): [number, number] | null {
  let lo = Infinity, hi = -Infinity;
  for (const s of series) {
    if ((s.yaxis ?? 'y') !== axis || s.visible === false || s.visible === 'legendonly' || !s.x || !s.y) continue;
    const n = Math.min(s.x.length, s.y.length);
    for (let i = 0; i < n; i++) {
      const xv = s.x[i], yv = s.y[i];
      if (xv < from || xv > to || !Number.isFinite(yv)) continue;
      if (yv < lo) lo = yv;
      if (yv > hi) hi = yv;
    }
  }
  if (!(hi >= lo)) return null;
  const span = hi - lo || Math.abs(hi) * 0.1 || 1;
  return [lo - span * pad, hi + span * pad];
}
