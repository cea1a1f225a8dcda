// dft, powerSpectrum and nextPowerOfTwo: the definition X[k] = Σⱼ x[j]·exp(−2πi·jk/n)
// summed directly here, numpy.fft.fft / ifft and scipy.signal.periodogram
// (window 'boxcar', no detrending, scaling 'spectrum') from
// test/reference/make_core_modules.py (versions in core-modules.json), and
// transforms known in closed form (any signals text, from memory).
import { readFileSync } from 'node:fs';
import FFT from 'fft.js';
import { describe, expect, it } from 'vitest';
import { dft, nextPowerOfTwo, powerSpectrum, releaseBigPlan } from '../../../src/core/numeric/fft.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

interface Ref {
  scipy: string;
  numpy: string;
  dft: { re: number[]; im: number[]; fre: number[]; fim: number[]; ire: number[]; iim: number[] }[];
  spectra: { dx: number; y: number[]; freq: number[]; power: number[] }[];
}
const ref = JSON.parse(readFileSync(new URL('../../reference/core-modules.json', import.meta.url), 'utf8')) as Ref;

/** Direct O(n²) sum of the definition; angles reduced mod n so large jk keeps precision. */
function directDft(re: ArrayLike<number>, im: ArrayLike<number>, inverse = false): { re: number[]; im: number[] } {
  const n = re.length, sgn = inverse ? 1 : -1;
  const outR: number[] = [], outI: number[] = [];
  for (let k = 0; k < n; k++) {
    let sr = 0, si = 0;
    for (let j = 0; j < n; j++) {
      const a = (sgn * 2 * Math.PI * ((j * k) % n)) / n;
      sr += re[j] * Math.cos(a) - im[j] * Math.sin(a);
      si += re[j] * Math.sin(a) + im[j] * Math.cos(a);
    }
    outR.push(inverse ? sr / n : sr);
    outI.push(inverse ? si / n : si);
  }
  return { re: outR, im: outI };
}

function maxDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  expect(a.length).toBe(b.length);
  let e = 0;
  for (let i = 0; i < a.length; i++) e = Math.max(e, Math.abs(a[i] - b[i]));
  return e;
}

describe('nextPowerOfTwo', () => {
  it('smallest power of two ≥ n, at least 2', () => {
    expect([1, 2, 3, 4, 5, 8, 9, 1000, 1024, 1025].map(nextPowerOfTwo)).toEqual([2, 2, 4, 4, 8, 8, 16, 1024, 1024, 2048]);
  });
});

describe(`dft against numpy.fft (NumPy ${ref.numpy})`, () => {
  it('forward and inverse, lengths 1 to 127, powers of two and not (Bluestein)', () => {
    for (const c of ref.dft) {
      const n = c.re.length;
      const f = dft(Float64Array.from(c.re), Float64Array.from(c.im));
      // Rounding of an FFT grows like ε·log n·Σ|x| (Higham 2002, §24.1); 1e-12·n is a generous bound for n ≤ 127 with |x| ~ 1.
      expect(maxDiff(f.re, c.fre), `forward n = ${n}`).toBeLessThan(1e-12 * n);
      expect(maxDiff(f.im, c.fim), `forward n = ${n}`).toBeLessThan(1e-12 * n);
      const g = dft(Float64Array.from(c.re), Float64Array.from(c.im), true);
      expect(maxDiff(g.re, c.ire), `inverse n = ${n}`).toBeLessThan(1e-13 * n);
      expect(maxDiff(g.im, c.iim), `inverse n = ${n}`).toBeLessThan(1e-13 * n);
    }
  });
});

describe('dft against the direct sum of the definition', () => {
  it('real and complex input, lengths 2 to 300 including primes and 2^k ± 1', () => {
    const rng = makeRng(77);
    for (const n of [2, 3, 4, 6, 31, 32, 33, 64, 97, 255, 256, 257, 300]) {
      const re = Float64Array.from({ length: n }, () => rng.normal());
      const im = n % 2 ? Float64Array.from({ length: n }, () => rng.normal()) : new Float64Array(n);
      const copyR = Float64Array.from(re), copyI = Float64Array.from(im);
      const want = directDft(re, im);
      const got = dft(re, im);
      expect(maxDiff(got.re, want.re), `n = ${n}`).toBeLessThan(1e-11 * n);
      expect(maxDiff(got.im, want.im), `n = ${n}`).toBeLessThan(1e-11 * n);
      // Inputs are not changed (module contract).
      expect(re).toEqual(copyR);
      expect(im).toEqual(copyI);
    }
  });

  it('inverse of forward gives the input back (the 1/n is in the inverse)', () => {
    const rng = makeRng(5);
    for (const n of [8, 12, 1000, 4096]) {
      const re = Float64Array.from({ length: n }, () => rng.normal());
      const im = Float64Array.from({ length: n }, () => rng.normal());
      const f = dft(re, im);
      const back = dft(f.re, f.im, true);
      expect(maxDiff(back.re, re)).toBeLessThan(1e-12);
      expect(maxDiff(back.im, im)).toBeLessThan(1e-12);
    }
  });
});

describe('big plans (tables kept as typed arrays, issue 16)', () => {
  it.each([1 << 17, 1 << 18])('a length above 2^16 (%i: an odd and an even power, two widths of the first pass) gives the same bits as fft.js with its own plain-array tables, forward and inverse, also after the plan was let go', (n) => {
    releaseBigPlan();
    const rng = makeRng(16);
    const re = Float64Array.from({ length: n }, () => rng.normal());
    const im = Float64Array.from({ length: n }, () => rng.normal());
    const plain = new FFT(n);
    const same = (a: Float64Array, b: Float64Array) => a.every((v, k) => Object.is(v, b[k]));
    // Real input: fft.js realTransform + completeSpectrum, as the module does.
    const realOut = new Float64Array(2 * n);
    plain.realTransform(realOut, re);
    plain.completeSpectrum(realOut);
    const ours = dft(re, new Float64Array(n));
    expect(same(ours.re, realOut.filter((_, k) => k % 2 === 0))).toBe(true);
    expect(same(ours.im, realOut.filter((_, k) => k % 2 === 1))).toBe(true);
    // Complex input, inverse.
    const data = new Float64Array(2 * n);
    for (let j = 0; j < n; j++) { data[2 * j] = re[j]; data[2 * j + 1] = im[j]; }
    const invOut = new Float64Array(2 * n);
    plain.inverseTransform(invOut, data);
    const inv = dft(re, im, true);
    expect(same(inv.re, invOut.filter((_, k) => k % 2 === 0))).toBe(true);
    expect(same(inv.im, invOut.filter((_, k) => k % 2 === 1))).toBe(true);
    releaseBigPlan();
    const again = dft(re, im, true);
    expect(same(again.re, inv.re) && same(again.im, inv.im)).toBe(true);
  });
});

describe('known transforms (closed forms, from memory)', () => {
  it('a unit impulse at 0 transforms to all ones; at j0 to exp(−2πi·k·j0/n)', () => {
    for (const n of [8, 10]) {
      const d = new Float64Array(n); d[0] = 1;
      const f = dft(d, new Float64Array(n));
      expect(maxDiff(f.re, new Array(n).fill(1))).toBeLessThan(1e-15);
      expect(maxDiff(f.im, new Array(n).fill(0))).toBeLessThan(1e-15);
      const s = new Float64Array(n); s[3] = 1;
      const g = dft(s, new Float64Array(n));
      for (let k = 0; k < n; k++) {
        expect(g.re[k]).toBeCloseTo(Math.cos((2 * Math.PI * 3 * k) / n), 13);
        expect(g.im[k]).toBeCloseTo(-Math.sin((2 * Math.PI * 3 * k) / n), 13);
      }
    }
  });

  it('a constant c transforms to n·c at k = 0 and zero elsewhere; a cosine on bin m to n/2 at ±m', () => {
    for (const n of [16, 15]) {
      const f = dft(new Float64Array(n).fill(2.5), new Float64Array(n));
      expect(f.re[0]).toBeCloseTo(2.5 * n, 12);
      for (let k = 1; k < n; k++) expect(Math.hypot(f.re[k], f.im[k])).toBeLessThan(1e-12);
      const m = 3;
      const c = Float64Array.from({ length: n }, (_, j) => Math.cos((2 * Math.PI * m * j) / n));
      const g = dft(c, new Float64Array(n));
      for (let k = 0; k < n; k++) {
        const want = k === m || k === n - m ? n / 2 : 0;
        expect(Math.abs(g.re[k] - want)).toBeLessThan(1e-12);
        expect(Math.abs(g.im[k])).toBeLessThan(1e-12);
      }
    }
  });

  it('length 1 returns copies of the input; empty or unequal parts are refused', () => {
    const re = Float64Array.of(4), im = Float64Array.of(-2);
    const f = dft(re, im);
    expect([f.re[0], f.im[0]]).toEqual([4, -2]);
    expect(f.re).not.toBe(re);
    expect(() => dft(new Float64Array(0), new Float64Array(0))).toThrow(RangeError);
    expect(() => dft(new Float64Array(3), new Float64Array(2))).toThrow(RangeError);
  });
});

describe(`powerSpectrum against scipy.signal.periodogram (SciPy ${ref.scipy})`, () => {
  it('window boxcar, no detrending, scaling spectrum: same frequencies and powers, even and odd n', () => {
    for (const c of ref.spectra) {
      const y = Float64Array.from(c.y);
      const p = powerSpectrum(y, c.dx);
      expect(maxDiff(p.freq, c.freq)).toBeLessThan(1e-12 * Math.max(...c.freq));
      const top = Math.max(...c.power);
      expect(maxDiff(p.power, c.power), `n = ${c.y.length}`).toBeLessThan(1e-12 * top);
      expect(Array.from(y)).toEqual(c.y);
    }
  });

  it('a sine of amplitude A on bin k gives A²/2 there; the powers sum to mean(y²) (Parseval)', () => {
    const n = 200, dx = 0.1, A = 3, k = 17;
    const y = Float64Array.from({ length: n }, (_, j) => A * Math.sin((2 * Math.PI * k * j) / n));
    const p = powerSpectrum(y, dx);
    expect(p.freq[k]).toBeCloseTo(k / (n * dx), 12);
    expect(p.power[k]).toBeCloseTo((A * A) / 2, 12);
    const rng = makeRng(3);
    const z = Float64Array.from({ length: 301 }, () => 1 + rng.normal());
    const q = powerSpectrum(z, 1);
    let ms = 0;
    for (const v of z) ms += (v * v) / z.length;
    expect(q.power.reduce((a, b) => a + b, 0)).toBeCloseTo(ms, 12);
  });

  it('refuses empty data and a spacing that is not positive', () => {
    expect(() => powerSpectrum(new Float64Array(0), 1)).toThrow(/no samples/);
    expect(() => powerSpectrum(new Float64Array(4), 0)).toThrow(/positive/);
    expect(() => powerSpectrum(new Float64Array(4), NaN)).toThrow(/positive/);
  });
});
