// The demo's shoulder (invented data, scripts/make-demo.mjs; ground truth in public/demo/demo-truth.json):
// main peak at 6.0 min (σ 0.1, height 3 mAU) carrying a shoulder at 6.35 min (σ 0.05, height 0.22 mAU),
// noise SD 0.05 mAU, quadratic drift. Fitting the region on the raw trace must support two peaks and
// recover the truth within the reported standard errors (3 SE, about 99.7 % for a normal estimate).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { supportedPeakCount } from '../../../../src/core/measure/fit/count.ts';
import { chromatographicFigures } from '../../../../src/core/measure/figures.ts';
import { FWHM_PER_SIGMA, GAUSS_AREA } from '../../../../src/core/measure/fit/shapes.ts';

interface Truth {
  noiseSd: number;
  drift: { c0: number; c1: number; c2: number };
  peaks: { label: string; centre: number; height: number; sigma: number }[];
}
const truth = JSON.parse(readFileSync(new URL('../../../../public/demo/demo-truth.json', import.meta.url), 'utf8')) as Truth;

function readDemo(name: string): { x: Float64Array; y: Float64Array } {
  const xs: number[] = [];
  const ys: number[] = [];
  for (const line of readFileSync(new URL(`../../../../public/demo/${name}`, import.meta.url), 'utf8').split(/\r?\n/)) {
    const m = /^\s*(-?[\d.]+)\s*,\s*(-?[\d.]+)\s*$/.exec(line);
    if (m) {
      xs.push(Number(m[1]));
      ys.push(Number(m[2]));
    }
  }
  return { x: Float64Array.from(xs), y: Float64Array.from(ys) };
}

const { x, y } = readDemo('demo-sample.csv');
const main = truth.peaks.find((p) => p.centre === 6.0);
const shoulder = truth.peaks.find((p) => p.label === 'shoulder');

describe('the demo shoulder', () => {
  it('raw trace, region 5.4–6.9 min: two peaks supported, each within 3 SE of the truth', () => {
    expect(main && shoulder).toBeTruthy();
    if (!main || !shoulder) return;
    const out = supportedPeakCount(x, y, { from: 5.4, to: 6.9, baseline: 'quadratic' });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.result.count).toBe(2);
    const [a, b] = out.result.fit.peaks;
    for (const [fit, t] of [
      [a, main],
      [b, shoulder],
    ] as const) {
      expect(Math.abs(fit.position.value - t.centre)).toBeLessThan(3 * fit.position.se);
      expect(Math.abs(fit.height.value - t.height)).toBeLessThan(3 * fit.height.se);
      expect(Math.abs(fit.fwhm.value - t.sigma * FWHM_PER_SIGMA)).toBeLessThan(3 * fit.fwhm.se);
      expect(Math.abs(fit.area.value - t.height * t.sigma * FWHM_PER_SIGMA * GAUSS_AREA)).toBeLessThan(3 * fit.area.se);
    }
    expect(out.result.fit.assumptions.find((q) => q.name === 'independent residuals')?.held).toBe(true);
    // Correlation of the two areas (here +0.65: both share the curved baseline under them).
    expect(Math.abs(out.result.fit.areaCorrelation[1])).toBeLessThanOrEqual(1);
    expect(out.result.fit.areaCorrelation[1]).toBe(out.result.fit.areaCorrelation[2]);
  });
  it('the shoulder has no measurable width at 5 % on the trace: a neighbour cuts the level', () => {
    // Peak bounds and a straight baseline as the peak table would give them (here: drift at the bounds).
    const drift = (t: number) => truth.drift.c0 + truth.drift.c1 * t + truth.drift.c2 * t * t;
    const at = (t: number) => Math.round(t / 0.01);
    const line = (t0: number, t1: number) => ({ slope: (drift(t1) - drift(t0)) / (t1 - t0), intercept: drift(t0) - ((drift(t1) - drift(t0)) / (t1 - t0)) * t0 });
    const [m, s] = chromatographicFigures(x, y, [
      { start: at(5.4), end: at(6.27), baseline: line(5.4, 6.6) },
      { start: at(6.27), end: at(6.6), baseline: line(5.4, 6.6) },
    ]);
    expect(m.plates.status).toBe('ok');
    expect(s.tailing.status).toBe('not-measurable');
    expect(s.tailing.reason).toMatch(/neighbour cuts the level/);
  });
});
