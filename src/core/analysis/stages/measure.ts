/**
 * Stages 3 and 4: noise on the measured trace, then peaks with thresholds in
 * multiples of that σ. Also used whole for the raw reference and each
 * alternative.
 */
import type { Signal, StepContext } from '../../steps/types.ts';
import { meanStep } from '../../numeric/interpolate.ts';
import { measureNoise, type NoiseReport, type NoiseSettings, type StackRun } from '../../measure/noise-report.ts';
import type { Peak, PeakDecisions, PeakOptions } from '../../measure/peak-types.ts';
import { applyPeakDecisions, defaultPeakOptions, detectPeaksStepwise } from '../../measure/peak-table.ts';
import { drain, type Stepwise } from '../pause.ts';
import type { PeakSettings } from '../request.ts';
import { withoutExcluded } from '../../measure/excluded-ranges.ts';
import { pharmacopoeialBlank } from '../../measure/companion-noise.ts'; // issue 20

export interface Measured {
  noise: NoiseReport | null;
  peaks: Peak[];
  peakOptions: PeakOptions | null;
  peakProblem?: string;
}

/** The noise report of one signal; null when it is too short to measure. */
export function noiseOn(measured: Signal, raw: Signal, noiseSettings: NoiseSettings, stack: StackRun | null): NoiseReport | null {
  if (measured.y.length < 5) return null;
  return measureNoise(measured, raw, noiseSettings, measured === raw ? null : stack);
}

/** Peaks on one signal with the user's settings and the noise already measured on it. */
export function peaksOn(measured: Signal, raw: Signal, noise: NoiseReport | null, ps: PeakSettings, ctx: StepContext, stack: StackRun | null, decisions?: PeakDecisions): Measured {
  return drain(peaksOnStepwise(measured, raw, noise, ps, ctx, stack, decisions));
}

/** {@link peaksOn} in steps: pauses inside detection (analysis/pause.ts). */
export function* peaksOnStepwise(measured: Signal, raw: Signal, noise: NoiseReport | null, ps: PeakSettings, ctx: StepContext, stack: StackRun | null, decisions?: PeakDecisions): Stepwise<Measured> {
  if (measured.y.length < 5 || !noise) return { noise, peaks: [], peakOptions: null, peakProblem: 'Fewer than 5 points: no peaks can be measured.' };
  const sigma = noise.sigma.sigma;
  if (!Number.isFinite(sigma)) {
    return { noise, peaks: [], peakOptions: null, peakProblem: 'The noise figure is not a finite number (the values are so large that their squares overflow, or there was nothing to measure), so S/N cannot be measured. Mark a quiet range of ordinary values, or rescale the data.' };
  }
  if (!(sigma > 0)) {
    return { noise, peaks: [], peakOptions: null, peakProblem: 'The noise is zero (the trace is perfectly smooth or constant), so S/N cannot be measured. Mark a quiet range with some noise, or measure on the raw trace.' };
  }
  const dx = meanStep(measured.x);
  const base = defaultPeakOptions(sigma, dx);
  const peakOptions: PeakOptions = {
    ...base,
    minProminence: ps.minProminenceSigma * sigma,
    minSnr: ps.minSnr,
    minWidth: ps.minWidth > 0 ? ps.minWidth : base.minWidth,
    minSeparation: ps.minSeparation,
    snrDefinition: ps.snrDefinition,
    pharmacopoeialMultiplier: ps.pharmacopoeialMultiplier,
    negative: ps.negative,
    split: ps.split ?? 'perpendicular-drop',
    limits: { detection: ps.detectionLimit, quantitation: ps.quantitationLimit },
    pharmacopoeialNoise: pharmacopoeialBlank(measured, raw, ctx, stack), // issue 20: h from the blank processed by the same stack
    noiseProfile: noise.profile,
    // The measured trace's own noise correlation (the raw ρ carried through the stack): it sets S/N box factors.
    noiseCorrelation: noise.measuredRho,
  };
  if (ps.excluded && ps.excluded.length) peakOptions.excluded = ps.excluded.map(([a, b]) => [a, b] as const);
  try {
    // Issue 17: excluded ranges drop detected peaks only; hand decisions below still apply everywhere.
    let peaks = withoutExcluded(yield* detectPeaksStepwise(measured.x, measured.y, peakOptions), peakOptions.excluded);
    if (decisions && (decisions.added.length || decisions.removed.length || decisions.bounds?.length)) peaks = /* issue 17: bounds */ applyPeakDecisions(peaks, decisions, measured.x, measured.y, peakOptions);
    return { noise, peaks, peakOptions };
  } catch (e) {
    return { noise, peaks: [], peakOptions, peakProblem: (e as Error).message };
  }
}

/** Noise and peaks on one signal with the user's settings. */
export function measurePeaks(measured: Signal, raw: Signal, noiseSettings: NoiseSettings, ps: PeakSettings, ctx: StepContext, stack: StackRun | null, decisions?: PeakDecisions): Measured {
  return drain(measurePeaksStepwise(measured, raw, noiseSettings, ps, ctx, stack, decisions));
}

/** {@link measurePeaks} in steps: pauses inside detection. */
export function measurePeaksStepwise(measured: Signal, raw: Signal, noiseSettings: NoiseSettings, ps: PeakSettings, ctx: StepContext, stack: StackRun | null, decisions?: PeakDecisions): Stepwise<Measured> {
  return peaksOnStepwise(measured, raw, noiseOn(measured, raw, noiseSettings, stack), ps, ctx, stack, decisions);
}
