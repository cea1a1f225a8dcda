import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { sha256Hex } from '../../src/core/io/sha256.ts';
import { makeRng } from '../../src/core/numeric/random.ts';

/** Seeded uniform numbers from the project's generator (mulberry32). */
const uniformFrom = (seed: number): (() => number) => makeRng(seed).uniform;

const ascii = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0));


describe('sha256Hex', () => {
  it('matches the FIPS 180-2 Appendix B test vectors', () => {
    // FIPS 180-2, Appendix B.1: one-block message "abc".
    expect(sha256Hex(ascii('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    // FIPS 180-2, Appendix B.2: the 448-bit two-block message.
    expect(sha256Hex(ascii('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq'))).toBe(
      '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1',
    );
    // FIPS 180-2, Appendix B.3: one million repetitions of "a".
    expect(sha256Hex(new Uint8Array(1_000_000).fill(0x61))).toBe('cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0');
  });

  it('hashes the empty message', () => {
    // Empty-message digest, widely published (NIST CAVP SHA256ShortMsg, Len = 0; from memory), checked against node:crypto too.
    const expected = 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855';
    expect(sha256Hex(new Uint8Array(0))).toBe(expected);
    expect(createHash('sha256').update(new Uint8Array(0)).digest('hex')).toBe(expected);
  });

  it('agrees with node:crypto on random bytes of every length around the padding boundaries', () => {
    const rand = uniformFrom(20261202);
    const lengths = [1, 55, 56, 57, 63, 64, 65, 119, 120, 127, 128, 129, 1000, 4097, 70_001];
    for (const n of lengths) {
      const bytes = Uint8Array.from({ length: n }, () => Math.floor(rand() * 256));
      expect(sha256Hex(bytes), `length ${n}`).toBe(createHash('sha256').update(bytes).digest('hex'));
    }
  });

  it('reports progress on large inputs and leaves the bytes unchanged', () => {
    const rand = uniformFrom(7);
    const bytes = new Uint8Array(9 * 1048576 + 13);
    for (let i = 0; i < bytes.length; i++) bytes[i] = Math.floor(rand() * 256);
    const copy = bytes.slice();
    const fractions: number[] = [];
    const hex = sha256Hex(bytes, (f) => fractions.push(f));
    expect(hex).toBe(createHash('sha256').update(copy).digest('hex'));
    expect(fractions.length).toBeGreaterThanOrEqual(2);
    expect(fractions[fractions.length - 1]).toBe(1);
    for (let i = 1; i < fractions.length; i++) expect(fractions[i]).toBeGreaterThan(fractions[i - 1]);
    // Compared with Buffer.equals: element-wise toEqual on 9 MB is very slow.
    expect(Buffer.from(bytes).equals(Buffer.from(copy))).toBe(true);
  });
});
