/**
 * What one analysis gives back: the whole result (what `analyse()` returns
 * and every export reads) and the updates the staged analysis yields on the
 * way, one per stage.
 */
import type { StepStatus } from '../pipeline.ts';
import type { Signal, SpikeEvent } from '../steps/types.ts';
import type { ResidualDiagnostics } from '../measure/residual-tests.ts';
import type { NoiseReport } from '../measure/noise-report.ts';
import type { Ledger, WindowAdvice } from '../measure/loss-matching.ts';
import type { Peak, PeakOptions } from '../measure/peak-types.ts';
import type { NoiseBumpCount } from '../measure/noise-bumps.ts';

/** One alternative's outcome, for the overlay and the residual verdicts. */
export interface AlternativeOutcome {
  id: string;
  label: string;
  processed: Signal;
  diagnostics: ResidualDiagnostics | null;
  noiseSigma: number | null;
  peakCount: number;
  /** Steps that could not run, in words. */
  problems: string[];
}

export interface WindowAdviceRow {
  uid: string;
  stepLabel: string;
  advice: WindowAdvice;
}

export interface LossReport {
  /** Column 0 is the raw trace (reference), column 1 the current stack, then the alternatives. */
  ledger: Ledger;
  /** Features below the detection limit in every column: left out of the ledger (counted only) unless asked for. */
  noiseLevelRows: number;
  /** True when the ledger holds those noise-level rows too. */
  noiseLevelShown: boolean;
  outcomes: AlternativeOutcome[];
  /** Narrowest half-height width among the reference's quantifiable peaks, in points; null when none is quantifiable. */
  narrowestFwhmPoints: number | null;
  advice: WindowAdviceRow[];
  /**
   * What the export asks the user to confirm: features the current stack loses or weakens against the raw
   * trace, and features that appear only after processing. Detectable features within the noise range (below
   * the S/N pure noise of this length reaches about once) are summed up in one sentence, not listed.
   */
  currentWarnings: string[];
  /** The quantifiable ones among them (lost, crossing a limit, or weakened beyond HEIGHT_LOSS_TOLERANCE): they keep the residual verdict from reading clean. */
  currentWeakened: string[];
  /**
   * Issue 17: the same warnings sorted by kind, one per feature (the noise-range sum is counted, not itemised),
   * for the export's one confirmation that lists the top items of each kind and then counts. Absent in results
   * made before it was added.
   */
  currentItems?: LossItem[];
}

/** One feature the current stack lost, weakened, or made appear (issue 17). */
export interface LossItem {
  kind: 'lost' | 'weakened' | 'appeared';
  /** Apex position (x-units). */
  x: number;
  /** S/N on the raw trace (lost, weakened) or after processing (appeared); null when not measured. */
  snr: number | null;
  sentence: string;
}

export interface StepRunSummary {
  uid: string;
  step: string;
  status: StepStatus;
  message?: string;
  notes: string[];
  figures?: Record<string, number>;
  cached: boolean;
  ms: number;
  points: number;
  eventCount: number;
  /** Points this step replaced (despiking), listed so nothing is removed silently. */
  events?: SpikeEvent[];
  /** Per-point extras a panel may draw, e.g. the local polynomial order. */
  extra?: Record<string, Float64Array>;
}

export interface AnalyseResult {
  sampleId: string;
  processed: Signal;
  /** raw − processed on the processed grid. */
  residual: Signal;
  /** Sentence when the residual needed interpolation (the grid changed). */
  residualNote?: string;
  /** Tests on the residual; null when no step ran. */
  diagnostics: ResidualDiagnostics | null;
  baseline?: Float64Array;
  intermediate?: Signal | null;
  runs: StepRunSummary[];
  events: SpikeEvent[];
  noise: NoiseReport | null;
  peaks: Peak[];
  /** The options the peaks were measured with (for the table header and exports). */
  peakOptions: PeakOptions | null;
  /** Why peaks could not be measured, when they could not. */
  peakProblem?: string;
  /** How many noise-only peaks pure noise of this length and correlation would give with these settings. */
  noiseBumps: NoiseBumpCount | null;
  /** The loss check; null when there is nothing to compare. */
  loss: LossReport | null;
  ms: number;
}

/** The stages in the order they land. */
export const STAGES = ['processed', 'residual', 'noise', 'peaks', 'bumps', 'alternative', 'loss'] as const;
export type StageName = typeof STAGES[number];

/**
 * One stage's news: the fields of the result it sets (the others stay as the
 * stages before left them) and the stages still to come. What depends on a
 * pending stage is provisional: the residual verdict until the loss check
 * lands, for one (it cannot read clean while the loss check may still find a
 * quantifiable feature weakened).
 */
export interface StageUpdate {
  stage: StageName;
  sampleId: string;
  patch: Partial<AnalyseResult>;
  /** Stages still to come, in order ('alternative' while any alternative is still to be worked out). */
  pending: StageName[];
  /** For 'alternative': which one of how many just landed. */
  progress?: { done: number; of: number };
}

/**
 * Whether σ for S/N is provisional: the noise stage (the raw σ carried through the stack, by simulation where a
 * step is not linear or changes the grid, which can take seconds on a long trace) has not landed for the newest
 * request, so the σ shown is the previous request's, or the noise report itself says its σ is not final.
 */
export function sigmaProvisional(pending: readonly StageName[], noise: NoiseReport | null): boolean {
  return pending.includes('noise') || noise?.provisional === true;
}

/**
 * Whether the S/N figures shown are provisional: σ is ({@link sigmaProvisional}), or the peak table measured with
 * the final σ has not landed yet. The page shows no S/N as final before both have.
 */
export function snrProvisional(pending: readonly StageName[], noise: NoiseReport | null): boolean {
  return sigmaProvisional(pending, noise) || pending.includes('peaks');
}
