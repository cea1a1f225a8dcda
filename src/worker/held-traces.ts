/**
 * The worker's side of the bridge, written as a plain object so it can run
 * in-process where no Worker exists (Node tests, very old browsers).
 */
import { AnalysisMemo, analyse, analyseSteps, type AnalyseRequest, type AnalyseResult, type StageUpdate } from '../core/analysis/index.ts';
import type { Pause } from '../core/analysis/pause.ts';
import type { SharedJob } from '../core/measure/peak-table.ts';
import { loadFileHashed } from '../core/io/load.ts';
import type { LoadOptions, LoadResult } from '../core/io/types.ts';
import { PipelineCache } from '../core/pipeline.ts';
import { STEP_REGISTRY } from '../core/steps/registry.ts';
import type { Trace } from '../core/trace.ts';
import { fitRequest, type FitJobOutcome, type FitRequest } from './fit-job.ts';

/**
 * The traces the computation worker holds, with the caches of their
 * analyses (pipeline outputs, per-trace memos), and the jobs that run on
 * them: analyses stage by stage, fits, loads.
 */
export class HeldTraces {
  private traces = new Map<string, Trace>();
  private cache = new PipelineCache(96);
  /** Per-trace results the current stack's edits cannot change (the raw reference, each alternative); cleared with the inputs. */
  private memo = new AnalysisMemo();

  /**
   * The traces to analyse. With `keep`, `traces` are the new ones and the
   * traces already held whose ids are in `keep` stay (nothing is sent twice);
   * without it, `traces` is the whole set.
   */
  setInputs(traces: Trace[], keep?: readonly string[]): void {
    const next = new Map<string, Trace>();
    for (const t of traces) next.set(t.id, t);
    this.waiting = new Set();
    if (keep) {
      for (const id of keep) {
        if (next.has(id)) continue;
        const t = this.traces.get(id) ?? this.staged.get(id);
        if (t) next.set(id, t);
        else this.waiting.add(id);
      }
    }
    this.traces = next;
    for (const id of [...this.staged.keys()]) if (next.has(id)) this.staged.delete(id);
    this.cache.clear();
    this.memo.clear();
  }

  /**
   * Traces handed over by the loading worker (issue 13: copied there, so a
   * big file costs the page's thread nothing). They join the inputs when the
   * page names them, whether they arrive before or after it does.
   */
  stage(traces: Trace[]): void {
    for (const t of traces) {
      if (this.waiting.delete(t.id)) { this.traces.set(t.id, t); this.cache.clear(); this.memo.clear(); }
      else this.staged.set(t.id, t);
    }
  }

  /** True while the page has named traces that have not arrived yet. */
  get incomplete(): boolean {
    return this.waiting.size > 0;
  }

  private staged = new Map<string, Trace>();
  private waiting = new Set<string>();

  analyse(request: AnalyseRequest): AnalyseResult {
    return analyse(request, this.traces, STEP_REGISTRY, this.cache, this.memo);
  }

  /**
   * The same analysis stage by stage, with the pauses inside long stages (undefined); the worker posts each update and may stop pulling at a pause or between stages when a newer request comes.
   * A request of the page's own (not a `side` job: the standards' analyses) starts a new run of the pipeline cache, which
   * lets go of step outputs neither this run nor the one before it uses (pipeline.ts, issue 16).
   */
  stages(request: AnalyseRequest, side = false): Generator<StageUpdate | Pause, void, SharedJob | undefined> {
    if (!side) this.cache.beginRun();
    return analyseSteps(request, this.traces, STEP_REGISTRY, { pipeline: this.cache, memo: this.memo });
  }

  /** Fit a region (issue 18), with the same traces and pipeline cache as the analysis. */
  fit(request: FitRequest): FitJobOutcome {
    return fitRequest(request, this.traces, STEP_REGISTRY, this.cache);
  }

  /** Load a file; the SHA-256 is made by the platform's native digest where there is one (same hex as the pure one). */
  load(bytes: Uint8Array, fileName: string, options: LoadOptions | undefined, onProgress: (f: number) => void): Promise<LoadResult> {
    return loadFileHashed(bytes, fileName, { ...(options ?? {}), onProgress });
  }
}
