/**
 * The one typed contract between the page and the computation worker.
 * Raw traces cross once (`inputs` sends only traces the worker does not
 * hold yet); after that only recipes and settings. Arrays coming back are
 * transferred, not copied (a loaded file's traces too).
 */
import type { LoadOptions, LoadResult } from '../core/io/types.ts';
import type { Trace } from '../core/trace.ts';
import type { AnalyseRequest, StageUpdate } from '../core/analysis/index.ts';
import type { Columns } from './columns.ts';
import type { FitJobOutcome, FitRequest } from './fit-job.ts';

export type { AnalyseRequest, StageUpdate };

export type ToWorker =
  /** New traces, and (when given) the ids of every trace that stays: traces the worker holds already are not sent again. */
  | { type: 'inputs'; traces: Trace[]; keep?: string[] }
  /** `side`: a job outside the latest-only order (the standards' analyses, issue 21): it neither cancels nor is cancelled. */
  | { type: 'analyse'; jobId: number; request: AnalyseRequest; side?: boolean }
  /** Fit a region (issue 18, worker/fit-job.ts). */
  | { type: 'fit'; jobId: number; request: FitRequest }
  /** `share`: also hand a copy of the traces to the computation worker through the port (made off the page's thread). */
  | { type: 'load'; jobId: number; bytes: Uint8Array; fileName: string; options?: Omit<LoadOptions, 'onProgress'>; share?: boolean }
  /** One end of the channel between the loading and the computation worker. */
  | { type: 'port'; port: MessagePort };

/** What the loading worker sends the computation worker through their port: a loaded file's traces, copied. */
export type ThroughPort = { type: 'traces'; traces: Trace[] };

export type FromWorker =
  /**
   * One stage of an analysis, as soon as it is ready (its arrays transferred); more follow until 'done' or
   * 'cancelled'. The peak table crosses as typed-array columns (`peakColumns`, transferred) in place of `patch.peaks`.
   */
  | { type: 'stage'; jobId: number; update: StageUpdate; peakColumns?: Columns }
  /** Every stage of the analysis was posted. */
  | { type: 'done'; jobId: number; ms: number }
  /** A newer analysis came in before this one finished: the stages not yet posted never will be. */
  | { type: 'cancelled'; jobId: number }
  | { type: 'fitted'; jobId: number; outcome: FitJobOutcome }
  /** `shared`: the traces went to the computation worker through the port too. */
  | { type: 'loaded'; jobId: number; result: LoadResult; shared?: boolean }
  | { type: 'progress'; jobId: number; fraction: number }
  /** `missing`: traces the page named never reached this worker (the page sends them again and retries). */
  | { type: 'failed'; jobId: number; message: string; missing?: boolean };
