/**
 * Doubles as RFC 4648 base64 of their IEEE 754 little-endian bytes, so every
 * value (NaN and infinities included) comes back bit for bit. Used by the
 * session file and by the saved region fits. Pure: no DOM.
 */

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
const DECODE = (() => {
  const t = new Int16Array(128).fill(-1);
  for (let i = 0; i < ALPHABET.length; i++) t[ALPHABET.charCodeAt(i)] = i;
  return t;
})();

/** Doubles as base64 of their little-endian bytes (RFC 4648, with padding). */
export function float64ToBase64(values: Float64Array): string {
  const bytes = new Uint8Array(values.length * 8);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < values.length; i++) view.setFloat64(i * 8, values[i], true);
  const parts: string[] = [];
  const chunk = 3 * 8192;
  for (let start = 0; start < bytes.length; start += chunk) {
    const end = Math.min(bytes.length, start + chunk);
    let s = '';
    for (let i = start; i < end; i += 3) {
      const a = bytes[i], b = i + 1 < end ? bytes[i + 1] : 0, c = i + 2 < end ? bytes[i + 2] : 0;
      s += ALPHABET[a >> 2] + ALPHABET[((a & 3) << 4) | (b >> 4)]
        + (i + 1 < end ? ALPHABET[((b & 15) << 2) | (c >> 6)] : '=')
        + (i + 2 < end ? ALPHABET[c & 63] : '=');
    }
    parts.push(s);
  }
  return parts.join('');
}

/**
 * The doubles written by {@link float64ToBase64}.
 * @throws RangeError when the text is not base64 of whole doubles.
 */
export function base64ToFloat64(text: string): Float64Array {
  if (typeof text !== 'string' || text.length % 4 !== 0) throw new RangeError('The numbers are not base64 text of whole 4-character groups.');
  const pad = text.endsWith('==') ? 2 : text.endsWith('=') ? 1 : 0;
  const byteLength = (text.length / 4) * 3 - pad;
  if (byteLength % 8 !== 0) throw new RangeError(`The numbers hold ${byteLength} bytes, which is not a whole number of 8-byte values.`);
  const bytes = new Uint8Array(byteLength);
  let o = 0;
  for (let i = 0; i < text.length; i += 4) {
    const q = [0, 1, 2, 3].map((k) => {
      const ch = text.charCodeAt(i + k);
      if (ch === 61 && i + k >= text.length - pad) return 0;
      const v = ch < 128 ? DECODE[ch] : -1;
      if (v < 0) throw new RangeError(`Character ${i + k + 1} of the numbers is not base64.`);
      return v;
    });
    const n = (q[0] << 18) | (q[1] << 12) | (q[2] << 6) | q[3];
    if (o < byteLength) bytes[o++] = (n >> 16) & 255;
    if (o < byteLength) bytes[o++] = (n >> 8) & 255;
    if (o < byteLength) bytes[o++] = n & 255;
  }
  const view = new DataView(bytes.buffer);
  const out = new Float64Array(byteLength / 8);
  for (let i = 0; i < out.length; i++) out[i] = view.getFloat64(i * 8, true);
  return out;
}

