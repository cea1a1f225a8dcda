/**
 * Issue 21: which row of the standards table a loaded trace is. Rows name
 * standard traces as the user knows them: usually the file name (the demo's
 * table does), or the trace's full name "file: column" in files holding
 * several, or the column name alone. The first of these the table holds is
 * the trace's key; otherwise its full name (and calibrate() then says it has
 * no row).
 */
import type { Trace } from '../trace.ts';
import type { StandardsTable } from './standards.ts';

/** The names a trace may go by in a standards table, most specific first. */
export function traceKeys(trace: Pick<Trace, 'name' | 'source'>): string[] {
  const prefix = `${trace.source.fileName}: `;
  const short = trace.name.startsWith(prefix) ? trace.name.slice(prefix.length) : trace.name;
  return [...new Set([trace.name, trace.source.fileName, short])];
}

/** The trace's name as the standards table gives it, or its full name when the table has no row for it. */
export function standardKeyOf(trace: Pick<Trace, 'name' | 'source'>, table: StandardsTable | null): string {
  const keys = traceKeys(trace);
  const rows = new Set(table?.rows.map((r) => r.standard) ?? []);
  return keys.find((k) => rows.has(k)) ?? trace.name;
}
