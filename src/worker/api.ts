/**
 * The one typed contract between the page and its workers: a method map.
 * Each method names what the page sends (`params`), what comes back when it
 * is finished (`result`) and what it reports on the way (`progress`), so the
 * page's side (bridge.ts) and the worker's side (worker.ts) cannot disagree
 * and no caller chooses the type of its own answer.
 *
 * Raw traces cross once (`inputs` sends only traces the worker does not
 * hold yet); after that only recipes and settings. Arrays coming back are
 * transferred, not copied (a loaded file's traces too).
 */
import type { LoadOptions, LoadResult } from '../core/io/types.ts';
import type { Trace } from '../core/trace.ts';
import type { AnalyseRequest, StageUpdate } from '../core/analysis/index.ts';
import type { BatchFile, BatchProgress, BatchResult, BatchSettings } from '../core/export/batch.ts';
import type { Recipe } from '../core/method.ts';
import type { Columns } from './transfer.ts';
import type { PeakView } from './peak-rank.ts';
import type { LedgerColumns } from './ledger-columns.ts';
import type { FitJobOutcome, FitRequest } from './fit-job.ts';
import type { Signal } from '../core/steps/types.ts';
import type { Drawn, FarSeries, NearestPoint, View } from './series.ts';

/** Every job a worker does for the page. */
export interface WorkerMethods {
  /**
   * An analysis, posted stage by stage ('stage' messages) as each lands. `side`: a job outside the latest-only
   * order (the standards' analyses, issue 21): it neither cancels nor is cancelled. 'cancelled' when a newer
   * analysis came in first: the stages not yet posted never will be.
   */
  analyse: { params: { request: AnalyseRequest; side?: boolean }; result: { outcome: 'done' | 'cancelled'; ms: number }; progress: never };
  /** Fit a region (issue 18, worker/fit-job.ts). */
  fit: { params: FitRequest; result: FitJobOutcome; progress: never };
  /**
   * Read a file (the loading worker). `share`: also hand a copy of the traces to the computation worker through
   * the port (made off the page's thread); `shared` says it was done. Progress: the fraction read.
   */
  load: {
    params: { bytes: Uint8Array; fileName: string; options?: Omit<LoadOptions, 'onProgress'>; share?: boolean };
    result: { result: LoadResult; shared: boolean };
    progress: number;
  };
  /** One recipe over many files (core/export/batch.ts), off the page's thread; progress after each file. */
  batch: { params: { files: BatchFile[]; recipe: Recipe; settings: BatchSettings }; result: BatchResult; progress: BatchProgress };
  /** Long series kept in the worker (series.ts) drawn for a view, which also becomes the view of later stages. */
  draw: { params: { refs: number[]; view: View }; result: Drawn[]; progress: never };
  /** Exact copies of long series kept in the worker, whole or between two x (exports, the focused view). */
  slice: { params: { refs: number[]; from?: number; to?: number }; result: Signal[]; progress: never };
  /** The sample of each long series nearest to an x (the cursor readout). */
  nearest: { params: { refs: number[]; x: number }; result: (NearestPoint | null)[]; progress: never };
}

export type Method = keyof WorkerMethods;
export type ParamsOf<M extends Method> = WorkerMethods[M]['params'];
export type ResultOf<M extends Method> = WorkerMethods[M]['result'];
export type ProgressOf<M extends Method> = WorkerMethods[M]['progress'];

/** A call of one method. */
export type Call = { [M in Method]: { type: 'call'; method: M; jobId: number; params: ParamsOf<M> } }[Method];

export type ToWorker =
  | Call
  /** New traces, and (when given) the ids of every trace that stays: traces the worker holds already are not sent again. */
  | { type: 'inputs'; traces: Trace[]; keep?: string[] }
  /** One end of the channel between the loading and the computation worker. */
  | { type: 'port'; port: MessagePort };

/** What the loading worker sends the computation worker through their port: a loaded file's traces, copied. */
export type ThroughPort = { type: 'traces'; traces: Trace[] };

export type FromWorker =
  /** A finished call: its method's result type. */
  | { [M in Method]: { type: 'result'; method: M; jobId: number; value: ResultOf<M> } }[Method]
  | { [M in Method]: { type: 'progress'; method: M; jobId: number; progress: ProgressOf<M> } }[Method]
  /**
   * One stage of an analysis, as soon as it is ready (its arrays transferred); more follow until the result.
   * The peak table crosses as typed-array columns (`peakColumns`, transferred) in place of `patch.peaks`;
   * `peakView`: the peak table's shown rows and the plot's markers, ranked in the worker, and the table's totals
   * (peak-rank.ts), so the page reads only those rows (it makes them as they are read, transfer.ts lazyRows);
   * the loss check's ledger as columns (`ledgerColumns`, ledger-columns.ts) in place of `patch.loss.ledger`;
   * series longer than series.ts's WHOLE_UP_TO stay in the worker (`far`: empty arrays in the patch, drawn for the view).
   */
  | { type: 'stage'; jobId: number; update: StageUpdate; peakColumns?: Columns; peakView?: PeakView; ledgerColumns?: LedgerColumns; far?: FarSeries[] }
  /**
   * A call, or a message that belongs to none (`jobId` null: traces or a port the worker could not take, a
   * message it could not read), went wrong. `missing`: traces the page named never reached this worker (the
   * page sends them again and retries).
   */
  | { type: 'failed'; jobId: number | null; message: string; missing?: boolean };
