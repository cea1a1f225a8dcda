/**
 * Fits and the loss check (issue 18): the ledger row of a feature inside a
 * fitted region says whether each processing still supports the fit's peak
 * count, e.g. "2 peaks supported by the fit on raw, not after 7-point
 * average (1)". The page's ledger and the report's loss section both use it.
 */
import type { FitJobResult } from './job.ts';

/** A kept fit as the ledger needs it. */
export interface LedgerFit {
  result: FitJobResult;
  /** True when a fit of the processed trace was made with an earlier step stack. */
  outOfDate?: boolean;
}

export interface LedgerFitNote {
  /** 1-based number of the fit among those given (as the exports number them). */
  fitNumber: number;
  /** Counts per version (raw first), for a compact cell. */
  counts: { label: string; count: number | null }[];
  /** True when some version supports fewer peaks than the raw trace. */
  fewer: boolean;
  /** The sentence for the row (region, shape and the processing check's summary). */
  text: string;
  /** The same in a few words for a table cell, e.g. "Fit 1: 2 peaks supported by the fit on raw, not after 7-point average (1)." */
  brief: string;
}

/** A region end as marked by a drag (5.40312…) in 5 significant digits. */
const short = (v: number) => String(Number(v.toPrecision(5)));

/**
 * The note for a ledger row at `position` (x-units): from the newest fit
 * whose region holds the position and that compared the versions; null
 * when no such fit exists.
 */
export function ledgerFitNote(position: number, fits: readonly LedgerFit[]): LedgerFitNote | null {
  for (let i = fits.length - 1; i >= 0; i--) {
    const r = fits[i].result;
    if (!r.processing || !(position >= r.settings.from && position <= r.settings.to)) continue;
    const stale = fits[i].outOfDate ? ' (made with an earlier step stack)' : '';
    const k = r.processing.referenceCount;
    const brief = r.processing.fewer.length || k === null
      ? `Fit ${i + 1}: ${r.processing.summary}${stale}`
      : `Fit ${i + 1}: ${k} peak${k === 1 ? '' : 's'} on ${r.processing.reference}, no fewer after any processing.${stale}`;
    return {
      brief,
      fitNumber: i + 1,
      counts: r.processing.rows.map((row) => ({ label: row.label, count: row.count })),
      fewer: r.processing.fewer.length > 0,
      text: `Fit ${i + 1} (${short(r.settings.from)}–${short(r.settings.to)}, ${r.settings.shape}): ${r.processing.summary}${stale}`,
    };
  }
  return null;
}

/** One line per ledger row inside a fitted region ("at 6.35: Fit 1 (…): …"), for the report's loss section. */
export function ledgerFitLines(positions: readonly number[], fits: readonly LedgerFit[]): string[] {
  const out: string[] = [];
  for (const p of positions) {
    const note = ledgerFitNote(p, fits);
    if (note) out.push(`Feature at ${Number(p.toPrecision(6))}: ${note.text}`);
  }
  return out;
}
