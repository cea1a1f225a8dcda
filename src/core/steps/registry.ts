/**
 * The one list of processing steps: the table of contents of the stack,
 * in the order the add-step menu shows them. Adding a step means adding its
 * file and one line here.
 */
import type { StepDefinition } from './types.ts';
import { blankSubtractionStep } from './blank-subtraction.ts';
import { ensembleAverageStep } from './ensemble-average.ts';
import { despikeStep } from './despike.ts';
import { baselineStep } from './baseline.ts';
import { movingAverageStep } from './moving-average.ts';
import { boxcarStep } from './boxcar.ts';
import { savitzkyGolayStep } from './savitzky-golay.ts';
import { localOrderStep } from './local-order.ts';
import { resampleStep } from './resample.ts';
import { frequencyFilterStep } from './frequency-filter.ts';
import { trimStep } from './trim.ts';

export const STEP_REGISTRY: readonly StepDefinition[] = [
  savitzkyGolayStep,
  movingAverageStep,
  boxcarStep,
  localOrderStep,
  despikeStep,
  baselineStep,
  blankSubtractionStep,
  ensembleAverageStep,
  frequencyFilterStep,
  resampleStep,
  trimStep,
] as unknown as readonly StepDefinition[];

/** The definition for a step id, or undefined. */
export function stepDefinition(id: string): StepDefinition | undefined {
  return STEP_REGISTRY.find((d) => d.id === id);
}
