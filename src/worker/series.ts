/**
 * Long series stay in the worker (issue 16, "the page takes in little").
 *
 * The analysis makes whole arrays: the processed trace, the residual, the
 * baseline, the chosen step's output and each alternative's output. Above
 * {@link WHOLE_UP_TO} points such a series no longer crosses to the page:
 * the worker keeps it under a number (`ref`) and sends what the plot needs,
 * the minimum and maximum of each half pixel column over the visible
 * x-range (about four points per pixel column, so a one-point spike still
 * shows), again whenever the page zooms, pans or resizes. Whatever needs the
 * exact values (exports, the cursor readout, the focused view, a peak added
 * by hand, the figure columns) asks for them by `ref` (bridge.ts): the
 * whole series, a stretch of it, or the points nearest an x. Up to
 * WHOLE_UP_TO points everything crosses whole, as before (the demo traces).
 *
 * The same arrays keep the same `ref` (the analysis caches unchanged
 * stages), so the page can tell a series that did not change.
 */
import { decimateMinMax, lowerBound } from '../core/numeric/decimate.ts';
import type { AnalyseResult } from '../core/analysis/index.ts';
import type { Signal } from '../core/steps/types.ts';

/** Series up to this many points cross whole; longer ones stay in the worker. */
export const WHOLE_UP_TO = 16_384;

/** What the plot shows: x from `from` to `to` (x-units; infinite for all) over `columns` pixel columns. */
export interface View { from: number; to: number; columns: number }

/** A series as drawn under one view. */
export interface Drawn { x: Float64Array; y: Float64Array; view: View }

/** Which field of the result a series kept in the worker stands in for. */
export type FarField = 'processed' | 'residual' | 'baseline' | 'intermediate' | 'outcome';

/** A series kept in the worker: its number, its length and the drawing for the view the worker knew. */
export interface FarSeries {
  field: FarField;
  /** For 'outcome': the alternative's id. */
  id?: string;
  ref: number;
  length: number;
  drawn: Drawn;
}

/** The nearest sample of one series to an x. */
export interface NearestPoint { ref: number; x: number; y: number; index: number }

export const FULL_VIEW: View = { from: -Infinity, to: Infinity, columns: 1000 };

export function sameView(a: View, b: View): boolean {
  return a.from === b.from && a.to === b.to && a.columns === b.columns;
}

/** About four points per pixel column: the minimum and maximum of each half column, in x order. */
export function drawSeries(x: Float64Array, y: Float64Array, view: View): Drawn {
  const d = decimateMinMax(x, y, view.from, view.to, Math.max(1, Math.round(view.columns)) * 2);
  return { x: d.x, y: d.y, view };
}

interface Held { x: Float64Array; y: Float64Array; job: number }

/** The worker's side: long series by number, for as long as the page may still show them. */
export class SeriesStore {
  private byRef = new Map<number, Held>();
  private refOfY = new WeakMap<Float64Array, Map<Float64Array, number>>();
  private nextRef = 1;
  /** Jobs whose series are kept (the newest few: the page may still show an older one while a newer one runs). */
  private jobs: number[] = [];
  view: View = FULL_VIEW;

  constructor(private readonly keepJobs = 3) {}

  /** The number of (x, y); the same arrays keep their number. */
  private keep(x: Float64Array, y: Float64Array, job: number): number {
    let byX = this.refOfY.get(y);
    const known = byX?.get(x);
    if (known !== undefined && this.byRef.has(known)) { this.byRef.get(known)!.job = Math.max(this.byRef.get(known)!.job, job); return known; }
    const ref = this.nextRef++;
    this.byRef.set(ref, { x, y, job });
    if (!byX) { byX = new Map(); this.refOfY.set(y, byX); }
    byX.set(x, ref);
    return ref;
  }

  /** A job starts posting: series of jobs older than the newest `keepJobs` are let go. */
  private touch(job: number): void {
    if (this.jobs.includes(job)) return;
    this.jobs.push(job);
    while (this.jobs.length > this.keepJobs) this.jobs.shift();
    const oldest = this.jobs[0];
    for (const [ref, h] of this.byRef) if (h.job < oldest) this.byRef.delete(ref);
  }

  /**
   * A stage's patch with every long series taken out (empty arrays in its
   * place) and listed with its drawing for the current view. Short ones
   * stay. The patch given is not changed.
   */
  thin(patch: Partial<AnalyseResult>, job: number): { patch: Partial<AnalyseResult>; far: FarSeries[] } {
    this.touch(job);
    const far: FarSeries[] = [];
    const out: Partial<AnalyseResult> = { ...patch };
    const take = (field: FarField, s: Signal, id?: string): Signal => {
      if (s.x.length <= WHOLE_UP_TO || s.x.length !== s.y.length) return s;
      const ref = this.keep(s.x, s.y, job);
      far.push({ field, id, ref, length: s.x.length, drawn: drawSeries(s.x, s.y, this.view) });
      return { x: new Float64Array(0), y: new Float64Array(0) };
    };
    if (patch.processed) {
      const p = patch.processed;
      out.processed = take('processed', p);
      if (patch.baseline && patch.baseline.length === p.x.length && out.processed !== p) {
        take('baseline', { x: p.x, y: patch.baseline });
        out.baseline = new Float64Array(0);
      }
    }
    if (patch.residual) out.residual = take('residual', patch.residual);
    if (patch.intermediate) out.intermediate = take('intermediate', patch.intermediate);
    if (patch.loss) out.loss = { ...patch.loss, outcomes: patch.loss.outcomes.map((o) => ({ ...o, processed: take('outcome', o.processed, o.id) })) };
    return { patch: out, far };
  }

  private held(ref: number): Held {
    const h = this.byRef.get(ref);
    if (!h) throw new Error('That result is no longer kept (a newer analysis replaced it); ask again.');
    return h;
  }

  /** The drawings of some series under a view (which becomes the view for later stages too). */
  draw(refs: readonly number[], view: View): Drawn[] {
    this.view = view;
    return refs.map((r) => { const h = this.held(r); return drawSeries(h.x, h.y, view); });
  }

  /** Exact copies of the series between from and to (x-units; infinite for all), one sample beyond each end. */
  slice(refs: readonly number[], from = -Infinity, to = Infinity): Signal[] {
    return refs.map((r) => {
      const h = this.held(r);
      if (from === -Infinity && to === Infinity) return { x: h.x.slice(), y: h.y.slice() };
      const a = Math.max(0, lowerBound(h.x, from) - 1);
      let b = lowerBound(h.x, to);
      if (b < h.x.length && h.x[b] <= to) b++;
      b = Math.min(h.x.length, b + 1);
      return { x: h.x.slice(a, b), y: h.y.slice(a, b) };
    });
  }

  /** The sample of each series nearest to x (in x). */
  nearest(refs: readonly number[], x: number): (NearestPoint | null)[] {
    return refs.map((ref) => {
      const h = this.held(ref);
      const n = h.x.length;
      if (!n || !Number.isFinite(x)) return null;
      let i = Math.min(lowerBound(h.x, x), n - 1);
      if (i > 0 && Math.abs(h.x[i - 1] - x) <= Math.abs(h.x[i] - x)) i -= 1;
      return { ref, x: h.x[i], y: h.y[i], index: i };
    });
  }

  clear(): void {
    this.byRef.clear();
    this.jobs = [];
  }
}
