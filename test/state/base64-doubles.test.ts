/**
 * src/state/base64-doubles.ts: doubles as RFC 4648 base64 of their IEEE 754
 * little-endian bytes, read back bit for bit. Outside references: Node's
 * Buffer base64 (RFC 4648 section 4, with padding) and Buffer's own
 * little-endian double writer; the bit patterns are IEEE 754-2008's binary64
 * classes (±0, subnormals, normals, ±Infinity, quiet and signalling NaN).
 */
import { describe, expect, test } from 'vitest';
import { base64ToFloat64, float64ToBase64 } from '../../src/state/base64-doubles.ts';
import { makeRng } from '../../src/core/numeric/random.ts';

/** Values where a text round trip would lose bits: subnormals, −0, the largest double, values of 17 significant digits. */
const AWKWARD = [0, -0, 5e-324, -2.5e-310, Number.MAX_VALUE, -Number.MAX_VALUE, 0.1 + 0.2, 1 / 3, Math.PI * 1e-300, 123456789.12345679];

/** A double from its 64 bits, written by Buffer (not by the module under test). */
function fromBits(bits: bigint): number {
  const b = Buffer.alloc(8);
  b.writeBigUInt64LE(bits);
  return b.readDoubleLE(0);
}

/** IEEE 754 binary64 patterns of every class, as bits (sign | 11-bit exponent | 52-bit fraction). */
const PATTERNS: bigint[] = [
  0x0000000000000000n, // +0
  0x8000000000000000n, // −0
  0x0000000000000001n, // smallest subnormal
  0x000fffffffffffffn, // largest subnormal
  0x800fffffffffffffn, // negative subnormal
  0x0010000000000000n, // smallest normal
  0x7fefffffffffffffn, // largest finite
  0x7ff0000000000000n, // +Infinity
  0xfff0000000000000n, // −Infinity
  0x7ff8000000000000n, // the canonical quiet NaN
  0x7ff8000000000001n, // quiet NaN with a payload
  0xfff8dead0000beefn, // negative quiet NaN with a payload
  0x7ff0000000000001n, // signalling NaN
  0x3ff0000000000000n, // 1
  0xbfb999999999999an, // −0.1
];

describe('float64ToBase64 / base64ToFloat64', () => {
  test('base64 of little-endian doubles matches Node’s own base64 (RFC 4648) byte for byte, and reads back bit for bit', () => {
    const rng = makeRng(5);
    for (const n of [0, 1, 2, 3, 10, 1001]) {
      const v = Float64Array.from({ length: n }, (_, i) => (i < AWKWARD.length ? AWKWARD[i] : rng.normal() * 10 ** Math.round(rng.normal() * 50)));
      const bytes = Buffer.alloc(8 * n);
      for (let i = 0; i < n; i++) bytes.writeDoubleLE(v[i], 8 * i);
      const text = float64ToBase64(v);
      // Node's Buffer is the outside reference for base64 (RFC 4648 section 4, with padding).
      expect(text).toBe(bytes.toString('base64'));
      const back = base64ToFloat64(text);
      expect(back.length).toBe(n);
      for (let i = 0; i < n; i++) expect(Object.is(back[i], v[i])).toBe(true);
    }
  });

  test('every IEEE 754 class comes back with the same 64 bits: ±0, subnormals, ±Infinity, NaN with its payload and sign', () => {
    const v = new Float64Array(new BigUint64Array(PATTERNS).buffer);
    const text = float64ToBase64(v);
    expect(text).toBe(Buffer.from(v.buffer).toString('base64'));
    const back = base64ToFloat64(text);
    expect([...new BigUint64Array(back.buffer)].map((b) => b.toString(16))).toEqual(PATTERNS.map((b) => b.toString(16)));
    expect(Object.is(back[1], -0)).toBe(true);
    expect(back[7]).toBe(Infinity);
    expect(back[8]).toBe(-Infinity);
    expect(Number.isNaN(back[9])).toBe(true);
  });

  test('random 64-bit patterns (any class) round-trip bit for bit, and each double alone equals Buffer’s reading of its bits', () => {
    const rng = makeRng(19);
    const word = () => BigInt(Math.floor(rng.uniform() * 2 ** 32));
    const bits = Array.from({ length: 5000 }, () => (word() << 32n) | word());
    const v = new Float64Array(new BigUint64Array(bits).buffer);
    const back = base64ToFloat64(float64ToBase64(v));
    expect(new BigUint64Array(back.buffer)).toEqual(new BigUint64Array(bits));
    // The non-NaN ones are also the same numbers Buffer reads from those bits.
    for (let i = 0; i < 200; i++) if (!Number.isNaN(back[i])) expect(Object.is(back[i], fromBits(bits[i]))).toBe(true);
  });

  test('lengths that leave 1 or 2 bytes in the last group are padded with = as RFC 4648 says', () => {
    // 8 bytes: 2 whole groups of 3 and 2 left over → one "="; 16 bytes: 1 left over → "==".
    expect(float64ToBase64(Float64Array.of(1)).endsWith('=') && !float64ToBase64(Float64Array.of(1)).endsWith('==')).toBe(true);
    expect(float64ToBase64(Float64Array.of(1, 2)).endsWith('==')).toBe(true);
    expect(float64ToBase64(Float64Array.of(1, 2, 3)).includes('=')).toBe(false);
    expect(float64ToBase64(new Float64Array(0))).toBe('');
    expect(base64ToFloat64('')).toEqual(new Float64Array(0));
  });

  test('more than one 24 kB chunk: the chunks join without a seam', () => {
    const v = Float64Array.from({ length: 3 * 8192 + 7 }, (_, i) => i * 1.000000001 - 5000);
    const text = float64ToBase64(v);
    expect(text).toBe(Buffer.from(v.buffer).toString('base64'));
    expect(base64ToFloat64(text)).toEqual(v);
  });

  test('the input array is not changed', () => {
    const v = Float64Array.from(AWKWARD);
    const copy = Float64Array.from(v);
    float64ToBase64(v);
    expect(new BigUint64Array(v.buffer)).toEqual(new BigUint64Array(copy.buffer));
  });

  test('text that is not base64 of whole doubles is refused with a reason', () => {
    expect(() => base64ToFloat64('abc')).toThrow(/4-character groups/);
    expect(() => base64ToFloat64('AAAA')).toThrow(/not a whole number of 8-byte values/);
    expect(() => base64ToFloat64('AAAAAAAAAA$=')).toThrow(/not base64/);
    expect(() => base64ToFloat64('AAAAAAAAAAé=')).toThrow(/Character 11 of the numbers is not base64/);
    // "=" only as padding at the end.
    expect(() => base64ToFloat64('AA=AAAAAAAA=')).toThrow(/not base64/);
  });
});
