import { describe, expect, it } from 'vitest';
import { boxcarAverage, boxcarStep } from '../../../src/core/steps/boxcar.ts';
import { resampleLinear, resampleStep } from '../../../src/core/steps/resample.ts';
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

describe('resample', () => {
  it('onto evenly spaced points from the first to the last x, by straight lines', () => {
    const x = Float64Array.from([0, 1, 3, 4, 10]);
    const y = Float64Array.from([0, 2, 6, 8, 20]); // y = 2x: linear interpolation is exact
    const r = resampleLinear(x, y, 11);
    for (let i = 0; i < 11; i++) {
      expect(r.x[i]).toBeCloseTo(i, 14);
      expect(r.y[i]).toBeCloseTo(2 * i, 13);
    }
    expect(r.x[10]).toBe(10);
  });

  it('step defaults to the input length and then reads as even', () => {
    const x = Float64Array.from({ length: 50 }, (_, i) => i + 0.3 * Math.sin(i));
    const y = x.map((v) => Math.cos(v / 7));
    const p = resampleStep.defaults;
    expect(resampleStep.validate(p, { x, y }, {})).toBeNull();
    const out = resampleStep.apply({ x, y }, p, {});
    expect(out.x.length).toBe(50);
    const step = (out.x[49] - out.x[0]) / 49;
    for (let i = 1; i < 50; i++) expect(out.x[i] - out.x[i - 1]).toBeCloseTo(step, 12);
    expect(out.notes[0]).toMatch(/50 points interpolated onto 50 evenly spaced points/);
    expect(resampleStep.validate({ points: 3 }, { x, y }, {})).toMatch(/at least 5/);
    expect(resampleStep.validate({ points: -4 }, { x, y }, {})).toMatch(/negative/);
    expect(resampleStep.validate({ points: 2.5 }, { x, y }, {})).toMatch(/whole number/);
  });
});
