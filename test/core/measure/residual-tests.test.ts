import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { lag1Autocorrelation, residual, residualDiagnostics, runsTest, twoSidedP } from '../../../src/core/measure/residual-tests.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { PASS_CHUNK } from '../../../src/core/numeric/median.ts';
import { ref } from '../baseline-reference.ts';
import { plainRuns } from './runs-rule.ts';

/** Two-sided 99.9 % range of a Binomial(n, p) count, normal approximation (z = 3.29). */
function binomialRange(n: number, p: number): [number, number] {
  const sd = Math.sqrt(n * p * (1 - p));
  return [n * p - 3.29 * sd, n * p + 3.29 * sd];
}

describe('runs test and lag-1 against outside values', () => {
  it('matches the runs count, z and p computed with NumPy and scipy.stats.norm', () => {
    // Source: make_baseline.py ("runs"): runs about the median counted with NumPy, p = 2·norm.sf(|z|) (SciPy 1.17.1).
    const e = Float64Array.from(ref.runs.e);
    const r = runsTest(e);
    expect(r.runs).toBe(ref.runs.runs);
    expect(r.expected).toBeCloseTo(ref.runs.expected, 12);
    expect(r.z).toBeCloseTo(ref.runs.z, 12);
    expect(r.p).toBeCloseTo(ref.runs.p, 6);
    expect(lag1Autocorrelation(e)).toBeCloseTo(ref.runs.lag1, 12);
  });

  it('counts runs, n₁ and n₂ as the plain rule does (points on the median left out), with ties, points on the median and short arrays (fast-check)', () => {
    // The rule written out with branches (runs-rule.ts); runsTest counts without branches.
    fc.assert(fc.property(fc.array(fc.integer({ min: -3, max: 3 }), { minLength: 0, maxLength: 60 }), (ints) => {
      const e = Float64Array.from(ints);
      const sorted = Array.from(e).sort((a, b) => a - b);
      const h = sorted.length >> 1;
      const med = sorted.length === 0 ? NaN : sorted.length % 2 ? sorted[h] : 0.5 * (sorted[h - 1] + sorted[h]);
      const want = plainRuns(e, med);
      const got = runsTest(e);
      expect(got.runs).toBe(want.runs);
      expect(got.expected).toBe(want.expected);
    }), { numRuns: 1000 });
  });

  it('give the same numbers, bit for bit, as one plain loop over arrays that cross the chunks they are read in (PASS_CHUNK)', () => {
    // The kernels read long arrays a chunk at a time (issue 16); the reference here is one loop each, as the
    // definitions read. Lengths around one, two and several chunks; white noise, ties on a coarse grid, a drift.
    const rng = makeRng(16);
    for (const n of [PASS_CHUNK - 1, PASS_CHUNK, PASS_CHUNK + 1, 2 * PASS_CHUNK + 3, 5 * PASS_CHUNK + 77]) {
      for (const kind of ['white', 'ties', 'drift'] as const) {
        const e = Float64Array.from({ length: n }, (_, i) => {
          const g = rng.normal();
          return kind === 'white' ? g : kind === 'ties' ? Math.round(2 * g) / 2 : g + 1e-4 * i;
        });
        let mean = 0;
        for (let i = 0; i < n; i++) mean += e[i];
        mean /= n;
        let num = 0, den = 0, ss = 0;
        for (let i = 0; i < n; i++) {
          const a = e[i] - mean;
          den += a * a;
          if (i + 1 < n) num += a * (e[i + 1] - mean);
          ss += e[i] * e[i];
        }
        const sorted = Array.from(e).sort((a, b) => a - b);
        const med = n % 2 ? sorted[n >> 1] : 0.5 * (sorted[(n >> 1) - 1] + sorted[n >> 1]);
        const want = plainRuns(e, med);
        const got = residualDiagnostics(e);
        expect(Object.is(lag1Autocorrelation(e), den > 0 ? num / den : 0), `${kind} ${n}`).toBe(true);
        expect(Object.is(got.rms, Math.sqrt(ss / n)), `${kind} ${n}`).toBe(true);
        expect([got.runs.runs, got.runs.expected], `${kind} ${n}`).toEqual([want.runs, want.expected]);
      }
    }
  });

  it('two-sided normal p-values agree with scipy.stats.norm.sf within the erfc approximation (1.2e-7 relative)', () => {
    // Source: make_baseline.py ("twoSidedP"); erfc from Numerical Recipes §6.2 (fractional error < 1.2e-7).
    ref.twoSidedP.z.forEach((z, k) => {
      const expected = ref.twoSidedP.p[k];
      expect(Math.abs(twoSidedP(z) - expected)).toBeLessThan(1.2e-7 * expected + 1e-15);
      expect(Math.abs(twoSidedP(-z) - expected)).toBeLessThan(1.2e-7 * expected + 1e-15);
    });
  });
});

describe('false alarms on white noise', () => {
  it('each test flags about 5 % of 400 seeded white-noise residuals (binomial 99.9 % bounds)', () => {
    // Lag-1 bound 2/√n: approximate 95 % limit for white noise (Box & Jenkins 1970; common practice),
    // so about 4.6 % fall outside; the runs test at 5 % two-sided (Wald & Wolfowitz 1940) about 5 %.
    // With 400 realisations the count is Binomial(400, 0.05): 99.9 % range 5.7 … 34.3.
    const rng = makeRng(1940);
    let lagAlarms = 0, runsAlarms = 0, structure = 0;
    for (let k = 0; k < 400; k++) {
      const e = Float64Array.from({ length: 500 }, () => rng.normal());
      const d = residualDiagnostics(e);
      if (Math.abs(d.lag1) > d.lag1Threshold) lagAlarms++;
      if (d.runs.p < 0.05) runsAlarms++;
      if (!d.looksLikeNoise) structure++;
    }
    const [lo, hi] = binomialRange(400, 0.05);
    expect(lagAlarms).toBeGreaterThan(lo);
    expect(lagAlarms).toBeLessThan(hi);
    expect(runsAlarms).toBeGreaterThan(lo);
    expect(runsAlarms).toBeLessThan(hi);
    // The structure verdict uses the one-sided halves (≈ 2.3 % and 2.5 %): at most ≈ 5 % by the union bound.
    expect(structure).toBeLessThan(hi);
  });
});

describe('residualDiagnostics verdicts', () => {
  it('flags a residual that contains a Gaussian bump', () => {
    // A bump of 1.5σ height and 40-point SD in 1000 points of white noise: lag-1 rises to about
    // var(bump)/(var(bump) + σ²) ≈ 0.12 (0.10 with this seed) > 2/√1000 = 0.063 (design check). A single
    // bump changes the run count little (one long stretch), so the lag-1 test is what catches it here.
    const rng = makeRng(12);
    const e = Float64Array.from({ length: 1000 }, (_, i) => rng.normal() + 1.5 * Math.exp(-0.5 * ((i - 500) / 40) ** 2));
    const copy = Float64Array.from(e);
    const d = residualDiagnostics(e);
    expect(d.looksLikeNoise).toBe(false);
    expect(d.lag1).toBeGreaterThan(d.lag1Threshold);
    expect(d.runs.z).toBeLessThan(0);
    expect(d.verdict).toMatch(/has structure/);
    expect(e).toEqual(copy);
  });

  it('high-pass noise (residual of a moving average): no slow structure, but the runs test rejects at p < 0.001, so it reads "caution", never clean (issue 14)', () => {
    // Residual of a 5-point mean of white noise, e = n − mean₅(n): var = 1 − 2/5 + 1/5 = 0.8,
    // lag-1 covariance = −2/5 + 4/25 = −0.24, so lag-1 ≈ −0.3 (derived here, no outside value).
    const rng = makeRng(13);
    const w = Float64Array.from({ length: 2004 }, () => rng.normal());
    const e = Float64Array.from({ length: 2000 }, (_, i) => w[i + 2] - (w[i] + w[i + 1] + w[i + 2] + w[i + 3] + w[i + 4]) / 5);
    const d = residualDiagnostics(e);
    expect(Math.abs(d.lag1 + 0.3)).toBeLessThan(4 / Math.sqrt(2000));
    expect(d.runs.p).toBeLessThan(0.001);
    expect(d.level).toBe('caution');
    expect(d.looksLikeNoise).toBe(false);
    expect(d.verdict).toMatch(/alternate/);
  });

  it('rms of a known residual, and refuses too short or non-finite input', () => {
    expect(residualDiagnostics(Float64Array.of(3, -4, 3, -4)).rms).toBeCloseTo(Math.sqrt(12.5), 14);
    expect(() => residualDiagnostics(Float64Array.of(1, 2))).toThrow(/at least 3/);
    expect(() => residualDiagnostics(Float64Array.of(1, NaN, 2))).toThrow(/finite/);
  });
});

describe('residual', () => {
  it('is raw − processed exactly on equal grids', () => {
    const x = Float64Array.of(0, 1, 2, 3, 4);
    const raw = { x, y: Float64Array.of(1, 5, 2, 8, 3) };
    const proc = { x: Float64Array.from(x), y: Float64Array.of(0.5, 4, 2.5, 7, 3) };
    const r = residual(raw, proc);
    expect(Array.from(r.y)).toEqual([0.5, 1, -0.5, 1, 0]);
    expect(r.note).toBeNull();
    expect(Array.from(raw.y)).toEqual([1, 5, 2, 8, 3]);
  });

  it('interpolates raw onto a different processed grid and says so; refuses points outside', () => {
    const x = Float64Array.from({ length: 11 }, (_, i) => i);
    const raw = { x, y: Float64Array.from(x, (v) => 2 * v) };
    const proc = { x: Float64Array.of(0.5, 2.5, 4.5), y: Float64Array.of(1, 5, 8) };
    const r = residual(raw, proc);
    expect(Array.from(r.y)).toEqual([0, 0, 1]);
    expect(r.note).toMatch(/interpolated/);
    expect(() => residual(raw, { x: Float64Array.of(5, 12), y: Float64Array.of(0, 0) })).toThrow(/outside/);
  });
});
