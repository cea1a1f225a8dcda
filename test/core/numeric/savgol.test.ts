// Savitzky–Golay weights and filter (src/core/numeric/savgol.ts). Sources:
// the published integer tables (Savitzky & Golay 1964, Anal. Chem. 36:1627, as
// corrected by Steinier, Termonia & Deltour 1972, Anal. Chem. 44:1906), exact
// rational least squares and SciPy savgol_coeffs / savgol_filter from
// test/reference/make_smoothing.py (smoothing.json), ml-savitzky-golay 5.0.0 in
// the interior, and a direct correlation written here from the definition.
// (Cases moved here from test/core/steps/savitzky-golay.test.ts and
// test/core/steps/moving-average-kernel.test.ts.)
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import mlSavitzkyGolay from 'ml-savitzky-golay';
import { padIndex } from '../../../src/core/numeric/convolve.ts';
import { worst } from './worst-error.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { savgolCoefficients, savitzkyGolay, type SavgolMode } from '../../../src/core/numeric/savgol.ts';

interface Reference {
  scipy: string;
  signal: number[];
  savgol: { window: number; order: number; deriv: number; mode: SavgolMode; delta: number; y: number[] }[];
  savgolCoeffs: { window: number; order: number; deriv: number; pos: number | null; c: number[]; exact: number[] }[];
  gaussianHeightRatio: { window: number; order: number; ratio: number }[];
}
const ref = JSON.parse(readFileSync(new URL('../../reference/smoothing.json', import.meta.url), 'utf8')) as Reference;

function expectClose(actual: ArrayLike<number>, expected: ArrayLike<number>, rel = 1e-9, abs = 1e-12): void {
  expect(actual.length).toBe(expected.length);
  for (let i = 0; i < expected.length; i++) {
    const tol = Math.max(abs, rel * Math.abs(expected[i]));
    if (!(Math.abs(actual[i] - expected[i]) <= tol)) {
      throw new Error(`index ${i}: got ${actual[i]}, expected ${expected[i]} (tolerance ${tol})`);
    }
  }
}

describe('Savitzky–Golay weights', () => {
  // Savitzky & Golay 1964, Anal. Chem. 36:1627, Table I (as corrected by Steinier, Termonia & Deltour 1972).
  const tables: [number, number, number[], number][] = [
    [5, 2, [-3, 12, 17, 12, -3], 35],
    [7, 2, [-2, 3, 6, 7, 6, 3, -2], 21],
    [9, 2, [-21, 14, 39, 54, 59, 54, 39, 14, -21], 231],
    [11, 2, [-36, 9, 44, 69, 84, 89, 84, 69, 44, 9, -36], 429],
    // Quartic rows: REFERENCES.md (SciPy; table from memory).
    [7, 4, [5, -30, 75, 131, 75, -30, 5], 231],
    [9, 4, [15, -55, 30, 135, 179, 135, 30, -55, 15], 429],
  ];
  it.each(tables)('smoothing, window %i order %i equals the published integers', (w, o, ints, norm) => {
    expectClose(savgolCoefficients(w, o), ints.map((v) => v / norm), 0, 1e-14);
    // Cubic gives the same weights as quadratic (odd order adds nothing at the centre): Savitzky & Golay 1964.
    expectClose(savgolCoefficients(w, o + 1), ints.map((v) => v / norm), 0, 1e-13);
  });

  it('first derivative, quadratic, 5 and 7 points equals the published integers', () => {
    // Savitzky & Golay 1964, first-derivative table; dot order (c[0] meets the leftmost sample).
    expectClose(savgolCoefficients(5, 2, 1), [-2, -1, 0, 1, 2].map((v) => v / 10), 0, 1e-14);
    expectClose(savgolCoefficients(7, 2, 1), [-3, -2, -1, 0, 1, 2, 3].map((v) => v / 28), 0, 1e-14);
  });

  it('smoothing weights sum to 1 and derivative weights to 0, even for window 101 order 6', () => {
    // Exact property of least squares (the constant column is reproduced); REFERENCES.md asks for the check.
    for (const [w, o] of [[101, 6], [5, 4], [2001, 6], [25, 3]]) {
      let s = 0;
      for (const c of savgolCoefficients(w, o)) s += c;
      expect(Math.abs(s - 1)).toBeLessThan(1e-12);
      let s1 = 0;
      for (const c of savgolCoefficients(w, o, 1)) s1 += c;
      expect(Math.abs(s1)).toBeLessThan(1e-12);
    }
  });

  it('weights match exact rational least squares and SciPy savgol_coeffs (use="dot"), including off-centre positions', () => {
    // Exact weights: Fraction arithmetic in make_smoothing.py; SciPy savgol_coeffs beside them (smoothing.json).
    for (const r of ref.savgolCoeffs) {
      const c = savgolCoefficients(r.window, r.order, r.deriv, r.pos ?? undefined);
      const scale = Math.max(...r.exact.map(Math.abs));
      expectClose(c, r.exact, 0, 1e-12 * scale);
      // SciPy fits raw powers of the offset; at window 101, order 6 it keeps only ~7 digits (4e-7 of the largest weight).
      expectClose(c, r.c, 0, (r.window > 50 ? 1e-6 : 1e-11) * scale);
    }
  });
});

describe('savitzkyGolay against SciPy savgol_filter', () => {
  it('docstring example savgol_filter([2,2,5,2,1,0,1,4,9], 5, 2)', () => {
    // SciPy 1.17 savgol_filter docstring (also in REFERENCES.md), printed to 6 decimals.
    const y = savitzkyGolay(Float64Array.from([2, 2, 5, 2, 1, 0, 1, 4, 9]), 5, 2);
    const want = [1.657143, 3.171429, 3.542857, 2.857143, 0.657143, 0.171429, 1, 4, 9];
    for (let i = 0; i < want.length; i++) expect(y[i]).toBeCloseTo(want[i], 6);
  });

  it('docstring derivative example: 0.25·i² with delta 0.5 gives 0, 1, …, 7', () => {
    // REFERENCES.md (SciPy savgol_filter, deriv=1, delta=0.5): y = 0.25·i² is x² at x = 0.5·i, so dy/dx = 2x = i exactly.
    const y = Float64Array.from({ length: 8 }, (_, i) => 0.25 * i * i);
    const d = savitzkyGolay(y, 5, 2, { deriv: 1, delta: 0.5 });
    expectClose(d, [0, 1, 2, 3, 4, 5, 6, 7], 0, 1e-12);
  });

  it(`every window, order, derivative and edge mode on the noisy test signal (SciPy ${ref.scipy})`, () => {
    // SciPy savgol_filter outputs in test/reference/smoothing.json, written by make_smoothing.py.
    const y = Float64Array.from(ref.signal);
    expect(ref.savgol.length).toBe(90);
    for (const r of ref.savgol) {
      const got = savitzkyGolay(y, r.window, r.order, { deriv: r.deriv, delta: r.delta, mode: r.mode });
      try {
        expectClose(got, r.y, 1e-9, 1e-12);
      } catch (e) {
        throw new Error(`window ${r.window} order ${r.order} deriv ${r.deriv} mode ${r.mode}: ${(e as Error).message}`, { cause: e });
      }
    }
  });

  it('height ratio of a σ = 5-point Gaussian after smoothing', () => {
    // SciPy savgol_filter on a noise-free Gaussian (smoothing.json); REFERENCES.md rounds them to 0.98827 / 0.8445 / 0.96535.
    const g = Float64Array.from({ length: 401 }, (_, i) => Math.exp(-0.5 * ((i - 200) / 5) ** 2));
    for (const r of ref.gaussianHeightRatio.filter((h) => h.order >= 0)) {
      const s = savitzkyGolay(g, r.window, r.order);
      expect(Math.abs(s[200] - r.ratio)).toBeLessThan(1e-12);
    }
    expect(savitzkyGolay(g, 11, 2)[200]).toBeCloseTo(0.98827, 5);
    expect(savitzkyGolay(g, 25, 2)[200]).toBeCloseTo(0.8445, 4);
    expect(savitzkyGolay(g, 25, 4)[200]).toBeCloseTo(0.96535, 5);
  });
});

describe('agreement with ml-savitzky-golay 5.0.0 in the interior', () => {
  it('smoothing and derivatives match where both use a full window', () => {
    // ml-savitzky-golay defaults to the first derivative and drops window−1 points (pad 'none'): ask for each derivative explicitly.
    const y = Float64Array.from(ref.signal);
    const h = 0.5;
    for (const [w, o] of [[5, 2], [11, 2], [11, 4], [25, 3]]) {
      for (const deriv of [0, 1, 2]) {
        const theirs = mlSavitzkyGolay(Array.from(y), h, { windowSize: w, polynomial: o, derivative: deriv, pad: 'none' });
        const ours = savitzkyGolay(y, w, o, { deriv, delta: h });
        const half = (w - 1) / 2;
        expect(theirs.length).toBe(y.length - 2 * half);
        // Their weights come from inverting XᵀX in raw coordinates, which loses digits as the window grows: 1e-8 relative to the signal scale.
        const scale = Math.max(...theirs.map(Math.abs));
        for (let i = 0; i < theirs.length; i++) expect(Math.abs(ours[i + half] - theirs[i])).toBeLessThan(1e-8 * scale);
      }
    }
  });
});

describe('properties', () => {
  it('polynomials of degree ≤ order pass unchanged, ends included (interp)', () => {
    // Exact property of least-squares polynomial fits (Savitzky & Golay 1964); SciPy documents it for mode 'interp'.
    const n = 60;
    for (const [w, o] of [[5, 2], [11, 3], [21, 4], [31, 6]]) {
      const p = Float64Array.from({ length: n }, (_, i) => {
        const t = (i - 20) / 10;
        let v = 0.7;
        for (let k = 1; k <= o; k++) v += ((k % 2 ? 1 : -1) * t ** k) / k;
        return v;
      });
      const s = savitzkyGolay(p, w, o);
      const amp = Math.max(...p.map(Math.abs));
      for (let i = 0; i < n; i++) expect(Math.abs(s[i] - p[i])).toBeLessThan(1e-11 * amp);
    }
  });

  it('a constant passes every edge mode unchanged (constant mode only away from the ends)', () => {
    const c = new Float64Array(40).fill(3.25);
    for (const mode of ['interp', 'mirror', 'nearest', 'wrap'] as const) {
      const s = savitzkyGolay(c, 9, 2, { mode });
      for (const v of s) expect(Math.abs(v - 3.25)).toBeLessThan(1e-13);
    }
    // Zero padding pulls the ends toward 0 by design (SciPy mode 'constant'); the interior is unchanged.
    const z = savitzkyGolay(c, 9, 2, { mode: 'constant' });
    for (let i = 4; i < 36; i++) expect(Math.abs(z[i] - 3.25)).toBeLessThan(1e-13);
  });
});

// Direct-correlation check (moved from the former test/core/numeric/kernels-fast.test.ts): the sped-up kernel
//  - Savitzky–Golay: out[i] = Σₖ c[k]·y[i + k − h] with the centre weights of
//    savgolCoefficients (Savitzky & Golay 1964, Anal. Chem. 36:1627), samples
//    beyond the ends by SciPy's ndimage padding rules (SciPy reference guide,
//    scipy.ndimage "mode"), and for 'interp' the end window's fit evaluated at
//    the outer points (SciPy savgol_filter documentation);
// Lengths are chosen to cross the 4-output groups, the 4096-point blocks and
// the cases where the window is longer than the data.
//
// Tolerance: the fast and naive sums round differently; each differs from the
// exact sum by at most about w·ε·Σ|terms| (Higham 2002, Accuracy and Stability
// of Numerical Algorithms, §4.2), so 1e-12 relative to Σ|c_k·y| (w ≤ 201,
// ε = 2.2e-16, with margin) is a bound neither can exceed unless the kernel is wrong.
function signal(n: number, seed: number): Float64Array {
  const rng = makeRng(seed);
  const y = new Float64Array(n);
  // A drift far from zero plus noise and a few tall spikes, so sums cancel and rounding shows.
  for (let i = 0; i < n; i++) y[i] = 50 + 0.01 * i + rng.normal() + (rng.uniform() < 0.01 ? 1e3 * rng.uniform() : 0);
  return y;
}

function naiveSavgol(y: Float64Array, w: number, order: number, deriv: number, mode: SavgolMode, cval: number): { out: Float64Array; scale: Float64Array } {
  const n = y.length, h = (w - 1) / 2;
  const out = new Float64Array(n), scale = new Float64Array(n);
  const c = savgolCoefficients(w, order, deriv);
  for (let i = 0; i < n; i++) {
    let s = 0, a = 0;
    if (mode === 'interp' && (i < h || i > n - 1 - h)) {
      // The fit to the first (last) w points, evaluated at this point.
      const left = i < h;
      const base = left ? 0 : n - w;
      const ce = savgolCoefficients(w, order, deriv, i - base);
      for (let k = 0; k < w; k++) { s += ce[k] * y[base + k]; a += Math.abs(ce[k] * y[base + k]); }
    } else {
      for (let k = 0; k < w; k++) {
        const j = mode === 'interp' ? i + k - h : padIndex(i + k - h, n, mode);
        const v = j < 0 ? cval : y[j];
        s += c[k] * v;
        a += Math.abs(c[k] * v);
      }
    }
    out[i] = s;
    scale[i] = a;
  }
  return { out, scale };
}

const REL = 1e-12;

describe('savitzkyGolay (folded interior) equals the direct correlation', () => {
  const modes: SavgolMode[] = ['interp', 'mirror', 'nearest', 'constant', 'wrap'];
  const shapes: [number, number, number][] = [[5, 2, 0], [7, 3, 1], [25, 2, 0], [25, 4, 2], [31, 3, 1], [101, 6, 0], [201, 3, 3]];
  for (const [w, order, deriv] of shapes) {
    for (const mode of modes) {
      it(`window ${w}, order ${order}, derivative ${deriv}, ${mode}`, () => {
        for (const n of [w, w + 1, w + 2, w + 3, w + 4, 9001]) {
          const y = signal(n, 1000 * w + n);
          const copy = Float64Array.from(y);
          const fast = savitzkyGolay(y, w, order, { deriv, mode, cval: 2.5 });
          expect(worst(fast, naiveSavgol(y, w, order, deriv, mode, 2.5))).toBeLessThan(REL);
          expect(y).toEqual(copy);
        }
      });
    }
    it(`window ${w}, order ${order}, derivative ${deriv}: data shorter than the window, padded modes`, () => {
      for (const n of [1, 2, 3, Math.max(1, w - 2)]) {
        const y = signal(n, 7 * n + w);
        for (const mode of ['mirror', 'nearest', 'constant', 'wrap'] as const) {
          const fast = savitzkyGolay(y, w, order, { deriv, mode, cval: -1 });
          expect(worst(fast, naiveSavgol(y, w, order, deriv, mode, -1))).toBeLessThan(REL);
        }
      }
    });
  }

  it('divides by the sample spacing once per derivative order', () => {
    const y = signal(3000, 5);
    const fast = savitzkyGolay(y, 11, 3, { deriv: 1, delta: 0.25 });
    const ref = naiveSavgol(y, 11, 3, 1, 'interp', 0);
    for (let i = 0; i < y.length; i++) {
      expect(Math.abs(fast[i] - ref.out[i] / 0.25)).toBeLessThan(REL * ref.scale[i] / 0.25);
    }
  });
});

describe('shapes that cannot be fitted', () => {
  it('are refused with a RangeError naming the problem; a derivative above the order gives zero weights', () => {
    expect(() => savgolCoefficients(0, 0)).toThrow(/at least 1/);
    expect(() => savgolCoefficients(5, 5)).toThrow(/smaller than the window/);
    expect(() => savgolCoefficients(5, -1)).toThrow(/order/);
    expect(() => savgolCoefficients(5, 2, 1.5)).toThrow(/derivative/);
    expect(() => savgolCoefficients(5, 2, 0, 5)).toThrow(/0 to 4/);
    // The third derivative of a quadratic is identically zero (definition).
    expect(Array.from(savgolCoefficients(7, 2, 3))).toEqual(new Array(7).fill(0));
  });
});
