/**
 * The page's one handle on the computation worker.
 *
 * Only the newest analysis matters: while a job runs, a newer request waits
 * in a single slot (an older waiting request is dropped and its promise
 * resolves to null), so a slider moved ten times runs at most one stale job
 * and the newest. Loads go to a second worker so a big file never holds up
 * the plot. Where no Worker exists (Node tests) everything runs in-process.
 */
import type { AnalyseRequest, AnalyseResult } from '../core/analyse.ts';
import type { LoadOptions, LoadResult } from '../core/io/types.ts';
import type { Trace } from '../core/trace.ts';
import { Engine } from './engine.ts';
import type { FromWorker, ToWorker } from './protocol.ts';

type Pending<T> = { resolve: (v: T) => void; reject: (e: Error) => void };

class WorkerChannel {
  private worker: Worker | null = null;
  private jobs = new Map<number, Pending<unknown> & { onProgress?: (f: number) => void }>();
  private nextId = 1;

  constructor(private readonly make: () => Worker) {}

  private ensure(): Worker {
    if (this.worker) return this.worker;
    const w = this.make();
    w.onmessage = (ev: MessageEvent<FromWorker>) => {
      const msg = ev.data;
      const job = this.jobs.get(msg.jobId);
      if (!job) return;
      if (msg.type === 'progress') { job.onProgress?.(msg.fraction); return; }
      this.jobs.delete(msg.jobId);
      if (msg.type === 'failed') job.reject(new Error(msg.message));
      else job.resolve(msg.result);
    };
    w.onerror = (ev) => {
      const err = new Error(`The computation worker stopped: ${ev.message || 'unknown error'}`);
      for (const job of this.jobs.values()) job.reject(err);
      this.jobs.clear();
      this.worker?.terminate();
      this.worker = null;
    };
    this.worker = w;
    return w;
  }

  send(msg: ToWorker, transfer: Transferable[] = []): void {
    this.ensure().postMessage(msg, transfer);
  }

  request<T>(build: (jobId: number) => ToWorker, transfer: Transferable[] = [], onProgress?: (f: number) => void): Promise<T> {
    const jobId = this.nextId++;
    return new Promise<T>((resolve, reject) => {
      this.jobs.set(jobId, { resolve: resolve as (v: unknown) => void, reject, onProgress });
      this.send(build(jobId), transfer);
    });
  }

  /** Stop the current job (a long load, say) by replacing the worker. */
  cancelAll(): void {
    this.worker?.terminate();
    this.worker = null;
    const err = new Error('Cancelled.');
    for (const job of this.jobs.values()) job.reject(err);
    this.jobs.clear();
  }
}

export interface ComputeBackend {
  setInputs(traces: Trace[]): void;
  analyse(request: AnalyseRequest): Promise<AnalyseResult>;
  load(bytes: Uint8Array, fileName: string, options?: Omit<LoadOptions, 'onProgress'>, onProgress?: (f: number) => void): Promise<LoadResult>;
  cancelLoad(): void;
}

/** Backend using two Web Workers (analysis and loading). */
export function workerBackend(make: () => Worker): ComputeBackend {
  const compute = new WorkerChannel(make);
  const loader = new WorkerChannel(make);
  let traces: Trace[] = [];
  return {
    setInputs(t) { traces = t; compute.send({ type: 'inputs', traces }); },
    analyse(request) { return compute.request<AnalyseResult>((jobId) => ({ type: 'analyse', jobId, request })); },
    load(bytes, fileName, options, onProgress) {
      return loader.request<LoadResult>((jobId) => ({ type: 'load', jobId, bytes, fileName, options }), [bytes.buffer as ArrayBuffer], onProgress);
    },
    cancelLoad() { loader.cancelAll(); },
  };
}

/** Backend running in the calling thread (tests, or when Worker is missing). */
export function inProcessBackend(): ComputeBackend {
  const engine = new Engine();
  return {
    setInputs(t) { engine.setInputs(t); },
    analyse(request) { return Promise.resolve().then(() => engine.analyse(request)); },
    load(bytes, fileName, options, onProgress) {
      return Promise.resolve().then(() => engine.load(bytes, fileName, options, onProgress ?? (() => undefined)));
    },
    cancelLoad() { /* an in-process load cannot be interrupted */ },
  };
}

/**
 * Latest-wins scheduler over a backend: at most one analysis in flight and
 * one waiting; a request superseded while waiting resolves to null.
 */
export class LatestOnly {
  private running = false;
  private waiting: { request: AnalyseRequest; resolve: (r: AnalyseResult | null) => void; reject: (e: Error) => void } | null = null;
  /** Jobs actually sent to the backend (for tests and timing). */
  sent = 0;

  constructor(private readonly backend: ComputeBackend) {}

  run(request: AnalyseRequest): Promise<AnalyseResult | null> {
    return new Promise((resolve, reject) => {
      if (this.waiting) this.waiting.resolve(null);
      this.waiting = { request, resolve, reject };
      this.pump();
    });
  }

  private pump(): void {
    if (this.running || !this.waiting) return;
    const job = this.waiting;
    this.waiting = null;
    this.running = true;
    this.sent++;
    this.backend.analyse(job.request).then(
      (r) => { this.running = false; job.resolve(r); this.pump(); },
      (e: Error) => { this.running = false; job.reject(e); this.pump(); },
    );
  }
}
