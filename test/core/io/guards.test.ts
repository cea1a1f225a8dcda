// The checks every loader makes before reading (src/core/io/guards.ts): each
// problem names the file and says what to do (the project's rule for bad input).
import { describe, expect, it } from 'vitest';
import { bytesProblem, sizeProblem, unexpectedLoadProblem } from '../../../src/core/io/guards.ts';
import { MAX_FILE_BYTES } from '../../../src/core/io/types.ts';

describe('sizeProblem', () => {
  it('nothing up to the limit; above it the size in MB and the limit, naming the file', () => {
    expect(sizeProblem(MAX_FILE_BYTES, 'a.csv')).toBeNull();
    const p = sizeProblem(MAX_FILE_BYTES + 1, 'big.csv')!;
    expect(p.fileName).toBe('big.csv');
    expect(p.problem).toBe('The file is 400 MB, more than the 400 MB the page can hold.');
    expect(p.advice).toMatch(/Cut the file into parts/);
    expect(sizeProblem(600 * 1048576, 'b.csv')!.problem).toMatch(/^The file is 600 MB/);
  });
});

describe('bytesProblem', () => {
  it('refuses no bytes and an empty file, passes ordinary bytes', () => {
    expect(bytesProblem('text', 'a.csv')!.problem).toMatch(/No file content/);
    expect(bytesProblem(new Uint8Array(0), 'e.csv')).toMatchObject({ fileName: 'e.csv', problem: 'The file is empty (0 bytes).' });
    expect(bytesProblem(new Uint8Array(3), 'ok.csv')).toBeNull();
  });
});

describe('unexpectedLoadProblem', () => {
  it('says it is our fault, with the error message and any extra advice', () => {
    const p = unexpectedLoadProblem('x.jdx', new TypeError('boom'), 'Try CSV.');
    expect(p.problem).toBe('The loader stopped on an unexpected error (boom).');
    expect(p.advice).toMatch(/fault in the page.*Try CSV\.$/);
    expect(unexpectedLoadProblem('x', 'plain').problem).toMatch(/\(plain\)/);
    expect(unexpectedLoadProblem('x', 'plain').advice.endsWith('attached.')).toBe(true);
  });
});
