import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { dft } from '../../../src/core/numeric/fft.ts';
import {
  frequencyFilter,
  frequencyFilterStep,
  lowPassResponse,
  notchResponse,
  powerSpectrum,
  SPECTRUM_GROUPS,
} from '../../../src/core/steps/frequency-filter.ts';

interface Reference {
  numpy: string;
  signal: number[];
  rfftRe: number[];
  rfftIm: number[];
}
const ref = JSON.parse(readFileSync(new URL('../../reference/smoothing.json', import.meta.url), 'utf8')) as Reference;

function rms(a: ArrayLike<number>, from: number, to: number): number {
  let s = 0;
  for (let i = from; i < to; i++) s += a[i] * a[i];
  return Math.sqrt(s / (to - from));
}

describe('DFT of any length', () => {
  it(`matches numpy.fft.rfft for a 200-point signal (NumPy ${ref.numpy})`, () => {
    // numpy.fft.rfft values in test/reference/smoothing.json (make_smoothing.py); 200 is not a power of two (Bluestein path).
    const y = Float64Array.from(ref.signal);
    const X = dft(y, new Float64Array(y.length));
    const scale = Math.max(...ref.rfftRe.map(Math.abs));
    for (let k = 0; k < ref.rfftRe.length; k++) {
      expect(Math.abs(X.re[k] - ref.rfftRe[k])).toBeLessThan(1e-12 * scale);
      expect(Math.abs(X.im[k] - ref.rfftIm[k])).toBeLessThan(1e-12 * scale);
    }
  });

  it('power-of-two lengths (real and complex input) match the DFT definition', () => {
    // X[k] = Σ x[j]·exp(−2πi·jk/n), summed directly (definition of the DFT).
    for (const n of [2, 4, 64]) {
      const re = Float64Array.from({ length: n }, (_, i) => Math.cos(1.3 * i) + 0.2 * i);
      for (const im of [new Float64Array(n), Float64Array.from({ length: n }, (_, i) => Math.sin(0.7 * i))]) {
        const X = dft(re, im);
        for (let k = 0; k < n; k++) {
          let sr = 0;
          let si = 0;
          for (let j = 0; j < n; j++) {
            const a = (-2 * Math.PI * ((j * k) % n)) / n;
            sr += re[j] * Math.cos(a) - im[j] * Math.sin(a);
            si += re[j] * Math.sin(a) + im[j] * Math.cos(a);
          }
          expect(Math.abs(X.re[k] - sr)).toBeLessThan(1e-11);
          expect(Math.abs(X.im[k] - si)).toBeLessThan(1e-11);
        }
      }
    }
  });

  it('round trip returns the input for power-of-two and other lengths', () => {
    // Inverse DFT of the DFT is the identity (definition).
    for (const n of [2, 3, 7, 64, 1000, 4096]) {
      const y = Float64Array.from({ length: n }, (_, i) => Math.sin(0.37 * i) + 0.01 * i);
      const X = dft(y, new Float64Array(n));
      const back = dft(X.re, X.im, true);
      for (let i = 0; i < n; i++) expect(Math.abs(back.re[i] - y[i])).toBeLessThan(1e-12);
    }
  });

  it('power spectrum follows Parseval and numpy', () => {
    // Power per bin from numpy rfft: |X|²/n², doubled except at 0 and n/2; the sum equals mean(y²) (Parseval).
    const y = Float64Array.from(ref.signal);
    const n = y.length;
    const { freq, power } = powerSpectrum(y, 0.5);
    expect(freq.length).toBe(n / 2 + 1);
    expect(freq[1]).toBeCloseTo(1 / (n * 0.5), 14);
    let total = 0;
    for (let k = 0; k < power.length; k++) {
      const p = (ref.rfftRe[k] ** 2 + ref.rfftIm[k] ** 2) / (n * n);
      const want = k === 0 || k === n / 2 ? p : 2 * p;
      expect(Math.abs(power[k] - want)).toBeLessThan(1e-12 * Math.max(want, 1e-3));
      total += power[k];
    }
    let ms = 0;
    for (const v of y) ms += v * v;
    expect(total).toBeCloseTo(ms / n, 12);
  });
});

describe('frequencyFilter', () => {
  // Slow part: a 0.5 Hz sine plus a Gaussian peak of σ = 0.2 s; x in seconds, 1 kHz sampling, 3000 points (not a power of two).
  const n = 3000;
  const dx = 0.001;
  const slow = Float64Array.from({ length: n }, (_, i) => Math.sin(2 * Math.PI * 0.5 * i * dx) + 2 * Math.exp(-0.5 * ((i * dx - 1.4) / 0.2) ** 2));
  const hum = Float64Array.from({ length: n }, (_, i) => 0.8 * Math.sin(2 * Math.PI * 50 * i * dx + 0.3));

  it('a notch at 50 Hz removes the hum and leaves the slow signal', () => {
    // Design check (our own stated targets): the zero band covers 49–51 Hz with 2 Hz tapers and the slow signal has
    // almost no power there. Farther than 1/width = 0.5 s from the ends the hum left over must be < 1 % of its RMS;
    // over the whole trace, ends included, < 6 %. A sharp taper rings longer, so it must do worse near the ends.
    const y = slow.map((v, i) => v + hum[i]);
    const out = frequencyFilter(y, dx, notchResponse(50, 2, 1));
    expect(out.length).toBe(n);
    const err = out.map((v, i) => v - slow[i]);
    expect(rms(err, 500, n - 500)).toBeLessThan(0.01 * rms(hum, 500, n - 500));
    expect(rms(err, 0, n)).toBeLessThan(0.06 * rms(hum, 0, n));
    const sharp = frequencyFilter(y, dx, notchResponse(50, 2, 0.05)).map((v, i) => v - slow[i]);
    expect(rms(sharp, 500, 1000)).toBeGreaterThan(2 * rms(err, 500, 1000));
  });

  it('a low-pass keeps a slow sine and removes a fast one', () => {
    // Gain is 1 below 18 Hz and 0 above 22 Hz by construction; leftovers come from the mirror joins only.
    const fast = Float64Array.from({ length: n }, (_, i) => 0.5 * Math.sin(2 * Math.PI * 120 * i * dx));
    const slowSine = Float64Array.from({ length: n }, (_, i) => Math.sin(2 * Math.PI * 2 * i * dx));
    const y = slowSine.map((v, i) => v + fast[i]);
    const out = frequencyFilter(y, dx, lowPassResponse(20, 0.2));
    const err = out.map((v, i) => v - slowSine[i]);
    expect(rms(err, 200, n - 200)).toBeLessThan(0.01 * rms(fast, 200, n - 200));
  });

  it('works on power-of-two and odd lengths, keeps constants and the length', () => {
    for (const len of [5, 1024, 1023, 777]) {
      const c = new Float64Array(len).fill(-2.5);
      const out = frequencyFilter(c, 1, lowPassResponse(0.1, 0.5));
      expect(out.length).toBe(len);
      // The DC gain is 1, so a constant passes unchanged.
      for (const v of out) expect(Math.abs(v + 2.5)).toBeLessThan(1e-12);
      const nOut = frequencyFilter(c, 1, notchResponse(0.2, 0.02, 0.5, 2));
      for (const v of nOut) expect(Math.abs(v + 2.5)).toBeLessThan(1e-12);
    }
  });

  it('the responses have the stated shape', () => {
    // Raised cosine: 1 / 0.5 / 0 at the start, middle and end of the transition band (definition).
    const lp = lowPassResponse(10, 0.2);
    expect(lp(8.99)).toBe(1);
    expect(lp(10)).toBeCloseTo(0.5, 14);
    expect(lp(11)).toBe(0);
    const no = notchResponse(50, 2, 0.5, 3);
    expect(no(50)).toBe(0);
    expect(no(101)).toBe(0);
    expect(no(151.5)).toBeCloseTo(0.5, 14);
    expect(no(152)).toBe(1);
    expect(no(10)).toBe(1);
  });
});

describe('frequency-filter step', () => {
  const n = 1500;
  const x = Float64Array.from({ length: n }, (_, i) => i * 0.001);
  const y = x.map((t) => Math.exp(-0.5 * ((t - 0.7) / 0.05) ** 2) + 0.3 * Math.sin(2 * Math.PI * 60 * t));

  it('notch with spectra before and after for the page', () => {
    const p = { ...frequencyFilterStep.defaults, kind: 'notch' as const, centre: 60, width: 2 };
    expect(frequencyFilterStep.validate(p, { x, y }, {})).toBeNull();
    const out = frequencyFilterStep.apply({ x, y }, p, {});
    expect(out.y.length).toBe(n);
    const f = out.extra?.spectrumFreq;
    const before = out.extra?.spectrumBefore;
    const after = out.extra?.spectrumAfter;
    expect(f && before && after).toBeTruthy();
    // 60 Hz lies on bin 90 (1500 points at 1 ms: bins are 2/3 Hz apart); amplitude 0.3 gives power 0.045 before (A²/2).
    expect(f?.[90]).toBeCloseTo(60, 9);
    expect(before?.[90]).toBeCloseTo(0.045, 3);
    // Power left at 60 Hz comes only from the end remnants: require a cut by more than 100 (20 dB).
    expect(after?.[90]).toBeLessThan(0.045 * 1e-2);
  });

  it('a long trace: the spectra for the figure are thinned (said in a note), the 60 Hz line still stands out of them, the filter and its variance figure are untouched', () => {
    const m = 200_000;
    const xl = Float64Array.from({ length: m }, (_, i) => i * 0.001);
    const yl = xl.map((t) => Math.exp(-0.5 * ((t - 70) / 0.05) ** 2) + 0.3 * Math.sin(2 * Math.PI * 60 * t));
    const p = { ...frequencyFilterStep.defaults, kind: 'notch' as const, centre: 60, width: 2 };
    const out = frequencyFilterStep.apply({ x: xl, y: yl }, p, {});
    const f = out.extra!.spectrumFreq, before = out.extra!.spectrumBefore, after = out.extra!.spectrumAfter;
    expect(f.length).toBeLessThanOrEqual(1 + 4 * SPECTRUM_GROUPS);
    expect(out.notes.some((t) => t.includes(`each of ${SPECTRUM_GROUPS.toLocaleString('en-US')} runs of frequencies (100,001 in all)`))).toBe(true);
    // The full spectrum's 60 Hz bin (A²/2 = 0.045: the mean power of a sinusoid of amplitude A on a bin, closed form, from
    // memory; the same figure as the definition test above) is the largest away from zero frequency, so the thinned one keeps it.
    const at60 = f.findIndex((v) => Math.abs(v - 60) < 1e-9);
    expect(at60).toBeGreaterThan(0);
    expect(before[at60]).toBeCloseTo(0.045, 3);
    expect(after[at60]).toBeLessThan(0.045 * 1e-2);
    // The filter still works on the whole spectrum: the trace keeps its length and its variance figure is the
    // ratio of the full spectra's total power (which the 60 Hz line dominates: about 0.045 of 0.046 removed).
    expect(out.y.length).toBe(m);
    expect(out.figures!.varianceKeptRatio).toBeLessThan(0.1);
  });

  it('low-pass cutoff as a fraction of half the sampling rate equals the same cutoff in cycles per x-unit', () => {
    const a = frequencyFilterStep.apply({ x, y }, { ...frequencyFilterStep.defaults, cutoff: 0.04, cutoffUnit: 'nyquist-fraction' }, {});
    const b = frequencyFilterStep.apply({ x, y }, { ...frequencyFilterStep.defaults, cutoff: 20, cutoffUnit: 'per-x-unit' }, {});
    for (let i = 0; i < n; i++) expect(Math.abs(a.y[i] - b.y[i])).toBeLessThan(1e-12);
  });

  it('validate explains impossible settings', () => {
    const d = frequencyFilterStep.defaults;
    expect(frequencyFilterStep.validate({ ...d, cutoff: 1.2 }, { x, y }, {})).toMatch(/below 1/);
    expect(frequencyFilterStep.validate({ ...d, cutoff: 600, cutoffUnit: 'per-x-unit' }, { x, y }, {})).toMatch(/half the sampling rate/);
    expect(frequencyFilterStep.validate({ ...d, cutoff: NaN }, { x, y }, {})).toMatch(/positive number/);
    expect(frequencyFilterStep.validate({ ...d, kind: 'notch', centre: 700 }, { x, y }, {})).toMatch(/cannot show it/);
    expect(frequencyFilterStep.validate({ ...d, kind: 'notch', centre: 50, width: 40 }, { x, y }, {})).toMatch(/zero frequency/);
    expect(frequencyFilterStep.validate({ ...d, kind: 'notch', width: -1 }, { x, y }, {})).toMatch(/width/);
  });
});
