/**
 * The merged candidate pass of the peak detector (`prominentMaxima`,
 * peak-detection.ts) equals the separate passes it replaces and SciPy.
 *
 * * Property (fast-check, fixed seeds): on random signals with ties and
 *   plateaus, every index, prominence, base and half-prominence width equals
 *   SciPy's definitions written out naively (walk out from each maximum),
 *   bit for bit.
 * * On long traces we did not design for it (drifting baselines, bands over
 *   the whole range, AR(1) noise, the demo over many seeds, the MALDI
 *   spectra): identical to `findLocalMaxima` + `peakProminences` + the
 *   threshold + `peakWidths`, the separate passes detection used before.
 * * Against SciPy 1.17 `find_peaks(prominence=…)` and `peak_widths`
 *   (test/reference/peaks.json, made by test/reference/make_peaks.py): 1e-9.
 */
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { findLocalMaxima, peakProminences, peakWidths, prominentMaxima, type ProminentMaxima } from '../../../src/core/measure/peak-detection.ts';
import { longTrace } from './long-traces.ts';
// @ts-expect-error a plain script without type declarations
import { makeDemo } from '../../../scripts/make-demo.mjs';
import { loadReal, MALDI_FILES } from '../../real/load-real.ts';

/** SciPy `_local_maxima_1d`, written out. */
function naiveMaxima(y: Float64Array): number[] {
  const out: number[] = [];
  let i = 1;
  while (i < y.length - 1) {
    if (y[i - 1] < y[i]) {
      let j = i + 1;
      while (j < y.length - 1 && y[j] === y[i]) j++;
      if (y[j] < y[i]) { out.push((i + j - 1) >> 1); i = j; }
    }
    i++;
  }
  return out;
}

/** The columns the naive definitions give: SciPy `_peak_prominences` walk, the threshold, `_peak_widths` at 0.5. */
function naive(y: Float64Array, minProminence: number): { index: number[]; prominence: number[]; leftBase: number[]; rightBase: number[]; halfWidth: number[] } {
  const r = { index: [] as number[], prominence: [] as number[], leftBase: [] as number[], rightBase: [] as number[], halfWidth: [] as number[] };
  for (const p of naiveMaxima(y)) {
    const v = y[p];
    let lb = p, lmin = v;
    for (let i = p; i >= 0 && y[i] <= v; i--) if (y[i] < lmin) { lmin = y[i]; lb = i; }
    let rb = p, rmin = v;
    for (let i = p; i < y.length && y[i] <= v; i++) if (y[i] < rmin) { rmin = y[i]; rb = i; }
    const prom = v - Math.max(lmin, rmin);
    if (!(prom >= minProminence)) continue;
    const h = v - prom * 0.5;
    let i = p;
    while (lb < i && h < y[i]) i--;
    let left = i;
    if (y[i] < h) left += (h - y[i]) / (y[i + 1] - y[i]);
    i = p;
    while (i < rb && h < y[i]) i++;
    let right = i;
    if (y[i] < h) right -= (h - y[i]) / (y[i - 1] - y[i]);
    r.index.push(p); r.prominence.push(prom); r.leftBase.push(lb); r.rightBase.push(rb); r.halfWidth.push(right - left);
  }
  return r;
}

/** The separate passes detection made before the merged one. */
function separate(y: Float64Array, minProminence: number) {
  const maxima = findLocalMaxima(y);
  const pd = peakProminences(y, maxima);
  const keep = Array.from(maxima.keys()).filter((k) => pd.prominences[k] >= minProminence);
  const index = keep.map((k) => maxima[k]);
  const prom = { prominences: Float64Array.from(keep, (k) => pd.prominences[k]), leftBases: Int32Array.from(keep, (k) => pd.leftBases[k]), rightBases: Int32Array.from(keep, (k) => pd.rightBases[k]) };
  const w = peakWidths(y, index, 0.5, prom);
  return { index, prominence: Array.from(prom.prominences), leftBase: Array.from(prom.leftBases), rightBase: Array.from(prom.rightBases), halfWidth: Array.from(w.widths) };
}

function columns(c: ProminentMaxima) {
  for (const a of [c.index, c.prominence, c.leftBase, c.rightBase, c.halfWidth]) expect(a.length).toBe(c.count);
  return { index: Array.from(c.index), prominence: Array.from(c.prominence), leftBase: Array.from(c.leftBase), rightBase: Array.from(c.rightBase), halfWidth: Array.from(c.halfWidth) };
}

describe('merged candidate pass = SciPy’s definitions written out (exact)', () => {
  const sig = fc.oneof(
    fc.array(fc.integer({ min: 0, max: 5 }), { minLength: 0, maxLength: 400 }).map((a) => Float64Array.from(a)),
    fc.array(fc.double({ min: -50, max: 50, noNaN: true }), { minLength: 0, maxLength: 400 }).map((a) => Float64Array.from(a)),
    fc.array(fc.oneof(fc.double({ min: -5, max: 5, noNaN: true }), fc.integer({ min: -2, max: 2 })), { minLength: 0, maxLength: 400 }).map((a) => Float64Array.from(a)),
  );

  it('indices, prominences, bases and half-prominence widths, any threshold; the input unchanged', () => {
    fc.assert(fc.property(sig, fc.oneof(fc.constant(0), fc.double({ min: 0, max: 20, noNaN: true })), (y, thr) => {
      const copy = Float64Array.from(y);
      expect(columns(prominentMaxima(y, thr))).toEqual(naive(y, thr));
      expect(y).toEqual(copy);
    }), { seed: 16160, numRuns: 400 });
  });
});

describe('merged candidate pass = the separate passes it replaced, on long and real traces (exact)', () => {
  it('drifting baselines, bands over the whole range, AR(1) noise, 10⁵ points, several thresholds', () => {
    for (const kind of ['drift', 'bands', 'ar1'] as const) {
      for (const seed of [1, 2, 3]) {
        const y = longTrace(100_000, 1600 + seed, kind);
        for (const thr of [0, 0.1, 0.5]) {
          const got = columns(prominentMaxima(y, thr));
          expect(got).toEqual(separate(y, thr));
          if (thr === 0.1) expect(got.index.length).toBeGreaterThan(1000);
        }
      }
    }
  });

  it('the demo sample over 200 seeds, and its dips (negated)', () => {
    for (let seed = 1; seed <= 200; seed++) {
      const y = Float64Array.from((makeDemo(seed) as { files: { y: number[] }[] }).files[0].y);
      const thr = 2 * 0.05; // the detector's default: 2σ, the demo's noise SD 0.05
      expect(columns(prominentMaxima(y, thr))).toEqual(separate(y, thr));
      if (seed <= 5) {
        const neg = y.map((v) => -v);
        expect(columns(prominentMaxima(neg, thr))).toEqual(separate(neg, thr));
      }
    }
  });

  it('the MALDI-TOF spectra (integer counts: many ties and plateaus)', () => {
    for (const f of MALDI_FILES) {
      const y = loadReal(f).traces[0]!.y;
      for (const thr of [0, 10, 200]) expect(columns(prominentMaxima(y, thr))).toEqual(separate(y, thr));
    }
  });
});

// Values computed by SciPy (version recorded in the file) with the committed script test/reference/make_peaks.py.
interface RefTrace {
  name: string; y: number[]; maxima: number[]; prominences: number[]; leftBases: number[]; rightBases: number[];
  widths05: { widths: number[] }; minProminence: number; findPeaksProminence: number[];
}
const ref = JSON.parse(readFileSync(new URL('../../reference/peaks.json', import.meta.url), 'utf8')) as { scipy: string; traces: RefTrace[] };

describe(`merged candidate pass = SciPy ${ref.scipy} find_peaks(prominence) + peak_widths(rel_height 0.5), 1e-9 relative`, () => {
  for (const t of ref.traces) {
    it(t.name, () => {
      const c = prominentMaxima(Float64Array.from(t.y), t.minProminence);
      expect(Array.from(c.index)).toEqual(t.findPeaksProminence);
      expect(c.count).toBeGreaterThan(0);
      for (let k = 0; k < c.count; k++) {
        const j = t.maxima.indexOf(c.index[k]);
        expect([c.leftBase[k], c.rightBase[k]]).toEqual([t.leftBases[j], t.rightBases[j]]);
        expect(Math.abs(c.prominence[k] - t.prominences[j])).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(t.prominences[j])));
        expect(Math.abs(c.halfWidth[k] - t.widths05.widths[j])).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(t.widths05.widths[j])));
      }
    });
  }
});
