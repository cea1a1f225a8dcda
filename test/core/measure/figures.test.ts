// Figures of chromatography on sampled traces, against the worked values in
// /work/shared/REFERENCES.md ("Per-peak figures of chromatography": formulas from memory of
// USP <621> and Ph. Eur. 2.2.46, EMG values computed there with SciPy 1.17.1 on the exact density).
import { describe, expect, it } from 'vitest';
import {
  chromatographicFigures,
  FIGURE_FORMULAS,
  plateNumber,
  resolutionHalfHeight,
} from '../../../src/core/measure/figures.ts';
import type { PeakForFigures } from '../../../src/core/measure/figures.ts';
import { emgPdf } from '../../../src/core/measure/fit/shapes.ts';

const STEP = 0.001;
const grid = (from: number, to: number) => Float64Array.from({ length: Math.round((to - from) / STEP) + 1 }, (_, i) => from + i * STEP);
const gauss = (x: number, c: number, s: number) => Math.exp(-0.5 * ((x - c) / s) ** 2);
const whole = (x: Float64Array, intercept = 0, slope = 0): PeakForFigures => ({ start: 0, end: x.length - 1, baseline: { intercept, slope } });

describe('figures of a Gaussian (REFERENCES.md: T = As = 1, N = 100 at t_R/σ = 10)', () => {
  const x = grid(0, 20);
  it('flat baseline', () => {
    const y = x.map((v) => 5 * gauss(v, 10, 1));
    const [f] = chromatographicFigures(x, y, [whole(x)]);
    expect(f.retentionTime.value).toBeCloseTo(10, 9);
    expect(f.tailing.value).toBeCloseTo(1, 6);
    expect(f.asymmetry.value).toBeCloseTo(1, 6);
    expect(f.width50.value).toBeCloseTo(2.35482, 5); // FWHM/σ = 2.3548200 (REFERENCES.md)
    expect(f.plates.value).toBeCloseTo(100, 3);
    // With the texts' rounded 5.54 instead of 8 ln 2: 99.91 (REFERENCES.md).
    expect(((f.plates.value as number) * 5.54) / (8 * Math.LN2)).toBeCloseTo(99.91, 2);
    expect(f.resolution.status).toBe('not-applicable');
    expect(f.retentionFactor).toEqual({ value: null, status: 'not-applicable', reason: 'no dead time entered' });
  });
  it('measured against its own sloped baseline, the same figures', () => {
    const y = x.map((v) => 5 * gauss(v, 10, 1) + 2 + 0.3 * v);
    const [f] = chromatographicFigures(x, y, [whole(x, 2, 0.3)]);
    expect(f.height.value).toBeCloseTo(5, 6);
    expect(f.tailing.value).toBeCloseTo(1, 6);
    expect(f.plates.value).toBeCloseTo(100, 3);
  });
  it('the input arrays are not changed', () => {
    const y = x.map((v) => gauss(v, 10, 1));
    const ys = y.slice();
    chromatographicFigures(x, y, [whole(x)]);
    expect(y).toEqual(ys);
  });
});

describe('figures of exponentially modified Gaussians (REFERENCES.md table, σ = 1, location 0)', () => {
  const table = [
    { k: 0.5, apex: 0.428142, w: 2.558864, t: 1.057187, as: 1.092878 },
    { k: 1, apex: 0.697369, w: 2.89089, t: 1.228212, as: 1.36218 },
    { k: 2, apex: 1.017913, w: 3.586465, t: 1.648134, as: 2.0556 },
  ];
  for (const r of table) {
    it(`τ/σ = ${r.k}: T ${r.t}, As ${r.as}`, () => {
      const x = grid(-8, 40);
      const y = x.map((v) => emgPdf(v, 0, 1, r.k));
      const [f] = chromatographicFigures(x, y, [whole(x)]);
      expect(f.retentionTime.value).toBeCloseTo(r.apex, 5);
      expect(f.width50.value).toBeCloseTo(r.w, 5);
      expect(f.tailing.value).toBeCloseTo(r.t, 5);
      expect(f.asymmetry.value).toBeCloseTo(r.as, 5);
    });
  }
});

describe('resolution, retention factor, selectivity', () => {
  it('Rs = 0.7516 for Gaussians of σ = 1 at 10 and 13 with 1.18 (REFERENCES.md); 0.75 with √(2 ln 2)', () => {
    const w = 2 * Math.sqrt(2 * Math.LN2);
    expect(resolutionHalfHeight(10, w, 13, w)).toBeCloseTo(0.7516, 4);
    expect((resolutionHalfHeight(10, w, 13, w) * Math.sqrt(2 * Math.LN2)) / 1.18).toBeCloseTo(0.75, 12);
    expect(plateNumber(10, w)).toBeCloseTo(100, 10);
  });
  it('on a trace: two separated Gaussians, dead time 2 (worked by hand: k = (10 − 2)/2 = 4 and (15 − 2)/2 = 6.5, α = 6.5/4)', () => {
    const x = grid(0, 20);
    const y = x.map((v) => gauss(v, 10, 0.5) + 0.5 * gauss(v, 15, 0.5));
    const mid = Math.round(12.5 / STEP);
    const peaks: PeakForFigures[] = [
      { start: 0, end: mid, baseline: { intercept: 0, slope: 0 } },
      { start: mid, end: x.length - 1, baseline: { intercept: 0, slope: 0 } },
    ];
    const [a, b] = chromatographicFigures(x, y, peaks, { deadTime: 2 });
    const w = 0.5 * 2 * Math.sqrt(2 * Math.LN2);
    expect(b.resolution.value).toBeCloseTo((1.18 * 5) / (2 * w), 5);
    expect(a.retentionFactor.value).toBeCloseTo(4, 8);
    expect(b.retentionFactor.value).toBeCloseTo(6.5, 8);
    expect(b.selectivity.value).toBeCloseTo(6.5 / 4, 8);
    expect(a.selectivity.status).toBe('not-applicable');
  });
  it('a bad dead time is named, not used', () => {
    const x = grid(0, 20);
    const y = x.map((v) => gauss(v, 10, 1));
    const [f] = chromatographicFigures(x, y, [whole(x)], { deadTime: -1 });
    expect(f.retentionFactor.status).toBe('not-applicable');
    expect(f.retentionFactor.reason).toMatch(/positive number/);
    const [g] = chromatographicFigures(x, y, [whole(x)], { deadTime: 12 });
    expect(g.retentionFactor.status).toBe('not-measurable');
  });
});

describe('"not measurable" when a neighbour cuts the level', () => {
  // Main peak σ = 0.1 at 6.0, height 3; shoulder σ = 0.05 at 6.35, height 0.22 (the demo's pair).
  const x = grid(5, 7.5);
  const y = x.map((v) => 3 * gauss(v, 6, 0.1) + 0.22 * gauss(v, 6.35, 0.05));
  // The valley between them, found here by hand from the samples.
  let valley = Math.round((6.2 - 5) / STEP);
  for (let i = valley; i < Math.round((6.35 - 5) / STEP); i++) if (y[i] < y[valley]) valley = i;
  const flat = { intercept: 0, slope: 0 };
  const [main, shoulder] = chromatographicFigures(x, y, [
    { start: 0, end: valley, baseline: flat },
    { start: valley, end: x.length - 1, baseline: flat },
  ]);
  it('the demo-like shoulder: its valley lies at about 63 % of its height, so no width of it is measurable', () => {
    expect(shoulder.width50.status).toBe('not-measurable');
    expect(shoulder.tailing.status).toBe('not-measurable');
    expect(shoulder.tailing.reason).toMatch(/leading bound .* lies above 5 % of the height: a neighbour cuts the level/);
    expect(shoulder.asymmetry.reason).toMatch(/above 10 % of the height/);
    expect(shoulder.plates.reason).toMatch(/above 50 % of the height/);
    expect(shoulder.resolution.status).toBe('not-measurable');
    expect(shoulder.retentionTime.status).toBe('ok');
  });
  it('the main peak: its valley to the shoulder lies at 4.6 % of its height, so T is measured (and raised by the shoulder)', () => {
    expect(main.tailing.status).toBe('ok');
    expect(main.tailing.value as number).toBeGreaterThan(1.01);
    expect(main.asymmetry.status).toBe('ok');
  });
  it('two equal Gaussians 4σ apart: the valley (27 %) cuts the 5 % and 10 % levels but not 50 %', () => {
    const xs = grid(0, 24);
    const ys = xs.map((v) => gauss(v, 10, 1) + gauss(v, 14, 1));
    const mid = Math.round(12 / STEP);
    const [a, b] = chromatographicFigures(xs, ys, [
      { start: 0, end: mid, baseline: flat },
      { start: mid, end: xs.length - 1, baseline: flat },
    ]);
    for (const f of [a, b]) {
      expect(f.width5.status).toBe('not-measurable');
      expect(f.width10.status).toBe('not-measurable');
      expect(f.width50.status).toBe('ok');
    }
    expect(a.tailing.reason).toMatch(/trailing bound/);
    expect(b.tailing.reason).toMatch(/leading bound/);
    // 1.18 · 4 / (2 · 2.35482) = 1.0022 for the separate peaks; the overlap narrows each measured width slightly.
    expect(b.resolution.value as number).toBeCloseTo(1.0022, 1);
  });
  it('a peak running off the end of the trace says so', () => {
    const xs = grid(0, 12);
    const ys = xs.map((v) => gauss(v, 10, 1));
    const [f] = chromatographicFigures(xs, ys, [whole(xs)]);
    expect(f.width5.reason).toMatch(/trace ends before the trailing edge/);
    expect(f.width50.status).toBe('ok');
  });
  it('unusable bounds give every figure "not measurable" with the reason', () => {
    const [f] = chromatographicFigures(x, y, [{ start: 10, end: 11, baseline: flat }]);
    expect(f.plates.status).toBe('not-measurable');
    expect(f.plates.reason).toMatch(/at least three samples/);
  });
});

it('every figure names its formula', () => {
  for (const v of Object.values(FIGURE_FORMULAS)) expect(v.formula.length).toBeGreaterThan(10);
  expect(FIGURE_FORMULAS.plates.formula).toMatch(/8 ln 2/);
  expect(FIGURE_FORMULAS.resolution.formula).toMatch(/1\.18/);
});
