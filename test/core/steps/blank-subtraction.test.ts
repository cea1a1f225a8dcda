import { describe, expect, it } from 'vitest';
import { blankSubtractionStep, subtractBlank } from '../../../src/core/steps/blank-subtraction.ts';
import { gridCoverageProblem } from '../../../src/core/steps/checks.ts';
import { createTrace, type Trace } from '../../../src/core/trace.ts';

const source = { fileName: 'made-in-test', sha256: '0'.repeat(64), rowsRead: 0, rowsSkipped: 0 };
const trace = (name: string, x: ArrayLike<number>, y: ArrayLike<number>): Trace => createTrace({ name, x, y, source });
const grid = (n: number, x0: number, dx: number) => Float64Array.from({ length: n }, (_, i) => x0 + i * dx);

describe('blank subtraction', () => {
  const x = grid(101, 0, 0.1);
  const y = Float64Array.from(x, (v) => 2 + v * v);
  const input = { x, y };

  it('subtracts a blank on the same grid exactly, times the scale factor', () => {
    const blank = trace('blank', x, Float64Array.from(x, (v) => 0.5 + v));
    for (const scale of [1, 0.5, 2]) {
      expect(blankSubtractionStep.validate({ scale }, input, { blank })).toBeNull();
      const out = blankSubtractionStep.apply(input, { scale }, { blank });
      for (let i = 0; i < x.length; i++) expect(out.y[i]).toBe(y[i] - scale * blank.y[i]);
    }
  });

  it('interpolates a blank on another grid linearly (exact for a straight-line blank) and says so', () => {
    // Linear interpolation reproduces a straight line exactly (to rounding): no outside value needed.
    const bx = grid(41, -0.5, 0.27);
    const blank = trace('blank', bx, Float64Array.from(bx, (v) => 0.5 + 3 * v));
    expect(blankSubtractionStep.validate({ scale: 1 }, input, { blank })).toBeNull();
    const out = blankSubtractionStep.apply(input, { scale: 1 }, { blank });
    for (let i = 0; i < x.length; i++) expect(out.y[i]).toBeCloseTo(y[i] - (0.5 + 3 * x[i]), 12);
    expect(out.notes.join(' ')).toMatch(/interpolated linearly/);
  });

  it('refuses a blank that does not overlap, or covers only part, naming the ranges', () => {
    const far = trace('far', grid(20, 50, 1), new Float64Array(20));
    const msg = blankSubtractionStep.validate({ scale: 1 }, input, { blank: far });
    expect(msg).toMatch(/do not overlap/);
    expect(msg).toMatch(/sample runs from x = 0 to 10/);
    expect(msg).toMatch(/from 50 to 69/);
    const part = trace('part', grid(50, 3, 0.2), new Float64Array(50));
    const msg2 = blankSubtractionStep.validate({ scale: 1 }, input, { blank: part });
    expect(msg2).toMatch(/does not cover the sample from x = 0 to 3 \(/);
    expect(msg2).toMatch(/extrapolation/);
    expect(gridCoverageProblem(x, grid(30, 2, 0.2), 'the blank')).toMatch(/x = 0 to 2 and from x = 7.8 to 10/);
    expect(() => subtractBlank(input, part)).toThrow(RangeError);
  });

  it('asks for a blank and checks the scale factor', () => {
    expect(blankSubtractionStep.validate({ scale: 1 }, input, {})).toMatch(/mark a loaded trace as blank/);
    const blank = trace('b', x, y);
    expect(blankSubtractionStep.validate({ scale: NaN }, input, { blank })).toMatch(/not a number/);
    expect(blankSubtractionStep.validate({ scale: -1 }, input, { blank })).toMatch(/from 0 to 10/);
  });

  it('leaves input and blank unchanged', () => {
    const blank = trace('b', grid(30, -1, 0.5), grid(30, 1, 0.1));
    const xc = Float64Array.from(x), yc = Float64Array.from(y), bc = Float64Array.from(blank.y);
    blankSubtractionStep.apply(input, { scale: 1.3 }, { blank });
    expect(x).toEqual(xc);
    expect(y).toEqual(yc);
    expect(blank.y).toEqual(bc);
  });
});

describe('subtractBlank', () => {
  it('is sample − scale·blank point by point on the same grid, without interpolation; refuses a non-finite scale', () => {
    const x = Float64Array.of(0, 1, 2, 3, 4, 5);
    const s = { x, y: Float64Array.of(5, 6, 7, 8, 9, 10) };
    const b = { x, y: Float64Array.of(1, 1, 2, 2, 3, 3) };
    const r = subtractBlank(s, b, 2);
    expect(r.interpolated).toBe(false);
    expect(Array.from(r.y)).toEqual([3, 4, 3, 4, 3, 4]);
    expect(Array.from(subtractBlank(s, b).y)).toEqual([4, 5, 5, 6, 6, 7]);
    expect(() => subtractBlank(s, b, Infinity)).toThrow(/finite/);
  });
});
