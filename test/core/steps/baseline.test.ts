import { describe, expect, it } from 'vitest';
import {
  arplsWeight, baselineArpls, baselineAsls, baselinePolynomial, baselineStep, pointsInRanges, type BaselineParams,
} from '../../../src/core/steps/baseline.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { maxMixedError, ref } from '../baseline-reference.ts';

const sig = (x: ArrayLike<number>, y: ArrayLike<number>) => ({ x: Float64Array.from(x), y: Float64Array.from(y) });

describe('AsLS baseline (Eilers & Boelens 2005)', () => {
  it('matches scipy.sparse spsolve with the same iteration rule', () => {
    // Source: asls_sparse in make_baseline.py (SciPy 1.17.1): weights p above, 1 − p on or below, stop when weights repeat.
    const y = Float64Array.from(ref.asls.y);
    const r = baselineAsls(y, ref.asls.lambda, ref.asls.p, ref.asls.maxIter);
    expect(r.iterations).toBe(ref.asls.iterations);
    expect(r.converged).toBe(ref.asls.converged);
    expect(maxMixedError(r.baseline, ref.asls.z)).toBeLessThan(1e-9);
  });

  it('sits at the noise expectile under a Gaussian peak on a sloped line, within 3σ everywhere', () => {
    // Asymmetric least squares estimates the p-expectile (Newey & Powell 1987, Econometrica 55:819);
    // for N(0, σ²) noise and p = 0.01 that is −1.7174σ (scipy.optimize.brentq in make_baseline.py).
    // Bound 1: away from the peak the mean offset is within ±0.3σ of it (the smooth follows about
    // λ^¼ ≈ 32 points locally; over seeds 1–200 the offset stayed in −1.87σ … −1.58σ).
    // Bound 2: |baseline − line| ≤ 3σ everywhere: the expectile offset plus local wander, plus the
    // peak pulling the fit up by at most ≈ 1σ (over seeds 1–200 the extremes were −2.54σ and +1.01σ).
    const rng = makeRng(77);
    const n = 2000, sigma = 0.05;
    const line = new Float64Array(n), y = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      line[i] = 0.5 + 0.001 * i;
      y[i] = line[i] + 2 * Math.exp(-0.5 * ((i - 1000) / 20) ** 2) + sigma * rng.normal();
    }
    const r = baselineAsls(y, 1e6, 0.01, 50);
    expect(r.converged).toBe(true);
    let far = 0, count = 0, worst = 0;
    for (let i = 0; i < n; i++) {
      const d = (r.baseline[i] - line[i]) / sigma;
      worst = Math.max(worst, Math.abs(d));
      if (Math.abs(i - 1000) > 200) { far += d; count++; }
    }
    expect(Math.abs(far / count - ref.expectile['0.01'])).toBeLessThan(0.3);
    expect(worst).toBeLessThan(3);
    // So the corrected peak height is within 3σ + one noise sample of the true 2.
    const height = y[1000] - r.baseline[1000];
    expect(Math.abs(height - 2)).toBeLessThan(3 * sigma + 4 * sigma);
  });

  it('reports when the weights have not settled', () => {
    const y = Float64Array.from(ref.asls.y);
    const r = baselineAsls(y, ref.asls.lambda, ref.asls.p, 1);
    expect(r.converged).toBe(false);
    expect(r.iterations).toBe(1);
  });
});

describe('arPLS baseline (Baek et al. 2015, Analyst 140:250)', () => {
  it('weight rule gives the REFERENCES.md values', () => {
    // REFERENCES.md (update rule from memory): m = −1, s = 1, d = 2 / 3 / 4 → 0.880797 / 0.5 / 0.119203.
    expect(arplsWeight(2, -1, 1)).toBeCloseTo(0.880797, 6);
    expect(arplsWeight(3, -1, 1)).toBeCloseTo(0.5, 12);
    expect(arplsWeight(4, -1, 1)).toBeCloseTo(0.119203, 6);
    expect(arplsWeight(1e6, -1, 1)).toBe(0);
  });

  it('matches scipy.sparse spsolve with the same rule', () => {
    // Source: arpls_sparse in make_baseline.py (SciPy 1.17.1), tol 1e-3 on ‖Δw‖/‖w‖.
    const y = Float64Array.from(ref.asls.y);
    const r = baselineArpls(y, ref.arpls.lambda, ref.arpls.maxIter, ref.arpls.tol);
    expect(r.iterations).toBe(ref.arpls.iterations);
    expect(r.converged).toBe(ref.arpls.converged);
    expect(maxMixedError(r.baseline, ref.arpls.z)).toBeLessThan(1e-9);
  });
});

describe('polynomial baseline', () => {
  it('matches numpy.polynomial.polynomial.polyfit on the points in the marked ranges (uneven x)', () => {
    // Source: make_baseline.py, polyfit/polyval of order 3, NumPy 2.4.6.
    const { x, y, ranges, order, baseline } = ref.polynomial;
    const b = baselinePolynomial(Float64Array.from(x), Float64Array.from(y), ranges, order);
    expect(maxMixedError(b, baseline)).toBeLessThan(1e-9);
  });

  it('recovers an exact polynomial of every order 0–5 (least squares of consistent data is exact)', () => {
    const x = Float64Array.from({ length: 200 }, (_, i) => 100 + 0.7 * i + 0.001 * i * i);
    for (let order = 0; order <= 5; order++) {
      const coef = [2, -0.5, 0.3, -0.1, 0.05, -0.02].slice(0, order + 1);
      const u = (v: number) => (v - 150) / 50;
      const y = x.map((v) => coef.reduce((s, c, k) => s + c * u(v) ** k, 0));
      const b = baselinePolynomial(x, y, [[100, 130], [200, 260]], order);
      expect(maxMixedError(b, y)).toBeLessThan(1e-9);
    }
  });

  it('counts points in ranges given either way round', () => {
    const x = Float64Array.of(0, 1, 2, 3, 4, 5);
    expect(pointsInRanges(x, [[4, 2]])).toEqual([2, 3, 4]);
    expect(pointsInRanges(x, [[-1, 0.5], [4.5, 9]])).toEqual([0, 5]);
  });
});

describe('baseline step', () => {
  const x = Float64Array.from({ length: 300 }, (_, i) => i * 0.1);
  const rng = makeRng(31);
  const y = Float64Array.from(x, (v) => 1 + 0.2 * v + Math.exp(-0.5 * ((v - 15) / 0.8) ** 2) + 0.01 * rng.normal());
  const input = sig(x, y);
  const d = baselineStep.defaults;

  it('has a stable id and a summary', () => {
    expect(baselineStep.id).toBe('baseline');
    expect(baselineStep.summary.split('. ').length).toBeGreaterThanOrEqual(2);
  });

  it('outputs y − baseline with the baseline set, leaves input unchanged, finite out', () => {
    const xc = Float64Array.from(x), yc = Float64Array.from(y);
    for (const method of ['asls', 'arpls', 'polynomial'] as const) {
      const params: BaselineParams = { ...d, method, ranges: [[0, 10], [20, 29.9]] };
      expect(baselineStep.validate(params, input, {})).toBeNull();
      const out = baselineStep.apply(input, params, {});
      expect(out.baseline).toBeDefined();
      for (let i = 0; i < y.length; i++) {
        expect(Number.isFinite(out.y[i])).toBe(true);
        expect(out.y[i]).toBe(y[i] - out.baseline![i]);
      }
      expect(out.notes.length).toBeGreaterThan(0);
    }
    expect(x).toEqual(xc);
    expect(y).toEqual(yc);
  });

  it('explains bad parameters in words', () => {
    const v = (p: Partial<BaselineParams>) => baselineStep.validate({ ...d, ...p } as BaselineParams, input, {});
    expect(v({ method: 'polynomial', ranges: [] })).toMatch(/No baseline ranges/);
    expect(v({ method: 'polynomial', ranges: [[100, 200]] })).toMatch(/No point/);
    expect(v({ method: 'polynomial', ranges: [[0, 0.15]], order: 3 })).toMatch(/Only 2 point.*order 3 needs at least 4/);
    expect(v({ method: 'polynomial', order: 7, ranges: [[0, 10]] })).toMatch(/order/);
    expect(v({ lambda: NaN })).toMatch(/λ is not a number/);
    expect(v({ lambda: 10 })).toMatch(/λ must be from 100/);
    expect(v({ p: 0.5 })).toMatch(/asymmetry p must be from 0.001/);
    expect(v({ maxIter: 0 })).toMatch(/passes/);
    expect(v({ maxIter: -3 })).toMatch(/passes/);
    expect(v({ method: 'nope' as 'asls' })).toMatch(/Unknown method/);
  });

  it('says when the fit had not settled', () => {
    const out = baselineStep.apply(input, { ...d, maxIter: 1 }, {});
    expect(out.notes.join(' ')).toMatch(/had not settled/);
  });
});
