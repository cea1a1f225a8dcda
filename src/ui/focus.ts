/**
 * Issue 17, the self-check in two clicks: which ledger feature a click means,
 * the stretch of trace to show around it, and a one-word verdict per column
 * against the raw trace.
 */
import type { LedgerCell, LedgerRow } from '../core/measure/loss-matching.ts';
import { HEIGHT_LOSS_TOLERANCE } from '../core/measure/residual-tests.ts';

export type Verdict = 'reference' | 'kept' | 'weakened' | 'lost' | 'appears only after processing' | 'not found';

/**
 * The verdict of one column against the raw trace (column 0): lost when the
 * raw trace has the feature and this column does not; weakened when its
 * standing falls below the raw one (a limit crossed) or it keeps less than
 * 1 − {@link HEIGHT_LOSS_TOLERANCE} of the raw height (the same tolerance the
 * residual verdict and the export confirmation use); appears only after
 * processing when the raw trace does not have it; otherwise kept.
 */
export function columnVerdict(row: LedgerRow, col: number): Verdict {
  if (col === 0) return 'reference';
  const raw = row.cells[0], c = row.cells[col];
  if (!raw.found) return c.found ? 'appears only after processing' : 'not found';
  if (!c.found) return 'lost';
  if (c.crossed === 'down') return 'weakened';
  if (c.heightKept !== null && c.heightKept < 100 * (1 - HEIGHT_LOSS_TOLERANCE)) return 'weakened';
  return 'kept';
}

/** Change of a value against the raw column's, in %; null when either is missing or the raw one is 0. */
export function againstRaw(raw: number | null, v: number | null): number | null {
  if (raw === null || v === null || raw === 0 || !Number.isFinite(raw) || !Number.isFinite(v)) return null;
  return (100 * (v - raw)) / Math.abs(raw);
}

/**
 * The ledger row a click at x means: the nearest feature whose position is
 * within its matching tolerance or one half-height width of x (whichever is
 * wider); null when none is that close.
 */
export function rowAt(rows: readonly LedgerRow[], x: number): LedgerRow | null {
  let best: LedgerRow | null = null, bestD = Infinity;
  for (const r of rows) {
    const widths = r.cells.map((c) => c.fwhm ?? 0);
    const reach = Math.max(r.tolerance, ...widths);
    const d = Math.abs(r.position - x);
    if (d <= reach && d < bestD) { best = r; bestD = d; }
  }
  return best;
}

/** The x-window shown around a feature: `widths` half-height widths either side (the widest column's), never narrower than 10 samples. */
export function focusWindow(row: LedgerRow, dx: number, widths = 4): [number, number] {
  const w = Math.max(...row.cells.map((c: LedgerCell) => c.fwhm ?? 0), 0);
  const half = Math.max(widths * w, 10 * Math.abs(dx));
  return [row.position - half, row.position + half];
}

/** Minimum and maximum of y over x in [from, to] across several series (one shared y scale); null when no point is inside. */
export function sharedYRange(series: readonly { x: ArrayLike<number>; y: ArrayLike<number> }[], from: number, to: number): [number, number] | null {
  let lo = Infinity, hi = -Infinity;
  for (const s of series) {
    // x is ascending (a trace's invariant): start at the first point inside by bisection.
    let a = 0, b = s.x.length;
    while (a < b) { const m = (a + b) >>> 1; if (s.x[m] < from) a = m + 1; else b = m; }
    for (let i = a; i < s.x.length; i++) {
      const xv = s.x[i];
      if (xv > to) break;
      const v = s.y[i];
      if (!Number.isFinite(v)) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  if (lo > hi) return null;
  if (lo === hi) { const pad = Math.abs(lo) * 0.05 || 1; return [lo - pad, hi + pad]; }
  return [lo, hi];
}
