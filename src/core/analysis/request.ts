/**
 * What the page (or the CLI, a test, a batch run) asks one analysis for:
 * the sample and its companions by id, the recipe, and the user's noise and
 * peak settings. Plain data, so it crosses to the worker as it is.
 */
import type { Recipe } from '../method.ts';
import type { PeakDecisions, SnrDefinition, SplitRule } from '../measure/peak-types.ts';
import type { NoiseSettings } from '../measure/noise-report.ts';

export { DEFAULT_NOISE_SETTINGS } from '../measure/noise-report.ts';
export type { NoiseMethod, NoiseSettings } from '../measure/noise-report.ts';

/** Peak thresholds as the user sets them; prominence in multiples of σ so it scales with the data. */
export interface PeakSettings {
  /** 'processed' (default) or 'raw': the trace peaks and noise are measured on. */
  measureOn: 'processed' | 'raw';
  minProminenceSigma: number;
  minSnr: number;
  /** x-units; 0 = 2.5 sample spacings (defaultPeakOptions). */
  minWidth: number;
  /** x-units; 0 = off. */
  minSeparation: number;
  snrDefinition: SnrDefinition;
  pharmacopoeialMultiplier: number;
  negative: boolean;
  detectionLimit: number;
  quantitationLimit: number;
  /** How peaks sharing a valley split the area (absent in sessions saved before it existed: perpendicular drop). */
  split?: SplitRule;
  /** Issue 17: x-ranges left out of peak finding (the trace is unchanged); absent or empty = none. */
  excluded?: [number, number][];
}

export const DEFAULT_PEAK_SETTINGS: PeakSettings = {
  measureOn: 'processed', minProminenceSigma: 2, minSnr: 2, minWidth: 0, minSeparation: 0,
  snrDefinition: 'rms', pharmacopoeialMultiplier: 5, negative: false, detectionLimit: 3, quantitationLimit: 10, split: 'perpendicular-drop',
};

export interface AnalyseRequest {
  sampleId: string;
  blankId?: string;
  scanIds: string[];
  recipe: Recipe;
  /** uid of a step whose output the page wants to draw as well. */
  showUid?: string | null;
  noise?: NoiseSettings;
  peaks?: PeakSettings;
  decisions?: PeakDecisions;
  /** Other stacks to compare with the current one (the loss check), at most {@link MAX_ALTERNATIVES}. */
  alternatives?: AlternativeRequest[];
  /** Also carry the ledger rows that are below the detection limit in every column (the page's toggle). */
  ledgerNoiseLevel?: boolean;
}

export const MAX_ALTERNATIVES = 6;

export interface AlternativeRequest {
  id: string;
  /** Words used in sentences, e.g. "5-point moving average". */
  label: string;
  recipe: Recipe;
}
