// Region fits (src/core/measure/fit/region.ts); moved from fit-noiseless.test.ts, with the correlation
// time from fit-count.test.ts.
// Noiseless sums of peak shapes on a sloped baseline must be recovered exactly (to 1e-6 relative):
// the model is exact, so any larger error is the solver's. Overlaps are set by the pharmacopoeial
// resolution from half-height widths, Rs = 1.18 Δt / (W₀.₅,₁ + W₀.₅,₂) (USP <621>, Ph. Eur. 2.2.46).
import { describe, expect, it } from 'vitest';
import { correlationTime, fitRegion } from '../../../../src/core/measure/fit/region.ts';
import type { PeakStart } from '../../../../src/core/measure/fit/region.ts';
import { SHAPES } from '../../../../src/core/measure/fit/shapes.ts';
import { normalArray } from '../../../../src/core/numeric/random.ts';
import { movingAverage } from '../../../../src/core/steps/moving-average.ts';
import type { ShapeKind } from '../../../../src/core/measure/fit/shapes.ts';

const x = Float64Array.from({ length: 801 }, (_, i) => 2 + i * 0.01); // 2 … 10 min
const LINE = { b0: 0.35, slope: 0.04 }; // y = 0.35 + 0.04 (x − 6): sloped under the peaks

interface Peak {
  shape: ShapeKind;
  params: number[];
}

function make(peaks: Peak[]): Float64Array {
  const y = x.map((v) => LINE.b0 + LINE.slope * (v - 6));
  for (const p of peaks) SHAPES[p.shape].evaluate(x, p.params, 0, y, null, 0);
  return y;
}

/** Rough starts, as peak detection would give them: position off by 0.15 FWHM, height −15 %, width +20 %. */
function roughStarts(peaks: Peak[]): PeakStart[] {
  return peaks.map((p) => {
    const f = SHAPES[p.shape].figures(p.params, 0);
    return { position: f.position + 0.15 * f.fwhm, height: 0.85 * f.height, fwhm: 1.2 * f.fwhm };
  });
}

/** A second peak placed so that the pair has resolution rs (half-height widths). */
function pairAt(shape: ShapeKind, first: number[], second: number[], rs: number): Peak[] {
  const m = SHAPES[shape];
  const f1 = m.figures(first, 0);
  const f2 = m.figures(second, 0);
  const dt = (rs * (f1.fwhm + f2.fwhm)) / 1.18;
  const moved = second.slice();
  moved[m.positionParam] += f1.position + dt - f2.position;
  return [{ shape, params: first }, { shape, params: moved }];
}

function expectRecovered(peaks: Peak[]) {
  const y = make(peaks);
  const out = fitRegion(x, y, { from: 2, to: 10, shape: peaks.map((p) => p.shape), starts: roughStarts(peaks) });
  expect(out.ok).toBe(true);
  if (!out.ok) return;
  const fit = out.fit;
  expect(fit.converged).toBe(true);
  peaks.forEach((p, k) => {
    const m = SHAPES[p.shape];
    const want = m.figures(p.params, 0);
    const got = fit.peaks[k];
    // Position relative to the peak's width (relative to the position itself would be far looser).
    expect(Math.abs(got.position.value - want.position) / want.fwhm).toBeLessThan(1e-6);
    for (const name of ['height', 'fwhm', 'area'] as const) expect(Math.abs(got[name].value / want[name] - 1)).toBeLessThan(1e-6);
    got.parameters.forEach((q, j) => {
      const scale = j === m.positionParam ? want.fwhm : Math.max(Math.abs(p.params[j]), 1e-3);
      expect(Math.abs(q.value - p.params[j]) / scale).toBeLessThan(1e-6);
    });
  });
  // Baseline b0 + b1 t with t = (x − 6)/4: b0 = 0.35, b1 = 0.04 · 4.
  expect(fit.baseline.coefficients[0].value).toBeCloseTo(LINE.b0, 7);
  expect(fit.baseline.coefficients[1].value).toBeCloseTo(LINE.slope * 4, 7);
  expect(fit.ssr).toBeLessThan(1e-18);
}

const G1 = [5.0, 2.0, 0.4];
const G2 = [0, 0.8, 0.3];
const L1 = [5.0, 1.5, 0.3];
const L2 = [0, 0.6, 0.25];
const E1 = [4.6, 1.0, 0.12, 0.15];
const E2 = [0, 0.4, 0.1, 0.2];

describe('noiseless shapes on a sloped baseline are recovered to 1e-6 relative', () => {
  it('a Gaussian alone', () => expectRecovered([{ shape: 'gaussian', params: G1 }]));
  it('a Lorentzian alone', () => expectRecovered([{ shape: 'lorentzian', params: L1 }]));
  it('an exponentially modified Gaussian alone (τ/σ = 1.25)', () => expectRecovered([{ shape: 'emg', params: E1 }]));
  it('a pseudo-Voigt alone (η = 0.35)', () => expectRecovered([{ shape: 'pseudo-voigt', params: [5.2, 1.2, 0.5, 0.35] }]));
  for (const rs of [0.8, 1.5]) {
    it(`two Gaussians at Rs ${rs}`, () => expectRecovered(pairAt('gaussian', G1, G2, rs)));
    it(`two Lorentzians at Rs ${rs}`, () => expectRecovered(pairAt('lorentzian', L1, L2, rs)));
    it(`two exponentially modified Gaussians at Rs ${rs}`, () => expectRecovered(pairAt('emg', E1, E2, rs)));
  }
  it('the input arrays are not changed', () => {
    const peaks = pairAt('gaussian', G1, G2, 0.8);
    const y = make(peaks);
    const xs = x.slice();
    const ys = y.slice();
    fitRegion(x, y, { from: 2, to: 10, peaks: 2 });
    expect(x).toEqual(xs);
    expect(y).toEqual(ys);
  });
});

describe('region fit: input the user can get wrong gives a message, not an exception', () => {
  const y = make([{ shape: 'gaussian', params: G1 }]);
  it.each([
    [{ from: 5, to: 5.05 }, /holds \d+ points/],
    [{ from: 6, to: 4 }, /smaller to a larger x/],
    [{ from: 2, to: 10, peaks: 5 }, /1 to 4 peaks/],
    [{ from: 2, to: 10, minFwhm: 20 }, /not smaller than the region/],
    [{ from: 2, to: 10, shape: 'triangle' as ShapeKind }, /Unknown peak shape/],
  ])('%o', (opts, message) => {
    const out = fitRegion(x, y, opts);
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.message).toMatch(message);
  });
  it('a non-finite sample inside the region is named by its line', () => {
    const bad = y.slice();
    bad[300] = NaN;
    const out = fitRegion(x, bad, { from: 2, to: 10 });
    expect(out).toEqual({ ok: false, message: expect.stringMatching(/Point 301/) });
  });
});

describe('correlation time of residuals (Geyer 1992 initial positive sequence)', () => {
  it('white noise ≈ 1; a k-point moving average of white noise ≈ k (τ = (Σc)²/Σc²)', () => {
    const e = normalArray(42, 20000);
    expect(correlationTime(e)).toBeLessThan(1.2);
    for (const k of [5, 15]) expect(correlationTime(movingAverage(e, k)) / k).toBeGreaterThan(0.8);
    for (const k of [5, 15]) expect(correlationTime(movingAverage(e, k)) / k).toBeLessThan(1.2);
  });
});
