/**
 * The report's calibration section (src/core/export/report-calibration.ts):
 * the curve's equation in words (moved from test/core/calibration/wiring.test.ts).
 */
import { describe, expect, test } from 'vitest';
import { curveEquation } from '../../../src/core/export/report-calibration.ts';
import { exp } from '../calibration/wiring-fixture.ts';

describe('the curve equation', () => {
  test('the equation writes a negative term with a minus sign', () => {
    const c = { ...exp.calibrations[0], coefficients: [{ term: 'intercept' as const, power: 0, value: -0.018, standardError: 0.02 }, { term: 'slope' as const, power: 1, value: 0.39, standardError: 0.004 }] };
    expect(curveEquation(c)).toBe('response = 0.39 (± 0.004)·amount − 0.018 (± 0.02)');
  });
});
