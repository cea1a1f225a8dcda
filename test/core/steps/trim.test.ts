import { describe, expect, it } from 'vitest';
import { trimStep } from '../../../src/core/steps/trim.ts';

describe('trim: keep one x-range', () => {
  const x = Float64Array.from({ length: 11 }, (_, i) => i * 0.5);
  const y = Float64Array.from(x, (v) => v * v);
  it('keeps exactly the points inside the range, unchanged, and leaves the input alone', () => {
    const before = Float64Array.from(y);
    expect(trimStep.validate({ range: [[1, 3.2]] }, { x, y }, {})).toBeNull();
    const out = trimStep.apply({ x, y }, { range: [[3.2, 1]] }, {});
    expect(Array.from(out.x)).toEqual([1, 1.5, 2, 2.5, 3]);
    expect(Array.from(out.y)).toEqual([1, 2.25, 4, 6.25, 9]);
    expect(out.notes[0]).toBe('Kept 5 of 11 points, x = 1 to 3; 2 left out before and 4 after.');
    expect(y).toEqual(before);
  });
  it('says what is wrong with a missing, doubled or too short range', () => {
    expect(trimStep.validate({ range: [] }, { x, y }, {})).toMatch(/No x-range chosen yet/);
    expect(trimStep.validate({ range: [[0, 1], [2, 3]] }, { x, y }, {})).toMatch(/Only one range/);
    expect(trimStep.validate({ range: [[0, 1]] }, { x, y }, {})).toMatch(/holds 3 points of this trace \(it runs from 0 to 5\); a trace needs at least 5/);
  });
});

describe('trim: ends of the range', () => {
  it('keeps points lying exactly on either end, and a range between samples keeps only the samples inside', () => {
    const x = Float64Array.from({ length: 21 }, (_, i) => i * 0.25);
    const y = Float64Array.from(x, (v) => 10 - v);
    const exact = trimStep.apply({ x, y }, { range: [[1, 2]] }, {});
    expect(Array.from(exact.x)).toEqual([1, 1.25, 1.5, 1.75, 2]);
    expect(exact.figures).toEqual({ pointsIn: 21, pointsOut: 5 });
    const between = trimStep.apply({ x, y }, { range: [[0.9, 2.1]] }, {});
    expect(Array.from(between.x)).toEqual([1, 1.25, 1.5, 1.75, 2]);
    expect(Array.from(between.y)).toEqual([9, 8.75, 8.5, 8.25, 8]);
    expect(trimStep.validate({ range: [[NaN, 2]] }, { x, y }, {})).toMatch(/finite/);
  });
});
