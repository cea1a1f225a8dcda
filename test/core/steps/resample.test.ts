import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { RESAMPLE_MAX_POINTS, resampleLinear, resampleStep } from '../../../src/core/steps/resample.ts';

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

interface Ref { numpy: string; resample: { x: number[]; y: number[]; count: number; gridX: number[]; gridY: number[] }[] }
const ref = JSON.parse(readFileSync(new URL('../../reference/core-modules.json', import.meta.url), 'utf8')) as Ref;

describe(`resampleLinear against numpy.interp onto numpy.linspace (NumPy ${ref.numpy}, test/reference/make_core_modules.py)`, () => {
  it('seeded uneven x, more, fewer and as many points as measured', () => {
    for (const c of ref.resample) {
      const x = Float64Array.from(c.x), y = Float64Array.from(c.y);
      const r = resampleLinear(x, y, c.count);
      for (let i = 0; i < c.count; i++) {
        expect(Math.abs(r.x[i] - c.gridX[i])).toBeLessThan(1e-13 * Math.abs(c.gridX[c.count - 1]));
        expect(Math.abs(r.y[i] - c.gridY[i])).toBeLessThan(1e-12);
      }
      // The ends are the measured ends exactly (module contract).
      expect(r.x[0]).toBe(x[0]);
      expect(r.x[c.count - 1]).toBe(x[x.length - 1]);
      expect(Array.from(x)).toEqual(c.x);
      expect(Array.from(y)).toEqual(c.y);
    }
  });

  it('refuses unequal lengths, fewer than 2 points and a bad count', () => {
    expect(() => resampleLinear(new Float64Array(3), new Float64Array(2), 5)).toThrow(RangeError);
    expect(() => resampleLinear(Float64Array.of(1), Float64Array.of(1), 5)).toThrow(/at least 2/);
    expect(() => resampleLinear(Float64Array.of(0, 1), Float64Array.of(0, 1), 1)).toThrow(/≥ 2/);
    expect(() => resampleLinear(Float64Array.of(0, 1), Float64Array.of(0, 1), 2.5)).toThrow(/whole number/);
  });
});

describe('resample step notes and limits', () => {
  it('warns when fewer points than measured are asked for, and refuses more than the most points', () => {
    const x = Float64Array.from({ length: 100 }, (_, i) => i * 0.2);
    const y = x.map(Math.sin);
    const out = resampleStep.apply({ x, y }, { points: 25 }, {});
    expect(out.x.length).toBe(25);
    // New step (19.8 / 24 = 0.825); detail narrower than two steps (1.65) can be lost.
    expect(out.notes.join(' ')).toMatch(/step 0\.825000 x-units/);
    expect(out.notes.join(' ')).toMatch(/narrower than about 1\.65 x-units/);
    expect(resampleStep.apply({ x, y }, { points: 200 }, {}).notes).toHaveLength(1);
    expect(resampleStep.validate({ points: RESAMPLE_MAX_POINTS + 1 }, { x, y }, {})).toMatch(/at most/);
    expect(resampleStep.validate({ points: NaN }, { x, y }, {})).toMatch(/not a number/);
  });
});
