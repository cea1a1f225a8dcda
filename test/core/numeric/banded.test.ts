import { describe, expect, it } from 'vitest';
import {
  differenceCoefficients, differencePenaltyBands, solveBandedSymmetric, whittaker,
} from '../../../src/core/numeric/banded.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { maxMixedError, ref } from '../baseline-reference.ts';

/** y = A·x for a symmetric banded A given by its diagonals (bands[k][i] = A[i][i + k]): the check of a solve. */
function multiplyBandedSymmetric(bands: readonly Float64Array[], x: Float64Array): Float64Array {
  const n = x.length;
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) y[i] = bands[0][i] * x[i];
  for (let k = 1; k < bands.length; k++) {
    for (let i = 0; i + k < n; i++) {
      y[i] += bands[k][i] * x[i + k];
      y[i + k] += bands[k][i] * x[i];
    }
  }
  return y;
}

describe('whittaker', () => {
  it('reproduces the published example (Eilers 2003, Anal. Chem. 75:3631; values as in REFERENCES.md)', () => {
    const z = whittaker(Float64Array.of(0, 0, 0, 10, 0, 0, 0), 1, 2);
    const expected = [-0.384615, 0.865385, 2.5, 4.038462, 2.5, 0.865385, -0.384615];
    // The published values have 6 decimals: agree to half a unit in the last place.
    for (let i = 0; i < 7; i++) expect(Math.abs(z[i] - expected[i])).toBeLessThan(5e-7);
  });

  it('with W = I keeps the sum and passes a straight line unchanged (Eilers 2003)', () => {
    const rng = makeRng(5);
    const y = Float64Array.from({ length: 500 }, (_, i) => Math.sin(i / 20) + rng.normal());
    let sy = 0, sz = 0;
    const z = whittaker(y, 1e4, 2);
    for (let i = 0; i < y.length; i++) { sy += y[i]; sz += z[i]; }
    // Rounding only: 500 terms of size ~1 at double precision.
    expect(Math.abs(sz - sy)).toBeLessThan(1e-9);
    const line = Float64Array.from({ length: 500 }, (_, i) => 3 - 0.02 * i);
    expect(maxMixedError(whittaker(line, 1e6, 2), line)).toBeLessThan(1e-12);
  });

  it('matches scipy.sparse spsolve for λ = 1e5 on 1000 points, and with 0/1 weights for λ = 1e3', () => {
    // Source: make_baseline.py, spsolve((W + λDᵀD), W y), SciPy 1.17.1.
    const y = Float64Array.from(ref.whittaker.y);
    expect(maxMixedError(whittaker(y, ref.whittaker.lambda, 2), ref.whittaker.z)).toBeLessThan(1e-9);
    const w = Float64Array.from(ref.whittakerWeighted.w);
    expect(maxMixedError(whittaker(y, ref.whittakerWeighted.lambda, 2, w), ref.whittakerWeighted.z)).toBeLessThan(1e-9);
  });

  it('stays accurate at n = 10^6 and λ = 1e9', () => {
    // Source: the same formula solved by scipy.sparse spsolve (make_baseline.py, every 1000th point stored).
    // The system's condition number is about 16λ ≈ 1.6e10, so either solver may carry relative errors
    // near 1e-16 × 1.6e10 ≈ 2e-6 in directions the penalty barely constrains; the removed trend keeps
    // ours well inside that (measured 3.6e-8). Tolerance 2e-7 relative to the values (≈ 1 to 4).
    const { n, lambda, every, z: zRef } = ref.whittakerLarge;
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) y[i] = 1 + 2e-6 * i + Math.sin((2 * Math.PI * i) / 2e5) + Math.exp(-0.5 * ((i - 3e5) / 5e3) ** 2);
    const z = whittaker(y, lambda, 2);
    const sub = zRef.map((_, j) => z[j * every]);
    expect(maxMixedError(sub, zRef)).toBeLessThan(2e-7);
    // Backward error: ‖Az − y‖∞ / (‖A‖∞‖z‖∞ + ‖y‖∞) at rounding level (Higham, Accuracy and Stability, §7.1).
    const bands = differencePenaltyBands(n, 2).map((b) => b.map((v) => v * lambda));
    bands[0] = bands[0].map((v) => v + 1);
    const az = multiplyBandedSymmetric(bands, z);
    let r = 0, zMax = 0, yMax = 0;
    for (let i = 0; i < n; i++) { r = Math.max(r, Math.abs(az[i] - y[i])); zMax = Math.max(zMax, Math.abs(z[i])); yMax = Math.max(yMax, Math.abs(y[i])); }
    expect(r / ((16 * lambda + 1) * zMax + yMax)).toBeLessThan(1e-14);
    // A straight line at this size and λ is still returned unchanged.
    const line = Float64Array.from({ length: n }, (_, i) => 2 + 3e-6 * i);
    expect(maxMixedError(whittaker(line, lambda, 2), line)).toBeLessThan(1e-12);
  });

  it('does not change its arguments, and refuses impossible input with a sentence', () => {
    const y = Float64Array.of(1, 2, 5, 2, 1, 0, 3);
    const w = Float64Array.of(1, 1, 0, 1, 1, 1, 1);
    const yc = Float64Array.from(y), wc = Float64Array.from(w);
    whittaker(y, 10, 2, w);
    expect(y).toEqual(yc);
    expect(w).toEqual(wc);
    expect(() => whittaker(y, -1)).toThrow(/λ/);
    expect(() => whittaker(y, NaN)).toThrow(/λ/);
    expect(() => whittaker(y, 1, 2, Float64Array.of(1, 1))).toThrow(/weights/);
    expect(() => whittaker(y, 1, 2, new Float64Array(7))).toThrow(/carry weight/);
    expect(() => whittaker(Float64Array.of(1, 2), 1, 2)).toThrow(/more than 2 points/);
  });
});

describe('banded solver', () => {
  it('solves a random symmetric positive definite band system (checked by multiplying back)', () => {
    // Property: A·x reproduces b to rounding for a diagonally dominant matrix (condition number < 10).
    const rng = makeRng(9);
    const n = 300;
    for (const m of [1, 2, 3]) {
      const bands = [Float64Array.from({ length: n }, () => 2 * m + 1 + rng.uniform())];
      for (let k = 1; k <= m; k++) bands.push(Float64Array.from({ length: n - k }, () => rng.uniform() * 2 - 1));
      const b = Float64Array.from({ length: n }, () => rng.normal());
      const x = solveBandedSymmetric(bands, b);
      expect(maxMixedError(multiplyBandedSymmetric(bands, x), b)).toBeLessThan(1e-13);
    }
  });

  it('builds DᵀD from the binomial difference coefficients', () => {
    // d-th differences: (−1)^(d−k)·C(d, k) (standard finite differences).
    expect(Array.from(differenceCoefficients(2))).toEqual([1, -2, 1]);
    expect(Array.from(differenceCoefficients(3))).toEqual([-1, 3, -3, 1]);
    // DᵀD for d = 2, n = 5 (written out by hand from D = [[1,−2,1,0,0],[0,1,−2,1,0],[0,0,1,−2,1]]).
    const b = differencePenaltyBands(5, 2);
    expect(Array.from(b[0])).toEqual([1, 5, 6, 5, 1]);
    expect(Array.from(b[1])).toEqual([-2, -4, -4, -2]);
    expect(Array.from(b[2])).toEqual([1, 1, 1]);
  });
});
