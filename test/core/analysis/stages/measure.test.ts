// Stages 3 and 4 (src/core/analysis/stages/measure.ts): noise, then peaks with
// thresholds in multiples of σ. Sources: S/N = H/σ (ICH Q2(R1) §6); on seeded
// white noise of σ = 0.1 under a Gaussian of height 10, H/σ ≈ 100 (the noise
// estimate's sampling error, a few %, sets the tolerance).
import { describe, expect, it } from 'vitest';
import { measurePeaks, noiseOn, peaksOn } from '../../../../src/core/analysis/stages/measure.ts';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS } from '../../../../src/core/analysis/request.ts';
import { NOISE_SIGMA, synthetic } from '../fixture.ts';

const t = synthetic(3);

describe('measurePeaks on the raw trace', () => {
  it('finds both Gaussians; the tall one has S/N = H/σ ≈ 10/0.1 and is quantifiable', () => {
    const m = measurePeaks(t, t, DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, {}, null);
    expect(Math.abs(m.noise!.sigma.sigma / NOISE_SIGMA - 1)).toBeLessThan(0.08);
    const tall = m.peaks.find((p) => Math.abs(p.x - 7) < 0.05)!;
    const small = m.peaks.find((p) => Math.abs(p.x - 14) < 0.05)!;
    expect(tall).toBeDefined();
    expect(small).toBeDefined();
    expect(Math.abs(tall.snr! / (10 / NOISE_SIGMA) - 1)).toBeLessThan(0.1);
    expect(tall.flag).toBe('quantifiable');
    // Thresholds are multiples of the measured σ.
    expect(m.peakOptions!.minProminence).toBeCloseTo(DEFAULT_PEAK_SETTINGS.minProminenceSigma * m.noise!.sigma.sigma, 12);
    expect(m.peakOptions!.limits).toEqual({ detection: 3, quantitation: 10 });
  });

  it('raising the limits changes the flags, not the S/N', () => {
    const a = measurePeaks(t, t, DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, {}, null);
    const b = measurePeaks(t, t, DEFAULT_NOISE_SETTINGS, { ...DEFAULT_PEAK_SETTINGS, quantitationLimit: 1000 }, {}, null);
    const pa = a.peaks.find((p) => Math.abs(p.x - 7) < 0.05)!, pb = b.peaks.find((p) => Math.abs(p.x - 7) < 0.05)!;
    expect(pb.snr).toBe(pa.snr);
    expect(pb.flag).toBe('detectable');
  });

  it('excluded ranges drop the peaks inside them', () => {
    const m = measurePeaks(t, t, DEFAULT_NOISE_SETTINGS, { ...DEFAULT_PEAK_SETTINGS, excluded: [[13, 15]] }, {}, null);
    expect(m.peaks.some((p) => p.x > 13 && p.x < 15)).toBe(false);
    expect(m.peaks.some((p) => Math.abs(p.x - 7) < 0.05)).toBe(true);
  });
});

describe('what cannot be measured is said, not hidden', () => {
  it('fewer than 5 points: no noise, and a sentence instead of peaks', () => {
    const short = { x: Float64Array.of(0, 1, 2, 3), y: Float64Array.of(0, 1, 0, 1) };
    expect(noiseOn(short, short, DEFAULT_NOISE_SETTINGS, null)).toBeNull();
    expect(peaksOn(short, short, null, DEFAULT_PEAK_SETTINGS, {}, null).peakProblem).toMatch(/Fewer than 5 points/);
  });

  it('zero noise: S/N cannot be measured, and the sentence says why', () => {
    const flat = { x: Float64Array.from({ length: 50 }, (_, i) => i), y: new Float64Array(50).fill(2) };
    const m = measurePeaks(flat, flat, DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, {}, null);
    expect(m.peaks).toEqual([]);
    expect(m.peakProblem).toMatch(/noise is zero|not a finite number|could not/i);
  });
});
