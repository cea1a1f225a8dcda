import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fDistributionQuantile, localOrderSmooth, localOrderStep } from '../../../src/core/steps/local-order.ts';
// The step's F test uses the project's one F distribution (numeric/distributions.ts); checked here too.
import { fCdf as fDistributionCdf, logGamma, regularizedIncompleteBeta as betaIncomplete } from '../../../src/core/numeric/distributions.ts';
import { savitzkyGolay } from '../../../src/core/numeric/savgol.ts';
import { normalArray } from '../../../src/core/numeric/random.ts';

interface Reference {
  scipy: string;
  fPpf: { p: number; d1: number; d2: number; q: number }[];
  fCdf: { x: number; d1: number; d2: number; p: number }[];
}
const ref = JSON.parse(readFileSync(new URL('../../reference/smoothing.json', import.meta.url), 'utf8')) as Reference;

/** Seeded normal numbers from the project's generator (mulberry32 + Box–Muller). */
const normals = normalArray;

describe('F distribution', () => {
  it('log-gamma at known points', () => {
    // Γ(n) = (n−1)!, Γ(1/2) = √π (Abramowitz & Stegun 6.1.8, 6.1.6).
    expect(logGamma(1)).toBeCloseTo(0, 14);
    expect(logGamma(5)).toBeCloseTo(Math.log(24), 13);
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 14);
    // ln Γ(171) = ln 170! = Σ ln k.
    let s = 0;
    for (let k = 2; k <= 170; k++) s += Math.log(k);
    expect(Math.abs(logGamma(171) - s) / s).toBeLessThan(1e-14);
  });

  it('incomplete beta at closed forms', () => {
    // I_x(1, b) = 1 − (1 − x)^b and I_x(a, 1) = x^a (Abramowitz & Stegun 26.5.x).
    expect(betaIncomplete(0.3, 1, 4)).toBeCloseTo(1 - 0.7 ** 4, 14);
    expect(betaIncomplete(0.3, 2.5, 1)).toBeCloseTo(0.3 ** 2.5, 14);
    expect(betaIncomplete(0.5, 3, 3)).toBeCloseTo(0.5, 14);
  });

  it(`CDF and quantiles match scipy.stats.f (SciPy ${ref.scipy})`, () => {
    // scipy.stats.f.cdf / f.ppf values in test/reference/smoothing.json (make_smoothing.py).
    for (const r of ref.fCdf) expect(Math.abs(fDistributionCdf(r.x, r.d1, r.d2) - r.p)).toBeLessThan(1e-12);
    expect(ref.fPpf.length).toBeGreaterThan(90);
    for (const r of ref.fPpf) {
      const q = fDistributionQuantile(r.p, r.d1, r.d2);
      expect(Math.abs(q - r.q) / r.q).toBeLessThan(1e-9);
    }
  });

  it('F(1, ν) quantile is the square of the two-sided t quantile', () => {
    // Handbook value t(0.975, 10) = 2.228139 (statistical tables, from memory) → F(0.95; 1, 10) = 4.964603.
    expect(fDistributionQuantile(0.95, 1, 10)).toBeCloseTo(2.2281388519649385 ** 2, 6);
  });
});

describe('localOrderSmooth', () => {
  it('on a noisy straight line, picks the quadratic in about α of independent windows', () => {
    // Under the null (true line, Gaussian noise) the extra-sum-of-squares F statistic is exactly F(1, w−3):
    // P(choose 2) = α. Windows that do not overlap are independent, so the count is Binomial(m, α); allow 4 SD.
    const n = 60000;
    const w = 11;
    const e = normals(2024, n);
    const y = e.map((v, i) => 0.5 + 0.001 * i + 0.2 * v);
    for (const alpha of [0.05, 0.2]) {
      const r = localOrderSmooth(y, w, alpha);
      let m = 0;
      let hits = 0;
      for (let i = 5; i + 5 < n; i += w) {
        m++;
        if (r.order[i] === 2) hits++;
      }
      const sdCount = Math.sqrt(m * alpha * (1 - alpha));
      expect(Math.abs(hits - m * alpha)).toBeLessThan(4 * sdCount);
    }
  });

  it('on a strongly curved peak picks the quadratic near the apex', () => {
    // A Gaussian of σ = 8 points, height 10, noise SD 0.05: curvature at the apex is far beyond the test's reach.
    const n = 201;
    const e = normals(7, n);
    const y = Float64Array.from({ length: n }, (_, i) => 10 * Math.exp(-0.5 * ((i - 100) / 8) ** 2) + 0.05 * e[i]);
    const r = localOrderSmooth(y, 11, 0.05);
    for (let i = 95; i <= 105; i++) expect(r.order[i]).toBe(2);
    // Where the quadratic is chosen everywhere the result equals the quadratic Savitzky–Golay fit (same least squares).
    const sg = savitzkyGolay(y, 11, 2);
    for (let i = 95; i <= 105; i++) expect(Math.abs(r.y[i] - sg[i])).toBeLessThan(1e-12);
  });

  it('a straight line passes unchanged, ends included, and a quadratic too where it is chosen', () => {
    // Least-squares fits reproduce polynomials of their own degree exactly.
    const line = Float64Array.from({ length: 40 }, (_, i) => 3 - 0.25 * i);
    const r = localOrderSmooth(line, 9);
    for (let i = 0; i < 40; i++) expect(Math.abs(r.y[i] - line[i])).toBeLessThan(1e-12);
    const quad = Float64Array.from({ length: 40 }, (_, i) => 0.1 * (i - 17) ** 2);
    const q = localOrderSmooth(quad, 9);
    for (let i = 0; i < 40; i++) {
      expect(q.order[i]).toBe(2);
      expect(Math.abs(q.y[i] - quad[i])).toBeLessThan(1e-11);
    }
  });
});

describe('local-order step', () => {
  it('reports per-point order and the counts in its notes', () => {
    const x = Float64Array.from({ length: 300 }, (_, i) => i * 0.02);
    const e = normals(3, 300);
    const y = Float64Array.from({ length: 300 }, (_, i) => 4 * Math.exp(-0.5 * ((i - 150) / 6) ** 2) + 0.05 * e[i]);
    const p = localOrderStep.defaults;
    expect(localOrderStep.validate(p, { x, y }, {})).toBeNull();
    const out = localOrderStep.apply({ x, y }, p, {});
    const order = out.extra?.order;
    expect(order?.length).toBe(300);
    const quad = Array.from(order ?? []).filter((k) => k === 2).length;
    expect(out.notes[0]).toContain(`quadratic at ${quad} point(s)`);
    expect(out.notes[0]).toContain(`Straight line kept at ${300 - quad} point(s)`);
    expect(order?.[150]).toBe(2);
  });

  it('validate explains a bad level or window', () => {
    const x = Float64Array.from({ length: 30 }, (_, i) => i);
    const input = { x, y: x };
    expect(localOrderStep.validate({ window: 3, alpha: 0.05 }, input, {})).toMatch(/at least 5/);
    expect(localOrderStep.validate({ window: 11, alpha: 0 }, input, {})).toMatch(/between/);
    expect(localOrderStep.validate({ window: 11, alpha: NaN }, input, {})).toMatch(/not a number/);
  });
});
