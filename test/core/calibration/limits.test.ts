/**
 * Detection and quantitation limits in amount (src/core/calibration/limits.ts):
 * DL = 3.3 σ/S and QL = 10 σ/S (ICH Q2(R1) §6.3, §7.3). Cases moved from
 * calibrate.test.ts, and one computed here by hand from the straight-line
 * least-squares formulas (b = Sxy/Sxx, s² = SSE/(n − 2); any regression text).
 */
import { describe, expect, it } from 'vitest';
import { amountLimits, DL_FACTOR, QL_FACTOR } from '../../../src/core/calibration/limits.ts';
import { fitCurve, responseSdAt, type CurveFit, type CurveModel } from '../../../src/core/calibration/regression.ts';

function fitOk(x: number[], y: number[], model: CurveModel): CurveFit {
  const r = fitCurve(x, y, model);
  if (!r.ok) throw new Error(r.problem);
  return r.fit;
}

describe('limits in amount (ICH Q2(R1) §6.3, §7.3)', () => {
  const x = [1, 1, 2, 2, 4, 4, 8, 8];
  const y = [2.1, 1.9, 4.05, 3.9, 8.2, 7.9, 16.1, 15.8];

  it('straight line: DL = 3.3 s/b and QL = 10 s/b with the residual SD; with the intercept\'s SD when chosen', () => {
    const fit = fitOk(x, y, { kind: 'line', throughOrigin: false, weighting: 'none' });
    const r = amountLimits(fit, 'residual');
    if (!r.ok) throw new Error(r.problem);
    expect(r.limits.detection).toBeCloseTo((3.3 * fit.residualSd) / fit.coefficients[1], 14);
    expect(r.limits.quantitation).toBeCloseTo((10 * fit.residualSd) / fit.coefficients[1], 14);
    expect(r.limits.method).toMatch(/ICH Q2\(R1\)/);
    const i = amountLimits(fit, 'intercept');
    if (!i.ok) throw new Error(i.problem);
    expect(i.limits.sigma).toBe(fit.standardErrors[0]);
    expect(i.limits.notes[0]).toMatch(/standing in for the SD of the intercepts/);
  });

  it('through the origin there is no intercept SD, and the message says what to choose instead', () => {
    const fit = fitOk(x, y, { kind: 'line', throughOrigin: true, weighting: 'none' });
    expect(amountLimits(fit, 'intercept')).toEqual({ ok: false, problem: expect.stringMatching(/choose the residual standard deviation/) });
  });

  it('weighted: σ is the response SD at the lowest standard; quadratic: S is the slope there', () => {
    const w = fitOk(x, y, { kind: 'line', throughOrigin: false, weighting: '1/x2' });
    const r = amountLimits(w, 'residual');
    if (!r.ok) throw new Error(r.problem);
    expect(r.limits.sigma).toBeCloseTo(responseSdAt(w, 1), 14);
    expect(r.limits.sigma).toBeCloseTo(w.residualSd * Math.sqrt(w.weightScale * 1), 14);
    const q = fitOk(x, y, { kind: 'quadratic', throughOrigin: false, weighting: 'none' });
    const rq = amountLimits(q, 'residual');
    if (!rq.ok) throw new Error(rq.problem);
    expect(rq.limits.slope).toBeCloseTo(q.coefficients[1] + 2 * q.coefficients[2] * 1, 12);
    expect(rq.limits.slopeAt).toBe(1);
  });
});

describe('limits by hand', () => {
  it('ICH factors 3.3 and 10; a straight line through (1, 3.1), (2, 4.9), (3, 7.1), (4, 8.9) computed with the textbook formulas', () => {
    expect(DL_FACTOR).toBe(3.3);
    expect(QL_FACTOR).toBe(10);
    const x = [1, 2, 3, 4], y = [3.1, 4.9, 7.1, 8.9];
    const mx = 2.5, my = (3.1 + 4.9 + 7.1 + 8.9) / 4;
    const sxx = x.reduce((a, v) => a + (v - mx) ** 2, 0);
    const sxy = x.reduce((a, v, k) => a + (v - mx) * (y[k] - my), 0);
    const b = sxy / sxx, a0 = my - b * mx;
    const sse = x.reduce((a, v, k) => a + (y[k] - a0 - b * v) ** 2, 0);
    const s = Math.sqrt(sse / (x.length - 2));
    const r = amountLimits(fitOk(x, y, { kind: 'line', throughOrigin: false, weighting: 'none' }), 'residual');
    if (!r.ok) throw new Error(r.problem);
    expect(r.limits.slope).toBeCloseTo(b, 12);
    expect(r.limits.detection).toBeCloseTo((3.3 * s) / b, 12);
    expect(r.limits.quantitation).toBeCloseTo((10 * s) / b, 12);
    expect(r.limits.quantitation / r.limits.detection).toBeCloseTo(10 / 3.3, 12);
  });

  it('a falling response uses the size of the slope and says so', () => {
    const r = amountLimits(fitOk([1, 2, 3, 4], [9, 7.1, 4.9, 3.1], { kind: 'line', throughOrigin: false, weighting: 'none' }), 'residual');
    if (!r.ok) throw new Error(r.problem);
    expect(r.limits.slope).toBeLessThan(0);
    expect(r.limits.detection).toBeGreaterThan(0);
    expect(r.limits.notes.join(' ')).toMatch(/negative slope/);
  });
});
