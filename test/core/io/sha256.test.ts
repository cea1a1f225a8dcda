import { afterEach, describe, expect, it, vi } from 'vitest';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { sha256Hex, sha256HexNative } from '../../../src/core/io/sha256.ts';
import { loadFile, loadFileHashed } from '../../../src/core/io/load.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

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

describe('sha256HexNative (Web Crypto where present, the pure digest otherwise)', () => {
  afterEach(() => { vi.unstubAllGlobals(); });

  it('gives the FIPS 180-2 Appendix B digests by the native route', async () => {
    // FIPS 180-2, Appendix B.1 and B.3 (as above); Node 20 has crypto.subtle, so the native route runs.
    const abc = await sha256HexNative(ascii('abc'));
    expect(abc).toEqual({ hex: 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad', method: 'native' });
    const million = await sha256HexNative(new Uint8Array(1_000_000).fill(0x61));
    expect(million.hex).toBe('cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0');
  });

  it('native and pure give the same hex on random bytes around the padding boundaries and on subarray views', async () => {
    const rand = uniformFrom(20261203);
    for (const n of [0, 1, 55, 56, 63, 64, 65, 119, 120, 4097, 1_000_003]) {
      const bytes = Uint8Array.from({ length: n }, () => Math.floor(rand() * 256));
      const r = await sha256HexNative(bytes);
      expect(r.method).toBe('native');
      expect(r.hex, `length ${n}`).toBe(sha256Hex(bytes));
      // A view into a larger buffer: only the viewed bytes are hashed.
      const big = new Uint8Array(n + 20);
      big.set(bytes, 7);
      expect((await sha256HexNative(big.subarray(7, 7 + n))).hex, `view of length ${n}`).toBe(r.hex);
    }
  });

  it('falls back to the pure digest, and says so, where there is no Web Crypto or it refuses', async () => {
    const bytes = ascii('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq');
    const expected = '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1'; // FIPS 180-2, Appendix B.2
    vi.stubGlobal('crypto', undefined);
    expect(await sha256HexNative(bytes)).toEqual({ hex: expected, method: 'pure' });
    vi.stubGlobal('crypto', { subtle: { digest: () => Promise.reject(new Error('refused')) } });
    expect(await sha256HexNative(bytes)).toEqual({ hex: expected, method: 'pure' });
  });

  it('loadFileHashed reports the same SHA-256 and the same trace as loadFile, and leaves the bytes unchanged', async () => {
    const text = 'time (min),signal (mV)\n' + Array.from({ length: 5000 }, (_, i) => `${(i * 0.01).toFixed(2)},${Math.sin(i / 50).toFixed(6)}`).join('\n') + '\n';
    const bytes = new TextEncoder().encode(text);
    const copy = bytes.slice();
    const a = loadFile(bytes, 'a.csv');
    const b = await loadFileHashed(bytes, 'a.csv');
    if (!a.ok || !b.ok) throw new Error('load failed');
    expect(b.report.sha256).toBe(createHash('sha256').update(copy).digest('hex'));
    expect(b.report.sha256).toBe(a.report.sha256);
    expect(b.traces[0].source.sha256).toBe(a.traces[0].source.sha256);
    expect(Array.from(b.traces[0].y)).toEqual(Array.from(a.traces[0].y));
    expect(Buffer.from(bytes).equals(Buffer.from(copy))).toBe(true);
  });

  it('a malformed digest passed in is ignored: the loader hashes the bytes itself', () => {
    const bytes = new TextEncoder().encode('x,y\n1,2\n2,3\n3,5\n4,4\n5,6\n');
    const r = loadFile(bytes, 'b.csv', { sha256: 'not-a-digest' });
    if (!r.ok) throw new Error('load failed');
    expect(r.report.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
  });

  it('netCDF and JCAMP-DX files carry the native digest too', async () => {
    const jcamp = new TextEncoder().encode('##TITLE=t\n##JCAMP-DX=4.24\n##DATA TYPE=UV/VIS SPECTRUM\n##XUNITS=NANOMETERS\n##YUNITS=ABSORBANCE\n##FIRSTX=1\n##LASTX=5\n##NPOINTS=5\n##XFACTOR=1\n##YFACTOR=1\n##XYDATA=(X++(Y..Y))\n1 1 2 3 4 5\n##END=\n');
    const r = await loadFileHashed(jcamp, 'c.jdx');
    const plain = loadFile(jcamp, 'c.jdx');
    expect(plain.ok).toBe(true);
    if (!r.ok || !plain.ok) throw new Error('load failed');
    expect(r.report.sha256).toBe(createHash('sha256').update(jcamp).digest('hex'));
    expect(r.report.sha256).toBe(plain.report.sha256);
    const cdf = new Uint8Array(readFileSync(new URL('../../fixtures/netcdf/chromatogram.cdf', import.meta.url)));
    const rc = await loadFileHashed(cdf, 'chromatogram.cdf');
    if (!rc.ok) throw new Error('netCDF load failed');
    expect(rc.report.sha256).toBe(createHash('sha256').update(cdf).digest('hex'));
  });
});
