/**
 * What every loader returns: traces plus a load report, or a problem the
 * user can act on. Loaders never throw for bad input; they return
 * `{ ok: false }` with the file, line and what to do.
 */
import type { Trace } from '../trace.ts';

/** A row the loader did not use, with the reason (1-based line number in the file). */
export interface SkippedRow {
  line: number;
  reason: string;
  text: string;
}

export interface LoadReport {
  fileName: string;
  sha256: string;
  /** Human-readable format, e.g. "delimited text (semicolon, decimal comma)". */
  format: string;
  rowsRead: number;
  skipped: SkippedRow[];
  /** Sentences for the notices area: sorting, duplicate x, index used as x, etc. */
  notices: string[];
  /** Metadata lines / labels kept from the file. */
  metadata: Record<string, string>;
  /** Column headers as read (for choosing x and y), with units parsed out. */
  columns?: { name: string; unit: string }[];
  /**
   * Choices the loader made that the file itself does not settle. The page
   * states them as notices too; the command line refuses the file and names
   * the option that settles it.
   */
  questions?: LoadQuestion[];
}

/** A choice the file does not settle: 'number-format' (delimiter and decimal sign) or 'columns' (which columns are traces). */
export interface LoadQuestion {
  kind: 'number-format' | 'columns';
  /** 1-based line the question is about, when there is one. */
  line?: number;
  /** The reading used and the other one, in words. */
  message: string;
}

export interface LoadProblem {
  fileName: string;
  /** 1-based line (text formats) when the problem is at a place in the file. */
  line?: number;
  /** What is wrong, in one sentence. */
  problem: string;
  /** What the user can do about it. */
  advice: string;
  /** When one statement of the user settles the problem: the words to offer and the option that says it. */
  settle?: { label: string; numberFormat: { decimal: '.' | ','; grouping: boolean } };
}

export type LoadResult =
  | { ok: true; traces: Trace[]; report: LoadReport }
  | { ok: false; error: LoadProblem };

/** Options the user may set when a file has several columns. */
export interface LoadOptions {
  /** 0-based column index used as x; -1 means point index. Default: first numeric column (or index when only one). */
  xColumn?: number;
  /** 0-based column indices loaded as y traces. Default: every numeric column but x. */
  yColumns?: number[];
  /**
   * Read delimited text only with this delimiter and/or decimal sign
   * (the command line's --delimiter and --decimal); default: decided from the file.
   */
  dialect?: { delimiter?: ',' | ';' | '\t' | 'whitespace'; decimal?: '.' | ',' };
  /** Called with a fraction 0..1 while parsing large files. */
  onProgress?: (fraction: number) => void;
  /**
   * How numbers are written, when the user states it (delimited text only):
   * the decimal sign, and whether the other sign groups thousands. Settles a
   * file the loader would otherwise refuse as ambiguous ("1.100" with a
   * decimal comma). Without it the loader decides from the file and refuses
   * what it cannot settle.
   */
  numberFormat?: { decimal: '.' | ','; grouping: boolean };
  /**
   * SHA-256 of exactly these bytes (64 lower-case hex characters), already
   * made by the caller, e.g. with the platform's native digest
   * ({@link loadFileHashed}); the loaders then do not hash again. Anything
   * else than 64 hex characters is ignored and the bytes are hashed here.
   */
  sha256?: string;
}

/** The caller's digest from {@link LoadOptions.sha256} when it is well formed, else null. */
export function givenSha256(options: LoadOptions | undefined): string | null {
  const h = options?.sha256;
  return typeof h === 'string' && /^[0-9a-f]{64}$/.test(h) ? h : null;
}

/** Most traces one file gives (columns of y); a wider file loads its first ones and says so. */
export const MAX_Y_COLUMNS = 200;

/** Longest line read, in bytes: a longer one (a file without line breaks, say) is refused at once, naming the line. */
export const MAX_LINE_BYTES = 8 * 1024 * 1024;

/** Largest file the page accepts, in bytes; bigger files are refused with a message. */
export const MAX_FILE_BYTES = 400 * 1024 * 1024;
