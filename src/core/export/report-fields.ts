/**
 * Issue 17: what the user writes beside the numbers. The report's fields
 * (analyst, sample, instrument, run), filled in the page and kept with the
 * session, and the short reason given for each hand change (a peak added
 * or removed, a start or end dragged), written into every export.
 */
import type { Peak } from '../measure/peak-types.ts';

/** Fields a report can carry about the run; each may be empty. */
export interface ReportFields {
  analyst: string;
  sample: string;
  instrument: string;
  run: string;
}

export const EMPTY_REPORT_FIELDS: ReportFields = { analyst: '', sample: '', instrument: '', run: '' };

/** Labels, in the order the page and the report show them. */
export const REPORT_FIELD_LABELS: readonly (readonly [keyof ReportFields, string])[] = [
  ['analyst', 'Analyst'],
  ['sample', 'Sample'],
  ['instrument', 'Instrument'],
  ['run', 'Run'],
];

/** Most characters kept in one field or reason (longer text is cut; a report field is a name or a code). */
export const FIELD_MAX_CHARS = 200;

/** Fields read back from a saved session or file: strings only, cut to length, anything else empty. */
export function cleanReportFields(v: unknown): ReportFields {
  const o = (v && typeof v === 'object' ? v : {}) as Record<string, unknown>;
  const one = (k: keyof ReportFields) => (typeof o[k] === 'string' ? (o[k] as string).slice(0, FIELD_MAX_CHARS) : '');
  return { analyst: one('analyst'), sample: one('sample'), instrument: one('instrument'), run: one('run') };
}

/** The filled fields as label/value pairs (empty ones are left out). */
export function reportFieldPairs(fields: ReportFields | null | undefined): [string, string][] {
  if (!fields) return [];
  return REPORT_FIELD_LABELS.filter(([k]) => fields[k].trim() !== '').map(([k, label]) => [label, fields[k].trim()]);
}

/** Which hand change a reason belongs to. */
export type HandChangeKind = 'added' | 'removed' | 'bounds';

/** A short reason for one hand change, at the x of that decision (the same x the decision holds). */
export interface HandReason {
  kind: HandChangeKind;
  x: number;
  reason: string;
}

/** Reasons read back from a saved session or file: well-formed entries only. */
export function cleanHandReasons(v: unknown): HandReason[] {
  if (!Array.isArray(v)) return [];
  const out: HandReason[] = [];
  for (const r of v) {
    if (!r || typeof r !== 'object') continue;
    const { kind, x, reason } = r as Record<string, unknown>;
    if ((kind === 'added' || kind === 'removed' || kind === 'bounds') && typeof x === 'number' && Number.isFinite(x) && typeof reason === 'string') {
      out.push({ kind, x, reason: reason.slice(0, FIELD_MAX_CHARS) });
    }
  }
  return out;
}

/** The hand change a peak row shows, or null for a detected peak left alone. */
export function handChangeOf(p: Peak): HandChangeKind | null {
  if (p.removedByUser) return 'removed';
  if (p.origin === 'added-by-user') return 'added';
  if (p.boundsByUser) return 'bounds';
  return null;
}

/**
 * The reason given for a peak's hand change: the last reason of that kind
 * within max(½ FWHM, `minTol`) of its apex (the tolerance the decisions
 * themselves are matched with), or '' when none was given.
 */
export function reasonFor(p: Peak, reasons: readonly HandReason[] | null | undefined, minTol = 0): string {
  const kind = handChangeOf(p);
  if (!kind || !reasons?.length) return '';
  const tol = Math.max(Number.isFinite(p.fwhm) ? p.fwhm / 2 : 0, minTol);
  let best: HandReason | null = null;
  for (const r of reasons) if (r.kind === kind && Math.abs(r.x - p.x) <= tol && (!best || Math.abs(r.x - p.x) <= Math.abs(best.x - p.x))) best = r;
  return best?.reason.trim() ?? '';
}
