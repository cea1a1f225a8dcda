/**
 * The shape every processing step shares. A step file exports one
 * {@link StepDefinition}; `registry.ts` lists them. Steps are pure: they
 * never change their inputs and always return new arrays.
 */
import type { Trace } from '../trace.ts';

/** A signal flowing between steps: x ascending, same length as y. */
export interface Signal {
  readonly x: Float64Array;
  readonly y: Float64Array;
}

/** The unit a parameter is measured in; the UI shows it beside the value. */
export type ParamUnit = 'points' | 'x-units' | 'ratio' | 'count' | 'cycles per x-unit' | 'none';

export type ParamSpec =
  | {
      key: string; label: string; kind: 'int'; unit: ParamUnit;
      min: number; max: number; step?: number;
      /** Window sizes must be odd. */
      odd?: boolean;
      help?: string;
    }
  | { key: string; label: string; kind: 'number'; unit: ParamUnit; min: number; max: number; step?: number; log?: boolean; help?: string }
  | { key: string; label: string; kind: 'choice'; unit: 'none'; choices: readonly { value: string; label: string }[]; help?: string }
  | { key: string; label: string; kind: 'boolean'; unit: 'none'; help?: string }
  /** A list of [from, to] x-ranges (x-units), e.g. baseline regions the user marks. */
  | { key: string; label: string; kind: 'ranges'; unit: 'x-units'; help?: string };

export type ParamValue = number | string | boolean | [number, number][];
export type StepParams = Record<string, ParamValue>;

/** Traces a step may need besides its input (blank, repeated scans). */
export interface StepContext {
  readonly blank?: Trace;
  readonly scans?: readonly Trace[];
}

/** A replaced point (despiking): never removed silently. */
export interface SpikeEvent {
  index: number;
  x: number;
  original: number;
  replacement: number;
}

export interface StepOutput extends Signal {
  /** Fitted baseline on the output grid (baseline steps). */
  baseline?: Float64Array;
  /** Points replaced (despiking). */
  events?: SpikeEvent[];
  /** Sentences for the page: what the step did that the user should know. */
  notes: string[];
  /** Per-point choices or extra series a panel may draw (e.g. local polynomial order). */
  extra?: Record<string, Float64Array>;
  /** Numbers a panel may show (e.g. n scans, measured noise before/after). */
  figures?: Record<string, number>;
}

export interface StepDefinition<P extends StepParams = StepParams> {
  /** Stable kebab-case id: it is saved in recipes, never rename. */
  readonly id: string;
  readonly label: string;
  /** Two or three sentences: what it does, when it helps, what it costs. */
  readonly summary: string;
  readonly params: readonly ParamSpec[];
  readonly defaults: P;
  /** True when the step assumes evenly spaced x. */
  readonly needsEvenSpacing?: boolean;
  /**
   * True when the output is an affine function of the input's y (and of the
   * blank's and scans' y) on the input's own x grid, whatever the parameters:
   * noise then passes exactly through the step's impulse response
   * (src/core/measure/noise-carry.ts). Leave unset for anything that decides
   * from the data (thresholds, weights, fitted orders) or changes the grid.
   * A function decides per parameters (averaging scans is linear unless it
   * aligns them, which decides shifts from the data).
   */
  readonly linear?: boolean | ((params: P) => boolean);
  /** Explain in words what is wrong with these parameters for this input, or null. */
  validate(params: P, input: Signal, ctx: StepContext): string | null;
  /** Pure: returns new arrays, never changes input. Call only when validate returned null. */
  apply(input: Signal, params: P, ctx: StepContext): StepOutput;
}
