/**
 * The one list of processing steps: the table of contents of the stack.
 * Adding a step means adding its file and one line here.
 */
import type { StepDefinition } from './types.ts';

export const STEP_REGISTRY: readonly StepDefinition[] = [
] as unknown as readonly StepDefinition[];

/** The definition for a step id, or undefined. */
export function stepDefinition(id: string): StepDefinition | undefined {
  return STEP_REGISTRY.find((d) => d.id === id);
}
