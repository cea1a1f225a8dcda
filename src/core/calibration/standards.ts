/**
 * Standards: the known amount of each named peak in each standard trace.
 *
 * As text (CSV file or cells pasted from a spreadsheet; see table-text.ts),
 * one row per standard trace and one column per named peak:
 *
 *     standard,Orchard Red (mg/L),Lagoon Blue (mg/L)
 *     std-low-a.csv,2,0.5
 *     std-low-b.csv,2,0.5
 *
 * The first column names the standard trace (as the traces are named when
 * loaded, usually the file name; the header may say "standard", "trace" or
 * "file"). A unit in brackets after a peak's name is that peak's amount
 * unit. An empty cell means the peak is not in that standard. Amounts are
 * numbers ≥ 0. Several levels and replicates are just more rows; rows with
 * the same amount of a peak are that peak's replicates.
 */
import { parseColumnHeader } from '../io/delimited.ts';
import { checkFormatAndVersion, isPlainObject } from './json-form.ts';
import { checkPeakName } from './named-peaks.ts';
import type { NamedPeakTable } from './named-peaks.ts';
import { readTextTable, tableNumber } from './table-text.ts';
import type { TableProblem } from './table-text.ts';

export const STANDARDS_FORMAT = 'tracewright-standards';
export const STANDARDS_VERSION = 1;

export interface StandardRow {
  /** The standard trace's name. */
  readonly standard: string;
  /** Line in the text it was read from, or null. */
  readonly line: number | null;
  /** Amount of each peak of {@link StandardsTable.names}, in that order; null when not in this standard. */
  readonly amounts: readonly (number | null)[];
}

export interface StandardsTable {
  readonly format: typeof STANDARDS_FORMAT;
  readonly version: number;
  /** Named peaks with amounts (column order). */
  readonly names: readonly string[];
  /** Amount unit of each, '' when not given. */
  readonly units: readonly string[];
  readonly rows: readonly StandardRow[];
}

const STANDARD_HEADERS = ['standard', 'trace', 'file', 'standard trace'];

/**
 * Read the standards' amounts from CSV text or a pasted table (see the module
 * comment). All-or-nothing; every problem names its line.
 */
export function readStandardsCsv(text: string, fileName: string): { ok: true; table: StandardsTable; notices: string[] } | { ok: false; problems: TableProblem[] } {
  const read = readTextTable(text, fileName, 'standards table');
  if (!read.ok) return read;
  const t = read.table;
  const problems: TableProblem[] = [];
  const heads = t.header.cells.map((c) => parseColumnHeader(c));
  if (heads.length < 2 || !STANDARD_HEADERS.includes(heads[0].name.toLowerCase())) {
    return {
      ok: false,
      problems: [{
        fileName, line: t.header.line,
        problem: `The first column must name the standard traces and be headed "standard"; the other columns are the named peaks, e.g. "standard,Orchard Red (mg/L),Lagoon Blue (mg/L)". Found: ${t.header.cells.map((c) => `"${c}"`).join(', ')}.`,
      }],
    };
  }
  const names: string[] = [], units: string[] = [];
  const seen = new Map<string, number>();
  heads.slice(1).forEach((h, k) => {
    const bad = checkPeakName(h.name);
    if (bad) { problems.push({ fileName, line: t.header.line, problem: `Column ${k + 2}: ${bad}.` }); return; }
    const key = h.name.toLowerCase();
    if (seen.has(key)) problems.push({ fileName, line: t.header.line, problem: `Columns ${seen.get(key)! + 2} and ${k + 2} are both "${h.name}"; give each named peak one column.` });
    seen.set(key, k);
    names.push(h.name);
    units.push(h.unit);
  });
  if (problems.length) return { ok: false, problems };
  const rows: StandardRow[] = [];
  const firstLine = new Map<string, number>();
  for (const r of t.rows) {
    const standard = (r.cells[0] ?? '').trim();
    const rowProblems: string[] = [];
    if (standard === '') rowProblems.push('the standard\'s name (first column) is empty');
    else if (firstLine.has(standard)) rowProblems.push(`standard "${standard}" is already listed on line ${firstLine.get(standard)}`);
    else firstLine.set(standard, r.line);
    if (r.cells.length > names.length + 1 && r.cells.slice(names.length + 1).some((c) => c !== '')) {
      rowProblems.push(`the row has ${r.cells.length} cells but the header only ${names.length + 1}`);
    }
    const amounts = names.map((name, k) => {
      const cell = r.cells[k + 1] ?? '';
      if (cell === '') return null;
      const v = tableNumber(cell, t);
      if (Number.isNaN(v)) { rowProblems.push(`the amount of "${name}", "${cell}", is not a number`); return null; }
      if (v < 0) { rowProblems.push(`the amount of "${name}" is negative (${cell})`); return null; }
      return v;
    });
    if (!rowProblems.length && amounts.every((a) => a === null)) rowProblems.push('the row gives no amount');
    if (rowProblems.length) {
      const sentence = rowProblems.join('; ');
      problems.push({ fileName, line: r.line, problem: `${sentence[0].toUpperCase()}${sentence.slice(1)}.` });
      continue;
    }
    rows.push({ standard, line: r.line, amounts });
  }
  if (problems.length) return { ok: false, problems };
  if (rows.length === 0) return { ok: false, problems: [{ fileName, line: null, problem: 'The standards table has a header but no rows.' }] };
  const notices: string[] = [];
  const unitless = names.filter((_, k) => units[k] === '');
  if (unitless.length) notices.push(`No amount unit for ${unitless.map((n) => `"${n}"`).join(', ')}: add it in brackets after the name, e.g. "${unitless[0]} (mg/L)".`);
  return { ok: true, table: { format: STANDARDS_FORMAT, version: STANDARDS_VERSION, names, units, rows }, notices };
}

/**
 * Check the standards against the named-peak table: every column must be a
 * named peak (exact spelling; a difference of case only is pointed out).
 */
export function checkStandardsAgainstNames(standards: StandardsTable, named: NamedPeakTable): string[] {
  const problems: string[] = [];
  const known = named.peaks.map((p) => p.name);
  for (const n of standards.names) {
    if (known.includes(n)) continue;
    const caseOnly = known.find((k) => k.toLowerCase() === n.toLowerCase());
    problems.push(caseOnly
      ? `The standards give amounts for "${n}", but the named peak is spelled "${caseOnly}"; use the same spelling.`
      : `The standards give amounts for "${n}", which is not a named peak. Named peaks: ${known.length ? known.map((k) => `"${k}"`).join(', ') : 'none yet'}.`);
  }
  return problems;
}

/** The standards as plain JSON (for exports and saved sessions). */
export function standardsToJson(table: StandardsTable): { format: string; version: number; names: string[]; units: string[]; rows: { standard: string; amounts: (number | null)[] }[] } {
  return {
    format: STANDARDS_FORMAT,
    version: STANDARDS_VERSION,
    names: [...table.names],
    units: [...table.units],
    rows: table.rows.map((r) => ({ standard: r.standard, amounts: [...r.amounts] })),
  };
}

/** Read the JSON form back; all-or-nothing, every problem listed. */
export function parseStandards(input: unknown): { ok: true; table: StandardsTable } | { ok: false; problems: string[] } {
  const head = checkFormatAndVersion(input, STANDARDS_FORMAT, STANDARDS_VERSION, 'standards table');
  if (!head.ok) return head;
  const { value, problems } = head;
  const names = value.names, units = value.units, rows = value.rows;
  if (!Array.isArray(names) || names.some((n) => checkPeakName(n) !== null)) problems.push('"names" must be a list of peak names.');
  if (!Array.isArray(units) || !Array.isArray(names) || units.length !== names.length || units.some((u) => typeof u !== 'string')) problems.push('"units" must be a list of texts, one per name.');
  if (!Array.isArray(rows)) problems.push('"rows" must be a list.');
  if (problems.length) return { ok: false, problems };
  const n = (names as string[]).length;
  const seen = new Set<string>();
  const out: StandardRow[] = [];
  (rows as unknown[]).forEach((r, i) => {
    if (!isPlainObject(r) || typeof r.standard !== 'string' || r.standard.trim() === '' || !Array.isArray(r.amounts) || r.amounts.length !== n) {
      problems.push(`Standard ${i + 1} must have a "standard" name and ${n} amounts.`);
      return;
    }
    if (seen.has(r.standard)) problems.push(`Standard "${r.standard}" is listed twice.`);
    seen.add(r.standard);
    const amounts = r.amounts as unknown[];
    if (amounts.some((a) => !(a === null || (typeof a === 'number' && Number.isFinite(a) && a >= 0)))) problems.push(`Standard "${r.standard}": amounts must be numbers ≥ 0 or null.`);
    out.push({ standard: r.standard, line: null, amounts: amounts as (number | null)[] });
  });
  if (problems.length) return { ok: false, problems };
  return { ok: true, table: { format: STANDARDS_FORMAT, version: STANDARDS_VERSION, names: (names as string[]).map((s) => s.trim()), units: units as string[], rows: out } };
}
