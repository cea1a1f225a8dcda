import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import mlSavitzkyGolay from 'ml-savitzky-golay';
import {
  noiseGain,
  savgolCoefficients,
  savitzkyGolay,
  savitzkyGolayStep,
} from '../../../src/core/steps/savitzky-golay.ts';
import type { SavgolMode } from '../../../src/core/steps/savitzky-golay.ts';
import { normalArray } from '../../../src/core/numeric/random.ts';

interface Reference {
  scipy: string;
  signal: number[];
  savgol: { window: number; order: number; deriv: number; mode: SavgolMode; delta: number; y: number[] }[];
  savgolCoeffs: { window: number; order: number; deriv: number; pos: number | null; c: number[]; exact: number[] }[];
  gaussianHeightRatio: { window: number; order: number; ratio: number }[];
}
const ref = JSON.parse(readFileSync(new URL('../../reference/smoothing.json', import.meta.url), 'utf8')) as Reference;

/** Seeded normal numbers from the project's generator (mulberry32 + Box–Muller). */
const normals = normalArray;

function sd(a: Float64Array, from = 0, to = a.length): number {
  let m = 0;
  for (let i = from; i < to; i++) m += a[i];
  m /= to - from;
  let v = 0;
  for (let i = from; i < to; i++) v += (a[i] - m) ** 2;
  return Math.sqrt(v / (to - from - 1));
}

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

  it('white-noise gain √Σc² matches REFERENCES.md', () => {
    // REFERENCES.md, Savitzky–Golay table (4 decimals).
    const rows: [number, number, number][] = [
      [5, 2, 0.6969], [7, 2, 0.5774], [9, 2, 0.5054], [11, 2, 0.4555], [7, 4, 0.7531], [9, 4, 0.6459],
    ];
    for (const [w, o, g] of rows) expect(noiseGain(savgolCoefficients(w, o))).toBeCloseTo(g, 4);
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

  it('white noise SD falls by √Σc²', () => {
    // Variance of a weighted sum of independent samples is σ²Σc² (any statistics text).
    // n = 20000 gives a relative SE of the SD of about 1/√(2n_eff); n_eff ≥ n/window for the smoothed series, so allow 4·√(w/(2n)).
    const n = 20000;
    const e = normals(11, n);
    for (const [w, o] of [[5, 2], [11, 2], [25, 4]]) {
      const g = noiseGain(savgolCoefficients(w, o));
      const s = savitzkyGolay(e, w, o);
      const ratio = sd(s, w, n - w) / sd(e, w, n - w);
      expect(Math.abs(ratio / g - 1)).toBeLessThan(4 * Math.sqrt(w / (2 * n)));
    }
  });
});

describe('savitzky-golay step', () => {
  const x = Float64Array.from({ length: 50 }, (_, i) => 2 + 0.1 * i);
  const y = x.map((v) => 3 * v * v - v);
  const input = { x, y };

  it('derivatives are divided by the mean x step (exact on a quadratic in x)', () => {
    // d/dx (3x² − x) = 6x − 1 and d²/dx² = 6: exact for a quadratic fit (least-squares property).
    const d1 = savitzkyGolayStep.apply(input, { ...savitzkyGolayStep.defaults, derivative: 1 }, {});
    const d2 = savitzkyGolayStep.apply(input, { ...savitzkyGolayStep.defaults, derivative: 2 }, {});
    for (let i = 0; i < x.length; i++) {
      expect(Math.abs(d1.y[i] - (6 * x[i] - 1))).toBeLessThan(1e-9);
      expect(Math.abs(d2.y[i] - 6)).toBeLessThan(1e-8);
    }
    expect(savitzkyGolayStep.validate({ ...savitzkyGolayStep.defaults, derivative: 1 }, input, {})).toBeNull();
  });

  it('validate explains bad settings', () => {
    const d = savitzkyGolayStep.defaults;
    expect(savitzkyGolayStep.validate({ ...d, window: 5, order: 5 }, input, {})).toMatch(/smaller than the window/);
    expect(savitzkyGolayStep.validate({ ...d, order: 7 }, input, {})).toMatch(/0 to 6/);
    expect(savitzkyGolayStep.validate({ ...d, order: 1, derivative: 2 }, input, {})).toMatch(/no derivative of order 2/);
    expect(savitzkyGolayStep.validate({ ...d, derivative: 3 }, input, {})).toMatch(/0, 1 or 2/);
  });
});
