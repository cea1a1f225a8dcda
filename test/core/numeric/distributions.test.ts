/**
 * t and F distributions against SciPy 1.17.1 (scipy.stats.t, scipy.stats.f,
 * scipy.special.betainc, scipy.special.gammaln), values computed by
 * test/reference/make_calibration.py into test/reference/calibration.json.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import {
  fCdf, fSurvival, logGamma, regularizedIncompleteBeta, studentTCdf, studentTQuantile, studentTSurvival,
} from '../../../src/core/numeric/distributions.ts';

interface Ref {
  scipy: string;
  distributions: {
    tQuantile: { p: number; df: number; quantile: number }[];
    tTail: { t: number; df: number; sf: number; cdf: number }[];
    fTail: { f: number; d1: number; d2: number; sf: number; cdf: number }[];
    incompleteBeta: { x: number; a: number; b: number; value: number }[];
    logGamma: { x: number; value: number }[];
  };
}
const ref = JSON.parse(readFileSync(new URL('../../reference/calibration.json', import.meta.url), 'utf8')) as Ref;
const d = ref.distributions;

/** |a − b| ≤ rel·|b| + abs. */
function near(a: number, b: number, rel: number, abs = 0): boolean {
  return Math.abs(a - b) <= rel * Math.abs(b) + abs;
}

describe(`distributions against SciPy ${ref.scipy}`, () => {
  it('ln Γ (scipy.special.gammaln) to 1e-14 relative, 1e-15 absolute near its zeros at 1 and 2', () => {
    for (const c of d.logGamma) expect(near(logGamma(c.x), c.value, 1e-14, 1e-15), `x=${c.x}`).toBe(true);
  });

  it('regularised incomplete beta (scipy.special.betainc) to 1e-12 relative', () => {
    for (const c of d.incompleteBeta) {
      expect(near(regularizedIncompleteBeta(c.x, c.a, c.b), c.value, 1e-12, 1e-300), `x=${c.x} a=${c.a} b=${c.b}`).toBe(true);
    }
  });

  it('Student t quantiles (scipy.stats.t.ppf) to 1e-12 relative', () => {
    for (const c of d.tQuantile) expect(near(studentTQuantile(c.p, c.df), c.quantile, 1e-12), `p=${c.p} df=${c.df}`).toBe(true);
  });

  it('Student t tails (scipy.stats.t.sf / cdf) to 1e-12 relative, non-integer df included', () => {
    for (const c of d.tTail) {
      expect(near(studentTSurvival(c.t, c.df), c.sf, 1e-12, 1e-300), `sf t=${c.t} df=${c.df}`).toBe(true);
      expect(near(studentTCdf(c.t, c.df), c.cdf, 1e-12, 1e-300), `cdf t=${c.t} df=${c.df}`).toBe(true);
    }
  });

  it('F tails (scipy.stats.f.sf / cdf) to 1e-12 relative', () => {
    for (const c of d.fTail) {
      expect(near(fSurvival(c.f, c.d1, c.d2), c.sf, 1e-12, 1e-300), `sf f=${c.f} d=${c.d1},${c.d2}`).toBe(true);
      expect(near(fCdf(c.f, c.d1, c.d2), c.cdf, 1e-12, 1e-300), `cdf f=${c.f} d=${c.d1},${c.d2}`).toBe(true);
    }
  });

  it('closed forms: t with 1 df is Cauchy, with 2 df has t = (2p − 1)/√(2p(1 − p)) (Johnson, Kotz & Balakrishnan, from memory)', () => {
    for (const p of [0.6, 0.9, 0.975, 0.999]) {
      expect(studentTQuantile(p, 1)).toBeCloseTo(Math.tan(Math.PI * (p - 0.5)), 10);
      expect(studentTQuantile(p, 2)).toBeCloseTo((2 * p - 1) / Math.sqrt(2 * p * (1 - p)), 10);
    }
    // Printed table value (any statistics table): t(0.975, 10) = 2.228.
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.228, 3);
  });

  it('refuses arguments outside the domain with a sentence', () => {
    expect(() => studentTQuantile(1, 5)).toThrow(/strictly between 0 and 1/);
    expect(() => studentTQuantile(0.5, 0)).toThrow(/degrees of freedom/);
    expect(() => regularizedIncompleteBeta(1.5, 1, 1)).toThrow(/0 ≤ x ≤ 1/);
    expect(() => logGamma(-1)).toThrow(RangeError);
  });
});
