/**
 * Looking at raw bytes before parsing: known binary formats by their magic
 * numbers, binary content in general, and the text encoding (UTF-8 with or
 * without byte-order mark, UTF-16 with a byte-order mark, Latin-1 fallback).
 *
 * Magic numbers from each format's specification: PNG (ISO/IEC 15948,
 * section 5.2), ZIP (PKWARE APPNOTE.TXT, 4.3.7), PDF (ISO 32000-1, 7.5.2),
 * gzip (RFC 1952, 2.3.1), HDF5 (HDF5 File Format Specification, superblock
 * signature), OLE2 compound file (MS-CFB, 2.2), JPEG (ITU-T T.81, SOI marker),
 * netCDF classic (Unidata netCDF classic format specification).
 */

import { MAX_LINE_BYTES } from './types.ts';
import type { LoadProblem } from './types.ts';

/** What the page understands, for messages that refuse a file. */
export const UNDERSTOOD_FORMATS =
  'delimited text (CSV, semicolon, tab or space separated; UTF-8, UTF-16 or UTF-32 with byte-order mark, or Latin-1), JCAMP-DX text, and netCDF classic (.cdf, .nc)';

/** A recognised binary format the page does not read, with advice for the user. */
export interface BinaryKind {
  /** Plain name, e.g. "a PNG image". */
  format: string;
  /** The whole sentence, when "This is ⟨format⟩, not a file of measured values …" does not fit. */
  problem?: string;
  /** What the user can do instead. */
  advice: string;
}

function startsWith(bytes: Uint8Array, magic: readonly number[]): boolean {
  if (bytes.length < magic.length) return false;
  for (let i = 0; i < magic.length; i++) if (bytes[i] !== magic[i]) return false;
  return true;
}

const EXPORT_ADVICE = `Export the trace from the instrument software as text (CSV) and load that. The page reads ${UNDERSTOOD_FORMATS}.`;

/**
 * Recognise a binary format the page does not read, by its leading bytes.
 * Returns null for anything else (including netCDF classic, which is read).
 */
export function sniffBinaryFormat(bytes: Uint8Array): BinaryKind | null {
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) {
    return { format: 'a PNG image', advice: `A picture of a trace cannot be read as data. ${EXPORT_ADVICE}` };
  }
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) {
    return { format: 'a JPEG image', advice: `A picture of a trace cannot be read as data. ${EXPORT_ADVICE}` };
  }
  if (startsWith(bytes, [0x50, 0x4b, 0x03, 0x04]) || startsWith(bytes, [0x50, 0x4b, 0x05, 0x06]) || startsWith(bytes, [0x50, 0x4b, 0x07, 0x08])) {
    return {
      format: 'a ZIP archive (a spreadsheet workbook such as .xlsx or .ods is one)',
      advice: `Unzip it and load the text file inside, or save the sheet as CSV. The page reads ${UNDERSTOOD_FORMATS}.`,
    };
  }
  if (startsWith(bytes, [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1])) {
    return {
      format: 'an older Office document (for example an .xls workbook)',
      advice: `Save the sheet as CSV and load that. The page reads ${UNDERSTOOD_FORMATS}.`,
    };
  }
  if (startsWith(bytes, [0x25, 0x50, 0x44, 0x46, 0x2d])) {
    return { format: 'a PDF document', advice: `A report cannot be read as data. ${EXPORT_ADVICE}` };
  }
  if (startsWith(bytes, [0x1f, 0x8b])) {
    return {
      format: 'a gzip-compressed file',
      advice: `Decompress it first (for example with gunzip or 7-Zip) and load the file inside. The page reads ${UNDERSTOOD_FORMATS}.`,
    };
  }
  if (startsWith(bytes, [0x43, 0x44, 0x46]) && bytes.length >= 4 && bytes[3] !== 1 && bytes[3] !== 2) {
    const v = bytes[3];
    return {
      format: `netCDF format version ${v}`,
      problem: `This is a netCDF file of format version ${v}${v === 5 ? ' (CDF-5, the 64-bit data format)' : ''}, which this page does not read.`,
      advice: `The page reads netCDF classic (version 1) and 64-bit offset (version 2) files. Save the file in one of those (for example with nccopy -k classic) or export CSV. The page reads ${UNDERSTOOD_FORMATS}.`,
    };
  }
  if (startsWith(bytes, [0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a])) {
    return {
      format: 'an HDF5 file (netCDF-4 files are HDF5)',
      advice: `Save it as netCDF classic (netCDF-3) or as CSV. The page reads ${UNDERSTOOD_FORMATS}.`,
    };
  }
  return null;
}

/** Bytes looked at when deciding whether unknown content is binary. */
const SNIFF_BYTES = 65536;

/**
 * Decide whether bytes without a recognised magic number are binary rather
 * than text: any NUL byte in the first 64 KiB (text in UTF-8 or Latin-1
 * never has one; UTF-16 with a byte-order mark is checked before this), or
 * more than 10 % control characters other than tab, line feed, form feed and
 * carriage return (common practice in file-type sniffers).
 *
 * @returns a sentence saying why the content looks binary, or null for text
 */
export function binaryReason(bytes: Uint8Array): string | null {
  const n = Math.min(bytes.length, SNIFF_BYTES);
  if (n === 0) return null;
  let nul = 0, nulEven = 0, control = 0, firstNul = -1;
  for (let i = 0; i < n; i++) {
    const b = bytes[i];
    if (b === 0) {
      nul++;
      if ((i & 1) === 0) nulEven++;
      if (firstNul < 0) firstNul = i;
    } else if (b < 32 && b !== 9 && b !== 10 && b !== 12 && b !== 13) {
      control++;
    }
  }
  if (nul > 0) {
    // UTF-32 text of mostly ASCII characters has three zeros in every four bytes.
    if (n >= 16 && nul >= n * 0.6) {
      let zeroAt = [0, 0, 0, 0];
      for (let i = 0; i < n; i++) if (bytes[i] === 0) zeroAt[i & 3]++;
      zeroAt = zeroAt.map((z) => z / Math.floor(n / 4));
      const le = zeroAt[0] < 0.2 && zeroAt[1] > 0.8 && zeroAt[2] > 0.8 && zeroAt[3] > 0.8;
      const be = zeroAt[3] < 0.2 && zeroAt[0] > 0.8 && zeroAt[1] > 0.8 && zeroAt[2] > 0.8;
      if (le || be) return `It looks like UTF-32${le ? 'LE' : 'BE'} text without a byte-order mark, which cannot be told apart from binary data safely.`;
    }
    // UTF-16 text of mostly ASCII characters has a zero in every other byte.
    if (nul >= n * 0.3 && (nulEven > nul * 0.9 || nulEven < nul * 0.1)) {
      return 'It looks like UTF-16 text without a byte-order mark, which cannot be told apart from binary data safely.';
    }
    return `It contains NUL bytes (the first at byte ${firstNul + 1}), which text files never have.`;
  }
  if (control > n * 0.1) return `${Math.round((100 * control) / n)} % of its first bytes are control characters, not text.`;
  return null;
}

/** The text of a file and how it was decoded. */
export interface DecodedText {
  text: string;
  /** e.g. "UTF-8", "UTF-8 with byte-order mark", "UTF-16LE", "Latin-1". */
  encoding: string;
  /** Sentences for the load report (fallback decoding). */
  notices: string[];
}

interface TextDecoderLike {
  decode(input: Uint8Array): string;
}
type TextDecoderConstructor = new (label?: string, options?: { fatal?: boolean }) => TextDecoderLike;

// TextDecoder exists at run time in browsers, workers and Node, but not in lib ES2022; reach it without the DOM types.
const NativeTextDecoder = (globalThis as unknown as { TextDecoder?: TextDecoderConstructor }).TextDecoder;

/** Turn an array of UTF-16 code units into a string without overflowing the call stack. */
function codeUnitsToString(units: Uint16Array, length: number): string {
  const parts: string[] = [];
  const chunk = 8192;
  for (let i = 0; i < length; i += chunk) {
    parts.push(String.fromCharCode.apply(null, Array.from(units.subarray(i, Math.min(length, i + chunk)))));
  }
  return parts.join('');
}

/**
 * Position of the first byte that breaks UTF-8 (RFC 3629 section 4: no
 * overlong forms, no surrogates, nothing above U+10FFFF), or -1 when all of
 * `bytes` is valid UTF-8. A sequence cut off at the end counts as invalid.
 */
export function utf8InvalidAt(bytes: Uint8Array): number {
  const n = bytes.length;
  let i = 0;
  while (i < n) {
    const b = bytes[i];
    if (b < 0x80) { i++; continue; }
    let need: number, min: number, max = 0xbf;
    if (b >= 0xc2 && b <= 0xdf) { need = 1; min = 0x80; }
    else if (b === 0xe0) { need = 2; min = 0xa0; }
    else if (b === 0xed) { need = 2; min = 0x80; max = 0x9f; }
    else if (b >= 0xe1 && b <= 0xef) { need = 2; min = 0x80; }
    else if (b === 0xf0) { need = 3; min = 0x90; }
    else if (b >= 0xf1 && b <= 0xf3) { need = 3; min = 0x80; }
    else if (b === 0xf4) { need = 3; min = 0x80; max = 0x8f; }
    else return i;
    if (i + need >= n) return i;
    const b1 = bytes[i + 1];
    if (b1 < min || b1 > max) return i;
    for (let k = 2; k <= need; k++) {
      const bk = bytes[i + k];
      if (bk < 0x80 || bk > 0xbf) return i;
    }
    i += need + 1;
  }
  return -1;
}

/**
 * Decode valid UTF-8 to a string with our own code (used where TextDecoder is
 * missing). Returns null when the bytes are not valid UTF-8.
 */
export function utf8Decode(bytes: Uint8Array): string | null {
  if (utf8InvalidAt(bytes) >= 0) return null;
  const units = new Uint16Array(bytes.length);
  let u = 0;
  const n = bytes.length;
  for (let i = 0; i < n;) {
    const b = bytes[i];
    let cp: number;
    if (b < 0x80) { cp = b; i += 1; }
    else if (b < 0xe0) { cp = ((b & 0x1f) << 6) | (bytes[i + 1] & 0x3f); i += 2; }
    else if (b < 0xf0) { cp = ((b & 0x0f) << 12) | ((bytes[i + 1] & 0x3f) << 6) | (bytes[i + 2] & 0x3f); i += 3; }
    else {
      cp = ((b & 0x07) << 18) | ((bytes[i + 1] & 0x3f) << 12) | ((bytes[i + 2] & 0x3f) << 6) | (bytes[i + 3] & 0x3f);
      i += 4;
    }
    if (cp >= 0x10000) {
      cp -= 0x10000;
      units[u++] = 0xd800 + (cp >> 10);
      units[u++] = 0xdc00 + (cp & 0x3ff);
    } else {
      units[u++] = cp;
    }
  }
  return codeUnitsToString(units, u);
}

/** Decode Latin-1 (ISO 8859-1): every byte is the code point of the same value. */
export function latin1Decode(bytes: Uint8Array): string {
  const units = new Uint16Array(bytes.length);
  units.set(bytes);
  return codeUnitsToString(units, bytes.length);
}

function utf32Decode(bytes: Uint8Array, littleEndian: boolean): { text: string; bad: number } {
  const count = Math.floor(bytes.length / 4);
  const units = new Uint16Array(count * 2);
  let u = 0, bad = 0;
  for (let i = 0; i < count; i++) {
    const o = 4 * i;
    const cp = littleEndian
      ? (bytes[o] | (bytes[o + 1] << 8) | (bytes[o + 2] << 16) | (bytes[o + 3] << 24)) >>> 0
      : ((bytes[o] << 24) | (bytes[o + 1] << 16) | (bytes[o + 2] << 8) | bytes[o + 3]) >>> 0;
    if (cp > 0x10ffff || (cp >= 0xd800 && cp <= 0xdfff)) { units[u++] = 0xfffd; bad++; continue; }
    if (cp >= 0x10000) {
      const c = cp - 0x10000;
      units[u++] = 0xd800 + (c >> 10);
      units[u++] = 0xdc00 + (c & 0x3ff);
    } else {
      units[u++] = cp;
    }
  }
  return { text: codeUnitsToString(units, u), bad };
}

function utf16Decode(bytes: Uint8Array, littleEndian: boolean): string {
  const count = Math.floor(bytes.length / 2);
  const units = new Uint16Array(count);
  for (let i = 0; i < count; i++) {
    const a = bytes[2 * i], b = bytes[2 * i + 1];
    units[i] = littleEndian ? a | (b << 8) : (a << 8) | b;
  }
  return codeUnitsToString(units, count);
}

/** 1-based line number of byte offset `at` (counting LF, CR LF and lone CR as one break). */
function lineOfByte(bytes: Uint8Array, at: number): number {
  let line = 1;
  for (let i = 0; i < at; i++) {
    if (bytes[i] === 10) line++;
    else if (bytes[i] === 13 && bytes[i + 1] !== 10) line++;
  }
  return line;
}

/**
 * Decode file bytes to text. A UTF-8 byte-order mark is removed; UTF-16
 * (little or big endian) is decoded when it starts with its byte-order mark;
 * otherwise the bytes must be valid UTF-8, and when they are not the file is
 * read as Latin-1 (ISO 8859-1) with a notice naming the first bad byte.
 * The input is never changed.
 */
export function decodeText(bytes: Uint8Array): DecodedText {
  if (startsWith(bytes, [0xef, 0xbb, 0xbf])) {
    const inner = decodeText(bytes.subarray(3));
    if (inner.encoding === 'UTF-8') return { ...inner, encoding: 'UTF-8 with byte-order mark' };
    return inner;
  }
  // UTF-32 first: its little-endian mark begins with the UTF-16 one (Unicode Standard, 23.8).
  if (startsWith(bytes, [0xff, 0xfe, 0x00, 0x00]) || startsWith(bytes, [0x00, 0x00, 0xfe, 0xff])) {
    const little = bytes[0] === 0xff;
    const encoding = little ? 'UTF-32LE' : 'UTF-32BE';
    const { text, bad } = utf32Decode(bytes.subarray(4), little);
    const notices = [`The file is ${encoding} text (it starts with a byte-order mark); it was decoded as such.`];
    if (bytes.length % 4 !== 0) notices.push(`The file's length is not a whole number of 4-byte characters, so its last ${bytes.length % 4} byte(s) were ignored.`);
    if (bad > 0) notices.push(`${bad} value(s) are not Unicode characters and were replaced by “�”.`);
    return { text, encoding, notices };
  }
  if (startsWith(bytes, [0xff, 0xfe]) || startsWith(bytes, [0xfe, 0xff])) {
    const little = bytes[0] === 0xff;
    const encoding = little ? 'UTF-16LE' : 'UTF-16BE';
    const notices = [`The file is ${encoding} text (it starts with a byte-order mark); it was decoded as such.`];
    if (bytes.length % 2 === 1) notices.push('The file has an odd number of bytes, so its last byte was ignored.');
    return { text: utf16Decode(bytes.subarray(2), little), encoding, notices };
  }
  let text: string | null;
  if (NativeTextDecoder) {
    try {
      text = new NativeTextDecoder('utf-8', { fatal: true }).decode(bytes);
    } catch {
      text = null;
    }
  } else {
    text = utf8Decode(bytes);
  }
  if (text !== null) return { text, encoding: 'UTF-8', notices: [] };
  const bad = utf8InvalidAt(bytes);
  return {
    text: latin1Decode(bytes),
    encoding: 'Latin-1',
    notices: [
      `The file is not valid UTF-8 (first bad byte at line ${lineOfByte(bytes, bad)}), so it was read as Latin-1 (ISO 8859-1). ` +
        'Check that names and units with accents or symbols such as ° look right; saving the file as UTF-8 avoids the guess.',
    ],
  };
}

/** True when the bytes start with a UTF-16 or UTF-32 byte-order mark (such text has NUL bytes, yet is text). */
export function hasWideTextMark(bytes: Uint8Array): boolean {
  return startsWith(bytes, [0xff, 0xfe]) || startsWith(bytes, [0xfe, 0xff]) || startsWith(bytes, [0x00, 0x00, 0xfe, 0xff]);
}

/**
 * The first line longer than `limit` bytes, or null. Lines end at LF, CR LF
 * or a lone CR, numbered from 1 as the loaders number them. Uses the
 * native byte search, so a 400 MB file is scanned in well under a second.
 */
export function overlongLine(bytes: Uint8Array, limit: number = MAX_LINE_BYTES): { line: number; start: number; length: number } | null {
  const n = bytes.length;
  if (n <= limit) return null;
  // First only whether there is one, a window at a time: a line that starts at pos and is at most
  // `limit` long ends within bytes[pos … pos + limit], so every line up to the last break in that
  // window is short enough. A window without a break starts an overlong line: only then are the
  // lines counted one by one (below) to name it.
  let pos = 0;
  for (;;) {
    if (n - pos <= limit) return null;
    const window = bytes.subarray(pos, pos + limit + 1);
    const last = Math.max(window.lastIndexOf(10), window.lastIndexOf(13));
    if (last === -1) break;
    pos += last + 1;
  }
  return firstOverlongLine(bytes, limit);
}

/** {@link overlongLine} by counting every line. */
function firstOverlongLine(bytes: Uint8Array, limit: number): { line: number; start: number; length: number } | null {
  const n = bytes.length;
  let pos = 0, line = 1;
  let nextLf = -2, nextCr = -2;
  while (pos < n) {
    if (nextLf !== -1 && nextLf < pos) nextLf = bytes.indexOf(10, pos);
    if (nextCr !== -1 && nextCr < pos) nextCr = bytes.indexOf(13, pos);
    let end: number, after: number;
    if (nextCr !== -1 && (nextLf === -1 || nextCr < nextLf)) { end = nextCr; after = nextLf === nextCr + 1 ? nextCr + 2 : nextCr + 1; }
    else if (nextLf !== -1) { end = nextLf; after = nextLf + 1; }
    else { end = n; after = n; }
    if (end - pos > limit) return { line, start: pos, length: end - pos };
    pos = after;
    line++;
  }
  return null;
}

/** A load problem for a line over {@link MAX_LINE_BYTES}, or null. */
export function overlongLineProblem(bytes: Uint8Array, fileName: string, limit: number = MAX_LINE_BYTES): LoadProblem | null {
  const long = overlongLine(bytes, limit);
  if (!long) return null;
  const mb = (v: number) => `${(v / 1048576).toFixed(v < 10 * 1048576 ? 1 : 0)} MB`;
  const whole = long.line === 1 && long.length === bytes.length;
  return {
    fileName,
    line: long.line,
    problem: whole
      ? `The file has no line break at all: its ${mb(bytes.length)} are one single line, and a table needs one row per line.`
      : `Line ${long.line} is longer than ${mb(limit)} (it runs for ${mb(long.length)} without a line break); a table needs one row per line.`,
    advice: 'Check that this is the exported table and not a file in another form; save it with one row of values per line (the page reads LF, CR LF and CR line ends) and load it again.',
  };
}
