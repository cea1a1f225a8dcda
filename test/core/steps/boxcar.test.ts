import { describe, expect, it } from 'vitest';
import { boxcarAverage, boxcarStep } from '../../../src/core/steps/boxcar.ts';
import { normalArray } from '../../../src/core/numeric/random.ts';

describe('boxcarAverage', () => {
  it('counts, centre x and tail handling (definition: non-overlapping groups of k)', () => {
    const x = Float64Array.from({ length: 11 }, (_, i) => 10 + 2 * i);
    const y = Float64Array.from({ length: 11 }, (_, i) => i * i);
    const d = boxcarAverage(x, y, 3, 'drop');
    expect(d.y.length).toBe(3); // floor(11/3)
    expect(d.dropped).toBe(2);
    expect(Array.from(d.x)).toEqual([12, 18, 24]); // mean of x in each group = its centre
    expect(Array.from(d.y)).toEqual([(0 + 1 + 4) / 3, (9 + 16 + 25) / 3, (36 + 49 + 64) / 3]);
    const k = boxcarAverage(x, y, 3, 'keep');
    expect(k.y.length).toBe(4); // ceil(11/3)
    expect(k.dropped).toBe(0);
    expect(k.x[3]).toBe(29); // mean of 28 and 30
    expect(k.y[3]).toBe((81 + 100) / 2);
    const even = boxcarAverage(x.slice(0, 9), y.slice(0, 9), 3, 'keep');
    expect(even.y.length).toBe(3);
  });

  it('uneven x: the new x is the mean x of each group', () => {
    const x = Float64Array.from([0, 1, 5, 6, 7, 20]);
    const r = boxcarAverage(x, new Float64Array(6), 2);
    expect(Array.from(r.x)).toEqual([0.5, 5.5, 13.5]);
  });

  it('white noise SD falls by about √k (REFERENCES.md: k-point average divides noise SD by √k)', () => {
    // Group means of independent samples are independent: relative SE of their SD ≈ 1/√(2m), m = n/k groups; allow 4 SE.
    const n = 40000;
    const y = normalArray(12345, n);
    const x = Float64Array.from({ length: n }, (_, i) => i);
    const k = 8;
    const r = boxcarAverage(x, y, k);
    const m = r.y.length;
    let mean = 0;
    for (const v of r.y) mean += v / m;
    let v2 = 0;
    for (const v of r.y) v2 += (v - mean) ** 2;
    const sdOut = Math.sqrt(v2 / (m - 1));
    expect(Math.abs(sdOut * Math.sqrt(k) - 1)).toBeLessThan(4 / Math.sqrt(2 * m) + 4 / Math.sqrt(2 * n));
  });
});

describe('boxcar step', () => {
  const x = Float64Array.from({ length: 23 }, (_, i) => i * 0.5);
  const y = x.map((v) => v * 2);
  it('notes say how many points came out and what happened to the tail', () => {
    const out = boxcarStep.apply({ x, y }, { size: 4, tail: 'drop' }, {});
    expect(out.y.length).toBe(5);
    expect(out.notes.join(' ')).toMatch(/23 points averaged in groups of 4: 5 points out/);
    expect(out.notes.join(' ')).toMatch(/last 3 point\(s\).*dropped/);
    const kept = boxcarStep.apply({ x, y }, { size: 4, tail: 'keep' }, {});
    expect(kept.y.length).toBe(6);
    expect(kept.notes.join(' ')).toMatch(/mean of only 3 point/);
  });
  it('validate refuses groups that leave too few points', () => {
    expect(boxcarStep.validate({ size: 5, tail: 'drop' }, { x, y }, {})).toMatch(/only 4 point/);
    expect(boxcarStep.validate({ size: 1, tail: 'drop' }, { x, y }, {})).toMatch(/at least 2/);
    expect(boxcarStep.validate({ size: 4, tail: 'drop' }, { x, y }, {})).toBeNull();
  });
});

describe('boxcarAverage contract', () => {
  it('leaves its input unchanged and refuses bad sizes, unequal lengths and a group larger than the data', () => {
    const x = Float64Array.from({ length: 10 }, (_, i) => i);
    const y = x.map((v) => v * v);
    const xc = Float64Array.from(x), yc = Float64Array.from(y);
    boxcarAverage(x, y, 3, 'keep');
    expect(x).toEqual(xc);
    expect(y).toEqual(yc);
    expect(() => boxcarAverage(x, y, 0)).toThrow(/≥ 1/);
    expect(() => boxcarAverage(x, y, 2.5)).toThrow(/whole number/);
    expect(() => boxcarAverage(x, y, 11)).toThrow(/larger than the data/);
    expect(() => boxcarAverage(x, y.slice(1), 2)).toThrow(RangeError);
    expect(() => boxcarAverage(x, y, 2, 'wrap' as never)).toThrow(/drop or keep/);
  });

  it('groups of 1 return the data; one group of n returns the mean (definition)', () => {
    const x = Float64Array.of(1, 2, 4, 8), y = Float64Array.of(3, -1, 5, 9);
    const one = boxcarAverage(x, y, 1);
    expect(Array.from(one.y)).toEqual([3, -1, 5, 9]);
    const all = boxcarAverage(x, y, 4);
    expect(Array.from(all.x)).toEqual([15 / 4]);
    expect(Array.from(all.y)).toEqual([4]);
  });

  it('validate refuses non-numbers, fractions, huge groups and unknown tails', () => {
    const x = Float64Array.from({ length: 40 }, (_, i) => i), y = new Float64Array(40);
    expect(boxcarStep.validate({ size: NaN, tail: 'drop' }, { x, y }, {})).toMatch(/not a number/);
    expect(boxcarStep.validate({ size: 2.5, tail: 'drop' }, { x, y }, {})).toMatch(/whole number/);
    expect(boxcarStep.validate({ size: 41, tail: 'drop' }, { x, y }, {})).toMatch(/larger than the trace/);
    expect(boxcarStep.validate({ size: 2, tail: 'wrap' as never }, { x, y }, {})).toMatch(/drop or keep/);
  });
});
