/**
 * The delimited-text loader: CSV and its relatives (semicolon, tab or
 * space separated), decimal point or comma, metadata lines before the table,
 * a header row with units, one or several numeric columns.
 *
 * How a file is read:
 * 1. Decode (UTF-8 with or without byte-order mark, UTF-16 with a mark,
 *    Latin-1 fallback with a notice).
 * 2. Take the first {@link SAMPLE_LINES} non-blank lines and try every
 *    delimiter/decimal-sign pair on them; the pair under which the most lines
 *    split into the same number of fields that are all numbers wins (ties:
 *    more numeric fields, then more columns, then the order comma, semicolon,
 *    tab, whitespace, and last comma with quoted decimal-comma numbers). PapaParse's own delimiter guess is not used, since it
 *    takes the comma in "1,5;2,7" for the delimiter.
 * 3. The table starts at the first line with the table's field count and
 *    numbers in its numeric columns that has at least two more such lines
 *    among the next four. The line before it, when it
 *    holds text, is the header (a second text line before that: names, then
 *    units). Lines above are metadata.
 * 4. Data rows are split with PapaParse (when the data holds quote marks) or
 *    a plain split (fast path, same result on plain files) and converted by
 *    {@link parseNumber}; a cell whose digits are grouped in threes by the
 *    other sign is read by {@link parseGroupedNumber} only when its column
 *    settles it (a cell with both signs, two group signs, or the decimal
 *    sign elsewhere in the column), and the file is refused naming the line
 *    otherwise. A row whose x, or every y, is not a number is skipped and
 *    listed; a y cell that is not a number leaves that point out of that
 *    column's trace only, counted and named in a notice.
 * 5. x is put in order by {@link orderByX} (the one rule every loader
 *    follows: sorted, y averaged over repeated x, each said in a notice
 *    that names points, not lines), and one trace is made per y column (at most
 *    {@link MAX_Y_COLUMNS}, the first ones, said in a notice).
 *
 * Columns: a column is measured values (and never text) when its cells are
 * mostly numbers or number-like failures (NaN, infinity, overflow,
 * hexadecimal, separators); so x is never drawn as the signal because a
 * broken y column was taken for text. A quote never closed, a line longer
 * than 8 MB (`MAX_LINE_BYTES`, a file without line breaks), and "0,1,234.5"
 * under a two-name header (a thousands comma splitting numbers) are refused
 * naming the line.
 *
 * Known limits: a file with one column of unquoted decimal-comma numbers
 * ("1,5" on every line) is read as two comma-separated integer columns,
 * since nothing in the file tells the two apart; the table must start
 * within the first {@link SAMPLE_LINES} non-blank lines.
 */
import Papa from 'papaparse';
import { createTrace, MIN_POINTS } from '../trace.ts';
import type { Trace } from '../trace.ts';
import { givenSha256, MAX_Y_COLUMNS } from './types.ts';
import type { LoadOptions, LoadProblem, LoadQuestion, LoadReport, LoadResult, SkippedRow } from './types.ts';
import { looksNumeric, parseGroupedNumber, parseNumber, parseNumberIn, whyNotNumber } from './numbers.ts';
import type { DecimalSign } from './numbers.ts';
import { decodeText, overlongLineProblem } from './sniff.ts';
import { sha256Hex } from './sha256.ts';
import { orderByX } from './order-x.ts';
import { bytesProblem, unexpectedLoadProblem } from './guards.ts';

/** Field separators the loader understands; "whitespace" means runs of spaces and tabs. */
export type Delimiter = ',' | ';' | '\t' | 'whitespace';

/** A delimiter and decimal sign decided for a whole file. */
export interface Dialect {
  delimiter: Delimiter;
  decimal: DecimalSign;
}

/** How data rows are split: our plain split, PapaParse, or chosen by content (default); "lines": the plain split cutting every row into strings (tests). */
export type RowSplitter = 'auto' | 'fast' | 'papa' | 'lines';

/** Non-blank lines looked at to decide the delimiter, decimal sign and where the table starts. */
export const SAMPLE_LINES = 500;

/** Characters of sample lines after which no more are taken (once {@link MIN_WIDE_SAMPLE} lines are in). */
export const SAMPLE_CHARS = 4 * 1024 * 1024;

/** Fewest sample lines taken however wide the rows are. */
const MIN_WIDE_SAMPLE = 8;

/** Skipped rows listed one by one in the report; the rest are only counted. */
export const MAX_LISTED_SKIPS = 1000;

/** Longest text of a skipped row kept in the report. */
const SKIP_TEXT_CHARS = 80;

/** Lines between two progress calls. */
const PROGRESS_EVERY = 65536;

/** Share of the progress bar spent hashing the bytes. */
const HASH_SHARE = 0.2;

const CANDIDATES: readonly Dialect[] = [
  { delimiter: ',', decimal: '.' },
  { delimiter: ';', decimal: ',' },
  { delimiter: ';', decimal: '.' },
  { delimiter: '\t', decimal: '.' },
  { delimiter: '\t', decimal: ',' },
  { delimiter: 'whitespace', decimal: '.' },
  { delimiter: 'whitespace', decimal: ',' },
  // Comma-separated with decimal commas only works when the numbers are quoted ("1,5","2,7").
  { delimiter: ',', decimal: ',' },
];

const DELIMITER_NAMES: Record<Delimiter, string> = {
  ',': 'comma',
  ';': 'semicolon',
  '\t': 'tab',
  whitespace: 'spaces',
};

/** Plain-words description of a dialect, e.g. "semicolon, decimal comma". */
export function dialectLabel(d: Dialect): string {
  return `${DELIMITER_NAMES[d.delimiter]}, decimal ${d.decimal === ',' ? 'comma' : 'point'}`;
}

function isSpaceOrTab(c: number): boolean {
  return c === 32 || c === 9;
}

/** Trim spaces and tabs only (String.prototype.trim also removes other characters PapaParse keeps). */
function trimSpaceTab(s: string): string {
  let a = 0, b = s.length;
  while (a < b && isSpaceOrTab(s.charCodeAt(a))) a++;
  while (b > a && isSpaceOrTab(s.charCodeAt(b - 1))) b--;
  return a === 0 && b === s.length ? s : s.slice(a, b);
}

function stripQuotes(s: string): string {
  const t = trimSpaceTab(s);
  if (t.length >= 2 && t.startsWith('"') && t.endsWith('"')) return t.slice(1, -1).replace(/""/g, '"').trim();
  return t;
}

/**
 * Reads lines one at a time without splitting the whole text: LF, CR LF and a
 * lone CR each end a line. Line numbers are 1-based.
 */
class LineReader {
  private pos: number;
  private nextLf = -2;
  private nextCr = -2;
  /** Number of the line last read. */
  line: number;
  /** Text of the line last read, without its line break. */
  current = '';
  /** Character offset where the line last read starts. */
  start = 0;

  constructor(private readonly text: string, startOffset = 0, firstLine = 1) {
    this.pos = startOffset;
    this.line = firstLine - 1;
  }

  /** Offset of the next unread character. */
  get offset(): number {
    return this.pos;
  }

  next(): boolean {
    const t = this.text;
    const p = this.pos;
    if (p >= t.length) return false;
    // indexOf results are cached so a file without CR is not rescanned for CR on every line.
    if (this.nextLf !== -1 && this.nextLf < p) this.nextLf = t.indexOf('\n', p);
    if (this.nextCr !== -1 && this.nextCr < p) this.nextCr = t.indexOf('\r', p);
    const lf = this.nextLf, cr = this.nextCr;
    let end: number, after: number;
    if (cr !== -1 && (lf === -1 || cr < lf)) {
      end = cr;
      after = lf === cr + 1 ? cr + 2 : cr + 1;
    } else if (lf !== -1) {
      end = lf;
      after = lf + 1;
    } else {
      end = t.length;
      after = t.length;
    }
    this.start = p;
    this.current = t.slice(p, end);
    this.pos = after;
    this.line++;
    return true;
  }
}

/**
 * The quoted field whose opening quote is at `start` ("" inside is one
 * quote), and the index just past its closing quote (or the line's end).
 */
function quoted(line: string, start: number): { field: string; end: number } {
  const n = line.length;
  let field = '';
  let i = start + 1;
  while (i < n) {
    if (line.charCodeAt(i) === 34) {
      if (line.charCodeAt(i + 1) === 34) { field += '"'; i += 2; continue; }
      i++;
      break;
    }
    field += line[i++];
  }
  return { field, end: i };
}

/**
 * Split one line into fields, honouring double quotes the way PapaParse does:
 * a field is quoted only when its first character is a quote; "" inside a
 * quoted field is one quote. Whitespace delimiting splits on runs of spaces
 * and tabs and ignores them at both ends of the line.
 */
export function splitFields(line: string, delimiter: Delimiter): string[] {
  const fields: string[] = [];
  const n = line.length;
  if (delimiter === 'whitespace') {
    let i = 0;
    for (;;) {
      while (i < n && isSpaceOrTab(line.charCodeAt(i))) i++;
      if (i >= n) break;
      let field = '';
      if (line.charCodeAt(i) === 34) ({ field, end: i } = quoted(line, i));
      const from = i;
      while (i < n && !isSpaceOrTab(line.charCodeAt(i))) i++;
      fields.push(field + line.slice(from, i));
    }
    return fields;
  }
  const d = delimiter.charCodeAt(0);
  let i = 0;
  for (;;) {
    if (i < n && line.charCodeAt(i) === 34) {
      const q = quoted(line, i);
      const field = q.field;
      i = q.end;
      const from = i;
      while (i < n && line.charCodeAt(i) !== d) i++;
      // PapaParse drops spaces between a closing quote and the delimiter.
      const after = line.slice(from, i);
      fields.push(trimSpaceTab(after) === '' ? field : field + after);
    } else {
      const end = line.indexOf(delimiter, i);
      const stop = end === -1 ? n : end;
      fields.push(line.slice(i, stop));
      i = stop;
    }
    if (i >= n) break;
    i++; // past the delimiter
    if (i === n) { fields.push(''); break; }
  }
  return fields;
}

/** A column header split into name and unit. */
export interface ColumnHeader {
  name: string;
  unit: string;
}

/**
 * Split a column header into name and unit: "Time (min)", "Absorbance [AU]"
 * and "Signal / mV" (slash with spaces around it, the quantity/unit style of
 * the SI Brochure, 9th ed., 5.4.1) give a unit; anything else is all name.
 * Surrounding quotes and spaces are removed.
 */
export function parseColumnHeader(raw: string): ColumnHeader {
  const s = stripQuotes(raw);
  let m = /^(.*?)\s*\(([^()]*)\)$/.exec(s);
  if (!m) m = /^(.*?)\s*\[([^[\]]*)\]$/.exec(s);
  if (!m) m = /^(.+?)\s+\/\s+(\S.*)$/.exec(s);
  if (m) return { name: m[1].trim(), unit: m[2].trim() };
  return { name: s, unit: '' };
}

/**
 * Units a trace column may carry after an underscore (`time_s`,
 * `voltage_mV`), as they are spelt; the match ignores case and keeps the
 * file's spelling. Only units usual for detector traces and their x axes
 * (common practice in instrument and logger exports; our own list): time,
 * wavelength and wavenumber, detector signals (absorbance, voltage,
 * current, counts, refractive index), and frequency. Single letters that
 * are also words or labels (a, h, k, v) are left out, so `peak_a` stays a
 * name.
 */
export const SUFFIX_UNITS: readonly string[] = [
  's', 'ms', 'min', 'nm', 'um', 'µm', 'cm-1',
  'AU', 'mAU', 'uAU', 'µAU', 'mV', 'uV', 'µV', 'nA', 'pA', 'uA', 'µA',
  'counts', 'cps', 'Hz', 'RIU', 'nRIU', 'ppm',
];
const SUFFIX_LOWER = new Map(SUFFIX_UNITS.map((u) => [u.toLowerCase(), u]));

/**
 * A trace column's header: the forms of {@link parseColumnHeader}, and
 * `name_unit` when the suffix is one of {@link SUFFIX_UNITS} and the name
 * before it is longer than one letter (`x_s` stays a name).
 */
export function parseTraceHeader(raw: string): ColumnHeader {
  const h = parseColumnHeader(raw);
  if (h.unit) return h;
  const m = /^(.+)_([^_\s]+)$/.exec(h.name);
  if (m && m[1].trim().length > 1 && SUFFIX_LOWER.has(m[2].toLowerCase())) return { name: m[1].trim(), unit: m[2] };
  return h;
}

/** Units recognised on a separate units line (lower case). Common practice in instrument exports; not exhaustive. */
const KNOWN_UNITS = new Set([
  's', 'sec', 'ms', 'min', 'h', 'nm', 'µm', 'um', 'cm-1', '1/cm', 'cm^-1', 'au', 'mau', 'µau', 'uau', 'abs', 'a.u.', 'v', 'mv', 'µv', 'uv',
  'a', 'ma', 'µa', 'ua', 'na', 'pa', 'counts', 'cps', 'hz', '%', '°c', 'k', 'bar', 'psi', 'mpa', 'ml/min', 'µl/min', 'ul/min', 'riu', 'nriu',
  'lsu', 'ppm', 'mg/l', 'µg/ml', 'ug/ml', 'm/z', 'da',
]);

/** True when a cell is a unit on its own: a known unit, or anything in parentheses or brackets. */
function looksLikeUnit(cell: string): boolean {
  const s = stripQuotes(cell);
  if (/^\(.*\)$|^\[.*\]$/.test(s)) return true;
  return KNOWN_UNITS.has(s.toLowerCase());
}

interface SampleLine {
  line: number;
  text: string;
  /** Character offset where the line starts. */
  start: number;
}

interface SampleSplit {
  fields: string[];
  /** A number by the dialect, plainly or with digits grouped in threes by the other sign. */
  numeric: boolean[];
  numericCount: number;
  /** Fields that are numbers only when read with grouping. */
  groupedCount: number;
}

interface DialectScore {
  dialect: Dialect;
  fullRows: number;
  numericFields: number;
  groupedFields: number;
  columns: number;
}

/** The sign that groups thousands when `decimal` is the decimal sign. */
function groupSign(decimal: DecimalSign): string {
  return decimal === ',' ? '.' : ',';
}

function splitSample(sample: readonly SampleLine[], d: Dialect, grouping = true): SampleSplit[] {
  const g = grouping ? groupSign(d.decimal) : '\u0000';
  return sample.map((s) => {
    const fields = splitFields(s.text, d.delimiter);
    let numericCount = 0, groupedCount = 0;
    const numeric = fields.map((f) => {
      if (!Number.isNaN(parseNumber(f, d.decimal))) { numericCount++; return true; }
      if (f.indexOf(g) !== -1 && parseGroupedNumber(f, d.decimal)) { numericCount++; groupedCount++; return true; }
      return false;
    });
    return { fields, numeric, numericCount, groupedCount };
  });
}

/** Most common field count among lines holding at least one number (ties: more fields). */
function modalFieldCount(rows: readonly SampleSplit[]): number {
  const counts = new Map<number, number>();
  for (const r of rows) if (r.numericCount > 0) counts.set(r.fields.length, (counts.get(r.fields.length) ?? 0) + 1);
  let best = 0, bestCount = 0;
  for (const [k, c] of counts) if (c > bestCount || (c === bestCount && k > best)) { best = k; bestCount = c; }
  return best;
}

function scoreDialect(sample: readonly SampleLine[], d: Dialect, grouping = true): DialectScore {
  const rows = splitSample(sample, d, grouping);
  const k = modalFieldCount(rows);
  let fullRows = 0, numericFields = 0, groupedFields = 0;
  for (const r of rows) {
    if (r.fields.length !== k || r.numericCount === 0) continue;
    numericFields += r.numericCount;
    groupedFields += r.groupedCount;
    if (r.numericCount === k) fullRows++;
  }
  return { dialect: d, fullRows, numericFields, groupedFields, columns: k };
}

/**
 * Decide delimiter and decimal sign from sample lines by consistent field
 * counts of numeric fields (see the module comment). Returns null when no
 * line holds a number under any candidate. Part of the reader's API on
 * purpose: the dialect choice on its own, for callers holding lines rather
 * than a file (the reader itself goes through the same bestDialect).
 */
export function decideDialect(lines: readonly string[]): Dialect | null {
  const sample = lines.map((text, i) => ({ line: i + 1, text, start: 0 }));
  const best = bestDialect(sample);
  return best ? best.dialect : null;
}

/**
 * The candidates left when the user fixed the delimiter and/or the decimal
 * sign (a stated number format fixes the decimal sign too). With only a
 * decimal comma fixed, a comma separates fields only when the file quotes
 * its numbers (RFC 4180), since an unquoted comma would then be both.
 */
function allowedDialects(fixed: LoadOptions['dialect'] | undefined, quoted: boolean, format?: LoadOptions['numberFormat']): readonly Dialect[] {
  const decimal = fixed?.decimal ?? format?.decimal;
  const delimiter = fixed?.delimiter;
  if (delimiter === undefined && decimal === undefined) return CANDIDATES;
  const commaFieldsNeedQuotes = delimiter === undefined && decimal === ',' && !quoted;
  const out = CANDIDATES.filter((d) => (delimiter === undefined || d.delimiter === delimiter) && (decimal === undefined || d.decimal === decimal)
    && !(commaFieldsNeedQuotes && d.delimiter === ','));
  // Every delimiter and decimal sign pair is a candidate; a pair outside the list cannot occur, but stay safe.
  return out.length ? out : [{ delimiter: delimiter ?? ',', decimal: decimal ?? '.' }];
}

function bestDialect(sample: readonly SampleLine[], candidates: readonly Dialect[] = CANDIDATES, grouping = true): DialectScore | null {
  let best: DialectScore | null = null;
  for (const d of candidates) {
    const s = scoreDialect(sample, d, grouping);
    if (s.numericFields === 0) continue;
    // Equal full rows: the reading that needs fewer grouped numbers wins, so "1,250" in a semicolon file
    // stays 1.25 with a decimal comma rather than 1250 with a grouping comma.
    if (
      !best ||
      s.fullRows > best.fullRows ||
      (s.fullRows === best.fullRows && s.groupedFields < best.groupedFields) ||
      (s.fullRows === best.fullRows && s.groupedFields === best.groupedFields && s.numericFields > best.numericFields) ||
      (s.fullRows === best.fullRows && s.groupedFields === best.groupedFields && s.numericFields === best.numericFields && s.columns > best.columns)
    ) best = s;
  }
  return best;
}

/** The full numeric rows of a sample under one dialect: line number and values. */
function fullRowValues(sample: readonly SampleLine[], d: Dialect, k: number): { line: number; values: number[] }[] {
  const out: { line: number; values: number[] }[] = [];
  splitSample(sample, d).forEach((r, i) => {
    if (r.fields.length === k && r.numericCount === k) out.push({ line: sample[i].line, values: r.fields.map((f) => parseNumber(f, d.decimal)) });
  });
  return out;
}

/** True when the text line just above the first full row names k ≥ 2 columns under this dialect. */
function headerSupports(sample: readonly SampleLine[], s: DialectScore): boolean {
  if (s.columns < 2) return false;
  const rows = splitSample(sample, s.dialect);
  const first = rows.findIndex((r) => r.fields.length === s.columns && r.numericCount === s.columns);
  if (first < 1) return false;
  const above = rows[first - 1];
  return above.fields.length === s.columns && above.numericCount === 0 && above.fields.every((f) => stripQuotes(f) !== '');
}

/**
 * Whether the numbers could as well be read another way: another allowed
 * delimiter and decimal sign reads every line the chosen one reads as a full
 * row of numbers, but into other numbers (e.g. "0,5" on every line: two
 * whole-number columns with a comma between, or one column with a decimal
 * comma). A header line that names the columns under only one of the
 * readings settles it. Returns the question for the load report, or null.
 */
function dialectQuestion(sample: readonly SampleLine[], best: DialectScore, candidates: readonly Dialect[]): LoadQuestion | null {
  if (best.fullRows === 0) return null;
  const mine = fullRowValues(sample, best.dialect, best.columns);
  const supported = headerSupports(sample, best);
  for (const d of candidates) {
    if (d.delimiter === best.dialect.delimiter && d.decimal === best.dialect.decimal) continue;
    const other = scoreDialect(sample, d);
    if (other.fullRows !== best.fullRows) continue;
    // A reading that needs more numbers with thousands grouping than the chosen one is not asked about:
    // grouped numbers are read only when the column settles it (the loader's own rule), so it is not a rival.
    if (other.groupedFields > best.groupedFields) continue;
    const theirs = fullRowValues(sample, d, other.columns);
    if (theirs.some((r) => r.values.some((v) => Number.isNaN(v)))) continue;
    const same = theirs.length === mine.length && theirs.every((r, i) => r.line === mine[i].line && r.values.length === mine[i].values.length && r.values.every((v, j) => Object.is(v, mine[i].values[j])));
    if (same) continue;
    if (supported && !headerSupports(sample, other)) continue;
    const show = (rows: typeof mine) => rows[0].values.join(' | ');
    return {
      kind: 'number-format', line: mine[0].line,
      message: `Line ${mine[0].line} reads as ${dialectLabel(best.dialect)} (${best.columns} column${best.columns === 1 ? '' : 's'}: ${show(mine)}) ` +
        `or as ${dialectLabel(d)} (${other.columns} column${other.columns === 1 ? '' : 's'}: ${show(theirs)}), and nothing in the file tells which.`,
    };
  }
  return null;
}

/** Growable Float64Array. */
class Column {
  data = new Float64Array(1024);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const bigger = new Float64Array(this.data.length * 2);
      bigger.set(this.data);
      this.data = bigger;
    }
    this.data[this.length++] = v;
  }
  values(): Float64Array {
    return this.data.subarray(0, this.length);
  }
}

function problem(fileName: string, text: string, advice: string, line?: number, settle?: LoadProblem['settle']): LoadResult {
  const error: LoadProblem = line === undefined ? { fileName, problem: text, advice } : { fileName, line, problem: text, advice };
  if (settle) error.settle = settle;
  return { ok: false, error };
}

function truncate(text: string): string {
  return text.length > SKIP_TEXT_CHARS ? `${text.slice(0, SKIP_TEXT_CHARS - 1)}…` : text;
}

/** Read a metadata line: "Key: value", "Key = value", "Key<delimiter>value", else "line N". */
function metadataEntry(text: string, line: number, delimiter: Delimiter): [string, string] {
  const t = trimSpaceTab(text).replace(/^(#|%|\/\/)\s*/, '');
  const colon = /^([^:=]{1,60}?)\s*[:=]\s*(.*)$/.exec(t);
  if (colon && colon[1].trim() !== '') return [stripQuotes(colon[1]), stripQuotes(colon[2])];
  if (delimiter !== 'whitespace') {
    const fields = splitFields(t, delimiter).map(stripQuotes);
    const rest = fields.slice(1).filter((f) => f !== '');
    if (fields.length >= 2 && fields[0] !== '' && rest.length > 0 && fields[0].length <= 60) return [fields[0], rest.join(', ')];
  }
  return [`line ${line}`, stripQuotes(t)];
}

interface Layout {
  dialect: Dialect;
  /** Field count of table rows. */
  columns: number;
  /** Columns numeric in more than half of the table-shaped sample lines. */
  numericColumns: number[];
  /**
   * Columns of measured values: the numeric ones, and those whose cells are
   * mostly numbers or number-like failures (NaN, infinity, overflow,
   * hexadecimal, separators) rather than words. Only these give traces.
   */
  dataColumns: number[];
  /** Index into the sample of the first table row. */
  tableIndex: number;
  headers: ColumnHeader[];
  /** Index into the sample of the header line (names), or -1. */
  headerIndex: number;
  notices: string[];
  /** Another reading of the numbers that the file does not rule out (see dialectQuestion). */
  question: LoadQuestion | null;
}

type LayoutResult = { ok: true; layout: Layout } | { ok: false; result: LoadResult };

function findLayout(sample: readonly SampleLine[], fileName: string, fixed?: LoadOptions['dialect'], format?: LoadOptions['numberFormat']): LayoutResult {
  const candidates = allowedDialects(fixed, sample.some((l) => l.text.includes('"')), format);
  const best = bestDialect(sample, candidates, format ? format.grouping : true);
  if (!best && candidates !== CANDIDATES) {
    return {
      ok: false,
      result: problem(
        fileName,
        `No line holds a number when the file is read as ${candidates.map(dialectLabel).join(' or ')}, as chosen.`,
        'Choose another delimiter or decimal sign, or leave the choice to the loader.',
      ),
    };
  }
  if (!best) {
    return {
      ok: false,
      result: problem(
        fileName,
        'The file holds only text: no line has a number that could be read.',
        'Load the file with the measured values (columns of numbers, e.g. time and signal). Numbers must use digits with a decimal point or comma, without units in the same cell.',
      ),
    };
  }
  const { dialect } = best;
  const K = best.columns;
  const rows = splitSample(sample, dialect, format ? format.grouping : true);
  const shaped = rows.filter((r) => r.fields.length === K && r.numericCount > 0);
  const numericColumns: number[] = [];
  for (let c = 0; c < K; c++) {
    let count = 0;
    for (const r of shaped) if (r.numeric[c]) count++;
    if (count * 2 > shaped.length) numericColumns.push(c);
  }
  const firstNumberLine = sample[rows.findIndex((r) => r.numericCount > 0)].line;
  if (numericColumns.length === 0) {
    return {
      ok: false,
      result: problem(
        fileName,
        `No column holds numbers in most rows: the numbers in this ${dialectLabel(dialect)} file are scattered across columns.`,
        'Check that the file is a table with one value per cell and a column of numbers for each signal, then load it again.',
        firstNumberLine,
      ),
    };
  }
  const good = (i: number) => {
    const r = rows[i];
    return r.fields.length === K && numericColumns.every((c) => r.numeric[c]);
  };
  // The table starts at the first good line that has at least two more good lines among the next four,
  // so a cell of text near the top of the data does not push the start down.
  let tableIndex = -1;
  for (let i = 0; i < rows.length && tableIndex < 0; i++) {
    if (!good(i)) continue;
    const window = Math.min(5, rows.length - i);
    let count = 0;
    for (let j = 0; j < window; j++) if (good(i + j)) count++;
    if (count >= Math.min(3, window)) tableIndex = i;
  }
  if (tableIndex < 0) {
    return {
      ok: false,
      result: problem(
        fileName,
        `No table of numbers found in the first ${sample.length} non-blank lines: no three of five neighbouring lines have ${K} fields with numbers in the same columns.`,
        'Check that the data rows all have the same number of fields; if the file has a very long text header, remove it or save only the table.',
        firstNumberLine,
      ),
    };
  }
  const dataColumns: number[] = [];
  const numericSet = new Set(numericColumns);
  for (let c = 0; c < K; c++) {
    if (numericSet.has(c)) { dataColumns.push(c); continue; }
    let numberish = 0, words = 0;
    for (let i = tableIndex; i < rows.length; i++) {
      const r = rows[i];
      if (r.fields.length !== K) continue;
      if (r.numeric[c]) { numberish++; continue; }
      const f = r.fields[c];
      if (stripQuotes(f) === '') continue;
      if (looksNumeric(f, dialect.decimal)) numberish++; else words++;
    }
    if (numberish > 0 && numberish >= words) dataColumns.push(c);
  }
  const notices: string[] = [];
  let headers: ColumnHeader[] = [];
  let headerIndex = -1;
  const above = tableIndex - 1;
  if (above >= 0 && rows[above].numericCount < rows[above].fields.length && dialect.delimiter === ',' && rows[above].fields.length < K) {
    // "0,1,234.5" under a two-name header: a thousands comma has split one number into two cells.
    const f = rows[tableIndex].fields;
    let pairs = 0;
    for (let c = 0; c + 1 < f.length; c++) {
      if (/^[+-]?\d{1,3}$/.test(f[c].trim()) && /^\d{3}(\.\d*)?([eE][+-]?\d+)?$/.test(f[c + 1].trim())) { pairs++; c++; }
    }
    if (pairs > 0 && K - pairs === rows[above].fields.length) {
      return {
        ok: false,
        result: problem(
          fileName,
          `Line ${sample[tableIndex].line} (“${truncate(sample[tableIndex].text)}”) looks like numbers written with a thousands comma in a comma-separated file: the header has ${rows[above].fields.length} names but the rows have ${K} fields, so a comma inside a number split it into two cells.`,
          'Save the file without thousands separators (or with the numbers in quotes), then load it again; reading it as it is would give wrong numbers.',
          sample[tableIndex].line,
        ),
      };
    }
  }
  if (above >= 0 && rows[above].numericCount < rows[above].fields.length) {
    let fields = rows[above].fields;
    if (fields.length !== K && dialect.delimiter === 'whitespace') {
      // Space-separated headers often have spaces inside names; tabs or two or more spaces then separate columns.
      const wide = trimSpaceTab(sample[above].text).split(/\t| {2,}/).filter((f) => f !== '');
      if (wide.length === K) fields = wide;
    }
    if (fields.length === K) {
      headerIndex = above;
      headers = fields.map(parseTraceHeader);
      // Names on one line and units on the next: only when every cell of the lower line is a known unit,
      // so a preamble line such as "Rig,bench 2" above a plain header is never taken for names.
      const twoAbove = above - 1;
      if (
        twoAbove >= 0 && rows[twoAbove].fields.length === K && rows[twoAbove].numericCount === 0 &&
        fields.every((f) => stripQuotes(f) === '' || looksLikeUnit(f)) &&
        fields.some((f) => stripQuotes(f) !== '')
      ) {
        const names = rows[twoAbove].fields.map(parseTraceHeader);
        headers = names.map((h, c) => ({ name: h.name, unit: h.unit || stripQuotes(fields[c]).replace(/^[([](.*)[)\]]$/, '$1') }));
        headerIndex = twoAbove;
      }
    } else {
      notices.push(
        `The line before the table (line ${sample[above].line}) has ${fields.length} fields but the table has ${K}, so it is kept as metadata and the columns are named by number.`,
      );
    }
  }
  for (let c = 0; c < K; c++) {
    if (!headers[c]) headers[c] = { name: `Column ${c + 1}`, unit: '' };
    else if (headers[c].name === '') headers[c] = { name: `Column ${c + 1}`, unit: headers[c].unit };
  }
  if (headerIndex < 0 && notices.length === 0) notices.push(`No header row: columns are named Column 1 to Column ${K}.`);
  const question = dialectQuestion(sample, best, candidates);
  return { ok: true, layout: { dialect, columns: K, numericColumns, dataColumns, tableIndex, headers, headerIndex, notices, question } };
}

interface RowSink {
  /** Called for each non-blank data row with its 1-based line number, its fields and its raw text (or how to get it). */
  row(line: number, fields: string[], rawText: string | (() => string)): void;
  /**
   * The same row read in place: its fields are `text[starts[k], ends[k])`, k = 0 … (table width − 1).
   * Takes the row and returns true when every cell it reads is a plain number; otherwise changes
   * nothing and returns false, and the row goes to {@link RowSink.row}.
   */
  spans?(line: number, text: string, starts: Int32Array, ends: Int32Array): boolean;
}

const LF = 10, CR = 13, SPACE = 32, TAB = 9;

/**
 * Data rows by a plain split on the delimiter. With a one-character delimiter
 * and a sink that reads spans, rows with the table's number of fields are
 * handed over as offsets into `text` (no string per line or per cell: at 10⁶
 * rows this is most of the parse); any other row, and any row the sink
 * declines, is cut and split as before. Lines, line numbers, blank lines and
 * fields are those of {@link LineReader} and `String.split`.
 */
function readRowsFast(
  text: string, startOffset: number, firstLine: number, delimiter: Delimiter, width: number, sink: RowSink, progress: (f: number) => void,
): void {
  const total = text.length;
  if (delimiter === 'whitespace' || !sink.spans) {
    const reader = new LineReader(text, startOffset, firstLine);
    let sinceProgress = 0;
    while (reader.next()) {
      const line = reader.current;
      const trimmed = trimSpaceTab(line);
      if (trimmed !== '') {
        const fields = delimiter === 'whitespace' ? trimmed.split(/[ \t]+/) : line.split(delimiter);
        sink.row(reader.line, fields, line);
      }
      if (++sinceProgress === PROGRESS_EVERY) {
        sinceProgress = 0;
        progress(reader.offset / total);
      }
    }
    return;
  }
  const d = delimiter.charCodeAt(0);
  const starts = new Int32Array(width);
  const ends = new Int32Array(width);
  let p = startOffset;
  let line = firstLine - 1;
  let sinceProgress = 0;
  while (p < total) {
    line++;
    let fields = 0, fieldStart = p, blank = true, i = p, c = 0;
    for (; i < total; i++) {
      c = text.charCodeAt(i);
      if (c === LF || c === CR) break;
      if (c !== SPACE && c !== TAB) blank = false;
      if (c === d) {
        if (fields < width) { starts[fields] = fieldStart; ends[fields] = i; }
        fields++;
        fieldStart = i + 1;
      }
    }
    if (fields < width) { starts[fields] = fieldStart; ends[fields] = i; }
    fields++;
    const lineEnd = i;
    // A line ends at LF, CR LF or a lone CR, as in LineReader.
    const after = i >= total ? total : c === CR && i + 1 < total && text.charCodeAt(i + 1) === LF ? i + 2 : i + 1;
    if (!blank && (fields !== width || !sink.spans(line, text, starts, ends))) {
      const raw = text.slice(p, lineEnd);
      sink.row(line, raw.split(delimiter), raw);
    }
    p = after;
    if (++sinceProgress === PROGRESS_EVERY) {
      sinceProgress = 0;
      progress(p / total);
    }
  }
}

/** True when `text[from, to)` holds the character `code`. */
function holds(text: string, from: number, to: number, code: number): boolean {
  for (let i = from; i < to; i++) if (text.charCodeAt(i) === code) return true;
  return false;
}

function countNewlines(s: string): number {
  let n = 0;
  for (let i = s.indexOf('\n'); i !== -1; i = s.indexOf('\n', i + 1)) n++;
  return n;
}

/**
 * Rows through PapaParse (data holding quote marks).
 * @returns the line of the first quoted field that is never closed, or 0.
 */
function readRowsPapa(
  text: string, startOffset: number, firstLine: number, delimiter: Delimiter, sink: RowSink, progress: (f: number) => void,
): number {
  let data = text.slice(startOffset).replace(/\r\n?/g, '\n');
  if (delimiter === 'whitespace') {
    // PapaParse splits on one character, so runs of spaces and tabs become one space and line ends are trimmed.
    data = data.replace(/[ \t]+/g, ' ').replace(/^ | $/gm, '');
  }
  const raw = new LineReader(text, startOffset, firstLine);
  let line = firstLine;
  let sinceProgress = 0;
  let unclosed = 0;
  Papa.parse<string[]>(data, {
    delimiter: delimiter === 'whitespace' ? ' ' : delimiter,
    newline: '\n',
    quoteChar: '"',
    dynamicTyping: false,
    skipEmptyLines: false,
    header: false,
    step: (results) => {
      const fields = results.data;
      const rowLine = line;
      let breaks = 0;
      for (const f of fields) if (f.indexOf('\n') !== -1) breaks += countNewlines(f);
      line += 1 + breaks;
      if (!unclosed && results.errors.some((e) => e.code === 'MissingQuotes')) unclosed = rowLine;
      const rawText = () => {
        // PapaParse gives a row for the empty text after a final line break; the raw file has no such line.
        while (raw.line < rowLine) if (!raw.next()) return '';
        return raw.current;
      };
      // Only the raw line tells a blank line from one of empty fields (",,"), as the fast path sees it.
      const blank = fields.every((f) => trimSpaceTab(f) === '') && trimSpaceTab(rawText()) === '';
      if (!blank) sink.row(rowLine, fields, rawText);
      if (++sinceProgress === PROGRESS_EVERY) {
        sinceProgress = 0;
        progress(results.meta.cursor / data.length);
      }
    },
  });
  return unclosed;
}

/**
 * Read a delimited text file (CSV, semicolon, tab or space separated) into
 * one trace per y column. Synchronous and pure: `bytes` is only read.
 *
 * Defaults: x is the first numeric column and every other numeric column
 * gives one trace; with a single numeric column x is the point index
 * (0, 1, 2, …, xName "Point", no unit), stated in a notice. `options.xColumn`
 * (0-based, -1 for the point index) and `options.yColumns` override this.
 * `options.onProgress` gets fractions 0..1 about every 65 536 lines and 1 at
 * the end.
 *
 * Never throws: every problem (empty, only text, no numeric column, fewer
 * than {@link MIN_POINTS} points, too big, bad column choice) comes back as
 * `{ ok: false, error }` naming the file, the line when there is one, the
 * problem and what to do.
 *
 * @param splitter "auto" (default) uses the fast plain split when the data
 *   rows hold no quote mark and PapaParse otherwise; "fast" and "papa" force
 *   one, so tests can show both give the same result on plain files; "lines"
 *   is the fast split with every row cut into strings (no reading in place),
 *   for tests of the in-place reading.
 */
export function parseDelimited(bytes: Uint8Array, fileName: string, options: LoadOptions = {}, splitter: RowSplitter = 'auto'): LoadResult {
  try {
    return parseDelimitedUnsafe(bytes, fileName, options, splitter);
  } catch (e) {
    return { ok: false, error: unexpectedLoadProblem(fileName, e, 'Try saving the file again as plain comma-separated text.') };
  }
}

/** What the cells of one column did while being read. */
class CellTally {
  /** Cells that were not numbers in rows kept for other columns. */
  bad = 0;
  badExamples: { line: number; text: string; why: string }[] = [];
  /** Cells read with grouped thousands, and the first of them. */
  grouped = 0;
  groupedFirst: { line: number; text: string; value: number } | null = null;
  /** Grouped cells that settle the reading by themselves ("1.234,5", "1.234.567"). */
  certain = 0;
  /** The first grouped cell that could also be a decimal ("1.234"). */
  ambiguousFirst: { line: number; text: string } | null = null;
  /** A plain number with the decimal sign was seen in this column. */
  decimalSeen = false;
}

/** Most names listed in one notice; the rest are counted. */
const MAX_LISTED_COLUMNS = 12;

/** Column headers kept in the load report. */
const MAX_REPORTED_COLUMNS = 1000;

/** Magnitude above which squares overflow (√1.8e308 ≈ 1.3e154), with a margin. */
const HUGE_VALUE = 1e150;

function listColumns(names: string[]): string {
  if (names.length <= MAX_LISTED_COLUMNS) return names.join(', ');
  return `${names.slice(0, MAX_LISTED_COLUMNS).join(', ')} and ${names.length - MAX_LISTED_COLUMNS} more`;
}

function parseDelimitedUnsafe(bytes: Uint8Array, fileName: string, options: LoadOptions, splitter: RowSplitter): LoadResult {
  const bad = bytesProblem(bytes, fileName);
  if (bad) return { ok: false, error: bad };
  const long = overlongLineProblem(bytes, fileName);
  if (long) return { ok: false, error: long };
  const onProgress = options.onProgress;
  const report = (f: number) => { if (onProgress) onProgress(Math.min(1, Math.max(0, f))); };
  const sha256 = givenSha256(options) ?? sha256Hex(bytes, onProgress ? (f) => report(HASH_SHARE * f) : undefined);
  const decoded = decodeText(bytes);
  const text = decoded.text;

  const sample: SampleLine[] = [];
  const reader = new LineReader(text);
  let sampleChars = 0;
  while (sample.length < SAMPLE_LINES && reader.next()) {
    if (trimSpaceTab(reader.current) === '') continue;
    sample.push({ line: reader.line, text: reader.current, start: reader.start });
    sampleChars += reader.current.length;
    // Very wide rows (thousands of columns): a few of them are enough to decide, and splitting hundreds would take long.
    if (sampleChars > SAMPLE_CHARS && sample.length >= MIN_WIDE_SAMPLE) break;
  }
  if (sample.length === 0) {
    return problem(fileName, 'The file holds only blank lines and spaces.', 'Choose the file again; if it was exported from an instrument, check that the export finished.');
  }

  const format = options.numberFormat;
  if (format && !((format.decimal === '.' || format.decimal === ',') && typeof format.grouping === 'boolean')) {
    return problem(fileName, 'The stated number format must name the decimal sign ("." or ",") and whether the other sign groups thousands.', 'State the decimal sign and the grouping, or leave them to the loader.');
  }
  const found = findLayout(sample, fileName, options.dialect, format);
  if (!found.ok) return found.result;
  const layout = found.layout;
  const { dialect, columns: K, headers, numericColumns, dataColumns } = layout;
  const notices = [...decoded.notices];
  const columnName = (c: number) => `column ${c + 1} (${headers[c].name})`;

  // Column choice: defaults, then the user's override, checked.
  let xColumn: number;
  if (options.xColumn === undefined) xColumn = dataColumns.length >= 2 ? (numericColumns[0] ?? dataColumns[0]) : -1;
  else xColumn = options.xColumn;
  if (!Number.isInteger(xColumn) || xColumn < -1 || xColumn >= K) {
    return problem(fileName, `Column ${xColumn} cannot be x: the file has ${K} column(s), numbered from 0, or -1 for the point index.`, 'Choose x from the list of columns.');
  }
  const dataSet = new Set(dataColumns);
  if (xColumn >= 0 && !dataSet.has(xColumn)) {
    return problem(fileName, `The chosen x, ${columnName(xColumn)}, does not hold numbers.`, 'Choose a column of numbers as x, or the point index.');
  }
  let yColumns = options.yColumns ?? dataColumns.filter((c) => c !== xColumn);
  if (yColumns.length === 0) {
    return problem(
      fileName,
      `No column is left for y: the only column of numbers, ${columnName(dataColumns[0] ?? 0)}, is used as x.`,
      'Choose the point index as x so the column of numbers becomes y.',
    );
  }
  if (yColumns.length > MAX_Y_COLUMNS) {
    if (options.yColumns) {
      return problem(fileName, `${yColumns.length} columns were chosen as y; one file gives at most ${MAX_Y_COLUMNS} traces.`, `Choose at most ${MAX_Y_COLUMNS} columns.`);
    }
    const all = yColumns.length;
    yColumns = yColumns.slice(0, MAX_Y_COLUMNS);
    notices.push(
      `The file has ${all.toLocaleString('en')} columns of numbers besides x; only the first ${MAX_Y_COLUMNS} (${columnName(yColumns[0])} to ${columnName(yColumns[MAX_Y_COLUMNS - 1])}) were loaded, ` +
        `since one file gives at most ${MAX_Y_COLUMNS} traces. To look at others, save the columns you need in a file of their own.`,
    );
  }
  for (const c of yColumns) {
    if (!Number.isInteger(c) || c < 0 || c >= K) {
      return problem(fileName, `Column ${c} cannot be y: the file has ${K} column(s), numbered from 0.`, 'Choose y from the list of columns.');
    }
    if (!dataSet.has(c)) {
      return problem(fileName, `The chosen y, ${columnName(c)}, does not hold numbers.`, 'Choose a column of numbers as y.');
    }
    if (c === xColumn) return problem(fileName, `${columnName(c)} was chosen as both x and y.`, 'Choose a different column for y.');
  }
  const used = new Set([xColumn, ...yColumns]);
  const textColumns: number[] = [];
  for (let c = 0; c < K; c++) if (!dataSet.has(c) && !used.has(c)) textColumns.push(c);

  // Metadata from the lines above the header (or the table).
  const metadata: Record<string, string> = {};
  const preambleEnd = layout.headerIndex >= 0 ? layout.headerIndex : layout.tableIndex;
  for (let i = 0; i < preambleEnd; i++) {
    const [key, value] = metadataEntry(sample[i].text, sample[i].line, dialect.delimiter);
    metadata[key in metadata ? `${key} (line ${sample[i].line})` : key] = value;
  }

  // Data rows. A row is kept when x and at least one y are numbers; a y cell that is not a number
  // leaves a gap (NaN here) in that column only, and is counted for the column's notice.
  const decimal = dialect.decimal;
  const decimalCode = decimal.charCodeAt(0);
  // A stated format without grouping: a sign that is not the decimal sign makes a cell not a number.
  const group = format && !format.grouping ? '\u0000' : groupSign(decimal);
  const xTally = new CellTally();
  const yTallies = yColumns.map(() => new CellTally());
  const readCell = (field: string, tally: CellTally, line: number): number => {
    const v = parseNumber(field, decimal);
    if (!Number.isNaN(v)) {
      if (!tally.decimalSeen && field.indexOf(decimal) !== -1) tally.decimalSeen = true;
      return v;
    }
    if (field.indexOf(group) !== -1) {
      const g = parseGroupedNumber(field, decimal);
      if (g) {
        tally.grouped++;
        if (!tally.groupedFirst) tally.groupedFirst = { line, text: truncate(stripQuotes(field)), value: g.value };
        if (g.certain) tally.certain++;
        else if (!tally.ambiguousFirst) tally.ambiguousFirst = { line, text: truncate(stripQuotes(field)) };
        return g.value;
      }
    }
    return NaN;
  };
  const notNumber = (c: number, field: string) => {
    const why = whyNotNumber(field, decimal);
    return `not a number in ${columnName(c)}: "${truncate(stripQuotes(field))}"${why === 'text' ? '' : ` (${why})`}`;
  };
  const xs = new Column();
  const ys = yColumns.map(() => new Column());
  const skipped: SkippedRow[] = [];
  let skippedCount = 0;
  const skip = (line: number, reason: string, raw: string | (() => string)) => {
    skippedCount++;
    if (skipped.length < MAX_LISTED_SKIPS) skipped.push({ line, reason, text: truncate(typeof raw === 'string' ? raw : raw()) });
  };
  const rowBuffer = new Float64Array(yColumns.length);
  const sink: RowSink = {
    row(line, fields, raw) {
      if (fields.length !== K) {
        skip(line, `has ${fields.length} field${fields.length === 1 ? '' : 's'}; the table has ${K}`, raw);
        return;
      }
      let x = 0;
      if (xColumn >= 0) {
        x = readCell(fields[xColumn], xTally, line);
        if (Number.isNaN(x)) { skip(line, notNumber(xColumn, fields[xColumn]), raw); return; }
      }
      const rowY = rowBuffer;
      let good = 0, firstBad = -1;
      for (let j = 0; j < yColumns.length; j++) {
        const v = readCell(fields[yColumns[j]], yTallies[j], line);
        rowY[j] = v;
        if (Number.isNaN(v)) { if (firstBad < 0) firstBad = j; } else good++;
      }
      if (good === 0) { skip(line, notNumber(yColumns[firstBad], fields[yColumns[firstBad]]), raw); return; }
      if (firstBad >= 0) {
        for (let j = firstBad; j < yColumns.length; j++) {
          if (!Number.isNaN(rowY[j])) continue;
          const t = yTallies[j];
          t.bad++;
          const f = fields[yColumns[j]];
          if (t.badExamples.length < 3) t.badExamples.push({ line, text: truncate(stripQuotes(f)), why: whyNotNumber(f, decimal) });
        }
      }
      xs.push(x);
      for (let j = 0; j < ys.length; j++) ys[j].push(rowY[j]);
    },
    // The common row, read in place: every cell read is a plain number (anything else goes to row()).
    spans(line, t, starts, ends) {
      let x = 0;
      if (xColumn >= 0) {
        x = parseNumberIn(t, starts[xColumn], ends[xColumn], decimal);
        if (Number.isNaN(x)) return false;
      }
      const rowY = rowBuffer;
      for (let j = 0; j < yColumns.length; j++) {
        const c = yColumns[j];
        const v = parseNumberIn(t, starts[c], ends[c], decimal);
        if (Number.isNaN(v)) return false;
        rowY[j] = v;
      }
      if (xColumn >= 0 && !xTally.decimalSeen && holds(t, starts[xColumn], ends[xColumn], decimalCode)) xTally.decimalSeen = true;
      for (let j = 0; j < yColumns.length; j++) {
        const c = yColumns[j];
        if (!yTallies[j].decimalSeen && holds(t, starts[c], ends[c], decimalCode)) yTallies[j].decimalSeen = true;
      }
      xs.push(x);
      for (let j = 0; j < ys.length; j++) ys[j].push(rowY[j]);
      return true;
    },
  };
  const first = sample[layout.tableIndex];
  const hasQuotes = text.indexOf('"', first.start) !== -1;
  const useFast = splitter === 'fast' || splitter === 'lines' || (splitter === 'auto' && !hasQuotes);
  const parseProgress = (f: number) => report(HASH_SHARE + (1 - HASH_SHARE) * f);
  let unclosed = 0;
  if (useFast) readRowsFast(text, first.start, first.line, dialect.delimiter, K, splitter === 'lines' ? { row: sink.row } : sink, parseProgress);
  else unclosed = readRowsPapa(text, first.start, first.line, dialect.delimiter, sink, parseProgress);
  if (unclosed) {
    return problem(
      fileName,
      `Line ${unclosed} opens a quoted field (") that is never closed, so everything after it would be read as one cell.`,
      'Close the quote on that line (or remove it) and load the file again; nothing after it can be read safely as it is.',
      unclosed,
    );
  }

  // Thousands grouping: read only where the whole column settles it.
  const tallied: [number, CellTally][] = [...(xColumn >= 0 ? [[xColumn, xTally] as [number, CellTally]] : []), ...yColumns.map((c, j) => [c, yTallies[j]] as [number, CellTally])];
  const signName = (c: string) => (c === ',' ? 'comma' : 'point');
  for (const [c, t] of tallied) {
    // A format the user stated settles it.
    if (t.ambiguousFirst && t.certain === 0 && !t.decimalSeen && !format) {
      const a = t.ambiguousFirst;
      const asDecimal = Number(a.text.replace(group, '.').replace(/^"|"$/g, ''));
      const asGrouped = parseGroupedNumber(a.text, decimal)?.value;
      return problem(
        fileName,
        `“${a.text}” in ${columnName(c)} could be ${asDecimal} or ${asGrouped}: the file uses a decimal ${signName(decimal)}, and no cell of this column shows whether “${group}” groups thousands or marks decimals.`,
        `State how the numbers are written (the decimal sign, and whether “${group}” groups thousands), or save the file with one decimal sign and no thousands separators (for example ${asGrouped} or ${String(asDecimal).replace('.', decimal)}), then load it again.`,
        a.line,
        { label: `Read “${group}” as a thousands separator (“${a.text}” = ${asGrouped})`, numberFormat: { decimal, grouping: true } },
      );
    }
  }
  for (const [c, t] of tallied) {
    if (t.groupedFirst) {
      const g = t.groupedFirst;
      notices.push(`${capitalise(columnName(c))} groups thousands with “${groupSign(decimal)}” (${t.grouped} cell${t.grouped === 1 ? '' : 's'}; the first at line ${g.line}: “${g.text}” read as ${g.value}).`);
    }
  }

  const rowsRead = xs.length;
  if (rowsRead < MIN_POINTS) {
    const why = skippedCount ? ` (${skippedCount} skipped; the first, line ${skipped[0].line}, ${skipped[0].reason})` : '';
    return problem(
      fileName,
      `Only ${rowsRead} row${rowsRead === 1 ? '' : 's'} of numbers could be read${why}; a trace needs at least ${MIN_POINTS} points.`,
      'Check that this is the whole file and that the data rows hold plain numbers; a longer recording is needed for any processing.',
      skippedCount ? skipped[0].line : first.line,
    );
  }
  if (skippedCount > 0) {
    notices.push(
      `${skippedCount} row${skippedCount === 1 ? ' was' : 's were'} skipped because ${skippedCount === 1 ? 'it' : 'they'} could not be read as numbers (first at line ${skipped[0].line}); see the list of skipped rows.` +
        (skippedCount > skipped.length ? ` Only the first ${skipped.length} are listed.` : ''),
    );
  }
  if (textColumns.length > 0) {
    notices.push(`Not loaded (they do not hold numbers): ${listColumns(textColumns.map(columnName))}.`);
  }

  // x: point index, or the chosen column sorted and made strictly ascending.
  let x = xs.values();
  let yValues = ys.map((c) => c.values());
  if (xColumn < 0) {
    x = new Float64Array(rowsRead);
    for (let i = 0; i < rowsRead; i++) x[i] = i;
    notices.push(
      dataColumns.length === 1
        ? 'The file has one column of numbers, so x is the point index (0, 1, 2, …), not a measured quantity.'
        : 'x is the point index (0, 1, 2, …), as chosen.',
    );
    if (dataColumns.length === 1 && K > 1 && yColumns.length === 1) {
      const y0 = yValues[0];
      let rising = true;
      for (let i = 1; i < y0.length && rising; i++) if (!(y0[i] > y0[i - 1])) rising = false;
      if (rising) {
        notices.push(
          `The only column of numbers, ${columnName(yColumns[0])}, rises at every row like an x axis (time, wavelength), yet it is drawn as the signal against the point index. ` +
            `If the file should hold a signal beside it, check ${listColumns(textColumns.map(columnName))}: no number could be read there.`,
        );
      }
    }
  } else {
    const ordered = orderByX(x, yValues);
    x = ordered.x;
    yValues = ordered.ys;
    notices.push(...ordered.notices);
  }
  if (x.length < MIN_POINTS) {
    return problem(
      fileName,
      `After averaging rows with the same x only ${x.length} distinct x value${x.length === 1 ? '' : 's'} remain; a trace needs at least ${MIN_POINTS}.`,
      'Check that the x column is the right one (for example time, not a run number).',
      first.line,
    );
  }

  // One trace per y column, over the rows where that column holds a number.
  const xHeader = xColumn >= 0 ? headers[xColumn] : { name: 'Point', unit: '' };
  const traces: Trace[] = [];
  const dropped: { c: number; count: number; tally: CellTally }[] = [];
  let largest = 0, largestWhere = '';
  for (let j = 0; j < yColumns.length; j++) {
    const c = yColumns[j];
    const yAll = yValues[j];
    let count = 0;
    for (let i = 0; i < yAll.length; i++) if (!Number.isNaN(yAll[i])) count++;
    if (count < MIN_POINTS) { dropped.push({ c, count, tally: yTallies[j] }); continue; }
    let tx = x, ty = yAll;
    if (count < yAll.length) {
      tx = new Float64Array(count);
      ty = new Float64Array(count);
      for (let i = 0, o = 0; i < yAll.length; i++) if (!Number.isNaN(yAll[i])) { tx[o] = x[i]; ty[o++] = yAll[i]; }
    }
    const t = yTallies[j];
    if (t.bad > 0) {
      const ex = t.badExamples.map((e) => `line ${e.line}: “${e.text}”, ${e.why}`).join('; ');
      notices.push(`${capitalise(columnName(c))}: ${t.bad} cell${t.bad === 1 ? ' is' : 's are'} not a number, so ${t.bad === 1 ? 'that point is' : 'those points are'} left out of this trace only (${ex}${t.bad > t.badExamples.length ? '; …' : ''}).`);
    }
    for (let i = 0; i < ty.length; i++) {
      const a = Math.abs(ty[i]);
      if (a > largest) { largest = a; largestWhere = columnName(c); }
    }
    traces.push(createTrace({
      name: `${fileName}: ${headers[c].name}`,
      x: tx,
      y: ty,
      xName: xHeader.name,
      xUnit: xHeader.unit,
      yName: headers[c].name,
      yUnit: headers[c].unit,
      source: { fileName, sha256, rowsRead, rowsSkipped: skippedCount, yColumn: c },
      metadata,
    }));
  }
  const describeDropped = (d: { c: number; count: number; tally: CellTally }) => {
    const ex = d.tally.badExamples[0];
    return `${columnName(d.c)} holds ${d.count === 0 ? 'no number' : `only ${d.count} number${d.count === 1 ? '' : 's'}`}` +
      (ex ? ` (the first cell that is not one: line ${ex.line}, “${ex.text}”, ${ex.why})` : '');
  };
  if (traces.length === 0) {
    const worst = dropped.reduce((a, b) => (b.count > a.count ? b : a));
    return problem(
      fileName,
      `${capitalise(describeDropped(worst))}; a trace needs at least ${MIN_POINTS} points.`,
      'Check that the column holds the measured values as plain numbers; cells such as NaN, infinity or text cannot be drawn.',
      worst.tally.badExamples[0]?.line ?? first.line,
    );
  }
  for (const d of dropped) notices.push(`${capitalise(describeDropped(d))}, fewer than the ${MIN_POINTS} a trace needs, so it gives no trace.`);
  let xLargest = 0;
  for (let i = 0; i < x.length; i++) xLargest = Math.max(xLargest, Math.abs(x[i]));
  if (xLargest > HUGE_VALUE) { largest = Math.max(largest, xLargest); if (xLargest >= largest) largestWhere = xColumn >= 0 ? columnName(xColumn) : 'x'; }
  if (largest > HUGE_VALUE) {
    notices.push(
      `Values as large as ${largest.toPrecision(3)} in ${largestWhere} are close to the largest number a double can hold, about 1.8e308: their squares overflow, ` +
        'so noise and S/N cannot be measured on them, and sums or differences in processing steps may overflow too. The page says so wherever that happens; such results are never drawn or exported as numbers.',
    );
  }
  const chosen = (options.dialect && (options.dialect.delimiter !== undefined || options.dialect.decimal !== undefined)) || options.numberFormat !== undefined;
  notices.unshift(
    `Read as ${dialectLabel(dialect)} (${decoded.encoding}), decided from ${sample.length} line${sample.length === 1 ? '' : 's'}${chosen ? ' among the readings allowed by the choice given' : ''}; ` +
      `the table starts at line ${first.line}.`,
  );
  if (layout.question) notices.push(`${layout.question.message} It was read the first way; check the plot.`);
  notices.push(...layout.notices);
  const loadReport: LoadReport = {
    fileName,
    sha256,
    format: `delimited text (${dialectLabel(dialect)}, ${decoded.encoding})`,
    rowsRead,
    skipped,
    notices,
    metadata: { ...metadata },
    columns: headers.slice(0, MAX_REPORTED_COLUMNS).map((h) => ({ ...h })),
  };
  if (layout.question) loadReport.questions = [layout.question];
  report(1);
  return { ok: true, traces, report: loadReport };
}

function capitalise(s: string): string {
  return s ? s[0].toUpperCase() + s.slice(1) : s;
}
