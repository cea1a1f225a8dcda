// src/core/numeric/interpolate.ts: straight-line interpolation, the even-
// spacing test, the mean step and the one grid check. Expected values are
// worked by hand (a straight line interpolates itself exactly).
import { describe, expect, it } from 'vitest';
import { interpolateLinear, isEvenlySpaced, meanStep, sameGrid } from '../../../src/core/numeric/interpolate.ts';

describe('interpolation and grids', () => {
  it('interpolates between neighbours and gives NaN outside the range, without changing its inputs', () => {
    const xs = Float64Array.of(0, 1, 3);
    const ys = Float64Array.of(0, 10, 30);
    const xq = Float64Array.of(-1, 0, 0.5, 2, 3, 4);
    const out = interpolateLinear(xs, ys, xq);
    expect(Array.from(out.slice(1, 5))).toEqual([0, 5, 20, 30]);
    expect(out[0]).toBeNaN();
    expect(out[5]).toBeNaN();
    expect(Array.from(xs)).toEqual([0, 1, 3]);
  });

  it('gives the same values for query points out of order (binary-search path)', () => {
    const xs = Float64Array.from({ length: 50 }, (_, i) => i * 0.3);
    const ys = xs.map((x) => 2 * x - 1);
    const q = Float64Array.of(7.2, 0.1, 14.6, 3.3);
    expect(Array.from(interpolateLinear(xs, ys, q)).map((v) => Number(v.toFixed(12)))).toEqual([13.4, -0.8, 28.2, 5.6]);
  });

  it('even spacing within 0.1 % of the mean step counts as even (printed time stamps jitter); 1 % off does not', () => {
    const even = Float64Array.from({ length: 100 }, (_, i) => i * 0.01);
    expect(isEvenlySpaced(even)).toBe(true);
    const jitter = even.map((v, i) => v + (i % 2 ? 0.000005 : 0));
    expect(isEvenlySpaced(jitter)).toBe(true);
    const off = Float64Array.from(even);
    off[50] += 0.0001;
    expect(isEvenlySpaced(off)).toBe(false);
    expect(meanStep(even)).toBeCloseTo(0.01, 15);
  });

  it('the grid check: same length and every value equal', () => {
    expect(sameGrid(Float64Array.of(1, 2, 3), Float64Array.of(1, 2, 3))).toBe(true);
    expect(sameGrid(Float64Array.of(1, 2, 3), Float64Array.of(1, 2, 3.0000001))).toBe(false);
    expect(sameGrid(Float64Array.of(1, 2), Float64Array.of(1, 2, 3))).toBe(false);
  });
});
