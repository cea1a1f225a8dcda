/**
 * Small user tables as text: a CSV file or cells pasted from a spreadsheet.
 * Shared by the named-peak table and the standards' amounts.
 *
 * Rules (our own, stated in messages): a byte-order mark is dropped; blank
 * lines and lines starting with "#" are skipped; the first other line is the
 * header. The delimiter is read from the header: tab if it holds a tab (what
 * spreadsheets put on the clipboard), else semicolon if it holds one, else
 * comma. Numbers use a decimal point, or a decimal comma when the delimiter
 * is not a comma and the cells use commas; a table that mixes both is refused.
 * Fields may be quoted ("a, b"), as in CSV. Line numbers in messages count
 * every line of the text from 1.
 */
import { splitFields } from '../io/delimited.ts';
import { parseNumber } from '../io/numbers.ts';
import type { DecimalSign } from '../io/numbers.ts';

/** A problem at a place in a user's table. */
export interface TableProblem {
  /** File name, or a label such as "pasted table". */
  readonly fileName: string;
  /** 1-based line, or null when the problem is about the whole table. */
  readonly line: number | null;
  /** What is wrong and what to do, in a sentence or two. */
  readonly problem: string;
}

/** "standards.csv, line 4: …" */
export function tableProblemText(p: TableProblem): string {
  return `${p.fileName}${p.line !== null ? `, line ${p.line}` : ''}: ${p.problem}`;
}

export interface TextTableRow {
  readonly line: number;
  readonly cells: readonly string[];
}

export interface TextTable {
  readonly header: TextTableRow;
  readonly rows: readonly TextTableRow[];
  readonly delimiter: ',' | ';' | '\t';
  readonly decimal: DecimalSign;
}

/** Largest table text accepted, characters. */
export const TABLE_MAX_CHARS = 1_000_000;
/** Most data rows accepted. */
export const TABLE_MAX_ROWS = 10_000;


function cleanCell(cell: string): string {
  return cell.trim();
}

/**
 * Split table text into a header and rows (see the module comment).
 * @param what the table's name for messages, e.g. "named-peak table"
 */
export function readTextTable(text: string, fileName: string, what: string): { ok: true; table: TextTable } | { ok: false; problems: TableProblem[] } {
  if (text.length > TABLE_MAX_CHARS) {
    return { ok: false, problems: [{ fileName, line: null, problem: `The ${what} is ${text.length} characters long; at most ${TABLE_MAX_CHARS} are read. Is this the right file?` }] };
  }
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  if (body.includes('\u0000')) {
    return { ok: false, problems: [{ fileName, line: null, problem: `The ${what} holds binary data (zero bytes); save it as plain text (CSV).` }] };
  }
  const lines = body.split(/\r\n|\n|\r/);
  const kept: { line: number; text: string }[] = [];
  lines.forEach((l, i) => {
    const t = l.trim();
    if (t === '' || t.startsWith('#') || /^[,;\t\s]*$/.test(t)) return;
    kept.push({ line: i + 1, text: l });
  });
  if (kept.length === 0) return { ok: false, problems: [{ fileName, line: null, problem: `The ${what} is empty: it needs a header line and at least one row.` }] };
  if (kept.length - 1 > TABLE_MAX_ROWS) {
    return { ok: false, problems: [{ fileName, line: null, problem: `The ${what} has ${kept.length - 1} rows; at most ${TABLE_MAX_ROWS} are read.` }] };
  }
  const head = kept[0].text;
  const delimiter: ',' | ';' | '\t' = head.includes('\t') ? '\t' : head.includes(';') ? ';' : ',';
  const split = (t: string) => splitFields(t, delimiter).map(cleanCell);
  const header = { line: kept[0].line, cells: split(head) };
  const rows = kept.slice(1).map((k) => ({ line: k.line, cells: split(k.text) }));

  let decimal: DecimalSign = '.';
  if (delimiter !== ',') {
    let commaOnly: TextTableRow | null = null, pointOnly: TextTableRow | null = null;
    for (const r of rows) {
      for (const c of r.cells) {
        const withPoint = !Number.isNaN(parseNumber(c, '.'));
        const withComma = !Number.isNaN(parseNumber(c, ','));
        if (withComma && !withPoint && !commaOnly) commaOnly = r;
        if (withPoint && !withComma && !pointOnly) pointOnly = r;
      }
    }
    if (commaOnly && pointOnly) {
      return {
        ok: false,
        problems: [{
          fileName, line: pointOnly.line,
          problem: `The ${what} mixes decimal commas (line ${commaOnly.line}) and decimal points (line ${pointOnly.line}); use one decimal sign throughout.`,
        }],
      };
    }
    if (commaOnly) decimal = ',';
  }
  return { ok: true, table: { header, rows, delimiter, decimal } };
}

/** A cell as a number with the table's decimal sign; NaN when it is not one. */
export function tableNumber(cell: string, t: TextTable): number {
  return parseNumber(cell, t.decimal);
}
