import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { Peak } from '../../../src/core/measure/peak-types.ts';
import { applyPeakDecisions, defaultPeakOptions, detectPeaks } from '../../../src/core/measure/peak-table.ts';
import { noiseRms } from '../../../src/core/measure/noise-estimators.ts';
import { gaussianHeightRatioMovingAverage, matchPeaks } from '../../../src/core/measure/loss-matching.ts';
import { movingAverage } from '../../../src/core/steps/moving-average.ts';
import { points, xUnits } from '../../../src/core/units.ts';

// The demo's ground truth is written by scripts/make-demo.mjs (invented, seeded data).
interface Truth {
  noiseSd: number;
  x: { step: number };
  drift: { c0: number; c1: number; c2: number };
  peaks: { label: string; centre: number; height: number; sigma: number; trueSn: number }[];
  spike: { x: number };
}
const truth = JSON.parse(readFileSync(new URL('../../../public/demo/demo-truth.json', import.meta.url), 'utf8')) as Truth;

/** A tiny reader for the demo CSV: keeps the rows that are two numbers. */
function readDemo(name: string): { x: Float64Array; y: Float64Array } {
  const xs: number[] = [], ys: number[] = [];
  for (const line of readFileSync(new URL(`../../../public/demo/${name}`, import.meta.url), 'utf8').split(/\r?\n/)) {
    const m = /^\s*(-?[\d.]+(?:e-?\d+)?)\s*,\s*(-?[\d.]+(?:e-?\d+)?)\s*$/i.exec(line);
    if (m) { xs.push(Number(m[1])); ys.push(Number(m[2])); }
  }
  return { x: Float64Array.from(xs), y: Float64Array.from(ys) };
}

const { x, y } = readDemo('demo-sample.csv');
const dx = truth.x.step;
// Quiet stretch after the spike and the last peak (8.5 ± 6σ = 9.4 min).
const noise = noiseRms(x, y, 10.2, x[x.length - 1]);
if (!noise.ok) throw new Error(noise.message);
const opts = defaultPeakOptions(noise.sigma, dx);
const peaks = detectPeaks(x, y, opts);
const nearest = (list: readonly Peak[], at: number): Peak => list.reduce((a, b) => (Math.abs(b.x - at) < Math.abs(a.x - at) ? b : a));
const ORDER = ['below-detection', 'detectable', 'quantifiable'];
const flagOf = (sn: number): string => ORDER[sn < 3 ? 0 : sn < 10 ? 1 : 2];
/** The flag must be one that an S/N between lo and hi could give (limits 3 and 10, ICH Q2(R1)). */
function expectFlagWithin(flag: string, lo: number, hi: number): void {
  const k = ORDER.indexOf(flag);
  expect(k).toBeGreaterThanOrEqual(ORDER.indexOf(flagOf(lo)));
  expect(k).toBeLessThanOrEqual(ORDER.indexOf(flagOf(hi)));
}

/** The shoulder is a local maximum of the noiseless trace only if its rise beats the main peak's fall there. */
function isLocalMaxInTruth(centre: number): boolean {
  const f = (t: number) => truth.peaks.reduce((s, p) => s + p.height * Math.exp(-0.5 * ((t - p.centre) / p.sigma) ** 2), 0);
  let best = -Infinity, at = -1;
  for (let t = centre - 0.05; t <= centre + 0.05; t += dx / 10) if (f(t) > best) { best = f(t); at = t; }
  return Math.abs(at - centre) < 0.049 && f(at) > f(at - dx) && f(at) > f(at + dx);
}

describe('the demo trace against its ground truth (public/demo/demo-truth.json)', () => {
  it('noise from a quiet range matches the true noise SD within sampling error', () => {
    // SD of a sample SD ≈ σ/√(2(n − 2)); allow 4.
    expect(Math.abs(noise.sigma - truth.noiseSd)).toBeLessThan((4 * truth.noiseSd) / Math.sqrt(2 * (noise.points - 2)));
  });

  // The issue asks for detection on the processed trace; here the lightest processing, a
  // 3-point moving average, whose height loss on each Gaussian is computed (exact sum).
  const ma3 = movingAverage(y, 3);
  const noise3 = noiseRms(x, ma3, 10.2, x[x.length - 1]);
  if (!noise3.ok) throw new Error(noise3.message);
  const peaks3 = detectPeaks(x, ma3, defaultPeakOptions(noise3.sigma, dx));

  for (const t of truth.peaks) {
    const resolvable = isLocalMaxInTruth(t.centre);
    it(`${t.label} at ${t.centre} min: ${resolvable ? 'found within one point, height within 3 noise SD, flag as its true S/N says' : 'is not a local maximum even without noise'}`, () => {
      if (!resolvable) {
        // A shoulder whose rise never beats the main peak's fall has no apex of its own:
        // local-maximum detection cannot list it; the user adds it by hand (checked below).
        expect(t.label).toBe('shoulder');
        return;
      }
      // Processed trace (3-point average): position within one point, height within 3 noise SD
      // of the true height times the computed moving-average loss (exact sum).
      const q = nearest(peaks3, t.centre);
      expect(Math.abs(q.x - t.centre)).toBeLessThanOrEqual(dx);
      const expectedH = t.height * gaussianHeightRatioMovingAverage(points(3), points(t.sigma / dx));
      expect(Math.abs(q.height - expectedH)).toBeLessThan(3 * truth.noiseSd);
      // Flags: a height within 3σ puts S/N within about 3.5 of the truth, and a 3-point average
      // raises S/N by at most √3 (noise ÷ √3, height kept ≤ 1); a flag is certain only when no
      // limit lies in that band.
      expectFlagWithin(q.flag, t.trueSn - 3.5, Math.sqrt(3) * t.trueSn + 3.5);
      if (t.trueSn >= 3 && Math.sqrt(3) * t.trueSn < 10) expect(q.flag).toBe('detectable');
      // Raw trace: a weak broad top breaks into noise maxima (the S/N 4 shoulder's does, into bumps
      // narrower than 3 points), so the raw checks are for peaks at S/N 10 and above. Even an ideal
      // estimator's apex SD for the S/N-10 peak (σ = 5 points) is σ/H·√(2σₚ/√π) ≈ 0.24 points
      // (Cramér–Rao bound for a Gaussian's centre, derived here): allow 2 points raw.
      if (t.trueSn >= 10) {
        const p = nearest(peaks, t.centre);
        expect(Math.abs(p.x - t.centre)).toBeLessThanOrEqual(2 * dx);
        expect(Math.abs(p.height - t.height)).toBeLessThan(3 * truth.noiseSd);
        expectFlagWithin(p.flag, t.trueSn - 3.5, t.trueSn + 3.5);
      }
    });
  }

  it('the spike (one point, 40 noise SD) is not a peak: its width is under the 3-point minimum', () => {
    expect(peaks.some((p) => Math.abs(p.x - truth.spike.x) <= 2 * dx)).toBe(false);
  });

  it('a shoulder that is no local maximum can be added by hand and is measured, marked as added', () => {
    const shoulder = truth.peaks.find((t) => t.label === 'shoulder');
    if (!shoulder) return;
    const out = applyPeakDecisions(peaks, { added: [shoulder.centre], removed: [] }, x, y, opts);
    const added = out.filter((p) => p.origin === 'added-by-user');
    expect(added).toHaveLength(1);
    expect(Math.abs(added[0].x - shoulder.centre)).toBeLessThanOrEqual(dx);
  });

  it('loss check: the large peaks survive 3- and 15-point averaging with height loss in that order', () => {
    const alt = (id: string, label: string, yy: Float64Array) => {
      const n = noiseRms(x, yy, 10.2, x[x.length - 1]);
      if (!n.ok) throw new Error(n.message);
      return { id, label, peaks: detectPeaks(x, yy, defaultPeakOptions(n.sigma, dx)) };
    };
    const led = matchPeaks([alt('raw', 'no smoothing', y), alt('ma3', '3-point moving average', movingAverage(y, 3)),
      alt('ma15', '15-point moving average', movingAverage(y, 15))], { dx: xUnits(dx), xUnit: 'min' });
    for (const t of truth.peaks.filter((p) => p.trueSn >= 20)) {
      const row = led.rows.find((r) => Math.abs(r.position - t.centre) <= 2 * dx);
      expect(row, t.label).toBeDefined();
      const [, c3, c15] = row!.cells;
      expect(c3.found && c15.found).toBe(true);
      expect(c15.heightKept!).toBeLessThan(c3.heightKept!);
    }
    // The sharp early peak (σ = 2 points) loses most: a 15-point average keeps under 40 % of a
    // Gaussian that narrow (exact sum, gaussianHeightRatioMovingAverage(points(15), points(2)) = 0.33).
    const sharp = led.rows.find((r) => Math.abs(r.position - 1.2) <= 2 * dx)!;
    expect(sharp.cells[2].heightKept!).toBeLessThan(45);
  });

  it('loss check: the shoulder survives 3-point averaging and is lost or downgraded by heavy averaging, in words', () => {
    const shoulder = truth.peaks.find((t) => t.label === 'shoulder')!;
    const alt = (id: string, label: string, yy: Float64Array) => {
      const n = noiseRms(x, yy, 10.2, x[x.length - 1]);
      if (!n.ok) throw new Error(n.message);
      return { id, label, peaks: detectPeaks(x, yy, defaultPeakOptions(n.sigma, dx)) };
    };
    const led = matchPeaks([alt('ma3', '3-point moving average', movingAverage(y, 3)),
      alt('ma41', '41-point moving average', movingAverage(y, 41))], { dx: xUnits(dx), xUnit: 'min' });
    const row = led.rows.reduce((a, b) => (Math.abs(b.position - shoulder.centre) < Math.abs(a.position - shoulder.centre) ? b : a));
    expect(Math.abs(row.position - shoulder.centre)).toBeLessThanOrEqual(dx);
    expect(row.cells[0].standing).toBe('detectable');
    expect(row.cells[1].crossed).toBe('down');
    expect(row.sentences.join(' ')).toMatch(/^The feature at 6\.3[4-6] min (is lost|drops below S\/N 3) with 41-point moving average\.$/);
  });
});
