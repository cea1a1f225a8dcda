// src/core/steps/checks.ts: the checks steps share, in their one wording.
import { describe, expect, it } from 'vitest';
import { checkOddWindow, formatNumber, gridCoverageProblem, unevenSpacingProblem } from '../../../src/core/steps/checks.ts';

describe('shared step checks', () => {
  it('a window must be an odd whole number within the limits and the trace', () => {
    expect(checkOddWindow(5, 100, 51)).toBeNull();
    expect(checkOddWindow(4, 100, 51)).toBe('The window must be an odd number of points so it is centred; try 5 or 3.');
    expect(checkOddWindow(2.5, 100, 51)).toMatch(/whole number of points, not 2.5/);
    expect(checkOddWindow(1, 100, 51)).toMatch(/at least 3 points/);
    expect(checkOddWindow(53, 100, 51)).toMatch(/at most 51 points/);
    expect(checkOddWindow(11, 10, 51)).toMatch(/larger than the trace \(10 points\); choose at most 9/);
    expect(checkOddWindow(NaN, 10, 51)).toMatch(/not a number/);
  });

  it('uneven x sends the user to the resample step, naming the step', () => {
    expect(unevenSpacingProblem(Float64Array.of(0, 1, 2, 3, 4), 'Savitzky–Golay')).toBeNull();
    expect(unevenSpacingProblem(Float64Array.of(0, 1, 2, 4, 8), 'Savitzky–Golay')).toBe('Savitzky–Golay assumes evenly spaced x, but the spacing of this trace varies; add the "Resample to even spacing" step before it.');
  });

  it('a blank or scan must cover the sample’s whole x range (no extrapolation)', () => {
    const sample = Float64Array.of(1, 2, 3, 4, 5);
    expect(gridCoverageProblem(sample, Float64Array.of(0, 6), 'the blank')).toBeNull();
    expect(gridCoverageProblem(sample, Float64Array.of(7, 9), 'the blank')).toMatch(/^The sample and the blank do not overlap: the sample runs from x = 1 to 5, the blank from 7 to 9\./);
    const partial = gridCoverageProblem(sample, Float64Array.of(2, 4.5), 'the blank');
    expect(partial).toMatch(/^The blank does not cover the sample from x = 1 to 2 and from x = 4\.5 to 5 /);
    expect(partial).toMatch(/Keep an x-range \(trim\)/);
  });

  it('numbers in messages have at most 6 significant digits', () => {
    expect(formatNumber(1 / 3)).toBe('0.333333');
    expect(formatNumber(Infinity)).toBe('Infinity');
  });
});
