import { describe, expect, it } from 'vitest';
import { binaryReason, decodeText, latin1Decode, sniffBinaryFormat, utf8Decode, utf8InvalidAt } from '../../../src/core/io/sniff.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

const bytesOf = (...b: number[]) => Uint8Array.from(b);

describe('UTF-8 decoding', () => {
  it('agrees with TextDecoder on random text from every Unicode plane', () => {
    const rng = makeRng(11);
    for (let trial = 0; trial < 200; trial++) {
      let s = '';
      const n = Math.floor(rng.uniform() * 60);
      for (let i = 0; i < n; i++) {
        // Mix ASCII, two-, three- and four-byte characters; skip the surrogate range, which is not a character.
        const kind = Math.floor(rng.uniform() * 4);
        let cp = [0x20 + Math.floor(rng.uniform() * 95), 0x80 + Math.floor(rng.uniform() * 0x780), 0x800 + Math.floor(rng.uniform() * 0xf7ff), 0x10000 + Math.floor(rng.uniform() * 0xfffff)][kind];
        if (cp >= 0xd800 && cp <= 0xdfff) cp = 0xb0;
        s += String.fromCodePoint(cp);
      }
      const bytes = new TextEncoder().encode(s);
      expect(utf8InvalidAt(bytes)).toBe(-1);
      expect(utf8Decode(bytes)).toBe(new TextDecoder('utf-8', { fatal: true }).decode(bytes));
    }
  });

  it('finds ill-formed sequences (RFC 3629 section 3 and 10)', () => {
    // RFC 3629: C0 and C1 lead only overlong forms; ED A0..BF would encode surrogates; F5..FF never appear; F4 90 exceeds U+10FFFF.
    expect(utf8InvalidAt(bytesOf(0x41, 0xc0, 0xaf))).toBe(1);
    expect(utf8InvalidAt(bytesOf(0xe0, 0x80, 0xaf))).toBe(0); // overlong 3-byte form
    expect(utf8InvalidAt(bytesOf(0x41, 0x42, 0xed, 0xa0, 0x80))).toBe(2);
    expect(utf8InvalidAt(bytesOf(0xf5, 0x80, 0x80, 0x80))).toBe(0);
    expect(utf8InvalidAt(bytesOf(0xf4, 0x90, 0x80, 0x80))).toBe(0);
    expect(utf8InvalidAt(bytesOf(0x41, 0xe2, 0x82))).toBe(1); // cut short at the end
    expect(utf8InvalidAt(bytesOf(0xb0))).toBe(0); // lone continuation byte (Latin-1 degree sign)
    expect(utf8Decode(bytesOf(0x41, 0xb0))).toBeNull();
  });

  it('reads Latin-1 byte for byte', () => {
    // ISO 8859-1: byte value = code point; 0xB0 is the degree sign, 0xB5 micro sign.
    expect(latin1Decode(bytesOf(0x32, 0x30, 0xb0, 0x43, 0xb5))).toBe('20\u00b0C\u00b5');
  });
});

describe('decodeText', () => {
  it('removes a UTF-8 byte-order mark and says so in the encoding', () => {
    const d = decodeText(bytesOf(0xef, 0xbb, 0xbf, 0x61, 0x2c, 0x62));
    expect(d).toEqual({ text: 'a,b', encoding: 'UTF-8 with byte-order mark', notices: [] });
  });

  it('decodes UTF-16 in both byte orders when it starts with its mark', () => {
    const le = decodeText(bytesOf(0xff, 0xfe, 0x31, 0x00, 0xb0, 0x00, 0x3d, 0xd8, 0x00, 0xde));
    expect(le.text).toBe('1\u00b0\u{1F600}');
    expect(le.encoding).toBe('UTF-16LE');
    const be = decodeText(bytesOf(0xfe, 0xff, 0x00, 0x31, 0x00, 0xb0));
    expect(be.text).toBe('1\u00b0');
    expect(be.encoding).toBe('UTF-16BE');
    expect(be.notices[0]).toMatch(/UTF-16BE/);
  });

  it('falls back to Latin-1 with a notice naming the line of the first bad byte', () => {
    const d = decodeText(bytesOf(0x61, 0x0a, 0x62, 0x0d, 0x0a, 0x54, 0x20, 0x28, 0xb0, 0x43, 0x29));
    expect(d.encoding).toBe('Latin-1');
    expect(d.text).toBe('a\nb\r\nT (\u00b0C)');
    expect(d.notices[0]).toMatch(/line 3/);
  });

  it('leaves its input unchanged', () => {
    const input = bytesOf(0xef, 0xbb, 0xbf, 0x61, 0xb0, 0x0a);
    const copy = input.slice();
    decodeText(input);
    expect(input).toEqual(copy);
  });
});

describe('binary content', () => {
  it('names the formats it recognises by magic number', () => {
    // Signatures: PNG (ISO/IEC 15948 5.2), ZIP local header "PK\3\4" (PKWARE APPNOTE 4.3.7), PDF "%PDF-" (ISO 32000-1 7.5.2),
    // gzip 1F 8B (RFC 1952 2.3.1), HDF5 superblock signature (HDF5 file format specification), OLE2 (MS-CFB 2.2), JPEG SOI (ITU-T T.81).
    expect(sniffBinaryFormat(bytesOf(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0))?.format).toMatch(/PNG/);
    expect(sniffBinaryFormat(bytesOf(0x50, 0x4b, 0x03, 0x04, 0))?.format).toMatch(/ZIP/);
    expect(sniffBinaryFormat(bytesOf(0x25, 0x50, 0x44, 0x46, 0x2d, 0x31))?.format).toMatch(/PDF/);
    expect(sniffBinaryFormat(bytesOf(0x1f, 0x8b, 0x08))?.format).toMatch(/gzip/);
    expect(sniffBinaryFormat(bytesOf(0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a))?.format).toMatch(/HDF5/);
    expect(sniffBinaryFormat(bytesOf(0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1))?.format).toMatch(/Office/);
    expect(sniffBinaryFormat(bytesOf(0xff, 0xd8, 0xff, 0xe0))?.format).toMatch(/JPEG/);
    expect(sniffBinaryFormat(new TextEncoder().encode('Time,Signal\n0,1\n'))).toBeNull();
    // netCDF classic is read, not refused.
    expect(sniffBinaryFormat(bytesOf(0x43, 0x44, 0x46, 0x01, 0, 0, 0, 0))).toBeNull();
  });

  it('calls NUL bytes and control characters binary, and text not', () => {
    expect(binaryReason(bytesOf(0x31, 0x2c, 0x00, 0x32))).toMatch(/NUL bytes \(the first at byte 3\)/);
    expect(binaryReason(new TextEncoder().encode('\u0031\u0000'.repeat(50)))).toMatch(/UTF-16/);
    expect(binaryReason(Uint8Array.from({ length: 100 }, (_, i) => (i % 3 === 0 ? 0x01 : 0x41)))).toMatch(/control characters/);
    expect(binaryReason(new TextEncoder().encode('Time\tSignal\r\n0\t1\f\n'))).toBeNull();
    expect(binaryReason(bytesOf(0x32, 0x30, 0xb0, 0x43))).toBeNull(); // Latin-1 text is text
  });
});
