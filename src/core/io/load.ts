/**
 * The one entry point for reading a file: checks the bytes, then hands them to
 * the reader for what they contain. The choice is made from the content, never
 * from the file name, so a CSV saved as ".txt" or a JCAMP-DX file saved as
 * ".csv" is still read correctly.
 */
import { givenSha256, MAX_FILE_BYTES } from './types.ts';
import type { LoadOptions, LoadResult } from './types.ts';
import { binaryReason, decodeText, hasWideTextMark, overlongLineProblem, sniffBinaryFormat, UNDERSTOOD_FORMATS } from './sniff.ts';
import { parseDelimited } from './delimited.ts';
import { sha256Hex, sha256HexNative } from './sha256.ts';
import { looksLikeJcamp, parseJcamp } from './jcamp.ts';
import { looksLikeNetcdf, parseNetcdf } from './netcdf.ts';
import { bytesProblem, unexpectedLoadProblem } from './guards.ts';

/** Bytes decoded to decide whether a text file is JCAMP-DX. */
const JCAMP_SNIFF_BYTES = 4096;

function refuse(fileName: string, problem: string, advice: string): LoadResult {
  return { ok: false, error: { fileName, problem, advice } };
}

/**
 * Read a file's bytes into traces, or explain why not. Never throws.
 *
 * Order of checks: size (at most {@link MAX_FILE_BYTES}), empty, known binary
 * formats by magic number (PNG, JPEG, ZIP, older Office, PDF, gzip, HDF5,
 * netCDF of a version not read), netCDF classic (read by the netCDF reader),
 * other binary content (NUL bytes or many control characters, unless a UTF-16
 * or UTF-32 byte-order mark says it is text), JCAMP-DX text, and otherwise
 * delimited text. Text with a line longer than {@link MAX_LINE_BYTES} is
 * refused at once, naming the line.
 * `bytes` is only read.
 *
 * @param options column choice, progress callback and a digest already made
 *   ({@link LoadOptions.sha256}); only delimited text uses the column choice.
 */
export function loadFile(bytes: Uint8Array, fileName: string, options: LoadOptions = {}): LoadResult {
  try {
    const bad = bytesProblem(bytes, fileName);
    if (bad) return { ok: false, error: bad };
    const known = sniffBinaryFormat(bytes);
    if (known) return refuse(fileName, known.problem ?? `This is ${known.format}, not a file of measured values the page can read.`, known.advice);
    if (looksLikeNetcdf(bytes)) return parseNetcdf(bytes, fileName, givenSha256(options) ?? sha256Hex(bytes));

    const why = hasWideTextMark(bytes) ? null : binaryReason(bytes);
    if (why) {
      return refuse(
        fileName,
        `The file is binary, not text. ${why}`,
        `Export the trace from the instrument software as text (CSV) or save it as UTF-8 text. The page reads ${UNDERSTOOD_FORMATS}.`,
      );
    }

    // A cut at 4 kB may split a character; that only matters for the look, and JCAMP-DX labels are ASCII.
    const head = decodeText(bytes.subarray(0, JCAMP_SNIFF_BYTES)).text;
    if (looksLikeJcamp(head)) {
      const long = overlongLineProblem(bytes, fileName);
      if (long) return { ok: false, error: long };
      const decoded = decodeText(bytes);
      const result = parseJcamp(decoded.text, fileName, givenSha256(options) ?? sha256Hex(bytes));
      if (result.ok && decoded.notices.length > 0) result.report.notices.unshift(...decoded.notices);
      return result;
    }
    return parseDelimited(bytes, fileName, options);
  } catch (e) {
    return { ok: false, error: unexpectedLoadProblem(fileName, e) };
  }
}

/**
 * {@link loadFile} with the bytes' SHA-256 made first by the platform's native
 * digest where there is one ({@link sha256HexNative}: Web Crypto in the page's
 * worker, about ten times faster than the pure hash on a 20 MB file), and by
 * the pure implementation otherwise. The hex, and so every report and export,
 * is the same either way. Never rejects.
 */
export async function loadFileHashed(bytes: Uint8Array, fileName: string, options: LoadOptions = {}): Promise<LoadResult> {
  if (!(bytes instanceof Uint8Array) || bytes.length === 0 || bytes.length > MAX_FILE_BYTES) return loadFile(bytes, fileName, options);
  const { hex } = await sha256HexNative(bytes);
  return loadFile(bytes, fileName, { ...options, sha256: hex });
}
