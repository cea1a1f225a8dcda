/**
 * Filtering in the frequency domain: a low-pass filter and a notch for
 * periodic interference such as mains hum, both with raised-cosine
 * transitions.
 *
 * How the ends and lengths that are not powers of two are handled: the
 * trace is extended at each end by its point reflection (2·y₀ − y_k, the
 * "odd" padding SciPy's filtfilt uses) until the whole is the next power of
 * two at least twice the trace length; past n − 1 reflected points the last
 * value is held. The reflection continues both value and slope through the
 * ends, so slow trends and the interference itself run on smoothly and the
 * filter sees no step there; the one jump, where the two extensions meet on
 * wrapping round, lies at least n/2 points away from the data. Padding with
 * zeros instead would put a step right beside the data, and an exact-length
 * transform (Bluestein) of the extension costs about six times as much for
 * the same result. A plain mirror extension (d c b a | a b c d) was tried
 * and left about three times more interference within the first quarter
 * second of a 3 s trace carrying 50 Hz hum.
 */
import { dft, nextPowerOfTwo, powerSpectrum } from '../numeric/fft.ts';
import { meanStep } from '../numeric/interpolate.ts';
import { thinTogether } from '../numeric/decimate.ts';
import type { Signal, StepDefinition, StepOutput } from './types.ts';

export { powerSpectrum };

/** Runs of frequency bins the spectra of the step's figure are thinned to (see {@link thinTogether}). */
export const SPECTRUM_GROUPS = 1024;

/** Gain as a function of frequency (cycles per x-unit, ≥ 0). */
export type FrequencyResponse = (f: number) => number;

/**
 * Low-pass gain: 1 below fc·(1 − t/2), 0 above fc·(1 + t/2), and a
 * raised-cosine (half a cosine period) in between, 0.5 at fc.
 * @param cutoff fc in cycles per x-unit (> 0).
 * @param transition t, the transition band width as a ratio of fc (0 < t ≤ 1).
 */
export function lowPassResponse(cutoff: number, transition: number): FrequencyResponse {
  if (!(cutoff > 0) || !(transition > 0 && transition <= 1)) {
    throw new RangeError(`The cutoff must be positive and the transition between 0 and 1 (got ${cutoff}, ${transition}).`);
  }
  const f1 = cutoff * (1 - transition / 2);
  const f2 = cutoff * (1 + transition / 2);
  return (f) => (f <= f1 ? 1 : f >= f2 ? 0 : 0.5 * (1 + Math.cos((Math.PI * (f - f1)) / (f2 - f1))));
}

/**
 * Notch gain: 0 within ±width/2 of centre·k for k = 1…harmonics, rising to 1
 * by a raised cosine over a further transition·width on each side, 1
 * elsewhere; the notches multiply.
 * @param centre fundamental in cycles per x-unit (> 0).
 * @param width full width of the zero band in cycles per x-unit (> 0).
 * @param transition taper on each side as a ratio of width (0 < t ≤ 1).
 * @param harmonics how many multiples of centre to remove (≥ 1).
 */
export function notchResponse(centre: number, width: number, transition: number, harmonics = 1): FrequencyResponse {
  if (!(centre > 0 && width > 0) || !(transition > 0 && transition <= 1) || !(Number.isInteger(harmonics) && harmonics >= 1)) {
    throw new RangeError(`Bad notch: centre ${centre}, width ${width}, transition ${transition}, harmonics ${harmonics}.`);
  }
  const half = width / 2;
  const taper = transition * width;
  return (f) => {
    let g = 1;
    for (let k = 1; k <= harmonics; k++) {
      const d = Math.abs(f - k * centre);
      if (d <= half) return 0;
      if (d < half + taper) g *= 0.5 * (1 - Math.cos((Math.PI * (d - half)) / taper));
    }
    return g;
  };
}

/**
 * Apply a real, zero-phase frequency response to evenly spaced samples.
 * The data are extended at both ends by point reflection to a power of two
 * at least 2n long (see the file comment), so nothing wraps around from one
 * end to the other. Interference that the
 * response removes still leaves a decaying remnant within about
 * 1/(band width) x-units of each end. O(n log n).
 * @param y samples (not changed), n ≥ 2.
 * @param dx sample spacing in x-units (> 0).
 * @param response gain at each frequency in cycles per x-unit.
 * @returns new filtered samples, same length.
 * @throws RangeError for fewer than 2 samples or a bad spacing.
 */
export function frequencyFilter(y: Float64Array, dx: number, response: FrequencyResponse): Float64Array {
  const n = y.length;
  if (n < 2) throw new RangeError('Frequency filtering needs at least 2 samples.');
  if (!(Number.isFinite(dx) && dx > 0)) throw new RangeError(`The sample spacing must be a positive number (got ${dx}).`);
  const m = nextPowerOfTwo(2 * n);
  const pad = Math.floor((m - n) / 2);
  const re = new Float64Array(m);
  for (let i = 0; i < n; i++) re[pad + i] = y[i];
  // Left extension occupies re[0..pad), right extension re[pad+n..m).
  for (let k = 1; k <= pad; k++) re[pad - k] = 2 * y[0] - y[Math.min(k, n - 1)];
  for (let k = 1; k <= m - pad - n; k++) re[pad + n - 1 + k] = 2 * y[n - 1] - y[Math.max(n - 1 - k, 0)];
  const spec = dft(re, new Float64Array(m));
  for (let k = 0; k < m; k++) {
    const kk = k <= m / 2 ? k : m - k;
    const g = response(kk / (m * dx));
    spec.re[k] *= g;
    spec.im[k] *= g;
  }
  const back = dft(spec.re, spec.im, true);
  return back.re.slice(pad, pad + n);
}

export type FrequencyFilterParams = {
  kind: 'low-pass' | 'notch';
  /** Low-pass cutoff (gain 0.5), in the unit chosen by cutoffUnit. */
  cutoff: number;
  cutoffUnit: 'per-x-unit' | 'nyquist-fraction';
  /** Notch: frequency to remove, cycles per x-unit. */
  centre: number;
  /** Notch: full width of the removed band, cycles per x-unit. */
  width: number;
  /** Notch: also remove 2×, 3×, … the centre frequency up to this many multiples. */
  harmonics: number;
  /** Low-pass: width of the smooth change of gain as a ratio of the cutoff. */
  transition: number;
  /** Notch: width of the smooth change of gain on each side as a ratio of the notch width. */
  notchTaper: number;
};

function nyquist(x: Float64Array): number {
  return 1 / (2 * meanStep(x));
}

function cutoffPerX(params: FrequencyFilterParams, x: Float64Array): number {
  return params.cutoffUnit === 'nyquist-fraction' ? params.cutoff * nyquist(x) : params.cutoff;
}

function bad(v: unknown): boolean {
  return typeof v !== 'number' || !Number.isFinite(v);
}

/** The frequency-filter step. */
export const frequencyFilterStep: StepDefinition<FrequencyFilterParams> = {
  id: 'frequency-filter',
  linear: true,
  label: 'Frequency filter',
  summary:
    'Takes the trace apart into sine waves, turns down the frequencies chosen and puts it back together: a low-pass keeps slow changes and removes fast noise, a notch removes one narrow band such as mains hum at 50 or 60 Hz and its multiples. ' +
    'It helps when the interference or noise sits at frequencies well away from those of the peaks (see the spectrum before and after). ' +
    'Peaks narrower than about one period of the cutoff are lowered and broadened, and sharp cut-offs ring (ripples beside steep edges and peaks), which is why the gain changes smoothly over a transition band.',
  params: [
    {
      key: 'kind', label: 'Filter', kind: 'choice', unit: 'none',
      choices: [
        { value: 'low-pass', label: 'low-pass (keep slow changes)' },
        { value: 'notch', label: 'notch (remove one frequency)' },
      ],
    },
    {
      key: 'cutoff', label: 'Cutoff', kind: 'number', unit: 'cycles per x-unit', min: 0, max: 1e12, log: true,
      help: 'Low-pass: frequency where the gain has fallen to one half, in cycles per x-unit, or as a fraction of the highest frequency the sampling can show (half the sampling rate), as chosen below.',
    },
    {
      key: 'cutoffUnit', label: 'Cutoff given as', kind: 'choice', unit: 'none',
      choices: [
        { value: 'nyquist-fraction', label: 'fraction of half the sampling rate' },
        { value: 'per-x-unit', label: 'cycles per x-unit' },
      ],
    },
    {
      key: 'centre', label: 'Notch frequency', kind: 'number', unit: 'cycles per x-unit', min: 0, max: 1e12,
      help: 'Notch: frequency to remove, in cycles per x-unit (50 for 50 Hz hum when x is in seconds; 3000 when x is in minutes).',
    },
    {
      key: 'width', label: 'Notch width', kind: 'number', unit: 'cycles per x-unit', min: 0, max: 1e12,
      help: 'Notch: full width of the band removed completely, in cycles per x-unit.',
    },
    {
      key: 'harmonics', label: 'Multiples removed', kind: 'int', unit: 'count', min: 1, max: 20,
      help: 'Notch: 1 removes only the notch frequency; 3 also removes twice and three times it.',
    },
    {
      key: 'transition', label: 'Low-pass transition', kind: 'number', unit: 'ratio', min: 0.01, max: 1,
      help: 'Low-pass: width of the smooth change of gain as a ratio of the cutoff (0.3 runs from 0.85 to 1.15 times the cutoff). Smaller is sharper but rings more.',
    },
    {
      key: 'notchTaper', label: 'Notch taper', kind: 'number', unit: 'ratio', min: 0.01, max: 1,
      help: 'Notch: width of the smooth change of gain on each side of the removed band, as a ratio of the notch width. Smaller is sharper but rings longer.',
    },
  ],
  defaults: { kind: 'low-pass', cutoff: 0.2, cutoffUnit: 'nyquist-fraction', centre: 50, width: 2, harmonics: 1, transition: 0.3, notchTaper: 1 },
  needsEvenSpacing: true,
  validate(params, input) {
    const ny = nyquist(input.x);
    if (params.kind === 'low-pass') {
      if (bad(params.transition) || params.transition < 0.01 || params.transition > 1) {
        return `The low-pass transition must be a ratio from 0.01 to 1 (got ${params.transition}).`;
      }
      if (bad(params.cutoff) || params.cutoff <= 0) return `The cutoff must be a positive number (got ${params.cutoff}).`;
      if (params.cutoffUnit === 'nyquist-fraction') {
        if (params.cutoff >= 1) return `As a fraction of half the sampling rate the cutoff must be below 1 (got ${params.cutoff}).`;
      } else if (params.cutoffUnit === 'per-x-unit') {
        if (params.cutoff >= ny) {
          return `The cutoff (${params.cutoff} cycles per x-unit) must be below half the sampling rate, ${ny.toPrecision(4)} cycles per x-unit.`;
        }
      } else return `Unknown cutoff unit "${String(params.cutoffUnit)}".`;
      return null;
    }
    if (params.kind === 'notch') {
      if (bad(params.centre) || params.centre <= 0) return `The notch frequency must be a positive number (got ${params.centre}).`;
      if (params.centre >= ny) {
        return `The notch frequency (${params.centre}) must be below half the sampling rate, ${ny.toPrecision(4)} cycles per x-unit; this trace cannot show it.`;
      }
      if (bad(params.width) || params.width <= 0) return `The notch width must be a positive number (got ${params.width}).`;
      if (bad(params.notchTaper) || params.notchTaper < 0.01 || params.notchTaper > 1) {
        return `The notch taper must be a ratio from 0.01 to 1 (got ${params.notchTaper}).`;
      }
      if (params.width * (1 + 2 * params.notchTaper) >= 2 * params.centre) {
        return `The notch (width ${params.width} plus tapers) would reach zero frequency and remove the trace's level; make it narrower than ${(2 * params.centre / (1 + 2 * params.notchTaper)).toPrecision(3)}.`;
      }
      const h = params.harmonics;
      if (bad(h) || !Number.isInteger(h) || h < 1 || h > 20) return `The number of multiples must be a whole number from 1 to 20 (got ${h}).`;
      return null;
    }
    return `Unknown filter "${String(params.kind)}"; choose low-pass or notch.`;
  },
  apply(input: Signal, params): StepOutput {
    const dx = meanStep(input.x);
    const n = input.y.length;
    const resolution = 1 / (n * dx);
    const notes: string[] = [];
    let response: FrequencyResponse;
    if (params.kind === 'low-pass') {
      const fc = cutoffPerX(params, input.x);
      response = lowPassResponse(fc, params.transition);
      notes.push(
        `Low-pass: everything below ${(fc * (1 - params.transition / 2)).toPrecision(4)} kept, everything above ${(fc * (1 + params.transition / 2)).toPrecision(4)} cycles per x-unit removed, smooth change between.`,
      );
    } else {
      const ny = 1 / (2 * dx);
      const count = Math.max(1, Math.min(params.harmonics, Math.floor(ny / params.centre)));
      response = notchResponse(params.centre, params.width, params.notchTaper, count);
      notes.push(`Notch: removed ${params.centre} ± ${params.width / 2} cycles per x-unit${count > 1 ? ` and ${count - 1} multiple(s)` : ''}.`);
      if (count < params.harmonics) notes.push(`Only ${count} multiple(s) lie below half the sampling rate; the rest were skipped.`);
      if (params.width < 2 * resolution) {
        notes.push(`The notch is narrower than two frequency steps of this trace (${resolution.toPrecision(3)} cycles per x-unit each); it may miss the interference.`);
      }
      notes.push(`Within about ${(1 / params.width).toPrecision(3)} x-units of each end (1 / notch width) some of the interference can remain.`);
    }
    const y = frequencyFilter(input.y, dx, response);
    const before = powerSpectrum(input.y, dx);
    const after = powerSpectrum(y, dx);
    let pb = 0;
    let pa = 0;
    for (let k = 1; k < before.power.length; k++) {
      pb += before.power[k];
      pa += after.power[k];
    }
    notes.push('Near each end the filter treats the trace as continuing smoothly (point reflection); what it removes may leave a small decaying remnant there.');
    // The spectra are for the step's small figure (a few hundred columns): a long trace's are kept as the
    // extremes of 1,024 runs of bins (issue 16: 500,000 bins each held 12 MB in the cache and again on the page).
    const shown = thinTogether(before.freq, before.power, after.power, SPECTRUM_GROUPS);
    if (shown.thinned) notes.push(`The spectra shown keep the lowest and highest power of each of ${SPECTRUM_GROUPS.toLocaleString('en-US')} runs of frequencies (${before.freq.length.toLocaleString('en-US')} in all); the filter itself used every one.`);
    return {
      x: Float64Array.from(input.x),
      y,
      notes,
      extra: { spectrumFreq: shown.x, spectrumBefore: shown.a, spectrumAfter: shown.b },
      figures: { varianceKeptRatio: pb > 0 ? pa / pb : 1 },
    };
  },
};
