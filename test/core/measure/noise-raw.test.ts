/**
 * The raw-trace σ estimator (src/core/measure/noise-raw.ts) on seeded families
 * it was not tuned on one by one, and its algebra against definitions.
 *
 * Monte-Carlo design (issue 14's checks; numbers stated so the run stays short):
 * 200 realisations of 10⁴ points per family, 2 of 10⁵ per family, 2 of 10⁶ for the
 * flat family and 1 of 10⁶ for every family (200 of 10⁵ per family with
 * TRACEWRIGHT_LONG_CHECKS=1). White-noise families: mean within 5 % of the true σ and every
 * realisation within 15 %. AR(1) φ = 0.5: the bias is stated, measured here
 * (the finest scale alone reads 0.645 σ — (6 − 8φ + 2φ²)/6 = 2.5/6, worked by
 * hand — and the correlation correction brings it back).
 */
import { describe, expect, it } from 'vitest';
import {
  correlationModel, curvatureMask, differenceShare, pieceAlgebra, rawNoiseModel, widenRuns,
} from '../../../src/core/measure/noise-raw.ts';
import { normalArray, makeRng } from '../../../src/core/numeric/random.ts';
import { ar1, FAMILIES, familyTrace, type Family } from './families.ts';

const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;

describe('method-of-moments algebra (standard regression algebra: E[e eᵀ] = (I − H) Γ (I − H))', () => {
  it('matches the explicit matrix product for small pieces', () => {
    for (const [w, L, deg] of [[10, 3, 1], [12, 4, 2], [16, 8, 3]] as const) {
      const alg = pieceAlgebra(w, L, deg);
      // Explicit: design matrix with columns 1, t, t², …, H = X (XᵀX)⁻¹ Xᵀ by normal equations.
      const r = deg + 1;
      const X = Array.from({ length: w }, (_, t) => Array.from({ length: r }, (_, p) => (t - (w - 1) / 2) ** p));
      const XtX = Array.from({ length: r }, (_, a) => Array.from({ length: r }, (_, b) => X.reduce((s, row) => s + row[a] * row[b], 0)));
      const inv = invert(XtX);
      const H = Array.from({ length: w }, (_, s) => Array.from({ length: w }, (_, t) => {
        let v = 0;
        for (let a = 0; a < r; a++) for (let b = 0; b < r; b++) v += X[s][a] * inv[a][b] * X[t][b];
        return v;
      }));
      const M = H.map((row, s) => row.map((v, t) => (s === t ? 1 : 0) - v));
      for (let j = 0; j <= L; j++) {
        const T = Array.from({ length: w }, (_, s) => Array.from({ length: w }, (_, t) => (Math.abs(s - t) === j ? 1 : 0)));
        const B = mul(mul(M, T), M);
        for (let k = 0; k <= L; k++) {
          let tr = 0;
          for (let t = 0; t + k < w; t++) tr += B[t][t + k];
          expect(alg.a[k * (L + 1) + j]).toBeCloseTo(tr, 9);
        }
      }
    }
  });

  it('recovers the autocorrelation of AR(1) noise, φ = 0.5: ρ(k) = 0.5^k (60 000 points, SE about 0.005)', () => {
    const e = ar1(makeRng(4), 60000, 0.5);
    const m = correlationModel(e, null, 8, 2)!;
    for (let k = 1; k <= 4; k++) expect(Math.abs(m.rho[k] - 0.5 ** k)).toBeLessThan(0.03);
    expect(Math.abs(m.gamma[0] - 1)).toBeLessThan(0.05);
  });

  it('share of the variance the second difference sees: 1 for white noise, 2.5/6 for AR(1) φ = 0.5 (by hand)', () => {
    const d2 = Float64Array.of(1, -2, 1);
    expect(differenceShare(d2, Float64Array.of(1))).toBeCloseTo(1, 14);
    const rho = Float64Array.from({ length: 9 }, (_, k) => 0.5 ** k);
    expect(differenceShare(d2, rho)).toBeCloseTo(2.5 / 6, 14);
  });
});

describe('feature mask', () => {
  it('masks a peak and its flanks, and almost nothing of pure noise', () => {
    const y = normalArray(3, 20000);
    const plain = curvatureMask(y);
    expect(plain.reduce((s, v) => s + v, 0) / y.length).toBeLessThan(0.02);
    const peaky = Float64Array.from(y, (v, i) => v + 200 * Math.exp(-0.5 * ((i - 10000) / 4) ** 2));
    const m = curvatureMask(peaky);
    for (let i = 9990; i <= 10010; i++) expect(m[i]).toBe(1);
    const wide = widenRuns(m);
    for (let i = 9980; i <= 10020; i++) expect(wide[i]).toBe(1);
  });
});

function familyRun(name: Family, n: number, reps: number, seed0: number): number[] {
  const out: number[] = [];
  for (let s = 0; s < reps; s++) out.push(rawNoiseModel(familyTrace(name, n, seed0 + s))!.sigma);
  return out;
}

describe('σ on seeded families (true σ = 1)', () => {
  for (const name of FAMILIES.filter((f) => f !== 'ar1')) {
    it(`${name}: 200 × 10⁴ points — mean within 5 %, every realisation within 15 %`, () => {
      const r = familyRun(name, 10000, 200, 1000);
      expect(Math.abs(mean(r) - 1)).toBeLessThan(0.05);
      for (const v of r) expect(Math.abs(v - 1)).toBeLessThan(0.15);
    }, 120_000);
  }

  it('AR(1) φ = 0.5: 200 × 10⁴ points — after the correlation correction the mean is within 3 % (the finest scale alone: 0.645)', () => {
    const r = familyRun('ar1', 10000, 200, 5000);
    expect(Math.abs(mean(r) - 1)).toBeLessThan(0.03);
    for (const v of r) expect(Math.abs(v - 1)).toBeLessThan(0.15);
    const finest = rawNoiseModel(familyTrace('ar1', 10000, 5000))!.sigmaFinest;
    expect(Math.abs(finest - Math.sqrt(2.5 / 6))).toBeLessThan(0.04);
  }, 120_000);

  it('10⁵ points, 2 realisations per family (10 in all): within 5 % each', () => {
    for (const name of FAMILIES) for (const v of familyRun(name, 100000, 2, 7000)) expect(Math.abs(v - 1)).toBeLessThan(0.05);
  }, 120_000);

  it('10⁶ points of white noise: within 2 %', () => {
    for (const v of familyRun('flat', 1_000_000, 2, 9000)) expect(Math.abs(v - 1)).toBeLessThan(0.02);
  }, 120_000);

  // Issue 14 asks for families of 10⁴–10⁶ points. One realisation of 10⁶ points per family by default; the mean
  // biases at 10⁴ (DEVELOPERS.md "Noise": drift +1.8 %, narrow +0.7 %) stay, the scatter shrinks ten-fold.
  it('10⁶ points, one realisation of every family (AR(1) after the correlation correction): within 3 %', () => {
    for (const name of FAMILIES) for (const v of familyRun(name, 1_000_000, 1, 11000)) expect(Math.abs(v - 1), name).toBeLessThan(0.03);
  }, 300_000);

  // 200 realisations of 10⁵ points per family (10⁸ points) take minutes on the project's 2-core machine:
  // TRACEWRIGHT_LONG_CHECKS=1 runs them.
  it.runIf(process.env.TRACEWRIGHT_LONG_CHECKS === '1')('10⁵ points, 200 realisations of every family: mean within 5 %, every realisation within 15 % (AR(1) mean within 3 %)', () => {
    for (const name of FAMILIES) {
      const r = familyRun(name, 100_000, 200, 13000);
      console.log(`${name}: mean ${mean(r).toFixed(4)}, range ${Math.min(...r).toFixed(4)}–${Math.max(...r).toFixed(4)}`);
      expect(Math.abs(mean(r) - 1), name).toBeLessThan(name === 'ar1' ? 0.03 : 0.05);
      for (const v of r) expect(Math.abs(v - 1), name).toBeLessThan(0.15);
    }
  }, 3_600_000);
});

describe('what each estimate says about itself', () => {
  it('names the method and the points, and reports white noise as white', () => {
    const m = rawNoiseModel(familyTrace('flat', 20000, 11))!;
    expect(m.method).toBe('finest-scale-mad');
    expect(m.points).toBeGreaterThan(19000);
    expect(m.description).toMatch(/second differences/);
    expect(m.checks.find((c) => c.id === 'correlation')!.text).toMatch(/white within the measurement/);
    expect(m.assumptionsHeld).toBe(true);
  });

  it('says so when noise grows with the signal, and gives σ along the trace', () => {
    // σ proportional to √(1 + level), level a ramp 0 … 400: the spread at the top is about 20 × that at the bottom.
    const n = 40000, rng = makeRng(12);
    const y = Float64Array.from({ length: n }, (_, i) => { const lv = (400 * i) / n; return lv + Math.sqrt(1 + lv) * rng.normal(); });
    const m = rawNoiseModel(y)!;
    const level = m.checks.find((c) => c.id === 'level')!;
    expect(level.held).toBe(false);
    expect(level.text).toMatch(/grows with the signal/);
    expect(m.assumptionsHeld).toBe(false);
    // Near the start σ ≈ √(1 + 5) ≈ 2.4, near the end ≈ √401 ≈ 20 (blocks of 833 points: level within ±4).
    const first = m.profile.sigma[0], last = m.profile.sigma[m.profile.sigma.length - 1];
    expect(first).toBeGreaterThan(1.5); expect(first).toBeLessThan(3.5);
    expect(last).toBeGreaterThan(17); expect(last).toBeLessThan(23);
  });

  it('homoscedastic noise on broad bands passes the level test', () => {
    const m = rawNoiseModel(familyTrace('bands', 40000, 13))!;
    expect(m.checks.find((c) => c.id === 'level')!.held).toBe(true);
  });

  it('a trace too short or all features gives null or a failed check, never a silent figure', () => {
    expect(rawNoiseModel(Float64Array.of(1, 2, 3))).toBeNull();
    const spiky = Float64Array.from({ length: 400 }, (_, i) => (i % 4 === 0 ? 100 : 0) + 0.01 * Math.sin(i));
    const m = rawNoiseModel(spiky);
    if (m) expect(m.checks.some((c) => c.held === false)).toBe(true);
  });

  it('never changes its input', () => {
    const y = familyTrace('narrow', 5000, 14);
    const before = Float64Array.from(y);
    rawNoiseModel(y);
    expect(y).toEqual(before);
  });
});

function mul(a: number[][], b: number[][]): number[][] {
  return a.map((row) => b[0].map((_, j) => row.reduce((s, v, k) => s + v * b[k][j], 0)));
}

function invert(m: number[][]): number[][] {
  const n = m.length;
  const a = m.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r][c]) > Math.abs(a[p][c])) p = r;
    [a[c], a[p]] = [a[p], a[c]];
    const d = a[c][c];
    for (let k = 0; k < 2 * n; k++) a[c][k] /= d;
    for (let r = 0; r < n; r++) if (r !== c) { const f = a[r][c]; for (let k = 0; k < 2 * n; k++) a[r][k] -= f * a[c][k]; }
  }
  return a.map((row) => row.slice(n));
}
