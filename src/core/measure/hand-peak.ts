/**
 * Where a peak added by hand goes (issue 17). A click lands where the
 * mouse was, rarely on the top; a peak measured at a point on a slope or a
 * shoulder that is no top has no height of its own (a click on a shoulder
 * gave height 2e-16 and width 0). So the click is moved to the nearest
 * local maximum (minimum for dips) of the trace the peaks are measured on,
 * within {@link SNAP_POINTS} samples either side, or refused with the
 * reason. Pure: returns a value, never throws for user input.
 */

/** How far a click may be moved to reach a top: this many samples either side (our own choice, stated on the page). */
export const SNAP_POINTS = 10;

export type HandPeakPlace =
  | { ok: true; index: number; x: number; moved: boolean }
  | { ok: false; reason: string };

const fmt = (v: number) => String(Number(v.toPrecision(6)));

/**
 * The apex a click at `at` (x-units) snaps to on (x, y), ascending x.
 * `taken` are apex x of peaks already in the table: a click that snaps to
 * one of them is refused, since that peak is there already.
 */
export function snapHandPeak(x: ArrayLike<number>, y: ArrayLike<number>, at: number, opts: { negative?: boolean; taken?: readonly number[]; xUnit?: string } = {}): HandPeakPlace {
  const n = Math.min(x.length, y.length);
  const unit = opts.xUnit ? ` ${opts.xUnit}` : '';
  if (n < 3 || !Number.isFinite(at)) return { ok: false, reason: 'The trace is too short to hold a peak there.' };
  if (at < x[0] || at > x[n - 1]) return { ok: false, reason: `x = ${fmt(at)}${unit} is outside the trace (${fmt(x[0])} to ${fmt(x[n - 1])}${unit}).` };
  let lo = 0, hi = n;
  while (lo < hi) { const mid = (lo + hi) >>> 1; if (x[mid] < at) lo = mid + 1; else hi = mid; }
  let i = Math.min(lo, n - 1);
  if (i > 0 && Math.abs(x[i - 1] - at) <= Math.abs(x[i] - at)) i -= 1;
  const v = (k: number) => (opts.negative ? -y[k] : y[k]);
  // A top: not lower than either neighbour and higher than at least one (a flat top counts once, at its first sample).
  const isTop = (k: number) => k > 0 && k < n - 1 && v(k) >= v(k - 1) && v(k) >= v(k + 1) && (v(k) > v(k - 1) || v(k) > v(k + 1)) && !(v(k) === v(k - 1));
  let best = -1;
  for (let d = 0; d <= SNAP_POINTS && best < 0; d++) {
    const cands = [i - d, i + d].filter((k, j) => (d > 0 || j === 0) && isTop(k));
    if (cands.length === 2) best = v(cands[0]) >= v(cands[1]) ? cands[0] : cands[1];
    else if (cands.length === 1) best = cands[0];
  }
  if (best < 0) {
    return {
      ok: false,
      reason: `No top within ${SNAP_POINTS} points of x = ${fmt(x[i])}${unit}: the trace only ${v(Math.min(i + 1, n - 1)) >= v(Math.max(i - 1, 0)) ? 'rises' : 'falls'} there (a slope or a shoulder), so a peak placed there would have no height of its own. Click nearer a top; a shoulder is measured by fitting the region.`,
    };
  }
  const tol = Math.max(Math.abs(x[Math.min(best + 1, n - 1)] - x[Math.max(best - 1, 0)]) / 2, 0);
  const dup = (opts.taken ?? []).find((t) => Math.abs(t - x[best]) <= tol);
  if (dup !== undefined) return { ok: false, reason: `The nearest top, at x = ${fmt(x[best])}${unit}, is already in the peak table.` };
  return { ok: true, index: best, x: x[best], moved: best !== i };
}
