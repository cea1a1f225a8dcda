import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { defaultPeakOptions, detectPeaks, markAppearsOnlyAfterProcessing, markSaturatedOnRaw } from '../../../src/core/measure/peak-table.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { noiseRms } from '../../../src/core/measure/noise-estimators.ts';
import { movingAverage } from '../../../src/core/steps/moving-average.ts';
import { loadFile } from '../../../src/core/io/load.ts';

const grid = (n: number) => Float64Array.from({ length: n }, (_, i) => i);
const gauss = (x: Float64Array, c: number, h: number, s: number, base = 0) => Float64Array.from(x, (v) => base + h * Math.exp(-0.5 * ((v - c) / s) ** 2));

describe('peaks are peaks, dips are dips', () => {
  // A dip 15σ deep and a peak 15σ high on seeded noise: looking for peaks never lists a negative height, and the
  // other way round (our rule: a detected row's height above its local baseline must be positive).
  const rng = makeRng(3);
  const x = grid(2000);
  const y = Float64Array.from(x, (v) => 15 * Math.exp(-0.5 * ((v - 500) / 6) ** 2) - 15 * Math.exp(-0.5 * ((v - 1500) / 6) ** 2) + rng.normal());
  it('peaks: only positive heights, and the dip at 1500 is not listed', () => {
    const p = detectPeaks(x, y, defaultPeakOptions(1));
    expect(p.every((q) => q.height > 0)).toBe(true);
    expect(p.some((q) => Math.abs(q.x - 500) < 3 && q.flag === 'quantifiable')).toBe(true);
    expect(p.some((q) => Math.abs(q.x - 1500) < 10 && q.flag !== 'below-detection')).toBe(false);
  });
  it('dips: only negative heights, and the peak at 500 is not listed', () => {
    const p = detectPeaks(x, y, { ...defaultPeakOptions(1), negative: true });
    expect(p.every((q) => q.height < 0)).toBe(true);
    expect(p.some((q) => Math.abs(q.x - 1500) < 3 && q.flag === 'quantifiable')).toBe(true);
    expect(p.some((q) => Math.abs(q.x - 500) < 10 && q.flag !== 'below-detection')).toBe(false);
  });
});

describe('marks', () => {
  it('thinly sampled: fewer than 5 samples across the half-height width (and only then)', () => {
    const x = grid(400);
    const y = Float64Array.from(x, (v) => gauss(x, 100, 10, 1.2)[v] + gauss(x, 300, 10, 4)[v]); // FWHM 2.8 and 9.4 samples
    const p = detectPeaks(x, y, { ...defaultPeakOptions(0.01), minProminence: 0.1 });
    const near = (c: number) => p.find((q) => Math.abs(q.x - c) < 1)!;
    expect(near(100).fwhmPoints).toBeLessThan(5);
    expect(near(100).marks).toContain('thinly-sampled');
    expect(near(300).marks).not.toContain('thinly-sampled');
  });

  it('possibly saturated: a top flat for 3 samples at the trace\'s largest value; on the raw trace when smoothing rounded it', () => {
    const x = grid(400);
    const clean = gauss(x, 200, 12, 6);
    const clipped = Float64Array.from(clean, (v) => Math.min(v, 10)); // a detector that stops at 10
    const second = Float64Array.from(clipped, (v, i) => v + 5 * Math.exp(-0.5 * ((i - 80) / 6) ** 2));
    const p = detectPeaks(x, second, { ...defaultPeakOptions(0.01), minProminence: 0.1 });
    expect(p.find((q) => Math.abs(q.x - 200) < 2)!.marks).toContain('possibly-saturated');
    expect(p.find((q) => Math.abs(q.x - 80) < 2)!.marks).not.toContain('possibly-saturated');
    // After a 9-point average the top is round; the mark comes from the raw trace under the peak's half height.
    const smooth = movingAverage(second, 9);
    const ps = detectPeaks(x, smooth, { ...defaultPeakOptions(0.01), minProminence: 0.1 });
    expect(ps.find((q) => Math.abs(q.x - 200) < 2)!.marks).not.toContain('possibly-saturated');
    const marked = markSaturatedOnRaw(ps, x, second, false);
    expect(marked.find((q) => Math.abs(q.x - 200) < 2)!.marks).toContain('possibly-saturated');
    expect(marked.find((q) => Math.abs(q.x - 80) < 2)!.marks).not.toContain('possibly-saturated');
  });

  it('appears only after processing: the demo spike after a 3-point average, and none of the demo\'s real peaks', () => {
    // The demo (invented, scripts/make-demo.mjs) has a one-sample spike 40 noise SD high at 10.00 min.
    const loaded = loadFile(new Uint8Array(readFileSync('public/demo/demo-sample.csv')), 'demo-sample.csv');
    if (!loaded.ok) throw new Error('demo');
    const t = loaded.traces[0];
    const truth = JSON.parse(readFileSync('public/demo/demo-truth.json', 'utf8')) as { spike: { x: number }; peaks: { centre: number; trueSn: number }[] };
    const sigmaOf = (y: Float64Array) => { const r = noiseRms(t.x, y, 10.2, 12); if (!r.ok) throw new Error(r.message); return r.sigma; };
    const raw = detectPeaks(t.x, t.y, defaultPeakOptions(sigmaOf(t.y), 0.01));
    const ma3 = movingAverage(t.y, 3);
    const marked = markAppearsOnlyAfterProcessing(detectPeaks(t.x, ma3, defaultPeakOptions(sigmaOf(ma3), 0.01)), raw, 0.01);
    const spike = marked.find((q) => Math.abs(q.x - truth.spike.x) < 0.02)!;
    expect(spike).toBeDefined();
    expect(spike.flag).toBe('quantifiable'); // the S/N 27: the mark is what tells it apart
    expect(spike.marks).toContain('appears-only-after-processing');
    expect(raw.some((q) => Math.abs(q.x - truth.spike.x) < 0.02)).toBe(false); // one sample wide on the raw trace
    for (const tp of truth.peaks.filter((q) => q.trueSn >= 10)) {
      expect(marked.find((q) => Math.abs(q.x - tp.centre) < 0.03)!.marks, `${tp.centre}`).not.toContain('appears-only-after-processing');
    }
  });
});
