// The S/N measures of one peak (src/core/measure/peak-snr.ts), called directly
// on small hand-made traces. Sources: ICH Q2(R1) (2005) §6 for the detection (3)
// and quantitation (10) limits; USP <621> / Ph. Eur. 2.2.46 for 2H/h, h the
// range (max − min) of the noise; the variance of the mean of L correlated
// samples, (σ²/L²)·Σ_{|k|<L}(L − |k|)ρ_k (any time-series text, from memory);
// the rest follows from the definitions and is computed by hand beside each check.
import { describe, expect, it } from 'vitest';
import { noiseModel, pharmacopoeialNoise, regionSnr, snrFlag, snrRms } from '../../../src/core/measure/peak-snr.ts';
import { defaultPeakOptions } from '../../../src/core/measure/peak-table.ts';
import { SIGMA_FLOOR_OF_SPAN } from '../../../src/core/measure/peak-types.ts';

const limits = { detection: 3, quantitation: 10 };

describe('snrFlag against the ICH Q2(R1) limits 3 and 10', () => {
  it('2.9 below detection, 3 detectable, 9.9 detectable, 10 quantifiable (a limit itself passes)', () => {
    expect(snrFlag(2.9, limits)).toBe('below-detection');
    expect(snrFlag(3, limits)).toBe('detectable');
    expect(snrFlag(9.9, limits)).toBe('detectable');
    expect(snrFlag(10, limits)).toBe('quantifiable');
    expect(snrFlag(1e6, limits)).toBe('quantifiable');
  });

  it('not measured for null, NaN and infinity; other limits are honoured (a lab using 2)', () => {
    expect(snrFlag(null, limits)).toBe('not-measured');
    expect(snrFlag(NaN, limits)).toBe('not-measured');
    expect(snrFlag(Infinity, limits)).toBe('not-measured');
    expect(snrFlag(2.5, { detection: 2, quantitation: 10 })).toBe('detectable');
  });
});

describe('snrRms = |H|/σ', () => {
  it('by hand: 12/4 = 3, a dip −12 gives 3 too; no noise means not measured', () => {
    expect(snrRms(12, 4)).toBe(3);
    expect(snrRms(-12, 4)).toBe(3);
    expect(snrRms(5, 0)).toBeNull();
  });
});

describe('regionSnr = mean/SD (n − 1) of the samples between the bounds', () => {
  it('by hand: 2, 4, 6 has mean 4 and SD 2, so 2; fewer than 3 samples or SD 0 give null', () => {
    const s = Float64Array.of(100, 2, 4, 6, 100);
    expect(regionSnr(s, 1, 3)).toBe(2);
    expect(regionSnr(s, 1, 2)).toBeNull();
    expect(regionSnr(Float64Array.of(5, 5, 5), 0, 2)).toBeNull();
  });
});

describe('noiseModel', () => {
  const s = Float64Array.from({ length: 50 }, (_, i) => (i === 20 ? 40 : i % 2));
  it('σ is the options\' σ everywhere without a profile; the rule floor is SIGMA_FLOOR_OF_SPAN × span', () => {
    const m = noiseModel(s, { ...defaultPeakOptions(0.5) });
    expect(m.sigmaAt(3)).toBe(0.5);
    expect(m.floor).toBe(SIGMA_FLOOR_OF_SPAN * 40);
    expect(m.ruleSigmaAt(3)).toBe(0.5);
    const z = noiseModel(s, { ...defaultPeakOptions(0) });
    expect(z.sigmaAt(3)).toBe(0);
    expect(z.ruleSigmaAt(3)).toBe(SIGMA_FLOOR_OF_SPAN * 40);
    // A constant trace has no span: the floor is the smallest positive number, never 0.
    expect(noiseModel(new Float64Array(10).fill(2), defaultPeakOptions(0)).floor).toBe(Number.MIN_VALUE);
  });

  it('box factor: 1/√L for white noise; with ρ = (1, 0.5) the L-point mean has variance (L + 2(L − 1)·0.5)/L² σ²', () => {
    const white = noiseModel(s, defaultPeakOptions(1));
    expect(white.boxFactor(1)).toBe(1);
    expect(white.boxFactor(9)).toBeCloseTo(1 / 3, 15);
    const corr = noiseModel(s, { ...defaultPeakOptions(1), noiseCorrelation: [1, 0.5] });
    for (const L of [2, 5, 17]) expect(corr.boxFactor(L)).toBeCloseTo(Math.sqrt((L + (L - 1)) / (L * L)), 14);
  });
});

describe('pharmacopoeialNoise: h = max − min of the noise', () => {
  it('on a blank: the range over multiplier × FWHM centred on the apex (USP <621>, Ph. Eur. 2.2.46)', () => {
    // Blank of period-4 pattern 0, 1, 0, −1 on x = 0…99: every window of ≥ 4 points has range 2.
    const bx = Float64Array.from({ length: 100 }, (_, i) => i);
    const by = Float64Array.from(bx, (v) => [0, 1, 0, -1][v % 4]);
    const o = { ...defaultPeakOptions(1), pharmacopoeialMultiplier: 5, pharmacopoeialNoise: { x: bx, y: by, fromBlank: true } };
    const r = pharmacopoeialNoise(bx, by, 50, 2, o, 50)!;
    expect(r.source).toBe('blank');
    expect(r.h).toBe(2);
    // Window 5 × 2 = 10 x-units centred on 50.
    expect(r.from).toBeGreaterThanOrEqual(45);
    expect(r.to).toBeLessThanOrEqual(55);
    expect(r.clipped).toBe(false);
    expect(pharmacopoeialNoise(bx, by, 50, 0, o, 50)).toBeNull();
  });

  it('on the trace itself: two stretches beyond 1.5 FWHM either side, residuals about one line, so a sloped baseline is not noise', () => {
    // y = 0.3·x + a peak of height 1 at 50 (FWHM 2) + a ±0.1 alternation; the residual range about the line is 0.2,
    // plus the peak's own tail at 1.5 FWHM ≈ 3.5σ (under 0.3 % of its height, the module's comment): 0.2 within 0.005.
    const x = Float64Array.from({ length: 101 }, (_, i) => i);
    const y = Float64Array.from(x, (v, i) => 0.3 * v + Math.exp(-0.5 * ((v - 50) / 0.85) ** 2) + (i % 2 ? 0.1 : -0.1));
    const o = { ...defaultPeakOptions(1), pharmacopoeialMultiplier: 5 };
    const r = pharmacopoeialNoise(x, y, 50, 2, o, 50)!;
    expect(r.source).toBe('trace itself');
    // Stretches from 50 − 3 − 5 = 42 to 47 and from 53 to 58 (gap 1.5·FWHM = 3, each stretch 5 wide).
    expect(r.from).toBe(42);
    expect(r.to).toBe(58);
    expect(r.points).toBe(12);
    expect(r.h).toBeCloseTo(0.2, 2);
    expect(r.h).toBeGreaterThanOrEqual(0.2 - 1e-12);
  });
});
