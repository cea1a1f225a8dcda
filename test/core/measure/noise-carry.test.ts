/**
 * σ carried from the raw trace through the stack (src/core/measure/noise-carry.ts).
 *
 * Sources beside each check: noise gains of Savitzky–Golay smoothing √Σc²
 * (Savitzky & Golay 1964; Steinier et al. 1972; values in
 * ../shared/REFERENCES.md); a k-point average of AR(1) noise, φ = 0.5:
 * SD × 0.667 for k = 5 (REFERENCES.md: var = σ²/k²·Σᵢⱼ φ^|i−j|); white noise
 * through a k-point average: σ/√k. For the steps that are not linear the
 * reference is the spread measured by adding known noise to a noiseless
 * trace: SD of process(T + ε₀) − process(T), pooled over seeds.
 *
 * Monte-Carlo sizes: 40 realisations of 2·10⁴ points for the moving-average
 * checks (mean within 5 %), 8 of 2·10⁴ for each simulated step (within 10 %).
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../../src/core/analysis/index.ts';
import { carryLinear, isLinearStack, noiseShapingTaps, passedVariance, simulatedNoise } from '../../../src/core/measure/noise-carry.ts';
import { constantProfile, sigmaAt } from '../../../src/core/measure/noise-profile.ts';
import { runPipeline } from '../../../src/core/pipeline.ts';
import { emptyRecipe, makeRecipeStep, type Recipe } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { createTrace, type Trace } from '../../../src/core/trace.ts';
import { normalArray } from '../../../src/core/numeric/random.ts';
import { expectedNoiseBumps } from '../../../src/core/measure/noise-bumps.ts';
import { familyParts, type Family } from './families.ts';

const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;

function traceOf(y: Float64Array, id = 't'): Trace {
  const x = Float64Array.from({ length: y.length }, (_, i) => i * 0.01);
  return createTrace({ id, name: id, x, y, source: { fileName: `${id}.csv`, sha256: '0'.repeat(64), rowsRead: y.length, rowsSkipped: 0 } });
}

function recipe(...steps: [string, Record<string, unknown>][]): Recipe {
  const r = emptyRecipe();
  for (const [id, p] of steps) r.steps.push(makeRecipeStep(STEP_REGISTRY.find((d) => d.id === id)!, p as never));
  return r;
}

function carried(y: Float64Array, rec: Recipe) {
  const t = traceOf(y);
  return analyse({ sampleId: t.id, scanIds: [], recipe: rec }, new Map([[t.id, t]]), STEP_REGISTRY);
}

describe('linear algebra of the carriage', () => {
  it('white noise passes σ·√Σg²; AR(1) φ = 0.5 through a 5-point average gives 0.667 σ (REFERENCES.md)', () => {
    const g = Float64Array.of(0.2, 0.2, 0.2, 0.2, 0.2);
    expect(Math.sqrt(passedVariance(g, Float64Array.of(1)))).toBeCloseTo(1 / Math.sqrt(5), 14);
    const rho = Float64Array.from({ length: 31 }, (_, k) => 0.5 ** k);
    // var = (1/25)·(5 + 2·(4·0.5 + 3·0.25 + 2·0.125 + 0.0625)) = 0.445 → SD 0.6671
    expect(Math.sqrt(passedVariance(g, rho))).toBeCloseTo(Math.sqrt((5 + 2 * (4 * 0.5 + 3 * 0.25 + 2 * 0.125 + 0.0625)) / 25), 12);
    expect(Math.sqrt(passedVariance(g, rho))).toBeCloseTo(0.667, 3);
  });

  it('Savitzky–Golay noise gain equals √Σc² of the published coefficients (white noise, exact route)', () => {
    // √Σc², quadratic 5 / 7 / 9 / 11 points: 0.6969 / 0.5774 / 0.5054 / 0.4555; quartic 7 / 9: 0.7531 / 0.6459 (REFERENCES.md).
    const cases: [number, number, number][] = [[5, 2, 0.6969], [7, 2, 0.5774], [9, 2, 0.5054], [11, 2, 0.4555], [7, 4, 0.7531], [9, 4, 0.6459]];
    const raw = traceOf(normalArray(1, 400));
    const white = { profile: constantProfile(400, 1), sigma: 1, rho: Float64Array.of(1) };
    for (const [w, o, expected] of cases) {
      const rec = recipe(['savitzky-golay', { window: w, order: o }]);
      const run = runPipeline(raw, raw.id, rec, STEP_REGISTRY);
      expect(isLinearStack(run, STEP_REGISTRY, raw)).toBe(true);
      const c = carryLinear(raw, run, rec, STEP_REGISTRY, {}, { sample: white });
      expect(c.gain).toBeCloseTo(expected, 4);
      expect(c.route).toBe('linear');
    }
  });

  it('the ends of a 5-point average that shrinks its window: gains 1, 1/√3, then 1/√5 (exact rows)', () => {
    const raw = traceOf(normalArray(2, 300));
    const rec = recipe(['moving-average', { window: 5, edge: 'shrink' }]);
    const run = runPipeline(raw, raw.id, rec, STEP_REGISTRY);
    const c = carryLinear(raw, run, rec, STEP_REGISTRY, {}, { sample: { profile: constantProfile(300, 2), sigma: 2, rho: Float64Array.of(1) } });
    expect(sigmaAt(c.profile, 0)).toBeCloseTo(2, 10);
    expect(sigmaAt(c.profile, 1)).toBeCloseTo(2 / Math.sqrt(3), 10);
    expect(sigmaAt(c.profile, 2)).toBeCloseTo(2 / Math.sqrt(5), 10);
    expect(sigmaAt(c.profile, 150)).toBeCloseTo(2 / Math.sqrt(5), 10);
    expect(sigmaAt(c.profile, 299)).toBeCloseTo(2, 10);
    expect(c.sigma).toBeCloseTo(2 / Math.sqrt(5), 10);
  });

  it('a blank adds its own carried noise: subtracting an equally noisy blank multiplies σ by √2', () => {
    const n = 3000;
    const sample = traceOf(normalArray(3, n), 's');
    const blank = traceOf(normalArray(4, n), 'b');
    const rec = recipe(['blank-subtraction', {}]);
    const r = analyse({ sampleId: 's', blankId: 'b', scanIds: [], recipe: rec }, new Map([['s', sample], ['b', blank]]), STEP_REGISTRY);
    const raw = r.noise!.rawSigma!.sigma;
    // The two traces' own σ differ by their sampling error; the sum of variances is what must come out.
    expect(r.noise!.carried!.route).toBe('linear');
    expect(r.noise!.carried!.description).toMatch(/the blank adds σ/);
    expect(r.noise!.sigma.sigma).toBeGreaterThan(1.3 * raw);
    expect(r.noise!.sigma.sigma).toBeLessThan(1.55 * raw);
  });

  it('a raw σ that changes along the trace is carried run by run: white noise through a 5-point average gives each run\'s σ/√5 (exact rows at the ends)', () => {
    const n = 1000;
    const t = traceOf(normalArray(5, n));
    const raw = { x: t.x, y: t.y };
    const rec = recipe(['moving-average', { window: 5 }]);
    const run = runPipeline(raw, 't', rec, STEP_REGISTRY);
    const profile = { points: n, starts: Int32Array.of(0, 300, 700), sigma: Float64Array.of(1, 2, 0.5) };
    const c = carryLinear(raw, run, rec, STEP_REGISTRY, {}, { sample: { profile, sigma: 1, rho: Float64Array.of(1) } });
    // Away from the ends, each point's σ is its own run's σ times the average's gain 1/√5 (one shared rounding).
    for (const [i, s] of [[10, 1], [299, 1], [300, 2], [500, 2], [699, 2], [700, 0.5], [989, 0.5]] as const) {
      expect(sigmaAt(c.profile, i)).toBeCloseTo(s / Math.sqrt(5), 12);
    }
  });

  it('every step marked linear is affine in its input: process(y + δ) − process(y) does not depend on y', () => {
    const n = 256;
    const d = normalArray(5, n);
    const ya = normalArray(6, n), yb = Float64Array.from(normalArray(7, n), (v, i) => 5 * v + 0.01 * i * i);
    const blank = traceOf(normalArray(8, n), 'b'), scan = traceOf(normalArray(9, n), 'c');
    const ctx = { blank, scans: [scan] };
    for (const def of STEP_REGISTRY.filter((s) => s.linear)) {
      const rec = recipe([def.id, {}]);
      const p = (y: Float64Array) => runPipeline(traceOf(y), 'x', rec, STEP_REGISTRY, ctx).final.y;
      const a0 = p(ya), a1 = p(Float64Array.from(ya, (v, i) => v + d[i]));
      const b0 = p(yb), b1 = p(Float64Array.from(yb, (v, i) => v + d[i]));
      for (let i = 0; i < n; i++) expect(a1[i] - a0[i]).toBeCloseTo(b1[i] - b0[i], 8);
    }
  });
});

describe('simulated noise series', () => {
  it('have the σ and the autocorrelation asked for (AR(1) φ = 0.5 up to lag 8; 2·10⁵ points, SE about 0.003)', () => {
    const rho = Float64Array.from({ length: 9 }, (_, k) => 0.5 ** k);
    const e = simulatedNoise(200000, constantProfile(200000, 3), noiseShapingTaps(rho), 1);
    let ss = 0;
    for (const v of e) ss += v * v;
    expect(Math.abs(Math.sqrt(ss / e.length) / 3 - 1)).toBeLessThan(0.01);
    for (let k = 1; k <= 4; k++) {
      let c = 0;
      for (let i = 0; i + k < e.length; i++) c += e[i] * e[i + k];
      expect(Math.abs(c / ss - 0.5 ** k)).toBeLessThan(0.02);
    }
  });
});

/** Mean carried σ and mean true spread SD(process(T + ε₀) − process(T)) over seeds. */
function compare(family: Family, rec: Recipe, reps: number, n = 20000, extra?: (signal: Float64Array, seed: number) => void) {
  const got: number[] = [], truth: number[] = [];
  let route = '';
  for (let s = 0; s < reps; s++) {
    const { signal, noise } = familyParts(family, n, 300 + s);
    extra?.(signal, s);
    const y = Float64Array.from(signal, (v, i) => v + noise[i]);
    const r = carried(y, rec);
    got.push(r.noise!.sigma.sigma);
    route = r.noise!.carried!.route;
    const x = Float64Array.from({ length: n }, (_, i) => i * 0.01);
    const a = runPipeline({ x, y }, 'a', rec, STEP_REGISTRY).final.y;
    const b = runPipeline({ x, y: signal }, 'b', rec, STEP_REGISTRY).final.y;
    let mu = 0;
    for (let i = 0; i < a.length; i++) mu += (a[i] - b[i]) / a.length;
    let ss = 0;
    for (let i = 0; i < a.length; i++) ss += (a[i] - b[i] - mu) ** 2;
    truth.push(Math.sqrt(ss / a.length));
  }
  return { got: mean(got), truth: mean(truth), route };
}

describe('carried σ against the truth (true raw σ = 1)', () => {
  it('5-point moving average, white noise: mean within 5 % of σ/√5 (40 × 2·10⁴ points)', () => {
    const r: number[] = [];
    for (let s = 0; s < 40; s++) r.push(carried(familyParts('flat', 20000, 100 + s).noise, recipe(['moving-average', { window: 5 }])).noise!.sigma.sigma);
    expect(Math.abs(mean(r) / (1 / Math.sqrt(5)) - 1)).toBeLessThan(0.05);
  }, 120_000);

  it('5-point moving average, AR(1) φ = 0.5: mean within 5 % of 0.667 σ (40 × 2·10⁴ points)', () => {
    const r: number[] = [];
    for (let s = 0; s < 40; s++) r.push(carried(familyParts('ar1', 20000, 200 + s).noise, recipe(['moving-average', { window: 5 }])).noise!.sigma.sigma);
    expect(Math.abs(mean(r) / 0.667 - 1)).toBeLessThan(0.05);
  }, 120_000);

  it('Savitzky–Golay 11/2 on white noise over broad bands: within 5 % of σ·0.4555 (√Σc², 1964/1972 tables)', () => {
    const c = compare('bands', recipe(['savitzky-golay', { window: 11, order: 2 }]), 8);
    expect(c.route).toBe('linear');
    expect(Math.abs(c.got / 0.4555 - 1)).toBeLessThan(0.05);
  }, 120_000);

  it('the same on a random-walk baseline (steps 0.1 σ): the stated bias, +7 % measured, stays within 10 %', () => {
    // At the scale of the correlation pieces the random walk is indistinguishable from correlated noise,
    // so part of it is carried as noise (DEVELOPERS.md states the figure).
    const c = compare('drift', recipe(['savitzky-golay', { window: 11, order: 2 }]), 8);
    expect(c.got / 0.4555 - 1).toBeGreaterThan(0);
    expect(c.got / 0.4555 - 1).toBeLessThan(0.1);
  }, 120_000);

  const spikes = (signal: Float64Array, seed: number) => { for (let i = 500 + seed; i < signal.length; i += 1500) signal[i] += 40; };
  const simulated: [string, Family, Recipe, ((s: Float64Array, seed: number) => void) | undefined][] = [
    ['despiking (Hampel, defaults) on a drifting baseline with spikes', 'drift', recipe(['despike', {}]), spikes],
    ['despiking (Hampel, 7 points, t = 3) on a drifting baseline with spikes', 'drift', recipe(['despike', { window: 7, threshold: 3 }]), spikes],
    ['running median of 5 on a drifting baseline', 'drift', recipe(['despike', { method: 'median', window: 5 }]), undefined],
    ['baseline (AsLS, defaults) on broad bands', 'bands', recipe(['baseline', {}]), undefined],
    ['baseline (AsLS, defaults) on a drifting baseline', 'drift', recipe(['baseline', {}]), undefined],
    ['baseline then Savitzky–Golay 11/2', 'drift', recipe(['baseline', {}], ['savitzky-golay', { window: 11, order: 2 }]), undefined],
    ['resampling to even spacing', 'flat', recipe(['resample', {}]), undefined],
    ['boxcar of 4 points', 'flat', recipe(['boxcar', { size: 4 }]), undefined],
    ['local polynomial order', 'flat', recipe(['local-order', {}]), undefined],
  ];
  for (const [what, fam, rec, extra] of simulated) {
    it(`${what}: within 10 % of the spread measured by adding known noise to the noiseless trace (8 × 2·10⁴ points)`, () => {
      const c = compare(fam, rec, 8, 20000, extra);
      expect(c.route).toBe('simulated');
      expect(Math.abs(c.got / c.truth - 1)).toBeLessThan(0.1);
    }, 120_000);
  }
});

describe('correlation of the measured trace\'s noise (carried ρ)', () => {
  // A k-point moving average of white noise has ρ(j) = (k − j)/k for j < k, 0 beyond (textbook, from memory;
  // it is the triangle g⋆g normalised).
  it('linear route: white noise through 3- and 5-point averages gives ρ(j) = (k − j)/k exactly', () => {
    for (const k of [3, 5]) {
      const raw = traceOf(normalArray(11, 2000));
      const rec = recipe(['moving-average', { window: k }]);
      const run = runPipeline(raw, raw.id, rec, STEP_REGISTRY);
      const c = carryLinear(raw, run, rec, STEP_REGISTRY, {}, { sample: { profile: constantProfile(2000, 1), sigma: 1, rho: Float64Array.of(1) } });
      expect(c.rho.length).toBe(k);
      for (let j = 0; j < k; j++) expect(c.rho[j]).toBeCloseTo((k - j) / k, 12);
    }
  });

  it('AR(1) φ = 0.5 raw noise through a 3-point average: ρ(k) from the explicit double sum', () => {
    const raw = traceOf(normalArray(12, 2000));
    const rho = Float64Array.from({ length: 31 }, (_, j) => 0.5 ** j);
    const rec = recipe(['moving-average', { window: 3 }]);
    const run = runPipeline(raw, raw.id, rec, STEP_REGISTRY);
    const c = carryLinear(raw, run, rec, STEP_REGISTRY, {}, { sample: { profile: constantProfile(2000, 1), sigma: 1, rho } });
    // cov(k) = (1/9) Σ_{a,b∈{-1,0,1}} ρ(|k + a − b|), worked out term by term.
    const cov = (k: number) => { let s = 0; for (let a = -1; a <= 1; a++) for (let b = -1; b <= 1; b++) s += 0.5 ** Math.abs(k + a - b); return s / 9; };
    for (let k = 0; k < 6; k++) expect(c.rho[k]).toBeCloseTo(cov(k) / cov(0), 10);
  });

  it('simulated route (a baseline step makes the stack non-linear): ρ(1) after a 3-point average near 2/3', () => {
    const n = 20_000;
    const r = carried(normalArray(13, n), recipe(['baseline', {}], ['moving-average', { window: 3 }]));
    expect(r.noise!.carried!.route).toBe('simulated');
    expect(r.noise!.measuredRho[1]).toBeGreaterThan(2 / 3 - 0.05);
    expect(r.noise!.measuredRho[1]).toBeLessThan(2 / 3 + 0.05);
    expect(r.noise!.measuredRho[2]).toBeGreaterThan(1 / 3 - 0.05);
    expect(r.noise!.measuredRho[2]).toBeLessThan(1 / 3 + 0.05);
  });

  it('noise only, 3-point average, 10 × 10⁵ points: the shown noise-only count matches what the table holds (±15 %), white would not', () => {
    const n = 100_000, R = 10;
    let rows = 0, shown = 0, white = 0;
    for (let r = 0; r < R; r++) {
      const res = carried(normalArray(100 + r, n), recipe(['moving-average', { window: 3 }]));
      rows += res.peaks.filter((p) => (p.snr ?? 0) >= 3).length;
      shown = res.noiseBumps!.aboveDetection;
      white = expectedNoiseBumps(n, 0.01, res.peakOptions!).aboveDetection;
    }
    const mean = rows / R;
    expect(Math.abs(mean / shown - 1)).toBeLessThan(0.15);
    // Without the carried correlation the count would be off by far more than the tolerance.
    expect(Math.abs(mean / white - 1)).toBeGreaterThan(0.3);
  }, 300_000);
});
