/**
 * Our own conversion of text fields to numbers, so the decimal sign is the
 * one the loader decided for the whole file and nothing is guessed per cell.
 *
 * Accepted grammar (after trimming spaces and tabs, and removing one pair of
 * surrounding double quotes):
 *
 *     [+|-] digits [decimal digits] [(e|E) [+|-] digits]
 *
 * with at least one digit before or after the decimal sign, which is either
 * "." or "," (never both in one file). Not accepted, so the cell is reported
 * with the reason from {@link whyNotNumber}: "NaN", "Inf"/"Infinity", empty
 * fields, hexadecimal, "1_000", and values beyond the largest double.
 *
 * Thousands separators are never taken from one cell alone.
 * {@link parseGroupedNumber} reads a cell whose digits are grouped in threes
 * by the other sign ("1.234,5" with a decimal comma, "1,234.5" with a
 * decimal point) and says whether the cell settles it by itself (both signs,
 * or two or more group signs) or could also be a decimal ("1.234"); the
 * delimited-text loader reads such cells only when their whole column is
 * unambiguous and refuses the file otherwise. "1,234.5" unquoted in a
 * comma-delimited file is two fields, "1" and "234.5".
 */

/** The decimal sign used by a whole file. */
export type DecimalSign = '.' | ',';

const SPACE = 32, TAB = 9, QUOTE = 34, PLUS = 43, MINUS = 45, DOT = 46, COMMA = 44;
const ZERO = 48, NINE = 57, LOWER_E = 101, UPPER_E = 69;

/** 10^0 … 10^22: every one an exact double. */
const POW10 = Float64Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

function isDigit(c: number): boolean {
  return c >= ZERO && c <= NINE;
}

/**
 * Convert one field to a number with the given decimal sign.
 *
 * @param field the cell text as split from the line (may carry spaces or quotes)
 * @param decimal "." (default) or ","; the other sign makes the field invalid
 * @returns the value, or NaN when the field is not a number by the grammar
 *   above or overflows to ±Infinity (callers treat NaN as "skip the row").
 */
export function parseNumber(field: string, decimal: DecimalSign = '.'): number {
  return parseNumberIn(field, 0, field.length, decimal);
}

/**
 * {@link parseNumber} of the cell `field[from, to)`, read in place: the
 * delimited-text loader reads data rows this way without cutting them into
 * strings. Same grammar, same value, bit for bit (it is the one
 * implementation; `parseNumber` calls it on the whole string).
 */
export function parseNumberIn(field: string, from: number, to: number, decimal: DecimalSign = '.'): number {
  let start = from;
  let end = to;
  while (start < end && (field.charCodeAt(start) === SPACE || field.charCodeAt(start) === TAB)) start++;
  while (end > start && (field.charCodeAt(end - 1) === SPACE || field.charCodeAt(end - 1) === TAB)) end--;
  if (end - start >= 2 && field.charCodeAt(start) === QUOTE && field.charCodeAt(end - 1) === QUOTE) {
    start++;
    end--;
    while (start < end && (field.charCodeAt(start) === SPACE || field.charCodeAt(start) === TAB)) start++;
    while (end > start && (field.charCodeAt(end - 1) === SPACE || field.charCodeAt(end - 1) === TAB)) end--;
  }
  if (start >= end) return NaN;
  const decimalCode = decimal === ',' ? COMMA : DOT;
  let i = start;
  let c = field.charCodeAt(i);
  if (c === PLUS || c === MINUS) i++;
  // One pass: the digits' integer m (exact while there are at most 15 digits) and how many follow the decimal sign.
  let digits = 0, m = 0, fraction = 0;
  for (; i < end; i++) {
    const d = field.charCodeAt(i) - ZERO;
    if (d < 0 || d > 9) break;
    m = m * 10 + d;
    digits++;
  }
  let decimalAt = -1;
  if (i < end && field.charCodeAt(i) === decimalCode) {
    decimalAt = i;
    for (i++; i < end; i++) {
      const d = field.charCodeAt(i) - ZERO;
      if (d < 0 || d > 9) break;
      m = m * 10 + d;
      digits++;
      fraction++;
    }
  }
  if (digits === 0) return NaN;
  let exponent = 0;
  if (i < end) {
    c = field.charCodeAt(i);
    if (c !== LOWER_E && c !== UPPER_E) return NaN;
    i++;
    let expSign = 1;
    if (i < end && (field.charCodeAt(i) === PLUS || field.charCodeAt(i) === MINUS)) { if (field.charCodeAt(i) === MINUS) expSign = -1; i++; }
    let expDigits = 0;
    while (i < end && isDigit(field.charCodeAt(i))) { if (exponent < 1e6) exponent = exponent * 10 + (field.charCodeAt(i) - ZERO); i++; expDigits++; }
    if (expDigits === 0 || i < end) return NaN;
    exponent *= expSign;
  }
  // Exact fast path (Clinger 1990, "How to read floating point numbers accurately", PLDI): when the
  // digits form an integer m below 2^53 and the power of ten k is at most 22 in size, both m and
  // 10^k are exact doubles, so one IEEE multiplication or division gives the correctly rounded
  // value, the same as Number(). Most instrument files take this path; the rest fall through.
  if (digits <= 15) {
    const power = exponent - fraction;
    const negative = field.charCodeAt(start) === MINUS;
    if (power >= 0 && power <= 22) { const v = m * POW10[power]; return negative ? -v : v; }
    if (power < 0 && power >= -22) { const v = m / POW10[-power]; return negative ? -v : v; }
  }
  let cell = start === 0 && end === field.length ? field : field.slice(start, end);
  if (decimalAt >= 0 && decimal === ',') {
    const at = decimalAt - start;
    cell = cell.slice(0, at) + '.' + cell.slice(at + 1);
  }
  // The grammar above is a subset of JavaScript's numeric literal syntax, so Number() rounds correctly.
  const value = Number(cell);
  return Number.isFinite(value) ? value : NaN;
}

/** A cell read with thousands grouping (see {@link parseGroupedNumber}). */
export interface GroupedNumber {
  value: number;
  /** True when the cell settles the reading by itself: it holds the decimal sign too, or two or more group signs. */
  certain: boolean;
}

/**
 * Read a cell whose integer digits are grouped in threes by the sign that is
 * not the decimal sign: "1.234,5" and "1.234.567" with a decimal comma,
 * "1,234.5" and "1,234,567" with a decimal point; optional sign, decimal
 * part and exponent as in {@link parseNumber}; spaces and one pair of quotes
 * around it are ignored. Returns null for anything else (plain numbers
 * included: call {@link parseNumber} first).
 */
export function parseGroupedNumber(field: string, decimal: DecimalSign = '.'): GroupedNumber | null {
  let t = field.trim();
  if (t.length >= 2 && t.startsWith('"') && t.endsWith('"')) t = t.slice(1, -1).trim();
  const g = decimal === ',' ? '\\.' : ',';
  const d = decimal === ',' ? ',' : '\\.';
  const m = new RegExp(`^([+-]?)(\\d{1,3}(?:${g}\\d{3})+)(?:${d}(\\d*))?([eE][+-]?\\d+)?$`).exec(t);
  if (!m) return null;
  const groups = m[2].split(decimal === ',' ? '.' : ',').length - 1;
  const digits = m[2].replace(/[.,]/g, '');
  const value = Number(`${m[1]}${digits}${m[3] !== undefined ? `.${m[3]}` : ''}${m[4] ?? ''}`);
  if (!Number.isFinite(value)) return null;
  return { value, certain: m[3] !== undefined || groups >= 2 };
}

/** The largest finite double, written as people read it. */
const LARGEST = '1.8e308';

/**
 * Why a cell is not a number, in a few words for a message: "empty",
 * "a NaN marker", "infinite", "beyond the largest number a double can
 * hold, about 1.8e308", "hexadecimal", "has a digit separator “_”", "has thousands
 * separators", "uses the other decimal sign", or "text".
 */
export function whyNotNumber(field: string, decimal: DecimalSign = '.'): string {
  let t = field.trim();
  if (t.length >= 2 && t.startsWith('"') && t.endsWith('"')) t = t.slice(1, -1).trim();
  if (t === '') return 'empty';
  if (/^[+-]?nan$/i.test(t)) return 'a NaN marker';
  if (/^[+-]?(inf|infinity|∞)$/i.test(t)) return 'infinite';
  if (/^[+-]?0x[0-9a-f]+$/i.test(t)) return 'hexadecimal';
  if (/^[+-]?0b[01]+$/i.test(t)) return 'binary notation';
  if (/^[+-]?[\d.,]*\d[\d.,]*(e[+-]?\d+)?$/i.test(t)) {
    const plain = t.replace(decimal === ',' ? /,/ : /^$/, '.');
    if (/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(plain) && !Number.isFinite(Number(plain))) return `beyond the largest number a double can hold, about ${LARGEST}`;
    if (/[.,].*[.,]/.test(t)) return 'has thousands separators that do not fit the file';
    return decimal === ',' ? 'uses a decimal point, but the file uses a decimal comma' : 'uses a decimal comma, but the file uses a decimal point';
  }
  if (/^[+-]?[\d_]+([.,]\d*)?$/.test(t) && t.includes('_')) return 'has a digit separator “_”';
  if (/^[+-]?[\d '’]+([.,]\d*)?$/.test(t) && /\d[ '’]\d/.test(t)) return 'has spaces or apostrophes between digits';
  if (/^[+-]?\d/.test(t)) return 'a number followed by text (a unit in the cell?)';
  return 'text';
}

/** True when a cell that is not a number looks like one that went wrong (NaN, infinity, overflow, hexadecimal, separators), not like words. */
export function looksNumeric(field: string, decimal: DecimalSign = '.'): boolean {
  const why = whyNotNumber(field, decimal);
  return why !== 'text' && why !== 'empty';
}
