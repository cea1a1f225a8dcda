/**
 * Types of the peak table: the options a detection runs with and one row
 * of the table. Shared by detection (peak-detection.ts), bounds and
 * integration (peak-bounds.ts), S/N (peak-snr.ts) and the table itself
 * (peak-table.ts).
 */
import type { SigmaProfile } from './noise-profile.ts';

/** How a peak's S/N is defined. */
export type SnrDefinition = 'rms' | 'pharmacopoeial' | 'region';

/** Where a peak stands against the limits; 'not-measured' when its S/N could not be computed. */
export type PeakFlag = 'below-detection' | 'detectable' | 'quantifiable' | 'not-measured';

/**
 * How two peaks that share a valley split what lies under them:
 * 'perpendicular-drop' (default) draws one straight baseline under the whole
 * group, from the first peak's start to the last peak's end, and divides the
 * area by a vertical line at each valley; 'valley-to-valley' gives each peak
 * its own straight baseline from valley to valley.
 */
export type SplitRule = 'perpendicular-drop' | 'valley-to-valley';

/**
 * Why an integration bound lies where it does.
 * * 'returned': the trace, averaged over the box (see peak-bounds.ts), came
 *   back to the local baseline within one standard deviation of that average;
 *   the bound lies one box length further out.
 * * 'valley': the trace rose again by more than three standard deviations of
 *   the box average: the lowest point before the rise.
 * * 'shared-valley': a valley shared with an overlapping neighbour at or above
 *   the detection limit (split by the split rule).
 * * 'width-limit': neither happened within the stated multiple of the peak's
 *   own half-height half-width.
 * * 'trace-end': the end of the trace came first.
 */
export type BoundKind = 'returned' | 'valley' | 'shared-valley' | 'width-limit' | 'trace-end' | 'set-by-hand';

/**
 * Something the user should know about a row.
 * * 'appears-only-after-processing': the raw trace has nothing here that
 *   passes the same thresholds (absent, or narrower than the smallest
 *   width, e.g. a one-point spike that smoothing spread). Set by the
 *   analysis, which holds the raw trace.
 * * 'possibly-saturated': the top is flat (at least 3 samples in a row) at
 *   the trace's largest value (smallest, for dips): the detector may have
 *   clipped it, so height and area may be too small.
 * * 'thinly-sampled': fewer than 5 samples across the half-height width;
 *   height, width and area depend on where the samples fell.
 * * 'also-in-blank': the blank has a peak at the same position (carry-over,
 *   a ghost peak); `blankHeight` holds its height (measure/ghost-peaks.ts).
 */
export type PeakMark = 'appears-only-after-processing' | 'possibly-saturated' | 'thinly-sampled' | 'also-in-blank';

/** Noise range h for the pharmacopoeial S/N, with where it was measured. */
export interface PharmacopoeialNoise {
  /** Range max − min in y-units. */
  readonly h: number;
  readonly points: number;
  /** 'blank' when measured on a blank run; 'trace itself' is a deviation from the texts, labelled so. */
  readonly source: 'blank' | 'trace itself';
  /** Window actually used (x-units). For the trace itself, the outer ends of the two stretches. */
  readonly from: number;
  readonly to: number;
  /** True when the window was cut by an end of the trace. */
  readonly clipped: boolean;
}

/** Detection thresholds and S/N settings. Every number states its unit. */
export interface PeakOptions {
  /** Smallest prominence kept, y-units. */
  minProminence: number;
  /** Smallest S/N kept (by the definition in use). Peaks whose S/N cannot be measured are kept. */
  minSnr: number;
  /** Smallest half-height width kept, x-units. */
  minWidth: number;
  /** Smallest apex-to-apex distance, x-units; the higher peak wins (SciPy's distance rule). 0 = off. */
  minSeparation: number;
  /**
   * σ of the noise (y-units, ≥ 0): the summary figure (e.g. the median over
   * the trace). 0 means no noise: S/N is then not measured, and the rules
   * that use σ take the floor {@link SIGMA_FLOOR_OF_SPAN} × the trace's span.
   */
  noiseSigma: number;
  /** σ along the trace where it varies (measure/noise-profile.ts); the σ used for a peak is the one at its apex sample. */
  noiseProfile?: SigmaProfile;
  /**
   * Autocorrelation of the noise at lags 0, 1, … (ρ₀ = 1), when known; it
   * sets the spread of the box averages the bounds use. Omitted = white noise.
   */
  noiseCorrelation?: ArrayLike<number>;
  /** Which S/N the `snr` column and the flags use. */
  snrDefinition: SnrDefinition;
  /** Width of the pharmacopoeial noise window in half-height widths (current texts: at least 5). */
  pharmacopoeialMultiplier: number;
  /** Trace on which h is measured; omitted = the trace itself (labelled so). */
  pharmacopoeialNoise?: { x: Float64Array; y: Float64Array; fromBlank: boolean };
  /** Detect troughs (absorbance dips): detection runs on −y, heights and areas come back negative. */
  negative?: boolean;
  /** Also compute the region S/N (mean over SD between the bounds) when it is not the definition in use. */
  regionSnr?: boolean;
  /** How peaks sharing a valley split the area (default 'perpendicular-drop'). */
  split?: SplitRule;
  /** Issue 17: x-ranges left out of peak finding (measure/excluded-ranges.ts); absent = none. */
  excluded?: readonly (readonly [number, number])[];
  /** S/N limits: detection (3; some labs accept 2) and quantitation (10), ICH Q2(R1). */
  limits: { detection: number; quantitation: number };
}

/** The σ floor, as a fraction of the detection signal's span (max − min), used by rules that need σ when σ is 0. */
export const SIGMA_FLOOR_OF_SPAN = 1e-6;

/** One row of the peak table. x-units unless stated; heights and areas in y-units (× x-units for area). */
export interface Peak {
  /** Sample index of the apex. */
  readonly index: number;
  /** Apex position: vertex of a parabola over the peak's top above its local baseline (peak-bounds.ts). */
  readonly x: number;
  /** y at the apex sample (the data, not the parabola). */
  readonly y: number;
  /**
   * Apex level above the peak's local baseline, at the apex x; negative for
   * dips. Apex level: least-squares parabola over the samples within
   * ±FWHM/6 of the apex (at least ±1, at most ±50 samples), FWHM the peak's
   * own half-height width. Baseline: the straight line under the peak
   * (see `baselineStart`, `baselineEnd`).
   */
  readonly height: number;
  /** SciPy prominence (always ≥ 0, on −y for dips). */
  readonly prominence: number;
  /** Prominence bases (SciPy): sample indices and x. */
  readonly leftBase: number;
  readonly rightBase: number;
  readonly leftBaseX: number;
  readonly rightBaseX: number;
  /** The peak's own half-height width, measured against its local baseline, x-units (crossings linearly interpolated). */
  readonly fwhm: number;
  /** The same width in samples. */
  readonly fwhmPoints: number;
  /** x of the half-height crossings. */
  readonly leftHalf: number;
  readonly rightHalf: number;
  /** Integration bounds: sample indices and x. */
  readonly startIndex: number;
  readonly endIndex: number;
  readonly start: number;
  readonly end: number;
  /** Why each bound lies where it does. */
  readonly startKind: BoundKind;
  readonly endKind: BoundKind;
  /** The local baseline (y-units of the trace) at `start` and at `end`: a straight line between them. */
  readonly baselineStart: number;
  readonly baselineEnd: number;
  /** How the area is split from neighbours sharing a valley; 'none' for a peak that shares none. */
  readonly split: SplitRule | 'none';
  /** Area between the bounds above the local baseline (trapezoid rule); negative for dips. */
  readonly area: number;
  /** σ used for this peak's S/N (y-units): the noise at its apex. */
  readonly noiseSigma: number;
  /** |height| / σ; null when σ is 0. */
  readonly snrRms: number | null;
  /** 2|H|/h, or null when h could not be measured. */
  readonly snrPharma: number | null;
  readonly pharmaNoise: PharmacopoeialNoise | null;
  /** Mean over SD of the samples between the bounds, when asked for. */
  readonly snrRegion: number | null;
  /** The S/N of the definition in use. */
  readonly snr: number | null;
  readonly snrDefinition: SnrDefinition;
  readonly flag: PeakFlag;
  readonly marks: readonly PeakMark[];
  /** Height of the blank's peak at the same position, y-units, when the row is marked 'also-in-blank' (issue 20). */
  readonly blankHeight?: number;
  readonly origin: 'detected' | 'added-by-user';
  /** Set when the user removed this detected peak; it stays in the table so exports show the decision. */
  readonly removedByUser?: boolean;
  /** Set when the user moved the start or end by hand (issue 17); area and height are then measured between those. */
  readonly boundsByUser?: boolean;
  /** A sentence about something the user should know about this peak's measures. */
  readonly note?: string;
}

/** Peaks the user added (by clicking) or removed, kept as x positions so they survive reprocessing. */
export interface PeakDecisions {
  /** x positions (x-units) where the user added a peak. */
  readonly added: readonly number[];
  /** x positions (x-units) of detected peaks the user removed. */
  readonly removed: readonly number[];
  /** Start and end the user set for the peak at x (issue 17; absent in sessions saved before). */
  readonly bounds?: readonly HandBounds[];
}

/** A peak's start and end set by hand: the peak whose apex is nearest x (within half its FWHM) takes them. */
export interface HandBounds {
  readonly x: number;
  readonly start: number;
  readonly end: number;
}
