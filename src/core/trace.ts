/**
 * The trace model: one measured y-against-x record, immutable once made.
 *
 * Invariants checked on creation (see {@link createTrace}):
 * x and y have equal length, every value is finite, x is strictly ascending,
 * and there are at least {@link MIN_POINTS} points. Loaders sort and report
 * before they call this; the model itself never reorders data silently.
 */

/** Fewest points a trace may have: below this no step or peak measure is meaningful. */
export const MIN_POINTS = 5;

/** What the user says a loaded trace is. */
/** 'standard' (issue 21): a run of known amounts for the calibration, analysed with the sample's method. */
export type TraceRole = 'sample' | 'blank' | 'scan' | 'standard' | 'ignore';

/** Where a trace came from, so a reviewer can tie every result to its bytes. */
export interface TraceSource {
  /** The file name as the user gave it. */
  readonly fileName: string;
  /** SHA-256 of the file's bytes, lower-case hex. */
  readonly sha256: string;
  /** Data rows accepted into the trace. */
  readonly rowsRead: number;
  /** Rows skipped (not numbers, wrong field count); listed in the load report. */
  readonly rowsSkipped: number;
  /** Which column of the file gave y (0-based), when the file had several. */
  readonly yColumn?: number;
}

/** An immutable y-against-x record. */
export interface Trace {
  readonly id: string;
  /** Display name, e.g. "run-07.csv: Absorbance". */
  readonly name: string;
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly xName: string;
  readonly xUnit: string;
  readonly yName: string;
  readonly yUnit: string;
  readonly source: TraceSource;
  /** Metadata lines or labels read from the file (preamble, JCAMP labels, netCDF attributes). */
  readonly metadata: Readonly<Record<string, string>>;
}

export interface TraceInit {
  id?: string;
  name: string;
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  xName?: string;
  xUnit?: string;
  yName?: string;
  yUnit?: string;
  source: TraceSource;
  metadata?: Record<string, string>;
}

/** A problem with trace data that the user can act on. */
export class TraceError extends RangeError {
  override name = 'TraceError';
}

let counter = 0;
function nextId(): string {
  counter += 1;
  return `t${Date.now().toString(36)}-${counter}`;
}

/**
 * Explain what is wrong with x/y data as a trace, or return null when the
 * invariants hold. Index numbers in the message are 1-based points.
 */
export function checkTraceData(x: ArrayLike<number>, y: ArrayLike<number>): string | null {
  if (x.length !== y.length) return `x has ${x.length} values but y has ${y.length}; they must be the same length.`;
  if (x.length < MIN_POINTS) return `Only ${x.length} point(s); a trace needs at least ${MIN_POINTS}.`;
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i])) return `x at point ${i + 1} is not a finite number (${x[i]}).`;
    if (!Number.isFinite(y[i])) return `y at point ${i + 1} is not a finite number (${y[i]}).`;
    if (i > 0 && !(x[i] > x[i - 1])) {
      return `x is not strictly ascending at point ${i + 1} (${x[i - 1]} then ${x[i]}).`;
    }
  }
  return null;
}

/**
 * Make an immutable trace. The arrays are copied, so later changes to the
 * caller's arrays cannot reach the trace.
 * @throws TraceError when an invariant fails (message says which and where).
 */
export function createTrace(init: TraceInit): Trace {
  const problem = checkTraceData(init.x, init.y);
  if (problem) throw new TraceError(problem);
  const trace: Trace = {
    id: init.id ?? nextId(),
    name: init.name,
    x: Float64Array.from(init.x),
    y: Float64Array.from(init.y),
    xName: init.xName ?? 'x',
    xUnit: init.xUnit ?? '',
    yName: init.yName ?? 'y',
    yUnit: init.yUnit ?? '',
    source: Object.freeze({ ...init.source }),
    metadata: Object.freeze({ ...(init.metadata ?? {}) }),
  };
  return Object.freeze(trace);
}

/** Axis label with unit, e.g. "Time (min)"; just the name when the unit is empty. */
export function axisLabel(name: string, unit: string): string {
  return unit ? `${name} (${unit})` : name;
}
