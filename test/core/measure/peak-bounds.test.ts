// Bounds and integration of one peak (src/core/measure/peak-bounds.ts), called
// directly on small hand-made traces. Sources: the Gaussian facts FWHM =
// 2√(2 ln 2)·σ and area = σ·√(2π)·h (any statistics handbook; REFERENCES.md),
// the trapezoid rule (exact on piecewise-linear data), linear interpolation and
// parabolas (exact on straight lines and quadratics); hand computations beside
// each check.
import { describe, expect, it } from 'vitest';
import {
  WIDTH_LIMIT,
  apexLevel,
  apexPosition,
  areaAbove,
  blankMeasure,
  copyMeasure,
  halfCrossings,
  lineAt,
  lineThrough,
  locatingCopy,
  measureLocal,
  measureLocalInto,
  xAt,
  type MeasureContext,
} from '../../../src/core/measure/peak-bounds.ts';
import { noiseModel } from '../../../src/core/measure/peak-snr.ts';
import { defaultPeakOptions } from '../../../src/core/measure/peak-table.ts';
import { prominentMaxima } from '../../../src/core/measure/peak-detection.ts';
import { longTrace } from './long-traces.ts';

const FLAT = lineThrough(0, 0, 1, 0);

describe('lines, x at a fractional index', () => {
  it('lineThrough and lineAt: the line through (1, 2) and (3, 8) has slope 3; equal x gives the mean level', () => {
    const l = lineThrough(1, 2, 3, 8);
    expect(l.slope).toBe(3);
    expect(lineAt(l, 5)).toBe(14);
    expect(lineAt(lineThrough(2, 1, 2, 5), 100)).toBe(3);
  });

  it('xAt interpolates linearly and clamps to the ends', () => {
    const x = Float64Array.of(0, 1, 5, 6);
    expect(xAt(x, 1.5)).toBe(3);
    expect(xAt(x, -2)).toBe(0);
    expect(xAt(x, 7)).toBe(6);
  });
});

describe('areaAbove: trapezoid rule of (trace − line)', () => {
  it('a triangle of base 4 and height 2 on a sloped line has area 4 (exact for piecewise-linear data)', () => {
    const x = Float64Array.of(0, 1, 2, 3, 4, 5, 6);
    const tri = [0, 0, 1, 2, 1, 0, 0];
    const line = lineThrough(0, 10, 6, 16);
    const s = Float64Array.from(x, (v, i) => tri[i] + lineAt(line, v));
    expect(areaAbove(x, s, line, 0, 6)).toBeCloseTo(4, 13);
    expect(areaAbove(x, s, line, 1, 3)).toBeCloseTo(1 * 0.5 + 1.5, 13); // 0→1 (0.5) plus 1→2 (1.5)
    expect(areaAbove(x, s, line, 3, 3)).toBe(0);
  });
});

describe('halfCrossings', () => {
  it('a triangle peak of height 4 crosses 2 exactly halfway up each flank (linear interpolation)', () => {
    const x = Float64Array.from({ length: 11 }, (_, i) => i);
    const s = Float64Array.of(0, 0, 0, 1, 2, 4, 2, 1, 0, 0, 0);
    const [l, r] = halfCrossings(x, s, FLAT, 5, 2, 0, 10);
    expect(l).toBeCloseTo(4, 14);
    expect(r).toBeCloseTo(6, 14);
    const [l3, r3] = halfCrossings(x, s, FLAT, 5, 3, 0, 10);
    expect(l3).toBeCloseTo(4.5, 14);
    expect(r3).toBeCloseTo(5.5, 14);
    // A side that never falls to the level crosses at its bound.
    const [lb, rb] = halfCrossings(x, s, FLAT, 5, -1, 2, 8);
    expect([lb, rb]).toEqual([2, 8]);
  });
});

describe('apex of a parabola', () => {
  it('the vertex and top of an exact parabola are found between samples, narrow and broad', () => {
    // y = 5 − (x − 10.3)² has its vertex at 10.3, level 5.
    const x = Float64Array.from({ length: 21 }, (_, i) => i);
    const s = Float64Array.from(x, (v) => 5 - (v - 10.3) ** 2);
    for (const fw of [3, 12]) {
      const at = apexPosition(x, s, FLAT, 10, fw);
      expect(at).toBeCloseTo(10.3, 10);
      expect(apexLevel(x, s, FLAT, 10, fw, at)).toBeCloseTo(5, 10);
    }
  });
});

describe('measureLocal on a noiseless Gaussian (σ_peak = 20 samples, h = 7)', () => {
  // Dense, noiseless: the estimates approach the handbook values. Noise σ is a tiny 1e-6 so the rules
  // have a scale (with σ = 0 they use the floor, checked in peak-snr.test.ts).
  const sigma = 20, h = 7, n = 601, centre = 300.4;
  const x = Float64Array.from({ length: n }, (_, i) => i * 0.5);
  const gauss = (i: number) => h * Math.exp(-0.5 * ((i - centre) / sigma) ** 2);

  function measured(baseline: (xv: number) => number) {
    const s = Float64Array.from(x, (v, i) => gauss(i) + baseline(v));
    const c: MeasureContext = { x, s, noise: noiseModel(s, defaultPeakOptions(1e-6, 0.5)), loc: locatingCopy(s) };
    const before = Float64Array.from(s);
    const m = measureLocal(c, 300, 2 * Math.sqrt(2 * Math.LN2) * sigma);
    expect(s).toEqual(before);
    return { m, s };
  }

  for (const [name, base] of [['flat baseline at 3', () => 3], ['sloped baseline 1 + 0.02·x', (v: number) => 1 + 0.02 * v]] as const) {
    it(`${name}: height h, half-height width 2√(2 ln 2)·σ, area σ√(2π)·h, apex at the centre`, () => {
      const { m, s } = measured(base);
      // The line follows the baseline under the peak (the Gaussian is below 1e-6·h at ±5.3σ).
      const dx = 0.5;
      expect(Math.abs(m.height / h - 1)).toBeLessThan(5e-4);
      expect(Math.abs(m.xApex - centre * dx)).toBeLessThan(1e-3);
      const fwhm = xAt(x, m.rightIp) - xAt(x, m.leftIp);
      // Linear interpolation at the half-height crossings on 1/20-σ sampling: within 0.1 %.
      expect(Math.abs(fwhm / (2 * Math.sqrt(2 * Math.LN2) * sigma * dx) - 1)).toBeLessThan(1e-3);
      const area = areaAbove(x, s, m.line, m.start, m.end);
      expect(Math.abs(area / (sigma * dx * Math.sqrt(2 * Math.PI) * h) - 1)).toBeLessThan(1e-3);
      // Bounds within WIDTH_LIMIT half-widths of the apex and wide enough to hold ±3σ (99.7 % of the area).
      const hw = Math.sqrt(2 * Math.LN2) * sigma;
      expect(m.index - m.start).toBeLessThanOrEqual(Math.ceil(WIDTH_LIMIT * hw));
      expect(m.end - m.index).toBeLessThanOrEqual(Math.ceil(WIDTH_LIMIT * hw));
      expect(m.index - m.start).toBeGreaterThan(3 * sigma);
      expect(m.end - m.index).toBeGreaterThan(3 * sigma);
      expect(Math.abs(lineAt(m.line, x[m.start]) - base(x[m.start]))).toBeLessThan(1e-3 * h);
      expect(Math.abs(lineAt(m.line, x[m.end]) - base(x[m.end]))).toBeLessThan(1e-3 * h);
    });
  }

  it('a valley between two Gaussians stops the bound there (kind "valley")', () => {
    // Second Gaussian 10σ away: the walk meets its flank and stops at the lowest point between them.
    const s = Float64Array.from(x, (_, i) => gauss(i) + h * Math.exp(-0.5 * ((i - centre - 10 * sigma / 2) / (sigma / 2)) ** 2));
    const c: MeasureContext = { x, s, noise: noiseModel(s, defaultPeakOptions(1e-6, 0.5)), loc: locatingCopy(s) };
    const m = measureLocal(c, 300, 2 * Math.sqrt(2 * Math.LN2) * sigma);
    expect(m.endKind).toBe('valley');
    let lowest = 300;
    for (let i = 300; i < 400; i++) if (s[i] < s[lowest]) lowest = i;
    expect(Math.abs(m.end - lowest)).toBeLessThanOrEqual(3);
  });
});

describe('measureLocalInto: one object filled again for each peak gives what measureLocal gives', () => {
  it('every candidate of a drifting noisy trace (10⁴ points): the same fields; a copy keeps its values when the object is filled again', () => {
    // Property of the definition: the rules are the same code, only where the result is written differs.
    const y = longTrace(10_000, 1617, 'drift');
    const x = Float64Array.from(y, (_, i) => i * 0.001);
    const c: MeasureContext = { x, s: y, noise: noiseModel(y, defaultPeakOptions(0.05, 0.001)), loc: locatingCopy(y) };
    const cand = prominentMaxima(y, 0.1);
    expect(cand.count).toBeGreaterThan(100);
    const into = blankMeasure();
    const copies = [];
    for (let k = 0; k < cand.count; k++) {
      measureLocalInto(c, cand.index[k], cand.halfWidth[k], into);
      const fresh = measureLocal(c, cand.index[k], cand.halfWidth[k]);
      expect({ ...into, line: { ...into.line } }).toEqual({ ...fresh, line: { ...fresh.line } });
      copies.push([copyMeasure(into), fresh] as const);
    }
    for (const [copy, fresh] of copies) {
      expect(copy).toEqual(fresh);
      expect(copy.line).not.toBe(into.line);
    }
  });

  it('with a minimum width: false only for candidates whose full measure is narrower; true ones measured in full', () => {
    // The early stop skips only what cannot change the decision: the same width expression, on the same crossings.
    const y = longTrace(10_000, 1618, 'ar1');
    const x = Float64Array.from(y, (_, i) => i * 0.001);
    const minWidth = 0.0025; // 2.5 samples, detection's default
    const c: MeasureContext = { x, s: y, noise: noiseModel(y, defaultPeakOptions(0.05, 0.001)), loc: locatingCopy(y) };
    const cand = prominentMaxima(y, 0.1);
    const into = blankMeasure();
    let narrow = 0, wide = 0;
    for (let k = 0; k < cand.count; k++) {
      const full = measureLocal(c, cand.index[k], cand.halfWidth[k]);
      const isNarrow = xAt(x, full.rightIp) - xAt(x, full.leftIp) < minWidth;
      const complete = measureLocalInto(c, cand.index[k], cand.halfWidth[k], into, minWidth);
      // Stopped early only where the full measure is narrower; otherwise the full measure (a peak left with no
      // height returns before its last shape, whatever its width).
      if (!complete) { narrow++; expect(isNarrow).toBe(true); continue; }
      wide++;
      expect({ ...into, line: { ...into.line } }).toEqual({ ...full, line: { ...full.line } });
    }
    // Both outcomes occur on this trace (noise bumps are narrow; its Gaussian bands are not).
    expect(narrow).toBeGreaterThan(50);
    expect(wide).toBeGreaterThan(5);
  });
});
