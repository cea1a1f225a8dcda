import { describe, expect, it } from 'vitest';
import {
  gaussianHeightRatioFromCoefficients, gaussianHeightRatioMovingAverage, matchPeaks, windowAdvice, type Alternative,
} from '../../../src/core/measure/loss-matching.ts';
import type { Peak, PeakFlag } from '../../../src/core/measure/peak-types.ts';
import { defaultPeakOptions, detectPeaks } from '../../../src/core/measure/peak-table.ts';
import { noiseRms } from '../../../src/core/measure/noise-estimators.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { savgolCoefficients, savitzkyGolay } from '../../../src/core/numeric/savgol.ts';
import { movingAverage } from '../../../src/core/steps/moving-average.ts';
import { points, xUnits } from '../../../src/core/units.ts';

function grid(n: number, step = 1, start = 0): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => start + i * step);
}
function gauss(x: Float64Array, peaks: [number, number, number][]): Float64Array {
  return Float64Array.from(x, (v) => peaks.reduce((s, [c, h, sg]) => s + h * Math.exp(-0.5 * ((v - c) / sg) ** 2), 0));
}
function nearest(peaks: readonly Peak[], at: number): Peak {
  return peaks.reduce((a, b) => (Math.abs(b.x - at) < Math.abs(a.x - at) ? b : a));
}

describe('expected height kept on a Gaussian (REFERENCES.md "Gaussian peaks and averaging")', () => {
  it('moving average, σ = 5 points: N = 5 → 0.961326, N = 11 → 0.831139 (exact sum)', () => {
    expect(gaussianHeightRatioMovingAverage(points(5), points(5))).toBeCloseTo(0.961326, 6);
    expect(gaussianHeightRatioMovingAverage(points(11), points(5))).toBeCloseTo(0.831139, 6);
    expect(gaussianHeightRatioMovingAverage(points(1), points(5))).toBe(1);
    // The approximation 1/√(1 + (N² − 1)/(12σ²)) (REFERENCES.md) agrees within 2 % here.
    for (const N of [3, 5, 11]) {
      const approx = 1 / Math.sqrt(1 + (N * N - 1) / (12 * 25));
      expect(Math.abs(gaussianHeightRatioMovingAverage(points(N), points(5)) / approx - 1)).toBeLessThan(0.02);
    }
  });

  it('from weights: uniform weights give the moving-average sum', () => {
    expect(gaussianHeightRatioFromCoefficients(new Float64Array(7).fill(1 / 7), points(3))).toBeCloseTo(gaussianHeightRatioMovingAverage(points(7), points(3)), 14);
  });

  it('Savitzky–Golay on σ = 5: quadratic 11 / 25 → 0.98827 / 0.8445, quartic 25 → 0.96535 (scipy.signal.savgol_coeffs, SciPy 1.17.1)', () => {
    expect(gaussianHeightRatioFromCoefficients(savgolCoefficients(11, 2), points(5))).toBeCloseTo(0.98827, 5);
    expect(gaussianHeightRatioFromCoefficients(savgolCoefficients(25, 2), points(5))).toBeCloseTo(0.8445, 4);
    expect(gaussianHeightRatioFromCoefficients(savgolCoefficients(25, 4), points(5))).toBeCloseTo(0.96535, 5);
  });

  it('refuses nonsense', () => {
    expect(() => gaussianHeightRatioMovingAverage(points(0), points(5))).toThrow(RangeError);
    expect(() => gaussianHeightRatioMovingAverage(points(5), points(0))).toThrow(/σ/);
    expect(() => gaussianHeightRatioFromCoefficients([], points(5))).toThrow(RangeError);
  });
});

describe('measured height kept matches the computed expectation (issue 5 check)', () => {
  // Gaussian σ = 5 points, apex on a sample, far from the ends; H = 100, noise σ = 1.
  const x = grid(400);
  const clean = gauss(x, [[200, 100, 5]]);
  const smoothers: [string, (y: Float64Array) => Float64Array, number][] = [
    ['MA 5', (y) => movingAverage(y, 5), gaussianHeightRatioMovingAverage(points(5), points(5))],
    ['MA 11', (y) => movingAverage(y, 11), gaussianHeightRatioMovingAverage(points(11), points(5))],
    ['SG 11/2', (y) => savitzkyGolay(y, 11, 2), 0.98827], // SciPy, REFERENCES.md
    ['SG 25/4', (y) => savitzkyGolay(y, 25, 4), 0.96535], // SciPy, REFERENCES.md
  ];
  const heightOf = (y: Float64Array, sigma: number): number => nearest(detectPeaks(x, y, defaultPeakOptions(sigma)), 200).height;

  it('noiseless: within 0.1 % (the apex parabola over ±FWHM/6 departs from the smoothed top by less)', () => {
    const h0 = heightOf(clean, 0.01);
    // The level beyond the bounds still holds ~1e-7 of the Gaussian's tail.
    expect(Math.abs(h0 / 100 - 1)).toBeLessThan(1e-6);
    for (const [, f, expected] of smoothers) {
      expect(Math.abs(heightOf(f(clean), 0.01) / h0 / expected - 1)).toBeLessThan(1e-3);
    }
  });

  it('SG 25/2 (window 2.1 × FWHM) leaves negative side lobes: the local baseline drops into them', () => {
    // The apex value follows the expectation 0.8445 (SciPy, REFERENCES.md); the local baseline is the
    // mean level beyond the bounds, which lie in the lobes, so the table shows a negative baseline and a
    // height between the apex value (above the true zero) and the apex above the lobes' deepest point.
    const sm = savitzkyGolay(clean, 25, 2);
    const p = nearest(detectPeaks(x, sm, defaultPeakOptions(0.01)), 200);
    expect(p.y / 100).toBeCloseTo(0.8445, 4);
    const lobe = -Math.min(...sm);
    expect(lobe).toBeGreaterThan(1); // a real effect, not rounding
    expect(p.baselineStart).toBeLessThan(-0.5);
    expect(p.baselineStart).toBeGreaterThanOrEqual(-lobe);
    expect(p.height).toBeGreaterThan(84.45);
    expect(p.height).toBeLessThanOrEqual(84.45 + lobe);
    // The height is the apex level above that baseline: what the table says adds up.
    expect(Math.abs(p.height - (84.45 - p.baselineStart))).toBeLessThan(0.05);
  });

  it('seeded noise: the mean ratio over 100 realisations is within 4 standard errors (+0.1 %)', () => {
    const rng = makeRng(55);
    const R = 100;
    const ratios = smoothers.map(() => [] as number[]);
    for (let r = 0; r < R; r++) {
      const y = Float64Array.from(clean, (v) => v + rng.normal());
      const h0 = heightOf(y, 1);
      smoothers.forEach(([, f], k) => ratios[k].push(heightOf(f(y), 1) / h0));
    }
    smoothers.forEach(([name, , expected], k) => {
      const m = ratios[k].reduce((a, b) => a + b, 0) / R;
      const sd = Math.sqrt(ratios[k].reduce((a, b) => a + (b - m) ** 2, 0) / (R - 1));
      const tol = (4 * sd) / Math.sqrt(R) + 1e-3 * expected;
      expect(Math.abs(m - expected), name).toBeLessThan(tol);
    });
  });
});

/** A table row with only what matching reads set meaningfully; built through the real type. */
function fakePeak(x: number, fwhm: number, height: number, flag: PeakFlag, snr: number): Peak {
  return {
    index: 0, x, y: height, height, prominence: height, leftBase: 0, rightBase: 0, leftBaseX: x - fwhm, rightBaseX: x + fwhm,
    fwhm, fwhmPoints: fwhm, leftHalf: x - fwhm / 2, rightHalf: x + fwhm / 2, startIndex: 0, endIndex: 0,
    start: x - fwhm, end: x + fwhm, startKind: 'returned', endKind: 'returned', baselineStart: 0, baselineEnd: 0, split: 'none',
    area: height * fwhm, noiseSigma: 1, snrRms: snr, snrPharma: null, pharmaNoise: null, snrRegion: null,
    snr, snrDefinition: 'rms', flag, marks: [], origin: 'detected',
  };
}

describe('matching is stable (issue 5 check)', () => {
  it('a peak shifted by less than the tolerance is one row; shifts and changes are reported', () => {
    const a: Alternative = { id: 'raw', label: 'raw', peaks: [fakePeak(10, 1, 50, 'quantifiable', 50)] };
    const b: Alternative = { id: 'ma', label: 'moving average', peaks: [fakePeak(10.3, 1.2, 40, 'quantifiable', 60)] };
    const led = matchPeaks([a, b], { dx: xUnits(0.1), xUnit: 'min' });
    expect(led.rows).toHaveLength(1);
    const c = led.rows[0].cells[1];
    expect(c.found).toBe(true);
    expect(c.heightKept).toBeCloseTo(80, 10);
    expect(c.widthChange).toBeCloseTo(20, 10);
    expect(c.apexShift).toBeCloseTo(0.3, 12);
    expect(c.apexShiftPoints).toBeCloseTo(3, 10);
    expect(c.areaChange).toBeCloseTo((40 * 1.2) / 50 * 100 - 100, 10);
    expect(led.sentences).toEqual([]);
  });

  it('a shift beyond the tolerance is a lost feature plus a new one', () => {
    const a: Alternative = { id: 'raw', label: 'raw', peaks: [fakePeak(10, 1, 50, 'quantifiable', 50)] };
    const b: Alternative = { id: 'x', label: 'shifted', peaks: [fakePeak(10.6, 1, 50, 'quantifiable', 50)] };
    const led = matchPeaks([a, b], { dx: xUnits(0.1), xUnit: 'min' });
    expect(led.rows).toHaveLength(2);
    expect(led.sentences).toContain('The feature at 10.0 min is lost with shifted.');
  });

  it('two peaks closer than the tolerance are not merged into one row', () => {
    const a: Alternative = { id: 'raw', label: 'raw', peaks: [fakePeak(10, 2, 50, 'quantifiable', 50)] };
    const b: Alternative = { id: 'd', label: 'split', peaks: [fakePeak(9.8, 1, 30, 'quantifiable', 30), fakePeak(10.3, 1, 30, 'quantifiable', 30)] };
    const led = matchPeaks([a, b], { dx: xUnits(0.1) });
    expect(led.rows).toHaveLength(2);
    expect(led.rows[0].position).toBe(10);
    expect(led.rows[0].cells[1].x).toBe(9.8); // the nearer one joins the feature
    expect(led.rows[1].position).toBe(10.3);
    expect(led.rows[1].cells[0].found).toBe(false);
    expect(led.rows[1].sentences[0]).toMatch(/not found with raw; it first appears with split, so check that the processing did not make it/);
  });

  it('peaks the user removed are left out; the tolerance floor is 2 points', () => {
    const removed = { ...fakePeak(5, 0.01, 10, 'detectable', 5), removedByUser: true };
    const led = matchPeaks([{ id: 'a', label: 'a', peaks: [removed, fakePeak(10, 0.01, 10, 'detectable', 5)] }], { dx: xUnits(0.1) });
    expect(led.rows).toHaveLength(1);
    expect(led.rows[0].tolerance).toBeCloseTo(0.2, 12);
    expect(() => matchPeaks([], { dx: xUnits(1) })).toThrow(RangeError);
  });
});

describe('survival ledger on a synthetic trace: raw against moving averages', () => {
  // 0–25 min at 0.01 min; two large peaks and a narrow small one at 12.41 min.
  const rng = makeRng(4141);
  const x = grid(2501, 0.01);
  const clean = gauss(x, [[6, 200, 0.2], [12.41, 7, 0.02], [19, 120, 0.15]]);
  const raw = Float64Array.from(clean, (v) => v + rng.normal());
  const yRaw0 = raw.slice();
  const alt = (id: string, label: string, y: Float64Array): Alternative => {
    const n = noiseRms(x, y, 0.5, 3.5);
    if (!n.ok) throw new Error(n.message);
    return { id, label, peaks: detectPeaks(x, y, defaultPeakOptions(n.sigma, 0.01)) };
  };
  const alts = [
    alt('raw', 'no smoothing', raw),
    alt('ma3', '3-point moving average', movingAverage(raw, 3)),
    alt('ma41', '41-point moving average', movingAverage(raw, 41)),
  ];
  const led = matchPeaks(alts, { dx: xUnits(0.01), xUnit: 'min' });

  it('the narrow small peak is found raw, survives 3-point averaging, and is lost or falls below S/N 3 with 41 points', () => {
    const row = led.rows.reduce((a, b) => (Math.abs(b.position - 12.41) < Math.abs(a.position - 12.41) ? b : a));
    expect(Math.abs(row.position - 12.41)).toBeLessThan(0.02);
    expect(row.cells[0].found).toBe(true);
    expect(['detectable', 'quantifiable']).toContain(row.cells[0].standing);
    expect(row.cells[1].found).toBe(true);
    const heavy = row.cells[2];
    expect(['lost', 'below-detection']).toContain(heavy.standing);
    expect(heavy.crossed).toBe('down');
    expect(row.crossed).toBe(true);
    const expected = heavy.standing === 'lost'
      ? 'The feature at 12.41 min is lost with 41-point moving average.'
      : 'The feature at 12.41 min drops below S/N 3 with 41-point moving average.';
    expect(row.sentences).toContain(expected);
    expect(led.sentences).toContain(expected);
  });

  it('the large peaks survive every alternative, losing more height with the longer window', () => {
    for (const at of [6, 19]) {
      const row = led.rows.find((r) => Math.abs(r.position - at) < 0.05);
      expect(row).toBeDefined();
      const [c0, c1, c2] = row!.cells;
      expect(c0.standing).toBe('quantifiable');
      expect(c1.standing).toBe('quantifiable');
      expect(c2.standing).toBe('quantifiable');
      expect(c0.heightKept).toBeCloseTo(100, 10);
      expect(c2.heightKept!).toBeLessThan(c1.heightKept!);
    }
  });

  it('did not change the raw trace', () => {
    expect(raw).toEqual(yRaw0);
  });
});

describe('window advice (rules of thumb, marked as such)', () => {
  const fwhm = 5 * 2.35482; // σ = 5 points

  it('SG quadratic 25 on a peak of FWHM 11.8 points passes about 1 × FWHM; warns with the computed 84.4 %', () => {
    const a = windowAdvice('savitzky-golay', points(25), 2, points(fwhm));
    expect(a.ratio).toBeCloseTo(25 / fwhm, 12);
    expect(a.expectedHeightKept).toBeCloseTo(0.8445, 4);
    expect(a.rule).toMatch(/O'Haver/);
    expect(a.warning).toMatch(/84\.4 %/);
  });

  it('SG quartic 25 is within 1–2 × FWHM (Press & Teukolsky 1990) only up to 2 ×', () => {
    const a = windowAdvice('savitzky-golay', points(25), 4, points(fwhm));
    expect(a.expectedHeightKept).toBeCloseTo(0.96535, 5);
    expect(a.rule).toMatch(/Press & Teukolsky 1990/);
    expect(a.warning).toBeDefined(); // 2.12 × FWHM
    expect(windowAdvice('savitzky-golay', points(21), 4, points(fwhm)).warning).toBeUndefined(); // 1.78 ×
  });

  it('moving average: 5 points is under half the FWHM (no warning), 11 is over', () => {
    const a = windowAdvice('moving-average', points(5), 0, points(fwhm));
    expect(a.expectedHeightKept).toBeCloseTo(0.961326, 6);
    expect(a.warning).toBeUndefined();
    expect(a.rule).toMatch(/common practice/);
    const b = windowAdvice('moving-average', points(11), 0, points(fwhm));
    expect(b.warning).toMatch(/83\.1 %/);
    expect(() => windowAdvice('moving-average', points(5), 0, points(0))).toThrow(RangeError);
  });
});
