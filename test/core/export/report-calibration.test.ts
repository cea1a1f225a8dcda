/**
 * The report's calibration section (src/core/export/report-calibration.ts):
 * the curve's equation in words (moved from test/core/calibration/wiring.test.ts).
 */
import { describe, expect, test } from 'vitest';
import { calNum, calibrationReportSection, curveEquation, intervalText } from '../../../src/core/export/report-calibration.ts';
import { exp } from '../calibration/wiring-fixture.ts';

describe('the curve equation', () => {
  test('the equation writes a negative term with a minus sign', () => {
    const c = { ...exp.calibrations[0], coefficients: [{ term: 'intercept' as const, power: 0, value: -0.018, standardError: 0.02 }, { term: 'slope' as const, power: 1, value: 0.39, standardError: 0.004 }] };
    expect(curveEquation(c)).toBe('response = 0.39 (± 0.004)·amount − 0.018 (± 0.02)');
  });
});

describe('numbers and intervals for reading', () => {
  test('five significant figures, exponent form outside 1e-4 … 1e7, a dash for none', () => {
    expect(calNum(3.14159265)).toBe('3.1416');
    expect(calNum(123456.78)).toBe('123460');
    expect(calNum(0.000012345)).toBe('1.2345e-5');
    expect(calNum(2.5e8)).toBe('2.5000e+8');
    expect(calNum(0)).toBe('0');
    expect([calNum(null), calNum(undefined), calNum(NaN)]).toEqual(['—', '—', '—']);
    expect(intervalText({ interval: { low: 1.23456, high: null, level: 0.95 } })).toBe('[1.2346, unbounded]');
    expect(intervalText({ interval: null })).toBe('—');
  });
});

describe('calibrationReportSection', () => {
  test('one row per named peak with its equation, the standards read back, this trace\'s amounts and the missing peak named', () => {
    const result = { peaks: [], peakOptions: { limits: { detection: 3, quantitation: 10 } } } as unknown as Parameters<typeof calibrationReportSection>[1];
    const html = calibrationReportSection(exp, result);
    expect(html).toContain('<h2>Calibration and amounts</h2>');
    for (const c of exp.calibrations) expect(html).toContain(curveEquation(c));
    expect((html.match(/<tr>/g) ?? []).length).toBe(1 + 2 + 1 + 12 + 1 + 2);
    expect(html).toMatch(/S\/N limits: detection 3, quantitation 10/);
    expect(html).toContain('Named peaks missing in this trace: B.');
    expect(html).toContain(`${calNum(exp.samples[0].amounts[0].amount)}`);
  });
});
