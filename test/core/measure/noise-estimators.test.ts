import { describe, expect, it } from 'vitest';
import { noisePeakToPeak, noiseRangeAround, noiseRms, type NoiseResult, type NoiseEstimate } from '../../../src/core/measure/noise-estimators.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

function ok(r: NoiseResult): NoiseEstimate {
  if (!r.ok) throw new Error(`expected an estimate, got: ${r.message}`);
  return r;
}

function range(n: number, step = 1, start = 0): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => start + i * step);
}

describe('noiseRms (SD about a least-squares line, n − 2 degrees of freedom)', () => {
  it('worked by hand: x 0..3, y 0,1,0,1 → line 0.2 + 0.2x, residuals ±0.2, ±0.6, σ = √(0.8/2)', () => {
    const r = ok(noiseRms(range(4), Float64Array.of(0, 1, 0, 1), 0, 3));
    expect(r.sigma).toBeCloseTo(Math.sqrt(0.4), 12);
    expect(r.points).toBe(4);
    expect(r.measure).toBe('sd');
    expect(r.description).toMatch(/n − 2/);
  });

  it('a straight line has no noise, and a slope does not change the estimate', () => {
    const x = range(200, 0.05);
    expect(ok(noiseRms(x, Float64Array.from(x, (v) => 3 - 2 * v), 0, 10)).sigma).toBeLessThan(1e-12);
    const rng = makeRng(11);
    const e = Float64Array.from(x, () => rng.normal());
    const a = ok(noiseRms(x, e, 1, 8)).sigma;
    const b = ok(noiseRms(x, Float64Array.from(x, (v, i) => e[i] + 5 * v + 100), 1, 8)).sigma;
    expect(Math.abs(a - b)).toBeLessThan(1e-9);
  });

  it('recovers a seeded σ within sampling error', () => {
    // SD of a sample SD ≈ σ/√(2(n − 2)) for normal data; allow 4 of those.
    const rng = makeRng(7);
    const n = 2000, sigma = 0.5;
    const x = range(n, 0.01);
    const y = Float64Array.from(x, (v) => 0.3 * v + sigma * rng.normal());
    const r = ok(noiseRms(x, y, x[0], x[n - 1]));
    expect(r.points).toBe(n);
    expect(Math.abs(r.sigma - sigma)).toBeLessThan((4 * sigma) / Math.sqrt(2 * (n - 2)));
  });

  it('returns problems as values: too few points, outside the trace, reversed range works', () => {
    const x = range(50), y = new Float64Array(50);
    const few = noiseRms(x, y, 10, 11);
    expect(few.ok).toBe(false);
    if (!few.ok) expect(few.message).toMatch(/at least 3 points/);
    const out = noiseRms(x, y, 100, 120);
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.message).toMatch(/outside the trace/);
    expect(ok(noiseRms(x, y, 20, 10)).points).toBe(11);
    expect(noiseRms(x, y, NaN, 3).ok).toBe(false);
  });
});

describe('noisePeakToPeak (range of residuals about a line, detrended)', () => {
  it('worked by hand: residuals −0.2, 0.6, −0.6, 0.2 → range 1.2', () => {
    const r = ok(noisePeakToPeak(range(4), Float64Array.of(0, 1, 0, 1), 0, 3));
    expect(r.sigma).toBeCloseTo(1.2, 12);
    expect(r.measure).toBe('range');
    expect(r.description).toMatch(/detrended/);
  });

  it('a slope added to the noise does not change the range', () => {
    const rng = makeRng(3);
    const x = range(300, 0.1);
    const e = Float64Array.from(x, () => rng.normal());
    const a = ok(noisePeakToPeak(x, e, 0, 30)).sigma;
    const b = ok(noisePeakToPeak(x, Float64Array.from(x, (v, i) => e[i] - 4 * v), 0, 30)).sigma;
    expect(Math.abs(a - b)).toBeLessThan(1e-9);
  });
});

describe('noiseRangeAround (pharmacopoeial h over a centred window)', () => {
  it('counts points and reports cutting by the trace end', () => {
    const x = range(101), y = Float64Array.from(x, (v) => (v % 2 === 0 ? 1 : -1));
    const mid = ok(noiseRangeAround(x, y, 50, 20));
    expect(mid.points).toBe(21);
    expect(mid.sigma).toBe(2);
    expect(mid.clipped).toBe(false);
    const edge = ok(noiseRangeAround(x, y, 2, 20));
    expect(edge.points).toBe(13);
    expect(edge.clipped).toBe(true);
    expect(noiseRangeAround(x, y, 500, 20).ok).toBe(false);
    expect(noiseRangeAround(x, y, 50, 1).ok).toBe(false);
    expect(noiseRangeAround(x, y, 50, -3).ok).toBe(false);
  });

  it("expected range of 100 normal points is d₂(100) σ = 5.0152 σ (Tippett 1925, REFERENCES.md)", () => {
    const rng = makeRng(100);
    const R = 200, n = 100;
    const hs: number[] = [];
    const x = range(n);
    for (let r = 0; r < R; r++) {
      const y = Float64Array.from(x, () => rng.normal());
      const e = ok(noiseRangeAround(x, y, 49.5, 99));
      expect(e.points).toBe(n);
      hs.push(e.sigma);
    }
    const mean = hs.reduce((a, b) => a + b, 0) / R;
    const sd = Math.sqrt(hs.reduce((a, b) => a + (b - mean) ** 2, 0) / (R - 1));
    // Within 4 standard errors of the mean of 200 ranges.
    expect(Math.abs(mean - 5.0152)).toBeLessThan((4 * sd) / Math.sqrt(R));
  });
});

describe('raw data is sacred', () => {
  it('no estimator changes its arguments', () => {
    const rng = makeRng(5);
    const x = range(500, 0.2), y = Float64Array.from(x, () => rng.normal());
    const x0 = x.slice(), y0 = y.slice();
    noiseRms(x, y, 10, 50); noisePeakToPeak(x, y, 10, 50); noiseRangeAround(x, y, 40, 10);
    expect(x).toEqual(x0);
    expect(y).toEqual(y0);
  });
});
