/**
 * How many peaks would pure noise give? For a trace of n points, its
 * noise's correlation and the current thresholds, the expected count of
 * noise-only rows at or above the detection and quantitation limits.
 *
 * The published counts do not fit our definition of height: for
 * independent samples the number of local maxima standing u·σ above the
 * mean is n·∫ᵤ^∞ φ(x)Φ(x)² dx (1,348 per 10⁶ points at u = 3), and Rice's
 * formula gives the same for a smooth correlated process, but both count
 * heights above the true mean, while the table measures each bump above its
 * own local baseline (peak-bounds.ts), keeps only bumps at least the
 * smallest width wide, and drops wiggles riding on bigger bumps. So the
 * count is simulated: seeded Gaussian noise with σ = 1 and the given
 * correlation goes through the same detector with the same thresholds (in
 * units of σ and samples), and the rate found is scaled to n points. The
 * definition is checked against an independent Python simulation of the
 * stated rules (test/reference/noise_bumps.py).
 */
import { dft } from '../numeric/fft.ts';
import { makeRng } from '../numeric/random.ts';
import { detectPeaksStepwise } from './peak-table.ts';
import type { PeakOptions } from './peak-types.ts';
import type { Stepwise } from '../analysis/pause.ts';

/** The expected count of noise-only rows, with how it was obtained. */
export interface NoiseBumpCount {
  /** Points of the trace the count is for. */
  readonly points: number;
  /** Expected rows of pure noise of that length at or above the detection limit. */
  readonly aboveDetection: number;
  /** The same at or above the quantitation limit (0 when none was seen: see `largestSnr`). */
  readonly aboveQuantitation: number;
  readonly limits: { readonly detection: number; readonly quantitation: number };
  /** Noise simulated (points) and rows counted in it. */
  readonly simulatedPoints: number;
  readonly countedAboveDetection: number;
  readonly countedAboveQuantitation: number;
  /** Largest S/N of a noise-only row in the simulation. */
  readonly largestSnr: number;
  /** S/N of the simulated noise-only rows at or above the detection limit, largest first. */
  readonly snrs: readonly number[];
  /**
   * The S/N that pure noise of this length reaches about once: the expected
   * count at or above it is one. Null when even at the detection limit it is
   * under one; the largest simulated S/N when the trace is longer than the
   * simulation (the true figure is then a little higher).
   */
  readonly oneBumpSnr: number | null;
  /** Lags of noise correlation used (0 = white). */
  readonly correlationLags: number;
  /** One sentence: what was simulated. */
  readonly method: string;
}

/** Simulated in chunks of this many points... */
const CHUNK = 1 << 15;
/** ...until this many rows at or above the detection limit were counted (about 5 % sampling error)... */
const ENOUGH = 400;
/** ...or 16 times the trace's length were simulated (at least one chunk, at most this many points). */
const MOST = 1 << 20;
const SEED = 0x5eed_b0b5;

/** Seeded Gaussian noise of unit variance with autocorrelation ρ (lags 0..K, zero beyond), circular. */
export function correlatedNoise(length: number, rho: ArrayLike<number> | undefined, seed: number): Float64Array {
  const rng = makeRng(seed);
  const w = new Float64Array(length);
  for (let i = 0; i < length; i++) w[i] = rng.normal();
  if (!rho || rho.length < 2) return w;
  // Spectral synthesis: the power spectrum of ρ (clipped at 0 where a short, estimated ρ makes it negative)
  // shapes the spectrum of white noise; the result has circular autocorrelation ρ and variance ρ₀ = 1.
  const K = Math.min(rho.length - 1, (length >> 1) - 1);
  const amp = new Float64Array(length);
  for (let k = 0; k < length; k++) {
    let s = 1;
    for (let m = 1; m <= K; m++) s += 2 * rho[m] * Math.cos((2 * Math.PI * k * m) / length);
    amp[k] = Math.sqrt(Math.max(0, s));
  }
  const W = dft(w, new Float64Array(length));
  for (let k = 0; k < length; k++) { W.re[k] *= amp[k]; W.im[k] *= amp[k]; }
  return dft(W.re, W.im, true).re;
}

const cache = new Map<string, Omit<NoiseBumpCount, 'points' | 'aboveDetection' | 'aboveQuantitation' | 'oneBumpSnr'>>();

/**
 * Expected number of noise-only rows at or above the limits for a trace of
 * `points` samples with mean spacing `dx` (x-units), measured with
 * `options` (thresholds in y- and x-units; σ = options.noiseSigma), whose
 * noise has autocorrelation `correlation` (lags 0, 1, …; omitted = white).
 * Cached per thresholds and correlation; the same inputs always give the
 * same number (seeded).
 * @throws RangeError unless points ≥ 1, dx > 0 and σ > 0.
 */
export function expectedNoiseBumps(points: number, dx: number, options: PeakOptions, correlation?: ArrayLike<number>): NoiseBumpCount {
  const steps = expectedNoiseBumpsStepwise(points, dx, options, correlation);
  for (;;) {
    const r = steps.next();
    if (r.done) return r.value;
  }
}

/**
 * {@link expectedNoiseBumps} in steps: it pauses inside the detection of each simulated chunk
 * (detectPeaksStepwise), so the worker can stop it for a newer request; the cache is filled only when it ends.
 */
export function* expectedNoiseBumpsStepwise(points: number, dx: number, options: PeakOptions, correlation?: ArrayLike<number>): Stepwise<NoiseBumpCount> {
  if (!(points >= 1) || !(dx > 0) || !(options.noiseSigma > 0)) {
    throw new RangeError('The expected count of noise bumps needs a trace length, a positive sample spacing and a positive noise σ.');
  }
  const sigma = options.noiseSigma;
  // Rounded so that nearly equal stacks share one simulation.
  const rho = correlation && correlation.length > 1 ? Array.from(correlation, (v) => Math.round(v * 100) / 100) : [];
  while (rho.length > 1 && rho[rho.length - 1] === 0) rho.pop();
  const sim: PeakOptions = {
    minProminence: options.minProminence / sigma,
    minSnr: options.minSnr,
    minWidth: options.minWidth / dx,
    minSeparation: options.minSeparation / dx,
    noiseSigma: 1,
    noiseCorrelation: rho.length > 1 ? rho : undefined,
    snrDefinition: options.snrDefinition,
    pharmacopoeialMultiplier: options.pharmacopoeialMultiplier,
    split: options.split,
    limits: options.limits,
  };
  const target = Math.min(MOST, Math.max(CHUNK, 16 * points));
  const key = JSON.stringify([sim, target]);
  let hit = cache.get(key);
  if (!hit) {
    let simulated = 0, dl = 0, ql = 0, largest = 0;
    const snrs: number[] = [];
    for (let chunk = 0; simulated < target && dl < ENOUGH; chunk++) {
      const y = correlatedNoise(CHUNK, sim.noiseCorrelation, (SEED + chunk * 0x9e3779b9) >>> 0);
      const x = new Float64Array(CHUNK);
      for (let i = 0; i < CHUNK; i++) x[i] = i;
      for (const p of yield* detectPeaksStepwise(x, y, sim)) {
        const s = p.snr;
        if (s === null) continue;
        if (s >= sim.limits.detection) { dl++; snrs.push(s); }
        if (s >= sim.limits.quantitation) ql++;
        if (s > largest) largest = s;
      }
      simulated += CHUNK;
    }
    const lags = rho.length > 1 ? rho.length - 1 : 0;
    hit = {
      snrs: snrs.sort((a, b) => b - a),
      limits: { ...options.limits }, simulatedPoints: simulated, countedAboveDetection: dl, countedAboveQuantitation: ql, largestSnr: largest, correlationLags: lags,
      method: `Simulated: ${simulated.toLocaleString('en-US')} points of seeded Gaussian noise${lags ? ` with the measured correlation (${lags} lag${lags === 1 ? '' : 's'})` : ' (white)'} through the same peak detection and thresholds; ${dl} rows at S/N ≥ ${options.limits.detection}, ${ql} at S/N ≥ ${options.limits.quantitation}, largest S/N ${largest.toFixed(2)}.`,
    };
    if (cache.size >= 16) cache.delete(cache.keys().next().value as string);
    cache.set(key, hit);
  }
  const scale = points / hit.simulatedPoints;
  // One expected bump at or above u means hit.simulatedPoints / points simulated rows at or above it.
  const rank = hit.simulatedPoints / points;
  let oneBumpSnr: number | null;
  if (hit.snrs.length === 0 || rank > hit.snrs.length) oneBumpSnr = null;
  else if (rank <= 1) oneBumpSnr = hit.snrs[0];
  else {
    const k = Math.floor(rank) - 1, f = rank - Math.floor(rank);
    oneBumpSnr = k + 1 < hit.snrs.length ? hit.snrs[k] + f * (hit.snrs[k + 1] - hit.snrs[k]) : hit.snrs[k];
  }
  return { ...hit, points, aboveDetection: hit.countedAboveDetection * scale, aboveQuantitation: hit.countedAboveQuantitation * scale, oneBumpSnr };
}

/**
 * The sentence the page and the exports show beside the counts, e.g.
 * "Pure noise of this length (100,000 points) would give about 62 bumps at
 * or above S/N 3, and far below one at or above S/N 10 (…)"
 */
export function noiseBumpSentence(c: NoiseBumpCount): string {
  const about = (v: number): string => {
    if (v >= 10) return `about ${Math.round(v).toLocaleString('en-US')} bumps`;
    if (v >= 1.05) return `about ${v.toFixed(1).replace(/\.0$/, '')} bumps`;
    if (v >= 0.95) return 'about one bump';
    if (v >= 0.05) return `about ${v.toFixed(2)} bumps (on average)`;
    return 'far below one bump';
  };
  // Noise-bump S/N falls off like a Gaussian tail: when the largest of many simulated bumps is well under the
  // quantitation limit, the expected count there is far below one.
  const q = c.countedAboveQuantitation === 0
    ? (c.largestSnr < 0.7 * c.limits.quantitation
      ? `far below one at or above S/N ${c.limits.quantitation} (the largest of the simulated bumps reached S/N ${c.largestSnr.toFixed(1)})`
      : `none at or above S/N ${c.limits.quantitation} in the simulation (the largest reached S/N ${c.largestSnr.toFixed(1)})`)
    : `${about(c.aboveQuantitation)} at or above S/N ${c.limits.quantitation}`;
  return `Pure noise of this length (${c.points.toLocaleString('en-US')} points) would give ${about(c.aboveDetection)} at or above S/N ${c.limits.detection}, and ${q}.`;
}
