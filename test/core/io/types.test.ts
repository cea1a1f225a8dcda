// io/types.ts is types plus three limits and one helper: the caller's SHA-256
// is used only when it is 64 lowercase hex characters (the digest's hex form,
// FIPS 180-4), else the loader hashes the bytes itself.
import { describe, expect, it } from 'vitest';
import { MAX_FILE_BYTES, MAX_LINE_BYTES, MAX_Y_COLUMNS, givenSha256 } from '../../../src/core/io/types.ts';

describe('givenSha256', () => {
  it('takes a well-formed digest, ignores anything else', () => {
    const h = 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855'; // SHA-256 of no bytes (FIPS 180-4 examples; from memory)
    expect(givenSha256({ sha256: h })).toBe(h);
    expect(givenSha256({ sha256: h.toUpperCase() })).toBeNull();
    expect(givenSha256({ sha256: h.slice(1) })).toBeNull();
    expect(givenSha256({})).toBeNull();
    expect(givenSha256(undefined)).toBeNull();
  });
});

describe('limits', () => {
  it('a line may be long but never longer than the largest file; columns capped', () => {
    expect(MAX_LINE_BYTES).toBeLessThan(MAX_FILE_BYTES);
    expect(MAX_FILE_BYTES).toBe(400 * 1024 * 1024);
    expect(Number.isInteger(MAX_Y_COLUMNS) && MAX_Y_COLUMNS >= 1).toBe(true);
  });
});
