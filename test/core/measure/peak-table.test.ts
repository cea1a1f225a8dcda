import { describe, expect, it } from 'vitest';
import type { Peak, PeakOptions } from '../../../src/core/measure/peak-types.ts';
import { applyPeakDecisions, defaultPeakOptions, detectPeaks, measurePeakAt } from '../../../src/core/measure/peak-table.ts';
import { noiseRms } from '../../../src/core/measure/noise-estimators.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

const FWHM_PER_SIGMA = 2.35482; // 2√(2 ln 2), REFERENCES.md "Gaussian peaks"
const AREA_PER_H_FWHM = 1.064467; // √(2π)/2.35482, REFERENCES.md
const D2_100 = 5.0152; // Tippett 1925, via REFERENCES.md

function grid(n: number, step = 1, start = 0): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => start + i * step);
}
function gauss(x: Float64Array, peaks: [centre: number, height: number, sigma: number][], base = (_v: number) => 0): Float64Array {
  return Float64Array.from(x, (v) => peaks.reduce((s, [c, h, sg]) => s + h * Math.exp(-0.5 * ((v - c) / sg) ** 2), base(v)));
}
function nearest(peaks: Peak[], at: number): Peak {
  return peaks.reduce((a, b) => (Math.abs(b.x - at) < Math.abs(a.x - at) ? b : a));
}

describe('Gaussian facts (REFERENCES.md) on a dense noiseless Gaussian on a flat baseline', () => {
  // σ = 2 x-units sampled every 0.01, centre between samples, ±25σ of flat baseline.
  const x = grid(10001, 0.01);
  const y = gauss(x, [[50.003, 10, 2]]);
  const peaks = detectPeaks(x, y, defaultPeakOptions(0.01, 0.01));

  it('one peak, FWHM = 2.35482 σ', () => {
    expect(peaks).toHaveLength(1);
    // The width is taken at half the fitted apex level, which a parabola over ±50 samples (σ = 200
    // samples here) puts 4e-5 low; at half height a level error δ widens a Gaussian by 1.44 δ/H
    // (derived here), so 1e-4 bounds it; interpolating the crossings adds < 1e-6.
    expect(Math.abs(peaks[0].fwhm / (FWHM_PER_SIGMA * 2) - 1)).toBeLessThan(1e-4);
    expect(peaks[0].leftHalf).toBeCloseTo(50.003 - FWHM_PER_SIGMA, 3);
    expect(peaks[0].rightHalf).toBeCloseTo(50.003 + FWHM_PER_SIGMA, 3);
  });

  it('height within 0.05 % (apex parabola over ±FWHM/6 departs from a Gaussian by < 0.03 %)', () => {
    expect(Math.abs(peaks[0].height / 10 - 1)).toBeLessThan(5e-4);
    expect(peaks[0].x).toBeCloseTo(50.003, 6);
  });

  it('area = 1.064467 · H · FWHM within 0.1 %, and = √(2π) H σ within 0.1 %', () => {
    const p = peaks[0];
    expect(Math.abs(p.area / (AREA_PER_H_FWHM * p.height * p.fwhm) - 1)).toBeLessThan(1e-3);
    expect(Math.abs(p.area / (Math.sqrt(2 * Math.PI) * 10 * 2) - 1)).toBeLessThan(1e-3);
  });

  it('never changes its inputs', () => {
    const x0 = x.slice(), y0 = y.slice();
    detectPeaks(x, y, defaultPeakOptions(0.01, 0.01));
    expect(x).toEqual(x0);
    expect(y).toEqual(y0);
  });
});

describe('trapezoid area is exact on a triangle', () => {
  const tri = [0, 0, 1, 2, 3, 2, 1, 0, 0];
  // The width rule is not under test here: a 3-point-wide triangle on a slope measures 2.86 points.
  const triOpts = { ...defaultPeakOptions(0.1), minWidth: 0 };
  it('flat baseline: base 6, height 3 → area 9', () => {
    const x = grid(9);
    const p = detectPeaks(x, Float64Array.from(tri), defaultPeakOptions(0.1));
    expect(p).toHaveLength(1);
    expect(p[0].area).toBeCloseTo(9, 12);
    expect(p[0].height).toBeCloseTo(3, 12);
    // Bounds lie one box length (here 1 sample) beyond the first sample back at the baseline.
    expect([p[0].start, p[0].end]).toEqual([0, 8]);
  });
  it('on a sloping baseline the area and height above it are unchanged', () => {
    const x = grid(9);
    const y = Float64Array.from(tri, (v, i) => v + 0.05 * i + 2);
    const p = detectPeaks(x, y, triOpts);
    expect(p).toHaveLength(1);
    expect(p[0].area).toBeCloseTo(9, 12);
    // The parabola through the slanted corner moves the apex by 0.025 and lifts it by 6e-4.
    expect(Math.abs(p[0].height - 3)).toBeLessThan(1e-3);
  });
  it('uneven x: a triangle with corners on samples still integrates exactly', () => {
    const x = Float64Array.of(0, 0.5, 1, 2.5, 3, 4, 6, 7, 8);
    const y = Float64Array.of(0, 0, 0, 4.5, 6, 4, 0, 0, 0); // corners at x = 1, 3, 6: area = 5 × 6 / 2
    const p = detectPeaks(x, y, defaultPeakOptions(0.1, 0.1));
    expect(p).toHaveLength(1);
    expect(p[0].area).toBeCloseTo(15, 12);
  });
});

describe('apex refinement by a parabola through the three top samples', () => {
  it('on an even grid it removes at least 80 % of the sample-apex error (σ = 3 samples; our requirement)', () => {
    for (const off of [0.1, 0.2, 0.3, 0.4, 0.45]) {
      const x = grid(101);
      const p = detectPeaks(x, gauss(x, [[50 + off, 10, 3]]), defaultPeakOptions(0.01));
      expect(p).toHaveLength(1);
      const sampleErr = Math.abs(x[p[0].index] - (50 + off));
      const refinedErr = Math.abs(p[0].x - (50 + off));
      expect(refinedErr).toBeLessThan(0.2 * sampleErr);
    }
  });

  it('on an uneven grid it uses the actual x values and still lands closer than the sample', () => {
    const x = Float64Array.from({ length: 101 }, (_, i) => i + 0.25 * Math.sin(i)); // strictly ascending
    for (const c of [40.3, 50.7, 61.45]) {
      const p = nearest(detectPeaks(x, gauss(x, [[c, 10, 3]]), defaultPeakOptions(0.01)), c);
      expect(Math.abs(p.x - c)).toBeLessThan(0.5 * Math.abs(x[p.index] - c));
    }
  });
});

describe('S/N definitions', () => {
  // Narrow peak (σ = 3 samples, FWHM ≈ 7 samples) with its apex on a sample: the apex level
  // is then the parabola through three symmetric samples, i.e. exactly the sample value.
  const x = grid(201);
  const blank = { x, y: Float64Array.from(x, (_, i) => (i % 2 === 0 ? 1 : -1)), fromBlank: true }; // h = 2
  const opts = (extra: Partial<PeakOptions>): PeakOptions => ({ ...defaultPeakOptions(1), snrDefinition: 'pharmacopoeial', pharmacopoeialNoise: blank, ...extra });

  it('2H/h = twice the height over the blank\'s range h = 2 (USP <621>, Ph. Eur. 2.2.46; REFERENCES.md: H = 10, h = 2 → 10)', () => {
    const p = detectPeaks(x, gauss(x, [[100, 10, 3]]), opts({}));
    expect(p).toHaveLength(1);
    // With the stated σ = 1 the bounds stop where the Gaussian is within a few σ of the baseline, and the
    // level beyond them still holds a little of its tail: the height is 10 within 0.05 %.
    expect(Math.abs(p[0].height / 10 - 1)).toBeLessThan(5e-4);
    expect(p[0].pharmaNoise?.h).toBe(2);
    expect(p[0].pharmaNoise?.source).toBe('blank');
    expect(p[0].snrPharma).toBeCloseTo((2 * p[0].height) / 2, 12);
    expect(p[0].snrPharma).toBeCloseTo(10, 2);
    expect(p[0].snr).toBe(p[0].snrPharma);
    // Flags with a margin either side of the quantitation limit 10 (ICH Q2(R1)).
    expect(detectPeaks(x, gauss(x, [[100, 10.5, 3]]), opts({}))[0].flag).toBe('quantifiable');
    expect(detectPeaks(x, gauss(x, [[100, 9.5, 3]]), opts({}))[0].flag).toBe('detectable');
  });

  it('H = 3, h = 2 → 3 (REFERENCES.md): 2H/h at the detection limit; flags either side of it', () => {
    const p = detectPeaks(x, gauss(x, [[100, 3, 3]]), opts({ minProminence: 0.5 }));
    expect(p[0].snrPharma).toBeCloseTo((2 * p[0].height) / 2, 12);
    expect(Math.abs((p[0].snrPharma as number) / 3 - 1)).toBeLessThan(5e-3);
    expect(detectPeaks(x, gauss(x, [[100, 3.2, 3]]), opts({ minProminence: 0.5 }))[0].flag).toBe('detectable');
    expect(detectPeaks(x, gauss(x, [[100, 2.8, 3]]), opts({ minProminence: 0.5 }))[0].flag).toBe('below-detection');
  });

  it('window is multiplier × FWHM; without a blank the trace itself is used and labelled so', () => {
    const rng = makeRng(8);
    const y = gauss(x, [[100, 10, 3]]).map((v) => v + 0.2 * rng.normal());
    const p = nearest(detectPeaks(x, y, { ...defaultPeakOptions(0.2), snrDefinition: 'pharmacopoeial' }), 100);
    expect(p.pharmaNoise?.source).toBe('trace itself');
    // Two stretches of 2.5 FWHM each: about 5 FWHM of samples in all.
    expect(Math.abs((p.pharmaNoise?.points ?? 0) - 5 * p.fwhm)).toBeLessThanOrEqual(2);
    expect(p.snrPharma).toBeCloseTo((2 * p.height) / (p.pharmaNoise?.h ?? NaN), 12);
  });

  it('H/σ on seeded white noise is within 5 % of true H / true σ over 200 realisations (issue 4 check)', () => {
    const rng = makeRng(2024);
    const R = 200, H = 20, sigma = 1;
    const xs = grid(1000);
    let sum = 0;
    for (let r = 0; r < R; r++) {
      const y = gauss(xs, [[600.3, H, 8]]).map((v) => v + sigma * rng.normal());
      const noise = noiseRms(xs, y, 0, 400);
      if (!noise.ok) throw new Error(noise.message);
      const p = nearest(detectPeaks(xs, y, { ...defaultPeakOptions(noise.sigma), minProminence: 8 * noise.sigma }), 600.3);
      expect(Math.abs(p.x - 600.3)).toBeLessThan(p.fwhm / 2); // the nearest peak is this one
      sum += p.snrRms as number;
    }
    expect(Math.abs(sum / R / (H / sigma) - 1)).toBeLessThan(0.05);
  });

  it("2H/h over 100 blank points relates to H/σ through Tippett's d₂(100) = 5.0152", () => {
    // Peak centred between samples 50 and 51 so the window 99 wide covers samples 1..100.
    const rng = makeRng(77);
    const xs = grid(151);
    const y = gauss(xs, [[50.5, 10, 3]]);
    const first = detectPeaks(xs, y, defaultPeakOptions(1));
    expect(first[0].x).toBeCloseTo(50.5, 5);
    const mult = 99.5 / first[0].fwhm; // a window 99.5 wide about 50.5 holds samples 1..100
    const R = 200;
    const ratios: number[] = [];
    for (let r = 0; r < R; r++) {
      const b = { x: xs, y: Float64Array.from(xs, () => rng.normal()), fromBlank: true };
      const p = detectPeaks(xs, y, { ...defaultPeakOptions(1), pharmacopoeialMultiplier: mult, pharmacopoeialNoise: b })[0];
      expect(p.pharmaNoise?.points).toBe(100);
      // With σ = 1: (H/σ) / (2H/h) = h/2, whose expectation is d₂(100)/2.
      ratios.push((p.snrRms as number) / (p.snrPharma as number));
    }
    const mean = ratios.reduce((a, b) => a + b, 0) / R;
    const sd = Math.sqrt(ratios.reduce((a, b) => a + (b - mean) ** 2, 0) / (R - 1));
    expect(Math.abs(mean - D2_100 / 2)).toBeLessThan((4 * sd) / Math.sqrt(R));
  });

  it('region S/N (mean over SD between the bounds) only when asked', () => {
    const y = gauss(x, [[100, 10, 3]]);
    expect(detectPeaks(x, y, defaultPeakOptions(1))[0].snrRegion).toBeNull();
    const p = detectPeaks(x, y, { ...defaultPeakOptions(1), regionSnr: true })[0];
    let sum = 0, n = 0;
    for (let i = p.startIndex; i <= p.endIndex; i++) { sum += y[i]; n++; }
    const mean = sum / n;
    let ss = 0;
    for (let i = p.startIndex; i <= p.endIndex; i++) ss += (y[i] - mean) ** 2;
    expect(p.snrRegion).toBeCloseTo(mean / Math.sqrt(ss / (n - 1)), 12);
  });
});

describe('filters and flags', () => {
  const rng = makeRng(99);
  const x = grid(2000, 0.01);
  const clean = gauss(x, [[3, 30, 0.1], [8, 2.5, 0.1], [12, 6, 0.1], [16, 30, 0.1], [16.6, 20, 0.1]]);
  const y = clean.map((v) => v + 0.5 * rng.normal());
  const base = defaultPeakOptions(0.5, 0.01);

  it('flags follow S/N against the limits; candidates below S/N 3 stay in the table', () => {
    const p = detectPeaks(x, y, base);
    // True S/N: 60, 5, 12, 60, 40 (heights over σ = 0.5).
    expect(nearest(p, 8).flag).toBe('detectable');
    expect(nearest(p, 12).flag).toBe('quantifiable');
    expect(nearest(p, 3).flag).toBe('quantifiable');
    for (const q of p) {
      const sn = q.snrRms as number;
      expect(sn).toBeGreaterThanOrEqual(base.minSnr);
      expect(q.flag).toBe(sn < 3 ? 'below-detection' : sn < 10 ? 'detectable' : 'quantifiable');
    }
    // Noise candidates between minSnr 2 and the limit 3 are listed, not hidden.
    expect(p.some((q) => q.flag === 'below-detection')).toBe(true);
  });

  it('minSnr 3 hides what was below detection; lowering the limit to 2 re-flags it', () => {
    const s = nearest(detectPeaks(x, y, base), 8);
    const strict = detectPeaks(x, y, { ...base, minSnr: 3 });
    if ((s.snrRms as number) < 3) expect(strict.some((q) => Math.abs(q.x - 8) < 0.05)).toBe(false);
    const lenient = nearest(detectPeaks(x, y, { ...base, limits: { detection: 2, quantitation: 10 } }), 8);
    expect(lenient.flag).toBe((lenient.snrRms as number) >= 2 ? 'detectable' : 'below-detection');
  });

  it('minWidth and minSeparation (x-units) remove narrow and close candidates', () => {
    const p = detectPeaks(x, y, base);
    expect(p.some((q) => Math.abs(q.x - 16.6) < 0.05)).toBe(true);
    const sep = detectPeaks(x, y, { ...base, minSeparation: 1 });
    expect(sep.some((q) => Math.abs(q.x - 16.6) < 0.05)).toBe(false);
    expect(sep.some((q) => Math.abs(q.x - 16) < 0.05)).toBe(true);
    const wide = detectPeaks(x, y, { ...base, minWidth: 0.3 }); // every true FWHM is 0.235
    expect(wide.every((q) => q.fwhm >= 0.3)).toBe(true);
    expect(wide.some((q) => Math.abs(q.x - 3) < 0.05)).toBe(false);
  });

  it('integration bounds stop at the valley between neighbours, so areas do not swallow them', () => {
    const p = detectPeaks(x, clean, defaultPeakOptions(0.01, 0.01));
    const a = nearest(p, 16), b = nearest(p, 16.6);
    expect(a.end).toBeLessThanOrEqual(b.start);
    expect(a.rightBase).toBeGreaterThan(b.index); // the prominence base itself lies beyond the smaller neighbour
    // Each area is close to the Gaussian's own √(2π)Hσ; the overlap tails cost a few per cent.
    expect(Math.abs(a.area / (Math.sqrt(2 * Math.PI) * 30 * 0.1) - 1)).toBeLessThan(0.1);
    expect(Math.abs(nearest(p, 3).area / (Math.sqrt(2 * Math.PI) * 30 * 0.1) - 1)).toBeLessThan(1e-3);
  });

  it('troughs: detection on −y, signed height and area', () => {
    const dip = clean.map((v) => 100 - v);
    const p = detectPeaks(x, dip, { ...defaultPeakOptions(0.01, 0.01), negative: true });
    const d = nearest(p, 3);
    expect(d.height).toBeCloseTo(-30, 1);
    expect(d.area).toBeLessThan(0);
    expect(d.y).toBe(dip[d.index]);
    expect(d.flag).toBe('quantifiable');
  });

  it('refuses impossible options with a sentence', () => {
    expect(() => detectPeaks(x, y, { ...base, noiseSigma: -1 })).toThrow(/noise σ must be a number of 0 or more/);
    expect(() => detectPeaks(x, y, { ...base, noiseSigma: NaN })).toThrow(/noise σ/);
    expect(() => detectPeaks(x, y, { ...base, minWidth: -1 })).toThrow(/minimum width/);
    expect(() => detectPeaks(x, y.subarray(0, 10), base)).toThrow(/same length/);
  });
});

describe("the user's decisions", () => {
  const x = grid(400, 0.05);
  const y = gauss(x, [[5, 10, 0.3], [10, 8, 0.3], [10.9, 3, 0.3]]);
  const opts = defaultPeakOptions(0.05, 0.05);
  const detected = detectPeaks(x, y, opts);

  it('a removed peak stays in the list, marked; an added one is measured and marked', () => {
    const before = detected.length;
    const y0 = y.slice();
    const out = applyPeakDecisions(detected, { added: [15], removed: [5.01] }, x, y, opts);
    expect(y).toEqual(y0);
    expect(out.length).toBe(before + 1);
    const removed = out.filter((p) => p.removedByUser);
    expect(removed).toHaveLength(1);
    expect(removed[0].x).toBeCloseTo(5, 3);
    const added = out.filter((p) => p.origin === 'added-by-user');
    expect(added).toHaveLength(1);
    expect(added[0].x).toBeCloseTo(15, 6);
    expect(added[0].note).toMatch(/Not a local maximum/); // flat baseline there
    for (let k = 1; k < out.length; k++) expect(out[k].x).toBeGreaterThanOrEqual(out[k - 1].x);
    expect(detected.some((p) => p.removedByUser)).toBe(false); // input list unchanged
  });

  it('measurePeakAt gives the same measures as detection at a detected apex', () => {
    const d = nearest(detected, 5);
    const m = measurePeakAt(x, y, d.index, opts);
    expect(m.origin).toBe('added-by-user');
    expect(m.height).toBeCloseTo(d.height, 12);
    expect(m.fwhm).toBeCloseTo(d.fwhm, 12);
    expect(m.area).toBeCloseTo(d.area, 9);
    expect(() => measurePeakAt(x, y, 4000, opts)).toThrow(/not a sample/);
  });
});
