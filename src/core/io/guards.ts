/**
 * The checks every loader makes before reading, and the one wording of a
 * loader's own failure, shared by {@link loadFile} and the delimited-text
 * reader (which the command line and tests also call directly), and by the
 * page's service layer (src/state/service.ts) before a file is even read.
 */
import { MAX_FILE_BYTES } from './types.ts';
import type { LoadProblem } from './types.ts';

/** A file of `byteLength` bytes larger than {@link MAX_FILE_BYTES}: the problem, else null (the page checks a picked file's size before reading it). */
export function sizeProblem(byteLength: number, fileName: string): LoadProblem | null {
  if (byteLength <= MAX_FILE_BYTES) return null;
  return {
    fileName,
    problem: `The file is ${(byteLength / 1048576).toFixed(0)} MB, more than the ${MAX_FILE_BYTES / 1048576} MB the page can hold.`,
    advice: 'Cut the file into parts, or keep only the time range you need, and load that.',
  };
}

/** Not bytes, larger than {@link MAX_FILE_BYTES}, or empty: the problem, else null. */
export function bytesProblem(bytes: unknown, fileName: string): LoadProblem | null {
  if (!(bytes instanceof Uint8Array)) return { fileName, problem: 'No file content was given to the loader.', advice: 'Choose the file again.' };
  const tooLarge = sizeProblem(bytes.length, fileName);
  if (tooLarge) return tooLarge;
  if (bytes.length === 0) {
    return { fileName, problem: 'The file is empty (0 bytes).', advice: 'Choose the file again; if it was exported from an instrument, check that the export finished.' };
  }
  return null;
}

/**
 * A loader stopped on an exception: a fault of ours, said as such.
 * @param more a sentence of advice for this reader, appended
 */
export function unexpectedLoadProblem(fileName: string, e: unknown, more = ''): LoadProblem {
  return {
    fileName,
    problem: `The loader stopped on an unexpected error (${e instanceof Error ? e.message : String(e)}).`,
    advice: `This is a fault in the page, not in your file alone: please report it with the file attached.${more === '' ? '' : ` ${more}`}`,
  };
}
