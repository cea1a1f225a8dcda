// One fit job as the page asks for it (src/core/measure/fit/job.ts). Sources: a
// noiseless Gaussian on a straight baseline is recovered exactly by least squares
// (the model is exact); FWHM = 2√(2 ln 2)·σ, area = σ√(2π)·h (handbook values);
// the settings checks against the module's own contract.
import { describe, expect, it } from 'vitest';
import { fitSettingsProblem, runFitJob, type FitSettings } from '../../../../src/core/measure/fit/job.ts';
import { FWHM_PER_SIGMA } from '../../../../src/core/measure/fit/shapes.ts';
import { makeRng } from '../../../../src/core/numeric/random.ts';

const x = Float64Array.from({ length: 400 }, (_, i) => i * 0.025);
const sigma = 0.3, h = 2, c = 5.1;
const clean = Float64Array.from(x, (v) => 0.5 + 0.02 * v + h * Math.exp(-0.5 * ((v - c) / sigma) ** 2));
const settings: FitSettings = { from: 2, to: 8, on: 'raw', shape: 'gaussian', baseline: 'line', maxPeaks: 1 };

describe('fitSettingsProblem', () => {
  it('names each mistake a user can make and passes good settings', () => {
    expect(fitSettingsProblem(settings)).toBeNull();
    expect(fitSettingsProblem({ ...settings, from: NaN })).toMatch(/Mark a region first/);
    expect(fitSettingsProblem({ ...settings, from: 8, to: 2 })).toMatch(/smaller to a larger x/);
    expect(fitSettingsProblem({ ...settings, shape: 'triangle' as never })).toMatch(/Unknown peak shape/);
    expect(fitSettingsProblem({ ...settings, baseline: 'cubic' as never })).toMatch(/Unknown baseline/);
    expect(fitSettingsProblem({ ...settings, maxPeaks: 5 })).toMatch(/1 to 4/);
    expect(fitSettingsProblem({ ...settings, maxPeaks: 0 })).toMatch(/1 to 4/);
  });
});

describe('runFitJob', () => {
  it('a noiseless Gaussian on a line: position, height, FWHM 2√(2 ln 2)σ and area σ√(2π)h recovered; inputs unchanged', () => {
    const y = Float64Array.from(clean);
    const out = runFitJob({ settings, raw: { label: 'raw', x, y } });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const p = out.result.fit.peaks[0];
    expect(out.result.count).toBe(1);
    expect(p.position.value).toBeCloseTo(c, 6);
    expect(p.height.value).toBeCloseTo(h, 6);
    expect(p.fwhm.value).toBeCloseTo(FWHM_PER_SIGMA * sigma, 6);
    expect(p.area.value).toBeCloseTo(sigma * Math.sqrt(2 * Math.PI) * h, 6);
    expect(out.result.statement).toBe('One Gaussian peak fitted; no larger count was tried.');
    expect(out.result.processing).toBeNull();
    expect(y).toEqual(clean);
  });

  it('fits the processed version when asked, and compares versions on the same grid; another grid gets a sentence instead', () => {
    const rng = makeRng(9);
    const raw = Float64Array.from(clean, (v) => v + 0.01 * rng.normal());
    const out = runFitJob({
      settings: { ...settings, on: 'processed', maxPeaks: 2 },
      raw: { label: 'raw', x, y: raw },
      processed: { label: 'current processing', x, y: clean },
      alternatives: [{ label: 'resampled', x: x.slice(0, 200), y: clean.slice(0, 200) }],
    });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.result.fittedLabel).toBe('current processing');
    expect(out.result.lead).toMatch(/^The fit on the current processing trace supports 1 Gaussian peak\./);
    const rows = out.result.processing!.rows;
    expect(rows.map((r) => r.label)).toEqual(['raw', 'current processing', 'resampled']);
    expect(rows[2].count).toBeNull();
    expect(rows[2].statement).toMatch(/x grid differs/);
  });

  it('bad settings come back as a message, not an exception', () => {
    const out = runFitJob({ settings: { ...settings, to: 1 }, raw: { label: 'raw', x, y: clean } });
    expect(out.ok).toBe(false);
  });
});
