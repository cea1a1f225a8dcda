/**
 * σ along a trace: a piecewise-constant profile on a trace's own grid.
 *
 * Where the noise gain of the processing varies along the trace (the ends of
 * a smoothing window, a grid that changes spacing) or the raw noise itself
 * grows with the signal, the σ that belongs to a peak is the one near it.
 * The profile is plain data (typed arrays), so it crosses to the page and
 * into exports like any other result; {@link sigmaAt} reads it.
 */

/** σ (y-units) on a trace's grid, constant over runs of indices. */
export interface SigmaProfile {
  /** Number of points of the grid it belongs to. */
  readonly points: number;
  /** Index where each run starts: ascending, the first is 0. */
  readonly starts: Int32Array;
  /** σ over each run, y-units, ≥ 0. */
  readonly sigma: Float64Array;
}

/** A profile with one σ everywhere. */
export function constantProfile(points: number, sigma: number): SigmaProfile {
  return { points, starts: Int32Array.of(0), sigma: Float64Array.of(sigma) };
}

/**
 * σ at sample `index` of the profile's grid (clamped to the grid), by binary
 * search over the runs. O(log runs).
 */
export function sigmaAt(p: SigmaProfile, index: number): number {
  const s = p.starts;
  const i = Math.max(0, Math.min(p.points - 1, Math.floor(index)));
  let lo = 0, hi = s.length - 1;
  while (lo < hi) {
    const m = (lo + hi + 1) >>> 1;
    if (s[m] <= i) lo = m; else hi = m - 1;
  }
  return p.sigma[lo];
}

/**
 * Profile from one σ per index, merging neighbours that differ by less than
 * `relTol` (relative) into one run, so a constant interior costs one entry.
 */
export function profileFromValues(values: Float64Array, relTol = 1e-6): SigmaProfile {
  const b = new ProfileBuilder(relTol);
  for (let i = 0; i < values.length; i++) b.push(values[i], 1);
  return b.done();
}

/**
 * {@link profileFromValues} fed with stretches of equal values (value, count)
 * instead of one value per index: the same runs, without an array of them.
 * Each value of a stretch compares with the run's first value as in
 * profileFromValues, and all of a stretch's values are alike, so the first
 * decides for the rest (a NaN or an infinity, which profileFromValues never
 * finds close to itself, is pushed one by one).
 */
export class ProfileBuilder {
  private readonly starts: number[] = [];
  private readonly sig: number[] = [];
  private runStart = 0;
  private runValue = NaN;
  private at = 0;

  constructor(private readonly relTol = 1e-6) {}

  push(v: number, count: number): void {
    if (count <= 0) return;
    if (!Number.isFinite(v) && count > 1) {
      for (let k = 0; k < count; k++) this.push(v, 1);
      return;
    }
    if (this.at === 0) {
      this.runValue = v;
    } else if (!(Math.abs(v - this.runValue) <= this.relTol * Math.max(Math.abs(this.runValue), Math.abs(v)))) {
      this.starts.push(this.runStart); this.sig.push(this.runValue);
      this.runStart = this.at; this.runValue = v;
    }
    this.at += count;
  }

  /** The profile of everything pushed (its points: the count pushed). */
  done(): SigmaProfile {
    const starts = this.starts.slice(), sig = this.sig.slice();
    if (this.at > 0) { starts.push(this.runStart); sig.push(this.runValue); }
    return { points: this.at, starts: Int32Array.from(starts), sigma: Float64Array.from(sig) };
  }
}

/** The median σ over the grid's points (each run weighted by its length). */
export function profileMedian(p: SigmaProfile): number {
  const order = Array.from(p.sigma.keys()).sort((i, j) => p.sigma[i] - p.sigma[j]);
  const len = (k: number) => (k + 1 < p.starts.length ? p.starts[k + 1] : p.points) - p.starts[k];
  const half = p.points / 2;
  let acc = 0;
  for (const k of order) {
    acc += len(k);
    if (acc >= half) return p.sigma[k];
  }
  return p.sigma[order[order.length - 1]];
}

/** Smallest and largest σ of the profile. */
export function profileRange(p: SigmaProfile): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (const v of p.sigma) { if (v < lo) lo = v; if (v > hi) hi = v; }
  return [lo, hi];
}

/** A noise figure for the texts: d significant figures; 'not a finite number' for NaN or ±Infinity (never "NaN" in an export). */
export const fmtNoiseNumber = (v: number, d = 4): string => (Number.isFinite(v) ? Number(v.toPrecision(d)).toString() : 'not a finite number');
