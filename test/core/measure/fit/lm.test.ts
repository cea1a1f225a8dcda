// Bounded Levenberg–Marquardt and its linear algebra (src/core/measure/fit/lm.ts).
// Sources: the Rosenbrock function, minimum 0 at (1, 1) (Rosenbrock 1960, Comput. J.
// 3:175; the standard test of Moré, Garbow & Hillstrom 1981, ACM TOMS 7:17, problem 1,
// start (−1.2, 1)); an exact Gaussian recovered to rounding; Cholesky of a matrix
// factored by hand; the covariance of straight-line least squares in closed form
// (any regression text: var(b) = s²/Sxx, var(a) = s²·Σx²/(n·Sxx)), which is
// scipy.optimize.curve_fit's absolute_sigma=False covariance.
import { describe, expect, it } from 'vitest';
import { choleskyInPlace, choleskySolve, covarianceFromJacobian, levenbergMarquardt, type LmProblem } from '../../../../src/core/measure/fit/lm.ts';

const unbounded = (p: number) => ({ lower: new Float64Array(p).fill(-Infinity), upper: new Float64Array(p).fill(Infinity) });

/** Rosenbrock as least squares: residuals 10(x₂ − x₁²) and 1 − x₁ (data 0, model −r). */
const rosenbrock: LmProblem = {
  data: new Float64Array(2),
  nParams: 2,
  evaluate(p, model, jac) {
    model[0] = -10 * (p[1] - p[0] * p[0]);
    model[1] = -(1 - p[0]);
    if (jac) {
      jac[0] = 20 * p[0]; jac[1] = 1; // ∂/∂x₁ (column 0)
      jac[2] = -10; jac[3] = 0; // ∂/∂x₂ (column 1)
    }
  },
  ...unbounded(2),
};

describe('levenbergMarquardt', () => {
  it('Rosenbrock from (−1.2, 1) reaches the minimum (1, 1) with sum of squares 0 (Moré, Garbow & Hillstrom 1981)', () => {
    const r = levenbergMarquardt(rosenbrock, [-1.2, 1]);
    expect(r.converged).toBe(true);
    expect(r.params[0]).toBeCloseTo(1, 8);
    expect(r.params[1]).toBeCloseTo(1, 8);
    expect(r.ssr).toBeLessThan(1e-20);
  });

  it('an exact Gaussian h·exp(−(x − c)²/(2s²)) is recovered to rounding from a rough start', () => {
    const x = Float64Array.from({ length: 81 }, (_, i) => -4 + i * 0.1);
    const truth = [2.5, 0.37, 0.6];
    const g = (p: ArrayLike<number>, v: number) => p[0] * Math.exp(-((v - p[1]) ** 2) / (2 * p[2] * p[2]));
    const data = Float64Array.from(x, (v) => g(truth, v));
    const n = x.length;
    const problem: LmProblem = {
      data, nParams: 3, ...unbounded(3),
      evaluate(p, model, jac) {
        for (let i = 0; i < n; i++) {
          const d = x[i] - p[1], e = Math.exp(-(d * d) / (2 * p[2] * p[2]));
          model[i] = p[0] * e;
          if (jac) {
            jac[i] = e;
            jac[n + i] = (p[0] * e * d) / (p[2] * p[2]);
            jac[2 * n + i] = (p[0] * e * d * d) / (p[2] ** 3);
          }
        }
      },
    };
    const r = levenbergMarquardt(problem, [1.5, 0, 1]);
    expect(r.converged).toBe(true);
    truth.forEach((t, j) => expect(Math.abs(r.params[j] - t)).toBeLessThan(1e-9));
    expect(r.ssr).toBeLessThan(1e-20);
    for (let i = 0; i < n; i++) expect(r.residual[i]).toBeCloseTo(data[i] - r.model[i], 15);
  });

  it('keeps parameters inside their bounds and reports which one sits on a bound', () => {
    // Fit y = a to data 5: with a ≤ 3 the best is a = 3, on the upper bound.
    const problem: LmProblem = {
      data: Float64Array.of(5, 5, 5), nParams: 1, lower: Float64Array.of(0), upper: Float64Array.of(3),
      evaluate(p, model, jac) { model.fill(p[0]); if (jac) jac.fill(1); },
    };
    const r = levenbergMarquardt(problem, [1]);
    expect(r.params[0]).toBe(3);
    expect(r.atBound[0]).toBe(1);
    expect(r.ssr).toBeCloseTo(12, 12);
  });

  it('stops when cancelled and says so', () => {
    const r = levenbergMarquardt(rosenbrock, [-1.2, 1], { isCancelled: () => true });
    expect(r.stopReason).toBe('cancelled');
    expect(r.converged).toBe(false);
  });
});

describe('Cholesky', () => {
  it('factors [[4, 2], [2, 5]] into [[2, 0], [1, 2]] and solves A·v = b (by hand)', () => {
    const a = Float64Array.of(4, 2, 2, 5);
    expect(choleskyInPlace(2, a)).toBe(true);
    expect(a[0]).toBeCloseTo(2, 15);
    expect(a[2]).toBeCloseTo(1, 15);
    expect(a[3]).toBeCloseTo(2, 15);
    // A·(1, 2) = (8, 12).
    const b = Float64Array.of(8, 12);
    choleskySolve(2, a, b);
    expect(b[0]).toBeCloseTo(1, 14);
    expect(b[1]).toBeCloseTo(2, 14);
  });

  it('refuses a matrix that is not positive definite', () => {
    expect(choleskyInPlace(2, Float64Array.of(1, 2, 2, 1))).toBe(false);
  });
});

describe('covarianceFromJacobian = s²·(JᵀJ)⁻¹, s² = ssr/(n − p)', () => {
  it('straight line a + b·x: var(b) = s²/Sxx, var(a) = s²·Σx²/(n·Sxx), cov(a, b) = −s²·x̄/Sxx', () => {
    const x = [0, 1, 2, 3, 5, 8];
    const n = x.length;
    const jac = new Float64Array(2 * n);
    x.forEach((v, i) => { jac[i] = 1; jac[n + i] = v; });
    const ssr = 2.4;
    const s2 = ssr / (n - 2);
    const mean = x.reduce((a, b) => a + b) / n;
    const sxx = x.reduce((a, v) => a + (v - mean) ** 2, 0);
    const sx2 = x.reduce((a, v) => a + v * v, 0);
    const c = covarianceFromJacobian(jac, n, 2, ssr);
    expect(c.residualVariance).toBeCloseTo(s2, 15);
    expect(c.matrix![0]).toBeCloseTo((s2 * sx2) / (n * sxx), 13);
    expect(c.matrix![3]).toBeCloseTo(s2 / sxx, 13);
    expect(c.matrix![1]).toBeCloseTo((-s2 * mean) / sxx, 13);
    expect(c.matrix![2]).toBe(c.matrix![1]);
  });

  it('two identical columns cannot be separated: no matrix', () => {
    const jac = Float64Array.of(1, 2, 3, 1, 2, 3);
    expect(covarianceFromJacobian(jac, 3, 2, 1).matrix).toBeNull();
  });
});
