/**
 * Delimited-text writer for every CSV the tool produces, safe to open in a
 * spreadsheet.
 *
 * * Quoting follows RFC 4180: a text cell holding the delimiter, a double
 *   quote, a line break (or starting with "#", so no data line can pass for a
 *   comment) is put in double quotes, inner quotes doubled.
 * * Formula injection (OWASP, "CSV Injection"): a TEXT cell beginning with
 *   =, +, -, @, tab or carriage return gets a leading single quote, so a
 *   spreadsheet shows it as text instead of running it. Numbers are never
 *   touched: a negative number is a number.
 * * Numbers are written in the shortest form that reads back to the same
 *   double (ECMAScript Number::toString, exponent as "E"), with the decimal
 *   sign the user chose.
 * * A number that is not finite (NaN, ±Infinity: an overflow, or no value at
 *   that point) is never written as "NaN" or "Infinity": its cell is left
 *   empty, and a comment line says how many cells are empty and in which
 *   columns.
 */

export type CsvDelimiter = ',' | ';' | '\t';
export type CsvDecimal = '.' | ',';

export interface CsvCellOptions {
  delimiter: CsvDelimiter;
  decimal: CsvDecimal;
  /**
   * Significant digits for numbers (1 to 17), for pasting into a report;
   * absent: full precision (every number reads back to the same double).
   */
  digits?: number;
}

/** Choices of significant digits the page offers besides full precision. */
export const CSV_DIGIT_CHOICES: readonly number[] = [3, 4, 5, 6, 8];

/** The comment line that states how numbers are written (every CSV with comment lines carries it). */
export function numbersLine(digits: number | undefined): string {
  return digits === undefined
    ? 'Numbers: full precision (the shortest text that reads back to exactly the same double, so reloading gives the same numbers).'
    : `Numbers: rounded to ${digits} significant digits for pasting into a report; reloading does not give back the numbers of the analysis (export with full precision for that).`;
}

export interface CsvOptions extends CsvCellOptions {
  /** Lines written before the rows, each prefixed "# " (line breaks inside start new comment lines). */
  comments?: string[];
  /** Line ending; default "\r\n" (RFC 4180). */
  newline?: '\n' | '\r\n';
}

const FORMULA_START = /^[=+\-@\t\r]/;
const NUMBER_TEXT = /^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?$/;

function checkOptions(opts: CsvCellOptions): void {
  if (!opts || (opts.delimiter !== ',' && opts.delimiter !== ';' && opts.delimiter !== '\t')) {
    throw new RangeError('The delimiter must be a comma, a semicolon or a tab.');
  }
  if (opts.decimal !== '.' && opts.decimal !== ',') throw new RangeError('The decimal sign must be "." or ",".');
  if (opts.digits !== undefined && !(Number.isInteger(opts.digits) && opts.digits >= 1 && opts.digits <= 17)) {
    throw new RangeError('Significant digits must be a whole number from 1 to 17, or left out for full precision.');
  }
  if (opts.decimal === ',' && opts.delimiter === ',') {
    throw new RangeError('A decimal comma cannot be used with a comma delimiter; choose a semicolon or tab delimiter, or a decimal point.');
  }
}

/**
 * Text of a number that reads back to exactly the same double with
 * `parseFloat` (after a decimal comma is turned back into a point).
 * NaN and ±Infinity give an empty cell: spreadsheets have no such numbers,
 * and an empty cell is how a missing value is usually shown.
 */
export function csvNumber(value: number, decimal: CsvDecimal = '.', digits?: number): string {
  if (!Number.isFinite(value)) return '';
  // Rounded: the shortest text of the rounded double (no trailing zeros from toPrecision).
  const v = digits === undefined ? value : Number(value.toPrecision(digits));
  const text = Object.is(v, -0) ? '-0' : String(v).replace('e', 'E');
  return decimal === ',' ? text.replace('.', ',') : text;
}

/**
 * One cell as it appears in the file.
 *
 * @param value a number (written as a number, never neutralised) or text
 *   (neutralised against formula injection, then quoted when needed)
 * @param opts delimiter and decimal sign; a decimal comma with a comma delimiter is refused
 * @throws RangeError on options that would make the file ambiguous
 */
export function csvCell(value: string | number, opts: CsvCellOptions): string {
  checkOptions(opts);
  if (typeof value === 'number') return csvNumber(value, opts.decimal, opts.digits);
  let text = String(value);
  if (FORMULA_START.test(text)) text = `'${text}`;
  const needsQuotes =
    text.includes(opts.delimiter) || text.includes('"') || text.includes('\n') || text.includes('\r') || text.startsWith('#');
  return needsQuotes ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * A comment line body: a spreadsheet still splits it at the delimiter, so
 * every piece after a delimiter is checked like a text cell (a piece that
 * is a plain number is left alone; leading spaces and quotes are looked past).
 */
function safeComment(text: string, delimiter: CsvDelimiter): string {
  return text
    .split(delimiter)
    .map((piece, i) => {
      if (i === 0) return piece;
      const m = /^([\s"]*)([\s\S]*)$/.exec(piece) as RegExpExecArray;
      const rest = m[2];
      if (FORMULA_START.test(rest) && !NUMBER_TEXT.test(rest.trim())) return `${m[1]}'${rest}`;
      return piece;
    })
    .join(delimiter);
}

/**
 * Write rows as delimited text: comment lines first ("# " + text), then one
 * line per row, cells through {@link csvCell}. Rows may differ in length.
 *
 * @param rows cells: numbers stay numbers, strings are text
 * @param opts delimiter (",", ";" or tab), decimal sign ("." or ","), optional comments and newline
 * @returns the file text, ending with a newline
 * @throws RangeError on a decimal comma with a comma delimiter, or an unknown delimiter
 */
export function writeCsv(rows: (string | number)[][], opts: CsvOptions): string {
  checkOptions(opts);
  if (!Array.isArray(rows)) throw new RangeError('The rows must be a list of rows.');
  const nl = opts.newline ?? '\r\n';
  const lines: string[] = [];
  const comments = [...(opts.comments ?? [])];
  const empty = emptyCellNote(rows);
  // How numbers are written, stated whenever the file has comment lines and holds a number.
  if (opts.comments && rows.some((r) => r.some((c) => typeof c === 'number'))) comments.push(numbersLine(opts.digits));
  if (empty && opts.comments) comments.push(empty);
  for (const comment of comments) {
    for (const part of String(comment).split(/\r\n|\r|\n/)) lines.push(`# ${safeComment(part, opts.delimiter)}`.trimEnd());
  }
  const cellOpts: CsvCellOptions = { delimiter: opts.delimiter, decimal: opts.decimal, digits: opts.digits };
  for (const row of rows) lines.push(row.map((c) => csvCell(c, cellOpts)).join(opts.delimiter));
  return lines.length ? lines.join(nl) + nl : '';
}

/**
 * The comment line for number cells that are not finite (left empty), or
 * null when there are none. Columns are named by the first row when it is
 * a header of text, else by number.
 */
export function emptyCellNote(rows: readonly (readonly (string | number)[])[]): string | null {
  const perColumn = new Map<number, number>();
  let total = 0;
  for (const row of rows) {
    for (let c = 0; c < row.length; c++) {
      const v = row[c];
      if (typeof v === 'number' && !Number.isFinite(v)) { perColumn.set(c, (perColumn.get(c) ?? 0) + 1); total++; }
    }
  }
  if (total === 0) return null;
  const head = rows[0];
  const name = (c: number) => (head && typeof head[c] === 'string' && head[c] !== '' ? `"${head[c]}"` : `column ${c + 1}`);
  const where = [...perColumn].map(([c, n]) => `${n} in ${name(c)}`).join(', ');
  return `Empty cells: ${total} value${total === 1 ? ' was' : 's were'} not a finite number (an overflow, a division by zero, or no value at that point) and ${total === 1 ? 'is' : 'are'} left empty: ${where}.`;
}
