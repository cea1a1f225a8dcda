// Small dense polynomials in ascending powers. References: exact integer
// arithmetic done by hand here (products and derivatives of integer
// polynomials are exact in floating point), the binomial theorem, and
// numpy.polynomial.polynomial.polyroots of seeded polynomials from
// test/reference/make_core_modules.py (NumPy version in core-modules.json).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  polynomialAdd,
  polynomialDerivative,
  polynomialMultiply,
  polynomialScale,
  polynomialShiftedPower,
  polynomialSignChangeRoots,
  polynomialValue,
} from '../../../src/core/numeric/polynomial.ts';

interface Ref { numpy: string; roots: { coefficients: number[]; realRoots: number[] }[] }
const ref = JSON.parse(readFileSync(new URL('../../reference/core-modules.json', import.meta.url), 'utf8')) as Ref;

describe('arithmetic (exact on integers, by hand)', () => {
  it('value by Horner: 1 − 2x + 3x² at x = 2 is 9; the empty polynomial is 0', () => {
    expect(polynomialValue([1, -2, 3], 2)).toBe(9);
    expect(polynomialValue([1, -2, 3], -1)).toBe(6);
    expect(polynomialValue([], 5)).toBe(0);
  });

  it('sum, product, scale and derivative', () => {
    expect(polynomialAdd([1, 2], [3, 4, 5])).toEqual([4, 6, 5]);
    // (1 + x)(1 − x) = 1 − x²; (x − 1)(x − 2)(x − 3) = −6 + 11x − 6x² + x³.
    expect(polynomialMultiply([1, 1], [1, -1])).toEqual([1, 0, -1]);
    expect(polynomialMultiply(polynomialMultiply([-1, 1], [-2, 1]), [-3, 1])).toEqual([-6, 11, -6, 1]);
    expect(polynomialMultiply([], [1, 2])).toEqual([]);
    expect(polynomialScale([1, -2, 0.5], 4)).toEqual([4, -8, 2]);
    // d/dx (−6 + 11x − 6x² + x³) = 11 − 12x + 3x².
    expect(polynomialDerivative([-6, 11, -6, 1])).toEqual([11, -12, 3]);
    expect(polynomialDerivative([7])).toEqual([]);
  });

  it('(c + h·u)^k by the binomial theorem: (2 + 3u)³ = 8 + 36u + 54u² + 27u³', () => {
    expect(polynomialShiftedPower(2, 3, 3)).toEqual([8, 36, 54, 27]);
    expect(polynomialShiftedPower(5, -1, 0)).toEqual([1]);
    // Value check against the power itself at a few u.
    for (const u of [-1.5, 0, 0.25, 2]) expect(polynomialValue(polynomialShiftedPower(0.7, -1.3, 4), u)).toBeCloseTo((0.7 - 1.3 * u) ** 4, 12);
  });

  it('does not change its arguments', () => {
    const a = [1, 2, 3], b = [4, 5];
    polynomialAdd(a, b); polynomialMultiply(a, b); polynomialScale(a, 2); polynomialDerivative(a);
    expect(a).toEqual([1, 2, 3]);
    expect(b).toEqual([4, 5]);
  });
});

describe('polynomialSignChangeRoots', () => {
  it('roots of products of known factors, ascending (exact fits)', () => {
    expect(polynomialSignChangeRoots([-6, 11, -6, 1])).toEqual([1, 2, 3].map((r) => expect.closeTo(r, 14)));
    // (x + 0.5)(x − 1)(x − 2)(x − 4): degree 4 through the recursive path.
    const p = [[0.5, 1], [-1, 1], [-2, 1], [-4, 1]].reduce((acc, f) => polynomialMultiply(acc, f), [1]);
    const r = polynomialSignChangeRoots(p);
    expect(r).toHaveLength(4);
    [-0.5, 1, 2, 4].forEach((want, i) => expect(r[i]).toBeCloseTo(want, 12));
    // Linear and quadratic closed forms: 2x − 3; x² − 5x + 6.
    expect(polynomialSignChangeRoots([-3, 2])).toEqual([1.5]);
    expect(polynomialSignChangeRoots([6, -5, 1])).toEqual([2, 3]);
  });

  it('reports only roots where the sign changes: a double root is left out, a triple root kept', () => {
    // (x − 1)²(x − 3): sign changes only at 3.
    const p = polynomialMultiply(polynomialMultiply([-1, 1], [-1, 1]), [-3, 1]);
    const r = polynomialSignChangeRoots(p);
    expect(r).toHaveLength(1);
    expect(r[0]).toBeCloseTo(3, 12);
    // x² touches zero only: no region where it is negative.
    expect(polynomialSignChangeRoots([0, 0, 1])).toEqual([]);
    // (x − 2)³ changes sign at 2 (an exact zero at a critical point).
    const t = polynomialSignChangeRoots(polynomialShiftedPower(-2, 1, 3));
    expect(t).toHaveLength(1);
    expect(t[0]).toBeCloseTo(2, 4);
  });

  it('no real roots, constants, trailing zero coefficients, and refusal of non-finite coefficients', () => {
    expect(polynomialSignChangeRoots([1, 0, 1])).toEqual([]);
    expect(polynomialSignChangeRoots([5])).toEqual([]);
    expect(polynomialSignChangeRoots([-3, 2, 0, 0])).toEqual([1.5]);
    expect(() => polynomialSignChangeRoots([1, NaN, 1, 1])).toThrow(RangeError);
  });

  it(`real roots of seeded polynomials of degree 3 to 6 equal numpy polyroots (NumPy ${ref.numpy})`, () => {
    expect(ref.roots.length).toBe(12);
    for (const c of ref.roots) {
      const r = polynomialSignChangeRoots(c.coefficients);
      // The seeded polynomials have simple roots, so every real root is a sign change.
      expect(r.length, `coefficients ${c.coefficients.join(', ')}`).toBe(c.realRoots.length);
      for (let i = 0; i < r.length; i++) expect(Math.abs(r[i] - c.realRoots[i])).toBeLessThan(1e-9 * Math.max(1, Math.abs(c.realRoots[i])));
      // Where a root is reported the polynomial changes sign across it.
      for (const x of r) expect(Math.sign(polynomialValue(c.coefficients, x - 1e-6))).not.toBe(Math.sign(polynomialValue(c.coefficients, x + 1e-6)));
    }
  });
});
