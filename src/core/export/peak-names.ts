/**
 * Issue 21: the names the method's named-peak table gives a trace's peaks,
 * in the shapes the exports need (a column for the peak table, comment
 * lines, the summary's `name`). Pure; a method without a named-peak table
 * gives no naming and the exports stay as they were.
 */
import { nameTracePeaks, type PeakNaming } from '../calibration/named-peaks.ts';
import type { Peak } from '../measure/peak-types.ts';
import { analysisOf, type Recipe } from '../method.ts';

/** The naming of these peaks by the method's named-peak table, or null when the method has none (or it is empty). */
export function peakNamingOf(method: Recipe | undefined, peaks: readonly Peak[]): PeakNaming | null {
  const table = method ? analysisOf(method).namedPeaks : undefined;
  if (!table || table.peaks.length === 0) return null;
  return nameTracePeaks(table, peaks);
}

/** The peak table's rows with a "name" column after "peak #" (rows[0] is the header); unchanged without a naming. */
export function withNameColumn(rows: (string | number)[][], naming: PeakNaming | null): (string | number)[][] {
  if (!naming) return rows;
  return rows.map((r, i) => [r[0], i === 0 ? 'name' : naming.names[i - 1] ?? '', ...r.slice(1)]);
}

/** Comment / report lines: the matching rule, each named peak found or missing. */
export function namedPeakLines(naming: PeakNaming | null, xUnit: string): string[] {
  if (!naming) return [];
  const u = xUnit ? ` ${xUnit}` : '';
  const lines = [`Named peaks: ${naming.ruleInWords}`];
  for (const m of naming.matches) {
    lines.push(m.peakIndex === null
      ? `Named peak "${m.name}" (expected ${m.expected} ± ${m.window}${u}): missing. ${m.note ?? ''}`.trim()
      : `Named peak "${m.name}" (expected ${m.expected} ± ${m.window}${u}): peak ${m.peakIndex + 1} at ${m.x}${u}.${m.note ? ` ${m.note}` : ''}`);
  }
  lines.push(naming.missing.length ? `Missing named peaks: ${naming.missing.join(', ')}.` : 'Missing named peaks: none.');
  return lines;
}
