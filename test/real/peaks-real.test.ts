/**
 * The peak table on the real MALDI-TOF spectra (test/fixtures/real; MALDIquant
 * fiedler2009subset items 1, 2 and 9, GPL-3+) with the page's own defaults
 * (σ from the raw trace, its profile and correlation): rules that must hold
 * on every row, and the rows changed by the width limit at shared valleys,
 * the rule against non-positive areas and the same-top merge (issue 14),
 * against figures worked out by hand in test/reference/make_real_rows.py
 * (NumPy; values in real-rows.json).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS } from '../../src/core/analysis/request.ts';
import { measurePeaks } from '../../src/core/analysis/stages/measure.ts';
import { WIDTH_LIMIT } from '../../src/core/measure/peak-bounds.ts';
import { defaultPeakOptions, detectPeaks } from '../../src/core/measure/peak-table.ts';
import { rawNoiseModel } from '../../src/core/measure/noise-raw.ts';
import { meanStep } from '../../src/core/numeric/interpolate.ts';
import type { Peak } from '../../src/core/measure/peak-types.ts';
import { loadReal, MALDI_FILES } from './load-real.ts';

const hand = JSON.parse(readFileSync(new URL('../reference/real-rows.json', import.meta.url), 'utf8')) as {
  narrow_between_neighbours: { index: number; mz: number; height: number; area: number };
  rows: { file: string; mz: number; index: number; height: number }[];
  doublet: { mz: number[]; dip_over_sigma_box5: number; replicate_02_box5_maxima: number[]; verdict: string };
};

const tables = new Map<string, { x: Float64Array; peaks: Peak[] }>();
function table(file: string) {
  let t = tables.get(file);
  if (!t) {
    const tr = loadReal(file).traces[0];
    const sig = { x: tr.x, y: tr.y };
    t = { x: tr.x, peaks: measurePeaks(sig, sig, DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, {}, null).peaks };
    tables.set(file, t);
  }
  return t;
}

/** Fractional sample index of x-value v, searching out from sample i (the m/z grid is uneven). */
function fracIndex(x: Float64Array, i: number, v: number): number {
  let k = i;
  while (k > 0 && x[k] > v) k--;
  while (k < x.length - 2 && x[k + 1] < v) k++;
  return k + (v - x[k]) / (x[k + 1] - x[k]);
}

describe('every row of the three MALDI-TOF tables (page defaults)', () => {
  for (const f of MALDI_FILES) {
    it(`${f}: area above its own line positive; bounds within ${WIDTH_LIMIT} own half-widths of the apex sample`, () => {
      const { x, peaks } = table(f);
      expect(peaks.length).toBeGreaterThan(300);
      for (const p of peaks) {
        expect(p.area, `m/z ${p.x.toFixed(2)}`).toBeGreaterThan(0);
        // Each side's own half-width in samples, from the half-height crossings (rule 3's limit, rounded up).
        const hwL = Math.max(p.index - fracIndex(x, p.index, p.leftHalf), 0.5), hwR = Math.max(fracIndex(x, p.index, p.rightHalf) - p.index, 0.5);
        expect(p.index - p.startIndex, `m/z ${p.x.toFixed(2)} left`).toBeLessThanOrEqual(Math.max(2, Math.ceil(WIDTH_LIMIT * hwL)) + 1);
        expect(p.endIndex - p.index, `m/z ${p.x.toFixed(2)} right`).toBeLessThanOrEqual(Math.max(2, Math.ceil(WIDTH_LIMIT * hwR)) + 1);
      }
    });
  }
});

describe('rows the issue-14 rules changed, against the hand figures (make_real_rows.py)', () => {
  it('m/z 3302.1 (spectrum 01; area -874 before, bounds 26 and 49 samples out from a 6-sample-wide peak): listed with a positive area, as by hand', () => {
    const h = hand.narrow_between_neighbours;
    const p = table('maldi-fiedler2009-01.csv').peaks.find((q) => Math.abs(q.index - h.index) <= 2)!;
    expect(p).toBeDefined();
    expect(h.area).toBeGreaterThan(0);
    expect(p.area).toBeGreaterThan(0);
    // The hand line runs through two 5-sample windows 24 samples out; ours through the levels at its own bounds on
    // a stretch falling from 1,700 to 1,430 counts over 50 samples toward the next peak: the two lines differ by
    // about a third of this S/N 5 peak's height (measured: ours 0.6 x the hand height). Only the order is checked.
    expect(p.height / h.height).toBeGreaterThan(0.4);
    expect(p.height / h.height).toBeLessThan(1.5);
  });

  for (const r of hand.rows) {
    it(`${r.file} m/z ${r.mz.toFixed(1)}: height within 6 % of the hand figure (hand baseline through windows 2-3 widths out)`, () => {
      const p = table(r.file).peaks.find((q) => Math.abs(q.index - r.index) <= 3)!;
      expect(p).toBeDefined();
      expect(Math.abs(p.height / r.height - 1)).toBeLessThan(0.06);
    });
  }

  it('the top at m/z 2754-2756 is one peak, by hand (the dip in 01 is not in its replicate 02), and each table lists one row there', () => {
    const d = hand.doublet;
    expect(d.verdict).toBe('one peak');
    expect(d.replicate_02_box5_maxima.length).toBe(1);
    for (const f of ['maldi-fiedler2009-01.csv', 'maldi-fiedler2009-02.csv']) {
      const rows = table(f).peaks.filter((p) => p.x > d.mz[0] - 2 && p.x < d.mz[1] + 2);
      expect(rows.length, f).toBe(1);
    }
    // With one σ for the whole trace (no profile) spectrum 01 listed two rows here before the same-top rule (apexes
    // 10 samples apart, each measured 46 samples wide over the whole top): now one.
    const t = loadReal('maldi-fiedler2009-01.csv').traces[0];
    const sigma = rawNoiseModel(t.y)!.sigma;
    const rows = detectPeaks(t.x, t.y, defaultPeakOptions(sigma, meanStep(t.x))).filter((p) => p.x > d.mz[0] - 2 && p.x < d.mz[1] + 2);
    expect(rows.length).toBe(1);
  });
});
