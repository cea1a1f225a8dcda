// src/core/units.ts: points and x-units are told apart by the compiler. The
// lines marked as expected type errors are the check: `npm run typecheck`
// (tsconfig.node.json covers test/) fails if a mix-up below stops being one.
import { describe, expect, it } from 'vitest';
import { gaussianHeightRatioMovingAverage, matchPeaks } from '../../src/core/measure/loss-matching.ts';
import { meanStep } from '../../src/core/numeric/interpolate.ts';
import { points, toPoints, toXUnits, xUnits } from '../../src/core/units.ts';

describe('points and x-units', () => {
  it('convert at a spacing: 0.25 min at 0.01 min per point is 25 points, and back', () => {
    const dx = meanStep(Float64Array.of(0, 0.01, 0.02, 0.03, 0.04));
    expect(toPoints(xUnits(0.25), dx)).toBeCloseTo(25, 12);
    expect(toXUnits(points(25), dx)).toBeCloseTo(0.25, 12);
  });

  it('a width in x-units where points are asked for does not compile (and the values are plain numbers at run time)', () => {
    const width = xUnits(0.5);
    // @ts-expect-error a width in x-units is not a number of points
    const wrong = (): number => gaussianHeightRatioMovingAverage(width, points(5));
    // @ts-expect-error a bare number says no unit
    const bare = (): number => gaussianHeightRatioMovingAverage(5, points(5));
    // @ts-expect-error the spacing is in x-units, not points
    const spacing = () => matchPeaks([], { dx: points(2) });
    expect(typeof wrong).toBe('function');
    expect(typeof bare).toBe('function');
    expect(typeof spacing).toBe('function');
    // Exact sum, worked by hand: (1/3)(1 + 2·exp(−1/50)) for N = 3, σ = 5 points.
    expect(gaussianHeightRatioMovingAverage(points(3), points(5))).toBeCloseTo((1 + 2 * Math.exp(-1 / 50)) / 3, 12);
  });
});
