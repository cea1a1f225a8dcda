// File names of exports (src/core/export/names.ts), against the module's rules:
// safe characters only, no leading dots, at most 80 characters, the same name
// from the same input, and each name once per run regardless of case (common
// file systems ignore case: NTFS, APFS by default; from memory).
import { describe, expect, it } from 'vitest';
import { exportSafeName, uniqueNamer, zipBaseName } from '../../../src/core/export/names.ts';

describe('exportSafeName', () => {
  it('keeps letters, digits, _ . - and space; other runs become one "_"; leading dots and spaces go', () => {
    expect(exportSafeName('run 07/A:B*?.csv')).toBe('run 07_A_B_.csv');
    expect(exportSafeName('..hidden')).toBe('hidden');
    expect(exportSafeName('  ..x')).toBe('x');
    expect(exportSafeName('a'.repeat(200))).toHaveLength(80);
    expect(exportSafeName('<<>>')).toBe('_');
  });
});

describe('zipBaseName', () => {
  it('last path part without its extension, made safe; "file" when nothing is left', () => {
    expect(zipBaseName('C:\\data\\day 1\\run-07.csv')).toBe('run-07');
    expect(zipBaseName('/tmp/x/trace.tar.gz')).toBe('trace.tar');
    expect(zipBaseName('...')).toBe('file');
    expect(zipBaseName('')).toBe('file');
  });
});

describe('uniqueNamer', () => {
  it('hands out each name once, adding -2, -3 in call order, without regard to case; a new namer starts afresh', () => {
    const next = uniqueNamer();
    expect(['run', 'Run', 'run', 'other', 'RUN'].map(next)).toEqual(['run', 'Run-2', 'run-3', 'other', 'RUN-4']);
    expect(uniqueNamer()('run')).toBe('run');
  });
});
