/**
 * Calibration curves by weighted least squares, against outside references:
 * NIST StRD "Norris" (certified values in test/fixtures/nist/Norris.dat), and
 * NumPy polyfit / lstsq and scipy.stats.linregress through the committed
 * script test/reference/make_calibration.py (versions in calibration.json).
 */
import { describe, expect, it } from 'vitest';
import { chooseCurve, curvatureTest, curveSlope, curveValue, fitCurve, lackOfFitTest, responseSdAt } from '../../../src/core/calibration/regression.ts';
import type { CurveFit, CurveModel } from '../../../src/core/calibration/regression.ts';
import { near, readNorris, reference } from './reference.ts';

function fitOk(x: readonly number[], y: readonly number[], model: CurveModel): CurveFit {
  const r = fitCurve(x, y, model);
  if (!r.ok) throw new Error(r.problem);
  return r.fit;
}

describe('NIST StRD Norris (certified values, lower difficulty, 36 observations)', () => {
  const norris = readNorris();
  const fit = fitOk(norris.x, norris.y, { kind: 'line', throughOrigin: false, weighting: 'none' });

  it('reads 36 observations and the certified values from the file', () => {
    expect(norris.x.length).toBe(36);
    expect(norris.b1).toBeCloseTo(1.00211681802045, 14);
  });

  it('slope, intercept and their standard deviations to 1e-9 relative', () => {
    expect(fit.terms).toEqual(['intercept', 'slope']);
    expect(near(fit.coefficients[0], norris.b0, 1e-9)).toBe(true);
    expect(near(fit.coefficients[1], norris.b1, 1e-9)).toBe(true);
    expect(near(fit.standardErrors[0], norris.b0Sd, 1e-9)).toBe(true);
    expect(near(fit.standardErrors[1], norris.b1Sd, 1e-9)).toBe(true);
  });

  it('residual standard deviation and R² to 1e-9 relative; 34 degrees of freedom', () => {
    expect(near(fit.residualSd, norris.residualSd, 1e-9)).toBe(true);
    expect(near(fit.rSquared, norris.rSquared, 1e-12)).toBe(true);
    expect(fit.df).toBe(34);
  });

  it('reaches far beyond the required 1e-9: every certified value to 1e-12 relative', () => {
    const errs = [
      Math.abs(fit.coefficients[0] / norris.b0 - 1), Math.abs(fit.coefficients[1] / norris.b1 - 1),
      Math.abs(fit.standardErrors[0] / norris.b0Sd - 1), Math.abs(fit.standardErrors[1] / norris.b1Sd - 1),
      Math.abs(fit.residualSd / norris.residualSd - 1),
    ];
    expect(Math.max(...errs)).toBeLessThan(1e-12);
  });

  it('does not change its inputs', () => {
    const x = norris.x.slice(), y = norris.y.slice();
    fitCurve(x, y, { kind: 'quadratic', throughOrigin: false, weighting: 'none' });
    expect(x).toEqual(norris.x);
    expect(y).toEqual(norris.y);
  });
});

describe(`weighted fits against NumPy ${reference.numpy} polyfit / lstsq and SciPy ${reference.scipy} linregress`, () => {
  for (const c of reference.fits) {
    for (const r of c.fits) {
      const label = `${c.name}: ${r.kind}${r.throughOrigin ? ' through origin' : ''}, ${r.weighting} (${r.source})`;
      it(label, () => {
        const fit = fitOk(c.amounts, c.responses, { kind: r.kind, throughOrigin: r.throughOrigin, weighting: r.weighting });
        expect(fit.powers).toEqual(r.powers);
        expect(fit.df).toBe(r.df);
        // Exact rational arithmetic (Python fractions, same script): 1e-10 relative on everything.
        const scaleC = Math.max(...r.exact.coefficients.map(Math.abs));
        r.exact.coefficients.forEach((v, j) => expect(near(fit.coefficients[j], v, 1e-10, 1e-13 * scaleC), `exact coef ${j}`).toBe(true));
        r.exact.standardErrors.forEach((v, j) => expect(near(fit.standardErrors[j], v, 1e-10), `exact se ${j}`).toBe(true));
        expect(near(fit.residualSd, r.exact.residualSd, 1e-10)).toBe(true);
        // NumPy to 1e-9, or to ten times NumPy's own distance from the exact values where raw powers of x
        // far from zero make polyfit's normal matrix ill-conditioned (far-from-origin quadratics: 2e-5 to 7e-5).
        const numpyOwn = Math.max(
          ...r.standardErrors.map((v, j) => Math.abs(v / r.exact.standardErrors[j] - 1)),
          ...r.coefficients.map((v, j) => Math.abs(v - r.exact.coefficients[j]) / (Math.abs(r.exact.coefficients[j]) + 1e-13 * scaleC)),
        );
        const tol = Math.max(1e-9, 10 * numpyOwn);
        r.coefficients.forEach((v, j) => expect(near(fit.coefficients[j], v, tol, 1e-12 * scaleC), `coef ${j}`).toBe(true));
        r.standardErrors.forEach((v, j) => expect(near(fit.standardErrors[j], v, tol), `se ${j}`).toBe(true));
        r.covariance.forEach((row, i) => row.forEach((v, j) => expect(near(fit.covariance[i][j], v, 10 * tol, 1e-14 * Math.abs(r.covariance[i][i])), `cov ${i},${j}`).toBe(true)));
        expect(near(fit.residualSd, r.residualSd, tol)).toBe(true);
        if (!c.name.startsWith('far-from-origin')) expect(tol).toBe(1e-9);
        expect(near(fit.rSquared, r.rSquared, 1e-9)).toBe(true);
        expect(near(fit.weightScale, r.weightScale, 1e-14)).toBe(true);
        if (r.linregress) {
          expect(near(fit.coefficients[1], r.linregress.slope, 1e-10)).toBe(true);
          expect(near(fit.coefficients[0], r.linregress.intercept, 1e-10, 1e-12)).toBe(true);
          expect(near(fit.standardErrors[1], r.linregress.stderr, 1e-10)).toBe(true);
          expect(near(fit.standardErrors[0], r.linregress.interceptStderr, 1e-10)).toBe(true);
          expect(near(fit.rSquared, r.linregress.rvalue ** 2, 1e-10)).toBe(true);
        }
        const lof = lackOfFitTest(fit);
        if (r.lackOfFit) {
          expect(lof.ok).toBe(true);
          if (lof.ok) {
            expect(lof.test.pureErrorDf).toBe(r.lackOfFit.pureErrorDf);
            expect(lof.test.lackOfFitDf).toBe(r.lackOfFit.lackOfFitDf);
            expect(near(lof.test.pureErrorSumOfSquares, r.lackOfFit.pureErrorSumOfSquares, 1e-9)).toBe(true);
            expect(near(lof.test.f, r.lackOfFit.f, 1e-7)).toBe(true);
            expect(near(lof.test.pValue, r.lackOfFit.pValue, 1e-7)).toBe(true);
          }
        } else {
          expect(lof.ok).toBe(false);
        }
        if (r.curvature) {
          const ct = curvatureTest(fit);
          expect(near(ct.t, r.curvature.t, Math.max(1e-8, tol))).toBe(true);
          expect(near(ct.pValue, r.curvature.pValue, Math.max(1e-8, 10 * tol))).toBe(true);
          expect(ct.df).toBe(r.curvature.df);
        }
      });
    }
  }
});

describe('curve helpers and properties', () => {
  it('passes exactly through data on a line and a quadratic (residual SD 0, R² 1)', () => {
    const x = [1, 2, 3, 4, 5, 6];
    const fit = fitOk(x, x.map((v) => 2 + 3 * v - 0.5 * v * v), { kind: 'quadratic', throughOrigin: false, weighting: '1/x' });
    expect(fit.coefficients[0]).toBeCloseTo(2, 12);
    expect(fit.coefficients[1]).toBeCloseTo(3, 12);
    expect(fit.coefficients[2]).toBeCloseTo(-0.5, 12);
    expect(fit.residualSd).toBeLessThan(1e-12);
    expect(curveValue(fit, 2.5)).toBeCloseTo(2 + 7.5 - 3.125, 12);
    expect(curveSlope(fit, 2.5)).toBeCloseTo(3 - 2.5, 12);
  });

  it('weights only rescale: the same weights times any constant give the same fit (normalised to sum n)', () => {
    const c = reference.fits[1];
    const fit = fitOk(c.amounts, c.responses, { kind: 'line', throughOrigin: false, weighting: '1/x2' });
    expect(fit.weights.reduce((s, w) => s + w, 0)).toBeCloseTo(fit.n, 12);
    // Response SD at amount x: s/√w(x), so it grows in proportion to x for 1/x² weights.
    expect(responseSdAt(fit, 10) / responseSdAt(fit, 5)).toBeCloseTo(2, 12);
  });

  it('the squared t of the quadratic term equals the extra-sum-of-squares F (Mandel test, ISO 8466-2; Draper & Smith ch. 6)', () => {
    const c = reference.fits[2];
    const line = fitOk(c.amounts, c.responses, { kind: 'line', throughOrigin: false, weighting: 'none' });
    const quad = fitOk(c.amounts, c.responses, { kind: 'quadratic', throughOrigin: false, weighting: 'none' });
    const f = (line.weightedResidualSumOfSquares - quad.weightedResidualSumOfSquares) / (quad.weightedResidualSumOfSquares / quad.df);
    expect(near(curvatureTest(quad).mandelF, f, 1e-9)).toBe(true);
  });

  it('refuses, in words, what the standards cannot carry', () => {
    const bad = (x: number[], model: CurveModel) => { const r = fitCurve(x, x.map((v) => v + 1), model); return r.ok ? '' : r.problem; };
    expect(bad([1, 2], { kind: 'line', throughOrigin: false, weighting: 'none' })).toMatch(/needs at least 3 standards.*there are 2/);
    expect(bad([1, 1, 1, 1], { kind: 'line', throughOrigin: false, weighting: 'none' })).toMatch(/2 or more different amounts/);
    expect(bad([1, 1, 2, 2], { kind: 'quadratic', throughOrigin: false, weighting: 'none' })).toMatch(/3 or more different amounts/);
    expect(bad([0, 1, 2, 3], { kind: 'line', throughOrigin: false, weighting: '1/x' })).toMatch(/above zero; standard 1 has 0/);
    expect(bad([0, 0, 0], { kind: 'line', throughOrigin: true, weighting: 'none' })).toMatch(/non-zero amounts/);
    const r = fitCurve([1, 2, 3], [1, NaN, 3], { kind: 'line', throughOrigin: false, weighting: 'none' });
    expect(r.ok ? '' : r.problem).toMatch(/Standard 2 .* not a finite number/);
  });
});

describe('model choice (never by R²)', () => {
  const byName = (n: string) => reference.fits.find((c) => c.name === n)!;

  it('replicates present: lack-of-fit F-test of the line decides (p from the reference)', () => {
    const c = byName('line-duplicates');
    const r = chooseCurve(c.amounts, c.responses, { throughOrigin: false, weighting: 'none' });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const ref = c.fits.find((f) => f.kind === 'line' && !f.throughOrigin && f.weighting === 'none')!.lackOfFit!;
    expect(r.choice.rule).toBe('lack-of-fit');
    expect(near(r.choice.lineLackOfFit!.pValue, ref.pValue, 1e-7)).toBe(true);
    expect(r.choice.chosen).toBe(ref.pValue < 0.05 ? 'quadratic' : 'line');
    expect(r.choice.sentence).toMatch(/Lack-of-fit F-test/);
  });

  it('no replicates: the t-test of the quadratic term decides (curved truth is detected)', () => {
    const c = byName('curved-single');
    const r = chooseCurve(c.amounts, c.responses, { throughOrigin: false, weighting: 'none' });
    if (!r.ok) throw new Error(r.problem);
    const ref = c.fits.find((f) => f.kind === 'quadratic' && !f.throughOrigin && f.weighting === 'none')!.curvature!;
    expect(r.choice.rule).toBe('curvature-t-test');
    expect(ref.pValue).toBeLessThan(0.05);
    expect(r.choice.chosen).toBe('quadratic');
    expect(r.fit.model.kind).toBe('quadratic');
    expect(r.choice.sentence).toMatch(/No lack-of-fit test \(no standard is repeated/);
  });

  it('a line whose R² is 0.999 but which bends is still replaced by the quadratic', () => {
    const x = [1, 1, 2, 2, 4, 4, 6, 6, 8, 8, 10, 10];
    const noise = [0.01, -0.01, 0.012, -0.008, -0.01, 0.01, 0.009, -0.011, -0.01, 0.01, 0.01, -0.01];
    const y = x.map((v, i) => 1 + 2 * v - 0.01 * v * v + noise[i]);
    const r = chooseCurve(x, y, { throughOrigin: false, weighting: 'none' });
    if (!r.ok) throw new Error(r.problem);
    expect(r.alternative!.rSquared).toBeGreaterThan(0.999);
    expect(r.choice.chosen).toBe('quadratic');
  });

  it('two levels only: the line is kept and the sentence says curvature could not be tested', () => {
    const r = chooseCurve([1, 1, 5, 5], [1.1, 0.9, 5.1, 4.9], { throughOrigin: false, weighting: 'none' });
    if (!r.ok) throw new Error(r.problem);
    expect(r.choice.rule).toBe('untestable');
    expect(r.choice.sentence).toMatch(/Curvature could not be tested/);
  });

  it('a model set by the user is used, with the tests reported for information', () => {
    const c = byName('curved-single');
    const r = chooseCurve(c.amounts, c.responses, { throughOrigin: false, weighting: 'none', fixed: 'line' });
    if (!r.ok) throw new Error(r.problem);
    expect(r.choice.rule).toBe('user');
    expect(r.fit.model.kind).toBe('line');
    expect(r.choice.sentence).toMatch(/set in the settings.*Curvature of the quadratic t = /);
  });
});
