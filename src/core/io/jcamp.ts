/**
 * JCAMP-DX reader: labelled-data-record text files (McDonald & Wilks 1988,
 * Appl. Spectrosc. 42:151; IUPAC revisions 4.24 / 5.01).
 *
 * Read: `##XYDATA=(X++(Y..Y))` (evenly spaced y, x from FIRSTX/LASTX/NPOINTS)
 * and `##XYPOINTS=(XY..XY)` (x, y pairs), in every ordinate form of the
 * standard — AFFN (plain numbers), PAC (numbers run together, signs as
 * separators), SQZ, DIF, DUP and mixtures — with XFACTOR/YFACTOR scaling,
 * the DIF y-check (the first y of a line after a line ending in DIF form
 * repeats that line's last y; a mismatch is an error naming the line), and
 * several blocks in one file (LINK blocks, or several TITLE..END blocks), one
 * trace per block holding data.
 *
 * Decisions (documented here because the standard leaves them to readers):
 * * A wrong NPOINTS is an ERROR, not a notice: x is built from
 *   FIRSTX/LASTX/NPOINTS, so a count that disagrees with the data means the x
 *   of every point is in doubt (usually a truncated or edited file).
 * * A missing NPOINTS is a notice (the decoded count is used).
 * * x is put in order as by every loader ({@link orderByX}): descending x
 *   (common in infrared) or x out of order is sorted, y is averaged over
 *   repeated x (XYPOINTS may repeat an x), each with a notice.
 * * `?` (missing value) in the data is an error: a trace holds finite numbers only.
 * * `E`/`e` directly after an AFFN number and followed by a sign is an exponent
 *   (1.5E-3); otherwise `E`/`e` are the SQZ digits +5/−5.
 * * NTUPLES (NMR/MS pages) and PEAK TABLE (sticks) blocks are not read; a file
 *   holding only those gets a clear message, otherwise a notice.
 * * A repeat count (DUP) may not take a block past its ##NPOINTS= (or past
 *   {@link MAX_JCAMP_POINTS} without one): a 181-byte file asking for 10^8
 *   repeats is refused naming the line, before any memory is taken.
 * * XFACTOR or YFACTOR of 0 is an error naming the line (every value would
 *   be 0); NPOINTS must be a whole number of at least 1.
 * * A data label cut off with the end of the file ("##XYDATA=(X++(Y..") says
 *   the file is cut short, not that the form is unknown.
 */
import { createTrace, TraceError } from '../trace.ts';
import type { Trace } from '../trace.ts';
import type { LoadProblem, LoadResult } from './types.ts';
import { orderByX } from './order-x.ts';

/**
 * A label as the standard compares it: spaces, dashes, slashes and
 * underscores removed, upper case ("Data Type" and "DATATYPE" are the same).
 */
export function jcampLabelKey(label: string): string {
  return label.replace(/[\s\-/_]/g, '').toUpperCase();
}

/**
 * True when the text looks like JCAMP-DX: the first non-blank line is a
 * `##TITLE=` record, or `##JCAMP-DX=` appears within the first 4 kB.
 * Cheap: looks only at the start of the text.
 */
export function looksLikeJcamp(text: string): boolean {
  if (typeof text !== 'string') return false;
  const head = text.slice(0, 4096).replace(/^\uFEFF/, '');
  const firstLine = head.split(/\r\n|\r|\n/).find((l) => l.trim() !== '');
  if (firstLine !== undefined) {
    const m = /^\s*##([^=]*)=/.exec(firstLine);
    if (m && jcampLabelKey(m[1]) === 'TITLE') return true;
  }
  return /##\s*JCAMP[\s\-_/]*DX\s*=/i.test(head);
}

/** One labelled data record with its continuation lines. */
interface Record_ {
  label: string;
  key: string;
  value: string;
  line: number;
  more: { text: string; line: number }[];
}

interface Block {
  index: number;
  title: string;
  line: number;
  parent: Block | null;
  labels: Map<string, Record_>;
  metadata: Record<string, string>;
  data: Record_ | null;
  ended: boolean;
}

/** Thrown inside this module only; turned into a LoadProblem at the top. */
class JcampProblem extends Error {
  constructor(
    readonly problem: string,
    readonly advice: string,
    readonly line?: number,
  ) {
    super(problem);
  }
}

const DATA_KEYS = new Set(['XYDATA', 'XYPOINTS', 'PEAKTABLE', 'NTUPLES', 'DATATABLE']);

// Ordinate-character tables of the compression forms (McDonald & Wilks 1988, Appl. Spectrosc. 42:151).
const SQZ = '@ABCDEFGHI';
const SQZ_NEG = 'abcdefghi';
const DIF = '%JKLMNOPQR';
const DIF_NEG = 'jklmnopqr';
const DUP = 'STUVWXYZs';

type Form = 'AFFN' | 'SQZ' | 'DIF' | 'DUP';
interface Token {
  kind: 'abs' | 'dif' | 'dup';
  form: Form;
  text: string;
}

/** The compressed forms' letters: the token each starts, and the leading digit (with sign) or repeat count the k-th letter stands for. */
const LETTER_CLASSES: readonly { letters: string; kind: Token['kind']; form: Form; digit: (k: number) => string }[] = [
  { letters: SQZ, kind: 'abs', form: 'SQZ', digit: (k) => String(k) },
  { letters: SQZ_NEG, kind: 'abs', form: 'SQZ', digit: (k) => `-${k + 1}` },
  { letters: DIF, kind: 'dif', form: 'DIF', digit: (k) => String(k) },
  { letters: DIF_NEG, kind: 'dif', form: 'DIF', digit: (k) => `-${k + 1}` },
  { letters: DUP, kind: 'dup', form: 'DUP', digit: (k) => String(k + 1) },
];

function stripComment(line: string): string {
  // `$$` starts a comment to the end of the line; look past a leading `##` so `##$$` cannot hide a label.
  const lead = /^\s*##/.exec(line);
  const at = line.indexOf('$$', lead ? lead[0].length : 0);
  return at >= 0 ? line.slice(0, at) : line;
}

function splitRecords(text: string): Record_[] {
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/);
  const records: Record_[] = [];
  let current: Record_ | null = null;
  for (let i = 0; i < lines.length; i++) {
    const raw = stripComment(lines[i]);
    const lineNo = i + 1;
    if (/^\s*##/.test(raw)) {
      const m = /^\s*##([^=]*)=(.*)$/.exec(raw);
      if (!m) {
        throw new JcampProblem(
          `Line ${lineNo} starts with "##" but has no "=": "${raw.trim().slice(0, 60)}".`,
          'Each labelled line must have the form ##LABEL=value; correct or remove this line.',
          lineNo,
        );
      }
      current = { label: m[1].trim(), key: jcampLabelKey(m[1]), value: m[2].trim(), line: lineNo, more: [] };
      records.push(current);
    } else if (current) {
      current.more.push({ text: raw, line: lineNo });
    }
  }
  return records;
}

function valueWithContinuation(r: Record_): string {
  const extra = r.more.map((m) => m.text.trim()).filter((t) => t !== '');
  return [r.value, ...extra].join('\n');
}

function assembleBlocks(records: Record_[]): Block[] {
  const blocks: Block[] = [];
  const stack: Block[] = [];
  const open = (title: string, line: number): Block => {
    const b: Block = {
      index: blocks.length,
      title,
      line,
      parent: stack.length ? stack[stack.length - 1] : null,
      labels: new Map(),
      metadata: {},
      data: null,
      ended: false,
    };
    blocks.push(b);
    stack.push(b);
    return b;
  };
  for (const r of records) {
    if (r.key === '') continue; // `##=` is a comment record
    if (r.key === 'TITLE') {
      const b = open(r.value, r.line);
      b.labels.set(r.key, r);
      b.metadata[r.label] = valueWithContinuation(r);
      continue;
    }
    const top = stack.length ? stack[stack.length - 1] : open('', r.line);
    if (r.key === 'END') {
      top.ended = true;
      stack.pop();
      continue;
    }
    if (DATA_KEYS.has(r.key)) {
      if (top.data) {
        throw new JcampProblem(
          `Line ${r.line}: a second data table (##${r.label}=) in the block that began on line ${top.line}; the first is on line ${top.data.line}.`,
          'Each block may hold one data table; end the block with ##END= before starting another.',
          r.line,
        );
      }
      top.data = r;
      continue;
    }
    top.labels.set(r.key, r);
    top.metadata[r.label] = valueWithContinuation(r);
  }
  return blocks;
}

/** Look a label up in the block, then in the blocks around it (a LINK block's labels apply to its children). */
function findLabel(block: Block, key: string): Record_ | undefined {
  for (let b: Block | null = block; b; b = b.parent) {
    const r = b.labels.get(key);
    if (r) return r;
  }
  return undefined;
}

function numberLabel(block: Block, key: string): { value: number; record: Record_ } | undefined {
  const r = findLabel(block, key);
  if (!r) return undefined;
  const value = parseAffn(r.value);
  if (!Number.isFinite(value)) {
    throw new JcampProblem(
      `##${r.label}= on line ${r.line} is not a number: "${r.value.slice(0, 40)}".`,
      `Write a plain number after ##${r.label}=.`,
      r.line,
    );
  }
  return { value, record: r };
}

function parseAffn(s: string): number {
  const t = s.trim();
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return NaN;
  return Number(t);
}

function tokenise(text: string, line: number): Token[] {
  const tokens: Token[] = [];
  let cur: Token | null = null;
  const flush = () => {
    if (cur) tokens.push(cur);
    cur = null;
  };
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c === ' ' || c === '\t' || c === ',' || c === ';') {
      flush();
      continue;
    }
    if ((c >= '0' && c <= '9') || c === '.') {
      if (cur) (cur as Token).text += c;
      else cur = { kind: 'abs', form: 'AFFN', text: c };
      continue;
    }
    if (c === '+' || c === '-') {
      const t = cur as Token | null;
      if (t && t.form === 'AFFN' && /[eE]$/.test(t.text)) {
        t.text += c;
        continue;
      }
      flush();
      cur = { kind: 'abs', form: 'AFFN', text: c };
      continue;
    }
    if ((c === 'E' || c === 'e') && cur && (cur as Token).form === 'AFFN' && /\d\.?$/.test((cur as Token).text)) {
      const next = text[i + 1];
      if (next === '+' || next === '-') {
        (cur as Token).text += c;
        continue;
      }
    }
    const letter = LETTER_CLASSES.find((l) => l.letters.includes(c));
    if (letter) {
      flush();
      cur = { kind: letter.kind, form: letter.form, text: letter.digit(letter.letters.indexOf(c)) };
    } else if (c === '?') {
      throw new JcampProblem(
        `Line ${line} holds a missing value ("?"); a trace needs a number at every point.`,
        'Replace the "?" with a measured value or cut the trace where it is missing.',
        line,
      );
    } else {
      throw new JcampProblem(
        `Line ${line} holds a character that is not part of any JCAMP-DX number form: "${c}" (position ${i + 1}).`,
        'Check that the data lines were not edited or damaged; only digits, signs, ".", "E" exponents and the SQZ/DIF/DUP letters may appear.',
        line,
      );
    }
  }
  flush();
  return tokens;
}

function tokenValue(t: Token, line: number): number {
  const v = Number(t.text);
  if (!Number.isFinite(v) || t.text === '' || t.text === '+' || t.text === '-') {
    throw new JcampProblem(
      `Line ${line} holds "${t.text}", which is not a number.`,
      'Check the data lines for damage or stray characters.',
      line,
    );
  }
  return v;
}

interface Decoded {
  ys: number[];
  forms: Set<Form>;
  lineStarts: { line: number; x: number; index: number }[];
  dataLines: number;
  lastLine: number;
}

/** Most points read from a block that declares no ##NPOINTS= (a repeat count cannot ask for more). */
export const MAX_JCAMP_POINTS = 10_000_000;

/** The most points a block may hold: its ##NPOINTS= when declared, else {@link MAX_JCAMP_POINTS}. */
interface PointCap {
  max: number;
  /** Where the cap comes from, for messages. */
  from: string;
}

/**
 * Decode `(X++(Y..Y))` lines: an x value, then y values in any mixture of
 * forms. A repeat count (DUP) that would take the block past `cap` is an
 * error naming the line, found before any memory is taken for it.
 */
function decodeXyData(rec: Record_, cap: PointCap): Decoded {
  const ys: number[] = [];
  const forms = new Set<Form>();
  const lineStarts: Decoded['lineStarts'] = [];
  let prevEndedDif = false;
  const lines = dataLinesOf(rec);
  for (const { text, line } of lines) {
    const tokens = tokenise(text, line);
    const first = tokens[0];
    if (first.kind !== 'abs') {
      throw new JcampProblem(
        `Line ${line} does not begin with an x value.`,
        'Each ##XYDATA= line must start with its x value; the line may be damaged.',
        line,
      );
    }
    const lineX = tokenValue(first, line);
    const lineYs: number[] = [];
    let prevKind: 'abs' | 'dif' | null = null;
    let lastDelta = 0;
    for (let t = 1; t < tokens.length; t++) {
      const tok = tokens[t];
      forms.add(tok.form);
      const v = tokenValue(tok, line);
      if (tok.kind === 'abs') {
        lineYs.push(v);
        prevKind = 'abs';
      } else if (tok.kind === 'dif') {
        if (lineYs.length === 0) {
          throw new JcampProblem(
            `Line ${line}: a difference (DIF) value comes before any absolute y value on the line.`,
            'In DIF form each line must start with an absolute y (the y-check value); the line may be damaged.',
            line,
          );
        }
        lastDelta = v;
        lineYs.push(lineYs[lineYs.length - 1] + v);
        prevKind = 'dif';
      } else {
        if (prevKind === null || tokens[t - 1].kind === 'dup' || !Number.isInteger(v) || v < 1) {
          throw new JcampProblem(
            `Line ${line}: a repeat count (DUP) has nothing to repeat or is not a whole number.`,
            'A DUP letter must follow a y value or a difference; the line may be damaged.',
            line,
          );
        }
        // The line may repeat the previous line's last y (the y-check), hence the one extra value allowed.
        if (ys.length + lineYs.length + (v - 1) > cap.max + 1) {
          throw new JcampProblem(
            `The repeat count (DUP) ${v} on line ${line} would give the block ${ys.length + lineYs.length + (v - 1)} values, more than the ${cap.max} ${cap.from}.`,
            'The file is damaged or was written wrongly here; export it again from the instrument.',
            line,
          );
        }
        for (let r = 1; r < v; r++) {
          lineYs.push(prevKind === 'dif' ? lineYs[lineYs.length - 1] + lastDelta : lineYs[lineYs.length - 1]);
        }
      }
    }
    let index = ys.length;
    if (prevEndedDif) {
      // Y-check (McDonald & Wilks 1988): the line repeats the previous line's last y.
      const expected = ys[ys.length - 1];
      if (lineYs.length === 0) {
        throw new JcampProblem(
          `Line ${line} has no y values, but the line before ended in DIF form and so this line must begin with the y-check value ${expected}.`,
          'The file is damaged here; export it again from the instrument.',
          line,
        );
      }
      const got = lineYs[0];
      if (Math.abs(got - expected) > 1e-9 * Math.max(1, Math.abs(got), Math.abs(expected))) {
        throw new JcampProblem(
          `DIF y-check failed on line ${line}: the line begins with ${got}, but the previous line ended at ${expected}.`,
          'A difference value was lost or altered on the previous line; export the file again from the instrument.',
          line,
        );
      }
      lineYs.shift();
      index -= 1;
    }
    lineStarts.push({ line, x: lineX, index });
    for (const y of lineYs) ys.push(y);
    prevEndedDif = prevKind === 'dif';
  }
  return { ys, forms, lineStarts, dataLines: lines.length, lastLine: lines.at(-1)?.line ?? rec.line };
}

/** The lines of a record's data that are not blank, in order. */
function dataLinesOf(rec: Record_): Record_['more'] {
  return rec.more.filter((l) => l.text.trim() !== '');
}

/** Decode `(XY..XY)` lines: x, y pairs separated by commas, semicolons or spaces. */
function decodeXyPoints(rec: Record_): { xs: number[]; ys: number[]; dataLines: number; lastLine: number } {
  const values: number[] = [];
  const lines = dataLinesOf(rec);
  const lastLine = lines.at(-1)?.line ?? rec.line;
  for (const { text, line } of lines) {
    for (const tok of tokenise(text, line)) {
      if (tok.kind !== 'abs') {
        throw new JcampProblem(
          `Line ${line} uses difference or repeat letters (DIF/DUP), which ##${rec.label}= pairs may not use.`,
          'Write the x, y pairs as plain numbers.',
          line,
        );
      }
      values.push(tokenValue(tok, line));
    }
  }
  if (values.length % 2 !== 0) {
    throw new JcampProblem(
      `##${rec.label}= (line ${rec.line}) holds an odd number of values (${values.length}); the last x has no y.`,
      'Each point needs an x and a y; the file may be cut short.',
      lastLine,
    );
  }
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < values.length; i += 2) {
    xs.push(values[i]);
    ys.push(values[i + 1]);
  }
  return { xs, ys, dataLines: lines.length, lastLine };
}

const X_UNITS: Record<string, [string, string]> = {
  '1/CM': ['Wavenumber', 'cm⁻¹'],
  'CM-1': ['Wavenumber', 'cm⁻¹'],
  NANOMETERS: ['Wavelength', 'nm'],
  NM: ['Wavelength', 'nm'],
  MICROMETERS: ['Wavelength', 'µm'],
  SECONDS: ['Time', 's'],
  S: ['Time', 's'],
  MINUTES: ['Time', 'min'],
  MIN: ['Time', 'min'],
  HZ: ['Frequency', 'Hz'],
  PPM: ['Chemical shift', 'ppm'],
  'M/Z': ['m/z', ''],
  'ARBITRARY UNITS': ['x', ''],
};

const Y_UNITS: Record<string, [string, string]> = {
  ABSORBANCE: ['Absorbance', ''],
  TRANSMITTANCE: ['Transmittance', ''],
  REFLECTANCE: ['Reflectance', ''],
  'ARBITRARY UNITS': ['y', ''],
  COUNTS: ['Counts', ''],
};

/** Axis name and unit from a JCAMP-DX unit label (known words mapped, anything else kept as written). */
function axisFromUnit(unit: string | undefined, table: Record<string, [string, string]>, fallback: string): [string, string] {
  if (unit === undefined || unit.trim() === '') return [fallback, ''];
  const known = table[unit.trim().toUpperCase()];
  return known ? [known[0], known[1]] : [fallback, unit.trim()];
}

/** True when `compact` is the start of `form` with the rest missing (a label line cut off with the file). */
function isCutForm(compact: string, form: string): boolean {
  return compact.length < form.length && form.startsWith(compact);
}

function cutLabel(rec: Record_): JcampProblem {
  return new JcampProblem(
    `The file is cut short: it ends inside the ##${rec.label}= label on line ${rec.line} (“${rec.value}”), before any data.`,
    'The export or the copy stopped early; export the file again from the instrument.',
    rec.line,
  );
}

function blockName(b: Block): string {
  return b.title.trim() !== '' ? `"${b.title.trim()}"` : `block ${b.index + 1}`;
}

interface BlockResult {
  trace: Trace;
  forms: string;
  dataLines: number;
}

/**
 * @param subject the block's name in notices about the order of x when the
 *   file holds several data blocks; '' for a file with one, so its notices
 *   read as those of any other format
 */
function readBlock(b: Block, fileName: string, sha256: string, notices: string[], subject: string): BlockResult {
  const rec = b.data as Record_;
  const compact = rec.value.replace(/\s/g, '').toUpperCase();
  const factor = (key: 'XFACTOR' | 'YFACTOR') => {
    const f = numberLabel(b, key);
    if (f && f.value === 0) {
      throw new JcampProblem(
        `##${f.record.label}= on line ${f.record.line} is 0, so every ${key[0].toLowerCase()} value would be 0.`,
        `A scaling factor multiplies every stored value; write the factor the instrument used (1 when the values are stored as they are).`,
        f.record.line,
      );
    }
    return f?.value ?? 1;
  };
  const xFactor = factor('XFACTOR');
  const yFactor = factor('YFACTOR');
  const nPointsLabel = numberLabel(b, 'NPOINTS');
  if (nPointsLabel && !(Number.isInteger(nPointsLabel.value) && nPointsLabel.value >= 1)) {
    throw new JcampProblem(
      `##NPOINTS= on line ${nPointsLabel.record.line} is ${nPointsLabel.value}, not a whole number of points.`,
      'Write the number of points in the data table after ##NPOINTS=.',
      nPointsLabel.record.line,
    );
  }
  const cap: PointCap = nPointsLabel
    ? { max: nPointsLabel.value, from: `points ##NPOINTS= (line ${nPointsLabel.record.line}) declares` }
    : { max: MAX_JCAMP_POINTS, from: 'points this reader takes from a block without ##NPOINTS=' };
  let xs: number[];
  let ys: number[];
  let formsText: string;
  let dataLines: number;
  const cutShort = b.ended ? '' : ' The block has no ##END= line, so the file looks cut short.';

  if (rec.key === 'XYDATA') {
    if (!/^\(X\+\+\(([A-Z])\.\.\1\)\)$/.test(compact)) {
      if (!b.ended && isCutForm(compact, '(X++(Y..Y))')) throw cutLabel(rec);
      throw new JcampProblem(
        `##${rec.label}= on line ${rec.line} has the form "${rec.value}", which this reader does not know; expected (X++(Y..Y)).`,
        'Export the spectrum as (X++(Y..Y)) or as (XY..XY) pairs.',
        rec.line,
      );
    }
    const firstX = numberLabel(b, 'FIRSTX');
    if (!firstX) {
      throw new JcampProblem(
        `${blockName(b)} has ##${rec.label}= but no ##FIRSTX=, so the x of the first point is unknown.`,
        'Add ##FIRSTX= (the x of the first point, in XUNITS) to the block.',
        rec.line,
      );
    }
    const lastX = numberLabel(b, 'LASTX');
    const deltaX = numberLabel(b, 'DELTAX');
    const dec = decodeXyData(rec, cap);
    dataLines = dec.dataLines;
    const n = dec.ys.length;
    if (n === 0) {
      throw new JcampProblem(
        `##${rec.label}= on line ${rec.line} is followed by no data.${cutShort}`,
        'The file is empty after the data label; export it again.',
        rec.line,
      );
    }
    if (nPointsLabel && nPointsLabel.value !== n) {
      throw new JcampProblem(
        `##NPOINTS= (line ${nPointsLabel.record.line}) says ${nPointsLabel.value} points, but ##${rec.label}= holds ${n} y values.${cutShort}`,
        'The x of each point cannot be trusted when the count disagrees; export the file again or correct ##NPOINTS=.',
        nPointsLabel.record.line,
      );
    }
    if (!nPointsLabel) notices.push(`${blockName(b)}: no ##NPOINTS=; the ${n} decoded values were used.`);
    let step: number;
    if (lastX && n > 1) step = (lastX.value - firstX.value) / (n - 1);
    else if (deltaX) step = deltaX.value;
    else {
      throw new JcampProblem(
        `${blockName(b)} has neither ##LASTX= nor ##DELTAX=, so the x spacing is unknown.`,
        'Add ##LASTX= (the x of the last point) to the block.',
        rec.line,
      );
    }
    if (deltaX && lastX && n > 1 && Math.abs(deltaX.value - step) > 0.01 * Math.abs(step)) {
      notices.push(
        `${blockName(b)}: ##DELTAX= ${deltaX.value} differs from (LASTX − FIRSTX)/(NPOINTS − 1) = ${step}; the latter was used.`,
      );
    }
    xs = new Array<number>(n);
    for (let i = 0; i < n; i++) xs[i] = firstX.value + i * step;
    if (lastX && n > 1) xs[n - 1] = lastX.value;
    // Abscissa check: each line's x (× XFACTOR) should sit at its point's place on the grid.
    const tol = Math.abs(step) + 0.5 * Math.abs(xFactor);
    const off = dec.lineStarts.find((s) => s.index < n && Math.abs(s.x * xFactor - xs[s.index]) > tol);
    if (off) {
      notices.push(
        `${blockName(b)}: the x written on line ${off.line} (${off.x * xFactor}) is not where FIRSTX/LASTX put that point (${xs[off.index]}); the x from FIRSTX/LASTX was used.`,
      );
    }
    ys = dec.ys.map((y) => y * yFactor);
    formsText = [...dec.forms].join('/');
  } else if (rec.key === 'XYPOINTS') {
    if (!/^\(XY\.\.XY\)$/.test(compact)) {
      if (!b.ended && isCutForm(compact, '(XY..XY)')) throw cutLabel(rec);
      throw new JcampProblem(
        `##${rec.label}= on line ${rec.line} has the form "${rec.value}", which this reader does not know; expected (XY..XY).`,
        'Export the data as (XY..XY) pairs or as (X++(Y..Y)).',
        rec.line,
      );
    }
    const dec = decodeXyPoints(rec);
    dataLines = dec.dataLines;
    const n = dec.xs.length;
    if (nPointsLabel && nPointsLabel.value !== n) {
      throw new JcampProblem(
        `##NPOINTS= (line ${nPointsLabel.record.line}) says ${nPointsLabel.value} points, but ##${rec.label}= holds ${n} pairs.${cutShort}`,
        'Export the file again or correct ##NPOINTS=.',
        nPointsLabel.record.line,
      );
    }
    xs = dec.xs.map((x) => x * xFactor);
    ys = dec.ys.map((y) => y * yFactor);
    formsText = 'pairs';
  } else {
    throw new Error('readBlock called on a block without XYDATA/XYPOINTS');
  }

  // x in order and repeated x averaged, as every loader does (infrared
  // spectra are usually written high to low wavenumber).
  const pointsRead = xs.length;
  const ordered = orderByX(xs, [ys], subject);
  notices.push(...ordered.notices);

  const [xName0, xUnit] = axisFromUnit(findLabel(b, 'XUNITS')?.value, X_UNITS, 'x');
  const [yName0, yUnit] = axisFromUnit(findLabel(b, 'YUNITS')?.value, Y_UNITS, 'y');
  // Our writer keeps axis names in private labels; prefer them when present.
  const xName = findLabel(b, '$XNAME')?.value || xName0;
  const yName = findLabel(b, '$YNAME')?.value || yName0;
  const metadata: Record<string, string> = {};
  const chain: Block[] = [];
  for (let p: Block | null = b; p; p = p.parent) chain.unshift(p);
  for (const p of chain) Object.assign(metadata, p.metadata);
  let trace: Trace;
  try {
    trace = createTrace({
      name: `${fileName}: ${b.title.trim() !== '' ? b.title.trim() : `block ${b.index + 1}`}`,
      x: ordered.x,
      y: ordered.ys[0],
      xName,
      xUnit,
      yName,
      yUnit,
      source: { fileName, sha256, rowsRead: pointsRead, rowsSkipped: 0 },
      metadata,
    });
  } catch (e) {
    if (e instanceof TraceError) {
      throw new JcampProblem(
        `${blockName(b)} (from line ${b.line}) cannot be a trace: ${e.message}`,
        'Check the data of this block; every point needs a distinct x and a finite y.',
        b.line,
      );
    }
    throw e;
  }
  return { trace, forms: formsText, dataLines };
}

/**
 * Read a JCAMP-DX file into traces, one per block that holds XYDATA or
 * XYPOINTS. Never throws for bad input: a problem comes back as
 * `{ ok: false, error }` naming the label or line.
 *
 * @param text the whole file as text
 * @param fileName the name shown to the user and kept in each trace's source
 * @param sha256 lower-case hex SHA-256 of the file's bytes
 * @returns traces (x ascending, × XFACTOR / YFACTOR applied, units from
 *   XUNITS/YUNITS) and a report whose metadata are the first block's labels;
 *   each trace carries its own block's labels (and those of enclosing LINK
 *   blocks) as metadata.
 */
export function parseJcamp(text: string, fileName: string, sha256: string): LoadResult {
  const fail = (problem: string, advice: string, line?: number): LoadResult => {
    const error: LoadProblem = { fileName, problem, advice };
    if (line !== undefined) error.line = line;
    return { ok: false, error };
  };
  if (typeof text !== 'string') return fail('The file could not be read as text.', 'Choose a JCAMP-DX text file.');
  try {
    const blocks = assembleBlocks(splitRecords(text));
    if (blocks.length === 0) {
      return fail('No ##TITLE= or other labelled line was found; this is not a JCAMP-DX file.', 'Choose a JCAMP-DX file (.jdx, .dx).');
    }
    const notices: string[] = [];
    const traces: Trace[] = [];
    const forms: string[] = [];
    let rowsRead = 0;
    const unread: Block[] = [];
    const readable = blocks.filter((b) => b.data?.key === 'XYDATA' || b.data?.key === 'XYPOINTS').length;
    for (const b of blocks) {
      if (!b.data) continue;
      if (b.data.key !== 'XYDATA' && b.data.key !== 'XYPOINTS') {
        unread.push(b);
        continue;
      }
      const r = readBlock(b, fileName, sha256, notices, readable > 1 ? blockName(b) : '');
      traces.push(r.trace);
      forms.push(r.forms);
      rowsRead += r.dataLines;
    }
    for (const b of unread) {
      const what = b.data?.key === 'PEAKTABLE' ? 'a peak table (sticks, not a continuous trace)' : `##${b.data?.label}= data`;
      if (traces.length > 0) notices.push(`${blockName(b)} holds ${what}, which is not read; it was skipped.`);
    }
    if (traces.length === 0) {
      if (unread.length > 0) {
        const b = unread[0];
        const what = b.data?.key === 'PEAKTABLE' ? 'only a peak table (sticks, not a continuous trace)' : `##${b.data?.label}= data, which this reader does not read`;
        return fail(
          `${blockName(b)} holds ${what}.`,
          'Export the spectrum or chromatogram as ##XYDATA=(X++(Y..Y)) or ##XYPOINTS=(XY..XY).',
          b.data?.line,
        );
      }
      const end = blocks.some((b) => !b.ended) ? ' The file also has no ##END= line, so it may be cut short.' : '';
      return fail(
        `No ##XYDATA= or ##XYPOINTS= data table was found.${end}`,
        'Check that this is the spectrum or chromatogram file and not only its header; export it again if it was cut short.',
      );
    }
    if (blocks.some((b) => !b.ended)) {
      notices.push('The file ends without ##END=; it may be cut short, although every data table held the expected number of points.');
    }
    const version = blocks.map((b) => b.labels.get('JCAMPDX')?.value).find((v) => v !== undefined);
    const uniqueForms = [...new Set(forms)].join(', ');
    return {
      ok: true,
      traces,
      report: {
        fileName,
        sha256,
        format: `JCAMP-DX${version ? ` ${version.split(/\s/)[0]}` : ''} (${traces.length} block${traces.length > 1 ? 's' : ''}; ${uniqueForms})`,
        rowsRead,
        skipped: [],
        notices,
        metadata: { ...blocks[0].metadata },
      },
    };
  } catch (e) {
    if (e instanceof JcampProblem) return fail(e.problem, e.advice, e.line);
    throw e;
  }
}
