/**
 * The noise figure the page, the peak table and every export use: the raw
 * trace's σ by the chosen method, carried through the stack to the trace the
 * peaks are measured on, with a profile along that trace and every check
 * behind it. Nothing falls back silently: each fallback is a note and a
 * failed check.
 */
import type { PipelineResult } from '../pipeline.ts';
import type { Recipe, Registry } from '../method.ts';
import type { Signal, StepContext } from '../steps/types.ts';
import { noisePeakToPeak, noiseRms, type NoiseEstimate } from './noise-estimators.ts';
import { correlationModel, differenceShare, MAX_CORRELATION_FACTOR, FEWEST_CORRELATION_POINTS, rawNoiseModel, type NoiseCheck, type RawNoiseModel } from './noise-raw.ts';
import { carryNoise, type CarriedNoise, type NoiseSources, type SourceNoise } from './noise-carry.ts';
import { constantProfile, profileRange, type SigmaProfile } from './noise-profile.ts';
import { fmtNoiseNumber } from './noise-profile.ts';

/**
 * Where the raw σ comes from: 'auto' (the raw trace's finest-scale σ with its
 * measured correlation, src/core/measure/noise-raw.ts), 'rms' (RMS about a
 * line over the quiet range the user marked, on the raw trace), 'blank' (the
 * blank trace's own noise, measured like 'auto'). Either way it is carried
 * through the stack to the measured trace.
 */
export type NoiseMethod = 'auto' | 'rms' | 'blank';

export interface NoiseSettings {
  method: NoiseMethod;
  /** Quiet baseline range the user marked (x-units); needed by 'rms' and for the peak-to-peak figure. */
  quietRange: [number, number] | null;
}

export const DEFAULT_NOISE_SETTINGS: NoiseSettings = { method: 'auto', quietRange: null };

/** What the page, the peak table and the exports show about noise. */
export interface NoiseReport {
  /** σ used for H/σ on the measured trace: the median of `profile`, with how it was made and whether its assumptions held. */
  sigma: NoiseEstimate;
  /** The raw trace's σ by the chosen method (the source of `sigma`). */
  rawSigma: NoiseEstimate | null;
  /** σ along the measured trace's grid; a peak's S/N uses the σ at its apex. */
  profile: SigmaProfile;
  /** How σ was carried from the raw trace through the stack; null when measured on the raw trace. */
  carried: CarriedNoise | null;
  /** Autocorrelation ρ(0..L) of the raw noise that the carriage used. */
  rho: Float64Array;
  /** Autocorrelation of the measured trace's noise: `rho` carried through the stack (the same as `rho` on the raw trace). */
  measuredRho: Float64Array;
  /** Every check behind σ (raw estimate and carriage). */
  checks: NoiseCheck[];
  /** False when a check failed or a fallback was used. */
  assumptionsHeld: boolean;
  /** True while the carried σ is not final (a staged analysis may post it late); S/N is then provisional. */
  provisional: boolean;
  /** Peak-to-peak range over the quiet range, when one is marked. */
  peakToPeak: NoiseEstimate | null;
  /** Sentences: fallbacks and problems. */
  notes: string[];
}

/** The stack the measured trace came from, for carrying σ through it. */
export interface StackRun {
  run: PipelineResult;
  recipe: Recipe;
  registry: Registry;
  ctx: StepContext;
  /** Names the input data (trace ids) for caching. */
  cacheKey: string;
}

const MODELS = new WeakMap<Float64Array, RawNoiseModel | null>();

/** {@link rawNoiseModel} of a raw array, kept while the array lives (raw arrays are never changed). */
export function cachedNoiseModel(y: Float64Array): RawNoiseModel | null {
  if (MODELS.has(y)) return MODELS.get(y) ?? null;
  const m = rawNoiseModel(y);
  MODELS.set(y, m);
  return m;
}

const fmt = (v: number, d = 4): string => fmtNoiseNumber(v, d);

function sourceOf(m: RawNoiseModel): SourceNoise {
  return { profile: m.profile, sigma: m.sigma, rho: m.rho };
}

interface RawChoice {
  source: SourceNoise;
  estimate: NoiseEstimate;
  checks: NoiseCheck[];
}

function fromModel(m: RawNoiseModel, prefix = ''): RawChoice {
  return {
    source: sourceOf(m),
    estimate: {
      ok: true, sigma: m.sigma, measure: 'sd', points: m.points, method: m.method, description: `${prefix}${m.description}`,
      checks: m.checks.map((c) => ({ ...c, text: `${prefix}${c.text}` })), assumptionsHeld: m.assumptionsHeld,
    },
    checks: m.checks.map((c) => ({ ...c, text: `${prefix}${c.text}` })),
  };
}

/** The raw σ by the chosen method, or null when none can be measured (notes say why). */
function rawChoice(raw: Signal, settings: NoiseSettings, ctx: StepContext, notes: string[]): RawChoice | null {
  const auto = () => {
    const m = cachedNoiseModel(raw.y);
    if (!m) { notes.push('The raw trace has too few points outside features for a noise estimate; mark a quiet range or load a blank.'); return null; }
    return fromModel(m);
  };
  if (settings.method === 'blank') {
    if (!ctx.blank) {
      notes.push('No trace is marked as blank, so the automatic estimate on the raw trace is used instead. Mark a blank to take σ from it.');
      const a = auto();
      if (a) a.checks.push({ id: 'method', held: false, text: 'σ from the blank was asked for, but there is no blank: the automatic estimate on the raw trace was used.' });
      return a;
    }
    const m = cachedNoiseModel(ctx.blank.y);
    if (!m) { notes.push('The blank has too few points for a noise estimate; the automatic estimate on the raw trace is used instead.'); return auto(); }
    // The blank's σ stands for the sample's noise everywhere; its level test says nothing about the sample's.
    const c = fromModel(m, `On the blank "${ctx.blank.name}": `);
    const sigma = m.sigma;
    return { ...c, source: { profile: constantProfile(raw.x.length, sigma), sigma, rho: m.rho }, estimate: { ...c.estimate, method: `blank-${m.method}` } };
  }
  if (settings.method === 'rms') {
    if (!settings.quietRange) {
      notes.push('No quiet baseline range is marked, so the automatic estimate is used. Mark a range on the plot to use the RMS about a line.');
      const a = auto();
      if (a) a.checks.push({ id: 'method', held: false, text: 'A quiet range was asked for, but none is marked: the automatic estimate was used.' });
      return a;
    }
    const r = noiseRms(raw.x, raw.y, settings.quietRange[0], settings.quietRange[1]);
    if (!r.ok) {
      notes.push(`${r.message} The automatic estimate is used instead.`);
      const a = auto();
      if (a) a.checks.push({ id: 'method', held: false, text: `The quiet range could not be used (${r.message}): the automatic estimate was used.` });
      return a;
    }
    const i0 = lowerIndex(raw.x, r.from ?? raw.x[0]), i1 = lowerIndex(raw.x, r.to ?? raw.x[raw.x.length - 1]);
    const cm = i1 - i0 + 1 >= FEWEST_CORRELATION_POINTS ? correlationModel(raw.y, null, 8, 2, i0, i1 + 1) : null;
    const checks: NoiseCheck[] = [{ id: 'quiet-range', held: true, text: `σ is the RMS about a straight line over the quiet range the user marked (${r.points} points of the raw trace); the range is assumed to hold no signal.` }];
    let rho: Float64Array = Float64Array.of(1);
    if (cm && differenceShare(Float64Array.of(1, -2, 1), cm.rho) > 1 / MAX_CORRELATION_FACTOR ** 2) {
      rho = cm.rho;
      checks.push({ id: 'correlation', held: true, text: `Noise correlation measured in the quiet range over 8 lags (ρ₁ = ${fmt(cm.rho[1], 2)}).` });
    } else {
      const a = cachedNoiseModel(raw.y);
      if (a && a.rho.length > 1) {
        rho = a.rho;
        checks.push({ id: 'correlation', held: true, text: `The quiet range is too short to measure the noise correlation; the automatic estimate's (ρ₁ = ${fmt(a.rho[1], 2)}, ${a.rho.length - 1} lags) is used.` });
      } else {
        checks.push({ id: 'correlation', held: false, text: 'The noise correlation could not be measured (quiet range too short, none measurable elsewhere); white noise is assumed when σ is carried through the stack.' });
      }
    }
    return {
      source: { profile: constantProfile(raw.x.length, r.sigma), sigma: r.sigma, rho },
      estimate: { ...r, description: `${r.description} On the raw trace.`, checks, assumptionsHeld: checks.every((c) => c.held !== false) },
      checks,
    };
  }
  return auto();
}

function lowerIndex(x: Float64Array, v: number): number {
  let a = 0, b = x.length;
  while (a < b) { const m = (a + b) >>> 1; if (x[m] < v) a = m + 1; else b = m; }
  return Math.min(a, x.length - 1);
}

/** Noise models of the blank and scans (each measured like 'auto'), for carrying their noise too. */
function otherSources(ctx: StepContext): Pick<NoiseSources, 'blank' | 'scans'> {
  const blankModel = ctx.blank ? cachedNoiseModel(ctx.blank.y) : null;
  const scans = new Map<string, SourceNoise>();
  for (const s of ctx.scans ?? []) {
    const m = cachedNoiseModel(s.y);
    if (m) scans.set(s.id, sourceOf(m));
  }
  return { blank: blankModel ? sourceOf(blankModel) : undefined, scans };
}

/**
 * σ on `measured` (the raw trace itself, or the stack's output described by
 * `stack`): the raw σ by the chosen method, carried through the stack.
 * Never throws for data it cannot measure: σ is then 0 with a note, and the
 * peak table says S/N cannot be measured.
 */
export function measureNoise(measured: Signal, raw: Signal, settings: NoiseSettings, stack: StackRun | null): NoiseReport {
  const notes: string[] = [];
  const method: NoiseMethod = settings.method === 'rms' || settings.method === 'blank' ? settings.method : 'auto';
  // 'windows' was the automatic estimate of earlier versions; 'robust' (point-to-point differences) is gone.
  if (method !== settings.method && String(settings.method) !== 'windows') notes.push(`The noise method "${String(settings.method)}" (from an older session) is no longer offered; the automatic estimate is used.`);
  const ctx = stack?.ctx ?? {};
  const choice = rawChoice(raw, { ...settings, method }, ctx, notes);
  let peakToPeak: NoiseEstimate | null = null;
  if (settings.quietRange) {
    const r = noisePeakToPeak(measured.x, measured.y, settings.quietRange[0], settings.quietRange[1]);
    if (r.ok) peakToPeak = r; else notes.push(r.message);
  }
  if (!choice) {
    const none: NoiseEstimate = { ok: true, sigma: 0, measure: 'sd', points: 0, method: 'none', description: 'No noise estimate could be made.', checks: [], assumptionsHeld: false };
    return { sigma: none, rawSigma: null, profile: constantProfile(measured.x.length, 0), carried: null, rho: Float64Array.of(1), measuredRho: Float64Array.of(1), checks: [], assumptionsHeld: false, provisional: false, peakToPeak, notes };
  }
  const checks = [...choice.checks];
  let carried: CarriedNoise | null = null;
  let profile = choice.source.profile;
  let sigma = choice.source.sigma;
  let description = choice.estimate.description;
  const onRaw = measured === raw || !stack;
  if (!onRaw && stack) {
    try {
      carried = carryNoise(raw, stack.run, stack.recipe, stack.registry, ctx, { sample: choice.source, ...otherSources(ctx) }, stack.cacheKey);
      profile = carried.profile;
      sigma = carried.sigma;
      description = `${description} ${carried.description}`;
      for (const n of carried.notes) checks.push({ id: 'carried-ends', held: false, text: n });
    } catch (e) {
      // Say so and keep the raw σ: S/N on the processed trace is then overstated by the stack's noise reduction.
      const msg = `σ could not be carried through the stack (${(e as Error).message}); the raw trace's σ is used, which overstates the noise of a smoothed trace and understates S/N.`;
      notes.push(msg);
      checks.push({ id: 'carried', held: false, text: msg });
      profile = constantProfile(measured.x.length, sigma);
    }
  }
  if (profile.points !== measured.x.length) profile = constantProfile(measured.x.length, sigma);
  const [lo, hi] = profileRange(profile);
  if (hi > lo * 1.001) description += ` σ varies along the trace from ${fmt(lo, 3)} to ${fmt(hi, 3)}; each peak's S/N uses the σ at its apex, the figure here is the median.`;
  const assumptionsHeld = checks.every((c) => c.held !== false);
  const sigmaEstimate: NoiseEstimate = {
    ok: true, sigma, measure: 'sd', points: choice.estimate.points,
    method: carried ? `${choice.estimate.method}, carried-${carried.route}` : choice.estimate.method,
    description, checks, assumptionsHeld,
  };
  return {
    sigma: sigmaEstimate, rawSigma: choice.estimate, profile, carried, rho: choice.source.rho, measuredRho: carried?.rho ?? choice.source.rho,
    checks, assumptionsHeld, provisional: carried?.provisional ?? false, peakToPeak, notes,
  };
}

const HELD_WORDS = { true: 'held', false: 'DID NOT HOLD', null: 'not tested' } as const;

/** One line per check: "Noise check (held): …". */
export function noiseCheckLines(checks: readonly NoiseCheck[]): string[] {
  return checks.map((c) => `Noise check (${HELD_WORDS[String(c.held) as 'true' | 'false' | 'null']}): ${c.text}`);
}

/**
 * The noise lines every export carries (peak CSV header, HTML report): the
 * verdict on the assumptions, each check, whether S/N is provisional, and how
 * σ varies along the trace.
 */
export function noiseSummaryLines(n: NoiseReport): string[] {
  const lines: string[] = [];
  lines.push(n.assumptionsHeld
    ? 'Noise assumptions: all that could be tested held.'
    : 'Noise assumptions: AT LEAST ONE DID NOT HOLD or a fallback was used (see the checks below); treat S/N with care.');
  lines.push(...noiseCheckLines(n.checks));
  const [lo, hi] = profileRange(n.profile);
  if (hi > lo * 1.001) lines.push(`σ along the measured trace: from ${fmt(lo)} to ${fmt(hi)} (median ${fmt(n.sigma.sigma)}); each peak's S/N H/σ uses the σ at its apex.`);
  if (n.rho.length > 1) lines.push(`Raw noise autocorrelation used to carry σ (lags 1–${n.rho.length - 1}): ${Array.from(n.rho.subarray(1)).map((v) => fmt(v, 3)).join(', ')}.`);
  if (n.provisional) lines.push('S/N is PROVISIONAL: the processed σ is still being worked out.');
  return lines;
}
