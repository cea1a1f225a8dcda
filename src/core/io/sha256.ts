/**
 * SHA-256 in plain TypeScript, so a trace can be tied to the exact bytes it
 * came from without Web Crypto (which is asynchronous and absent in some
 * worker and test settings).
 *
 * Method: NIST FIPS 180-4, "Secure Hash Standard", sections 4.1.2, 4.2.2,
 * 5.1.1, 5.3.3 and 6.2.
 */

// FIPS 180-4 section 4.2.2: first 32 bits of the fractional parts of the cube roots of the first 64 primes.
const K = new Uint32Array([
  0x428a2f98, 0x71374491, 0xb5c0fbcf, 0xe9b5dba5, 0x3956c25b, 0x59f111f1, 0x923f82a4, 0xab1c5ed5,
  0xd807aa98, 0x12835b01, 0x243185be, 0x550c7dc3, 0x72be5d74, 0x80deb1fe, 0x9bdc06a7, 0xc19bf174,
  0xe49b69c1, 0xefbe4786, 0x0fc19dc6, 0x240ca1cc, 0x2de92c6f, 0x4a7484aa, 0x5cb0a9dc, 0x76f988da,
  0x983e5152, 0xa831c66d, 0xb00327c8, 0xbf597fc7, 0xc6e00bf3, 0xd5a79147, 0x06ca6351, 0x14292967,
  0x27b70a85, 0x2e1b2138, 0x4d2c6dfc, 0x53380d13, 0x650a7354, 0x766a0abb, 0x81c2c92e, 0x92722c85,
  0xa2bfe8a1, 0xa81a664b, 0xc24b8b70, 0xc76c51a3, 0xd192e819, 0xd6990624, 0xf40e3585, 0x106aa070,
  0x19a4c116, 0x1e376c08, 0x2748774c, 0x34b0bcb5, 0x391c0cb3, 0x4ed8aa4a, 0x5b9cca4f, 0x682e6ff3,
  0x748f82ee, 0x78a5636f, 0x84c87814, 0x8cc70208, 0x90befffa, 0xa4506ceb, 0xbef9a3f7, 0xc67178f2,
]);

// FIPS 180-4 section 5.3.3: initial hash value.
const H0 = [0x6a09e667, 0xbb67ae85, 0x3c6ef372, 0xa54ff53a, 0x510e527f, 0x9b05688c, 0x1f83d9ab, 0x5be0cd19];

/** Process whole 64-byte blocks of `data` starting at `offset`, updating `h` in place. */
function compressBlocks(h: Uint32Array, w: Uint32Array, data: Uint8Array, offset: number, blocks: number): void {
  let h0 = h[0], h1 = h[1], h2 = h[2], h3 = h[3], h4 = h[4], h5 = h[5], h6 = h[6], h7 = h[7];
  for (let b = 0; b < blocks; b++) {
    let p = offset + b * 64;
    for (let t = 0; t < 16; t++, p += 4) {
      w[t] = (data[p] << 24) | (data[p + 1] << 16) | (data[p + 2] << 8) | data[p + 3];
    }
    for (let t = 16; t < 64; t++) {
      const w15 = w[t - 15], w2 = w[t - 2];
      const s0 = ((w15 >>> 7) | (w15 << 25)) ^ ((w15 >>> 18) | (w15 << 14)) ^ (w15 >>> 3);
      const s1 = ((w2 >>> 17) | (w2 << 15)) ^ ((w2 >>> 19) | (w2 << 13)) ^ (w2 >>> 10);
      w[t] = (w[t - 16] + s0 + w[t - 7] + s1) | 0;
    }
    let a = h0, bb = h1, c = h2, d = h3, e = h4, f = h5, g = h6, hh = h7;
    for (let t = 0; t < 64; t++) {
      const S1 = ((e >>> 6) | (e << 26)) ^ ((e >>> 11) | (e << 21)) ^ ((e >>> 25) | (e << 7));
      const ch = (e & f) ^ (~e & g);
      const t1 = (hh + S1 + ch + K[t] + w[t]) | 0;
      const S0 = ((a >>> 2) | (a << 30)) ^ ((a >>> 13) | (a << 19)) ^ ((a >>> 22) | (a << 10));
      const maj = (a & bb) ^ (a & c) ^ (bb & c);
      const t2 = (S0 + maj) | 0;
      hh = g; g = f; f = e; e = (d + t1) | 0;
      d = c; c = bb; bb = a; a = (t1 + t2) | 0;
    }
    h0 = (h0 + a) | 0; h1 = (h1 + bb) | 0; h2 = (h2 + c) | 0; h3 = (h3 + d) | 0;
    h4 = (h4 + e) | 0; h5 = (h5 + f) | 0; h6 = (h6 + g) | 0; h7 = (h7 + hh) | 0;
  }
  h[0] = h0; h[1] = h1; h[2] = h2; h[3] = h3; h[4] = h4; h[5] = h5; h[6] = h6; h[7] = h7;
}

/**
 * SHA-256 digest of `bytes` as 64 lower-case hex characters (FIPS 180-4).
 * The input is only read, never changed. Any length, including 0, is accepted.
 *
 * @param bytes the file's bytes
 * @param onProgress optional, called with the fraction 0..1 hashed so far
 *   (about every 4 MB) for large inputs; not called for inputs under 4 MB.
 */
export function sha256Hex(bytes: Uint8Array, onProgress?: (fraction: number) => void): string {
  const h = Uint32Array.from(H0);
  const w = new Uint32Array(64);
  const n = bytes.length;
  const wholeBlocks = Math.floor(n / 64);
  // Hash in slices of 64 Ki blocks (4 MB) so progress can be reported between them.
  const slice = 65536;
  for (let b = 0; b < wholeBlocks; b += slice) {
    const count = Math.min(slice, wholeBlocks - b);
    compressBlocks(h, w, bytes, b * 64, count);
    if (onProgress && wholeBlocks > slice) onProgress((b + count) / wholeBlocks);
  }
  // Padding (FIPS 180-4 section 5.1.1): a 1 bit, zeros, then the 64-bit message length in bits.
  const rest = n - wholeBlocks * 64;
  const tailLength = rest < 56 ? 64 : 128;
  const tail = new Uint8Array(tailLength);
  tail.set(bytes.subarray(wholeBlocks * 64));
  tail[rest] = 0x80;
  const bitLengthHigh = Math.floor(n / 0x20000000); // n * 8 / 2^32
  const bitLengthLow = (n * 8) >>> 0;
  tail[tailLength - 8] = bitLengthHigh >>> 24;
  tail[tailLength - 7] = bitLengthHigh >>> 16;
  tail[tailLength - 6] = bitLengthHigh >>> 8;
  tail[tailLength - 5] = bitLengthHigh;
  tail[tailLength - 4] = bitLengthLow >>> 24;
  tail[tailLength - 3] = bitLengthLow >>> 16;
  tail[tailLength - 2] = bitLengthLow >>> 8;
  tail[tailLength - 1] = bitLengthLow;
  compressBlocks(h, w, tail, 0, tailLength / 64);
  let hex = '';
  for (let i = 0; i < 8; i++) hex += (h[i] >>> 0).toString(16).padStart(8, '0');
  return hex;
}

/** The one Web Crypto call used here; typed locally because the core is compiled without DOM types. */
interface NativeDigest {
  digest(algorithm: 'SHA-256', data: Uint8Array): Promise<ArrayBuffer>;
}

function nativeDigest(): NativeDigest | null {
  const c = (globalThis as { crypto?: { subtle?: NativeDigest } }).crypto;
  return c && c.subtle && typeof c.subtle.digest === 'function' ? c.subtle : null;
}

/** How {@link sha256HexNative} made its digest. */
export type Sha256Method = 'native' | 'pure';

/**
 * SHA-256 of `bytes` as 64 lower-case hex characters, by the platform's native
 * digest (Web Crypto `crypto.subtle.digest`, present in browsers' secure
 * contexts, their workers and Node ≥ 19) where it exists and accepts the
 * bytes; otherwise by {@link sha256Hex}. Both give the same hex (FIPS 180-4;
 * checked in test/core/io/sha256.test.ts); `method` says which one ran.
 * The input is only read. Never rejects.
 */
export async function sha256HexNative(bytes: Uint8Array): Promise<{ hex: string; method: Sha256Method }> {
  const subtle = nativeDigest();
  if (subtle) {
    try {
      const d = new Uint8Array(await subtle.digest('SHA-256', bytes));
      let hex = '';
      for (let i = 0; i < d.length; i++) hex += d[i].toString(16).padStart(2, '0');
      return { hex, method: 'native' };
    } catch {
      // Web Crypto refuses some inputs (a view of a SharedArrayBuffer, say): the pure digest gives the same hex.
    }
  }
  return { hex: sha256Hex(bytes), method: 'pure' };
}
