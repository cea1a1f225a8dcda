// padIndex: the index SciPy's ndimage edge modes give a sample beyond the ends.
// References: numpy.pad of arange(n) (NumPy's names for the same rules) and
// scipy.ndimage.correlate1d, both from test/reference/make_core_modules.py
// (versions in core-modules.json); the pictures in the module's comment are
// the SciPy reference guide's, scipy.ndimage "mode".
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { padIndex, type PadMode } from '../../../src/core/numeric/convolve.ts';

interface Ref {
  scipy: string;
  numpy: string;
  pad: { n: number; mode: PadMode; from: number; index: number[] }[];
  correlate: { mode: PadMode; y: number[]; kernel: number[]; out: number[] }[];
}
const ref = JSON.parse(readFileSync(new URL('../../reference/core-modules.json', import.meta.url), 'utf8')) as Ref;

describe(`padIndex against numpy.pad (NumPy ${ref.numpy})`, () => {
  it('reflect, mirror, nearest and wrap, 13 samples beyond each end of 1, 2, 3 and 5 samples (several reflections)', () => {
    expect(ref.pad.length).toBeGreaterThanOrEqual(15);
    for (const c of ref.pad) {
      const got = c.index.map((_, k) => padIndex(c.from + k, c.n, c.mode));
      expect(got, `${c.mode}, n = ${c.n}`).toEqual(c.index);
    }
  });

  it('a single sample is repeated in every mode but constant (mirror has nothing to reflect)', () => {
    for (const mode of ['reflect', 'mirror', 'nearest', 'wrap'] as const) {
      for (const j of [-7, -1, 1, 9]) expect(padIndex(j, 1, mode)).toBe(0);
    }
  });

  it('constant gives -1 outside and the index itself inside', () => {
    expect([-3, -1, 0, 4, 5, 9].map((j) => padIndex(j, 5, 'constant'))).toEqual([-1, -1, 0, 4, -1, -1]);
  });

  it('the pictures of the SciPy reference guide for a b c d', () => {
    // SciPy reference guide, scipy.ndimage "mode": reflect d c b a | a b c d | d c b a; mirror d c b | a b c d | c b a.
    const row = (mode: PadMode, from: number, to: number) => Array.from({ length: to - from + 1 }, (_, k) => 'abcd'[padIndex(from + k, 4, mode)]).join('');
    expect(row('reflect', -4, 7)).toBe('dcbaabcddcba');
    expect(row('mirror', -3, 6)).toBe('dcbabcdcba');
    expect(row('nearest', -4, 7)).toBe('aaaaabcddddd');
    expect(row('wrap', -4, 7)).toBe('abcdabcdabcd');
  });
});

describe(`correlation through padIndex equals scipy.ndimage.correlate1d (SciPy ${ref.scipy})`, () => {
  it('kernels longer and shorter than the signal, every mode', () => {
    expect(ref.correlate.length).toBe(20);
    for (const c of ref.correlate) {
      const n = c.y.length, w = c.kernel.length, h = Math.floor(w / 2);
      for (let i = 0; i < n; i++) {
        let s = 0;
        for (let k = 0; k < w; k++) {
          const j = padIndex(i + k - h, n, c.mode);
          s += c.kernel[k] * (j < 0 ? 0 : c.y[j]);
        }
        expect(Math.abs(s - c.out[i]), `${c.mode}, n = ${n}, w = ${w}, i = ${i}`).toBeLessThan(1e-13);
      }
    }
  });
});
