/**
 * The page's one handle on the computation worker.
 *
 * Only the newest analysis matters: every request goes to the worker at
 * once, the worker posts each stage as it lands and stops older work between
 * stages, and the page drops any update of a request it has superseded (its
 * promise resolves to null). A slider moved ten times thus waits for at most
 * one stage of stale work. Loads go to a second worker so a big file never
 * holds up the plot. Where no Worker exists (Node tests) everything runs
 * in-process, stage by stage the same way.
 */
import type { AnalyseRequest, AnalyseResult, StageUpdate } from '../core/analysis/index.ts';
import type { LoadOptions, LoadResult } from '../core/io/types.ts';
import type { Trace } from '../core/trace.ts';
import { HeldTraces } from './held-traces.ts';
import type { Call, FromWorker, Method, ParamsOf, ProgressOf, ResultOf, ToWorker } from './api.ts';
import { runBatch, type BatchFile, type BatchProgress, type BatchResult, type BatchSettings } from '../core/export/batch.ts';
import type { Recipe } from '../core/method.ts';
import { STEP_REGISTRY } from '../core/steps/registry.ts';
import type { FitJobOutcome, FitRequest } from './fit-job.ts';
import { macrotask, runStages } from './stager.ts';
import { lazyRows } from './transfer.ts';
import { rememberPeakView } from './peak-rank.ts';
import { ledgerFromColumns } from './ledger-columns.ts';
import type { Peak } from '../core/measure/peak-types.ts';
import type { Signal } from '../core/steps/types.ts';
import type { Drawn, FarSeries, NearestPoint, View } from './series.ts';

/**
 * Series kept in the worker (series.ts), by the placeholder that stands in for them in the page's result: the
 * Signal object (processed, residual, intermediate, an alternative's output) or the empty baseline array.
 */
const farSeries = new WeakMap<object, FarSeries>();

/** The series kept in the worker that this field of a result stands for; undefined when it crossed whole. */
export function farOf(s: Signal | Float64Array | null | undefined): FarSeries | undefined {
  return s ? farSeries.get(s) : undefined;
}

/** A stage's patch with each placeholder registered against the series it stands for. */
function markFar(patch: Partial<AnalyseResult>, far: readonly FarSeries[]): void {
  for (const f of far) {
    const at: object | undefined = f.field === 'outcome' ? patch.loss?.outcomes.find((o) => o.id === f.id)?.processed
      : f.field === 'baseline' ? patch.baseline ?? undefined : patch[f.field] ?? undefined;
    if (at) farSeries.set(at, f);
  }
}

type Job = {
  resolve: (v: unknown) => void;
  reject: (e: Error) => void;
  onProgress?: (p: unknown) => void;
  onStage?: (u: StageUpdate) => void;
};

/** Something went wrong that belongs to no job the page still waits for: the page shows it (a notice). */
export type ProblemSink = (title: string, lines: string[]) => void;

/**
 * How long the loading worker may sit idle before it is replaced (ms). An
 * idle worker collects no garbage: after a 20 MB file it kept the file's
 * bytes and the parser's buffers, 20–35 MB, until the next load (issue 16).
 * The fresh one (about 1.5 MB) starts at once, so the next load or batch
 * does not wait for a worker to start.
 */
export const LOADER_IDLE_MS = 2000;

class WorkerChannel {
  private worker: Worker | null = null;
  private jobs = new Map<number, Job>();
  private nextId = 1;
  private idleTimer: ReturnType<typeof setTimeout> | null = null;
  /** Counts the workers made; a new one holds no traces yet. */
  generation = 0;

  /** `retireAfterMs`: end the worker once it has had no job for that long (the loading worker). */
  constructor(private readonly make: () => Worker, private readonly problem: ProblemSink, private readonly name: string, private readonly retireAfterMs: number | null = null) {}

  private stopIdleTimer(): void {
    if (this.idleTimer !== null) { clearTimeout(this.idleTimer); this.idleTimer = null; }
  }

  /** No job left: replace the worker by a fresh one after the idle time, unless a call comes first. */
  private retireWhenIdle(): void {
    if (this.retireAfterMs === null || this.jobs.size > 0) return;
    this.stopIdleTimer();
    this.idleTimer = setTimeout(() => {
      this.idleTimer = null;
      if (this.jobs.size > 0 || !this.worker) return;
      this.worker.terminate();
      this.worker = null;
      this.ensure();
    }, this.retireAfterMs);
  }

  /** The generation of the live worker, making one when needed. */
  live(): number {
    this.ensure();
    return this.generation;
  }

  private ensure(): Worker {
    if (this.worker) return this.worker;
    this.generation++;
    const w = this.make();
    w.onmessage = (ev: MessageEvent<FromWorker>) => this.take(ev.data);
    w.onmessageerror = () => {
      // A message that could not be read: which job it answered is unknown, so it is said, not dropped.
      this.problem(`A message from the ${this.name} worker could not be read`, ['The browser could not copy it across. If a result does not appear, change a setting to ask for it again, or reload the page (your work is kept).']);
    };
    w.onerror = (ev) => {
      const err = new Error(`The ${this.name} worker stopped: ${ev.message || 'unknown error'}`);
      if (this.jobs.size === 0) this.problem(`The ${this.name} worker stopped`, [ev.message || 'unknown error', 'It is started again with the next request.']);
      for (const job of this.jobs.values()) job.reject(err);
      this.jobs.clear();
      this.worker?.terminate();
      this.worker = null;
    };
    this.worker = w;
    return w;
  }

  /** One message from the worker. */
  private take(msg: FromWorker): void {
    const job = msg.jobId === null ? undefined : this.jobs.get(msg.jobId);
    if (!job) {
      // A failure of no job the page waits for (traces, the port, an unreadable message) is shown, not dropped.
      if (msg.type === 'failed') this.problem(`The ${this.name} worker reported a problem`, [msg.message]);
      return;
    }
    if (msg.type === 'progress') { job.onProgress?.(msg.progress); return; }
    if (msg.type === 'stage') {
      // Rows are made as they are read (the table's shown rows, the plot's markers: the worker ranked them).
      let update = msg.peakColumns ? { ...msg.update, patch: { ...msg.update.patch, peaks: lazyRows<Peak>(msg.peakColumns) } } : msg.update;
      const loss = update.patch.loss;
      if (msg.ledgerColumns && loss) update = { ...update, patch: { ...update.patch, loss: { ...loss, ledger: ledgerFromColumns(msg.ledgerColumns) } } };
      if (msg.peakView && update.patch.peaks) rememberPeakView(update.patch.peaks, msg.peakView);
      if (msg.far) markFar(update.patch, msg.far);
      job.onStage?.(update);
      return;
    }
    this.jobs.delete(msg.jobId!);
    if (msg.type === 'failed') job.reject(Object.assign(new Error(msg.message), { missing: msg.missing === true }));
    else job.resolve(msg.value);
    this.retireWhenIdle();
  }

  send(msg: ToWorker, transfer: Transferable[] = []): void {
    this.stopIdleTimer();
    this.ensure().postMessage(msg, transfer);
  }

  /** Call one method; the promise gets that method's result (its type is the method's, not the caller's choice). */
  call<M extends Method>(method: M, params: ParamsOf<M>, opts: { transfer?: Transferable[]; onProgress?: (p: ProgressOf<M>) => void; onStage?: (u: StageUpdate) => void } = {}): Promise<ResultOf<M>> {
    const jobId = this.nextId++;
    return new Promise<ResultOf<M>>((resolve, reject) => {
      this.jobs.set(jobId, { resolve: resolve as (v: unknown) => void, reject, onProgress: opts.onProgress as ((p: unknown) => void) | undefined, onStage: opts.onStage });
      this.send({ type: 'call', method, jobId, params } as Call, opts.transfer ?? []);
    });
  }

  /** Stop the current job (a long load, say) by replacing the worker. */
  cancelAll(): void {
    this.stopIdleTimer();
    this.worker?.terminate();
    this.worker = null;
    const err = new Error('Cancelled.');
    for (const job of this.jobs.values()) job.reject(err);
    this.jobs.clear();
  }
}

export interface ComputeBackend {
  setInputs(traces: Trace[]): void;
  /** Run an analysis; `onStage` gets each stage's update as it lands. True when every stage landed, false when a newer request stopped it. */
  /** `side`: outside the latest-only order (neither cancels nor is cancelled). */
  analyse(request: AnalyseRequest, onStage: (u: StageUpdate) => void, side?: boolean): Promise<boolean>;
  load(bytes: Uint8Array, fileName: string, options?: Omit<LoadOptions, 'onProgress'>, onProgress?: (f: number) => void): Promise<LoadResult>;
  cancelLoad(): void;
  /** Fit a region (issue 18); runs after the analysis already sent. */
  fit(request: FitRequest): Promise<FitJobOutcome>;
  /** One recipe over many files (the files' bytes are handed over); off the page's thread where there is a worker. */
  batch(files: BatchFile[], recipe: Recipe, settings: BatchSettings, onProgress?: (p: BatchProgress) => void): Promise<BatchResult>;
  /** Series kept in the worker, drawn for a view (which later stages then use too). */
  draw(refs: number[], view: View): Promise<Drawn[]>;
  /** Exact copies of series kept in the worker, whole or between two x. */
  slice(refs: number[], from?: number, to?: number): Promise<Signal[]>;
  /** The sample of each series kept in the worker nearest to x. */
  nearest(refs: number[], x: number): Promise<(NearestPoint | null)[]>;
}

/** The exact arrays of one field of a result (fetched from the worker when they stayed there). */
export async function exactSignal(backend: ComputeBackend, s: Signal, from?: number, to?: number): Promise<Signal> {
  const f = farOf(s);
  return f ? (await backend.slice([f.ref], from, to))[0] : s;
}

/**
 * A copy of a result with every series that stayed in the worker fetched whole (exports, reports): exactly
 * the arrays the analysis made, in one call. The result itself is not changed.
 */
export async function exactResult(backend: ComputeBackend, r: AnalyseResult): Promise<AnalyseResult> {
  const outcomes = r.loss?.outcomes ?? [];
  const fields: (Signal | Float64Array | null | undefined)[] = [r.processed, r.residual, r.baseline, r.intermediate, ...outcomes.map((o) => o.processed)];
  const far = fields.map(farOf);
  const refs = far.filter((f): f is FarSeries => f !== undefined).map((f) => f.ref);
  if (!refs.length) return r;
  const got = new Map<number, Signal>();
  (await backend.slice(refs)).forEach((s, i) => got.set(refs[i], s));
  const sig = (s: Signal, f: FarSeries | undefined) => (f ? got.get(f.ref)! : s);
  return {
    ...r,
    processed: sig(r.processed, far[0]),
    residual: sig(r.residual, far[1]),
    baseline: far[2] ? got.get(far[2].ref)!.y : r.baseline,
    intermediate: r.intermediate ? sig(r.intermediate, far[3]) : r.intermediate,
    loss: r.loss ? { ...r.loss, outcomes: outcomes.map((o, k) => ({ ...o, processed: sig(o.processed, far[4 + k]) })) } : r.loss,
  };
}

/**
 * Backend using two Web Workers (analysis and loading). A trace crosses to
 * the analysis worker once: the loading worker hands it a copy of every
 * file it reads through a port between the two (so the page's thread never
 * copies a big file), and the page then only names which traces stay;
 * traces that did not come that way (a restored session) are copied once.
 */
export function workerBackend(make: () => Worker, problem: ProblemSink = () => undefined): ComputeBackend {
  const compute = new WorkerChannel(make, problem, 'computation');
  const loader = new WorkerChannel(make, problem, 'loading', LOADER_IDLE_MS);
  // Ids the compute worker holds, and for which worker.
  let held = new Set<string>();
  let heldBy = 0;
  // Ids the loading worker handed to the compute worker of generation `portedTo`.
  let ported = new Set<string>();
  let portedTo = 0;
  let portFor: [number, number] | null = null;
  let current: Trace[] = [];
  const sendInputs = () => {
    const gen = compute.live();
    const known = gen === heldBy ? held : new Set<string>();
    const viaPort = gen === portedTo ? ported : new Set<string>();
    // Copied here and handed over: one memory copy instead of the slower structured clone.
    const fresh = current.filter((x) => !known.has(x.id) && !viaPort.has(x.id)).map((t) => ({ ...t, x: t.x.slice(), y: t.y.slice() }));
    compute.send({ type: 'inputs', traces: fresh, keep: current.map((x) => x.id) }, fresh.flatMap((t) => [t.x.buffer, t.y.buffer]));
    held = new Set(current.map((x) => x.id));
    heldBy = gen;
    for (const id of held) ported.delete(id);
  };
  const ensurePort = (): boolean => {
    if (typeof MessageChannel === 'undefined') return false;
    const c = compute.live(), l = loader.live();
    if (portFor && portFor[0] === c && portFor[1] === l) return true;
    const ch = new MessageChannel();
    compute.send({ type: 'port', port: ch.port1 }, [ch.port1]);
    loader.send({ type: 'port', port: ch.port2 }, [ch.port2]);
    portFor = [c, l];
    return true;
  };
  const analyseOnce = (request: AnalyseRequest, onStage: (u: StageUpdate) => void, side?: boolean) => {
    // A worker made anew (after a fault) is given the traces again first.
    if (compute.live() !== heldBy) sendInputs();
    return compute.call('analyse', { request, side }, { onStage }).then((r) => r.outcome === 'done');
  };
  return {
    setInputs(t) { current = t; sendInputs(); },
    analyse(request, onStage, side) {
      return analyseOnce(request, onStage, side).catch((e: Error & { missing?: boolean }) => {
        if (!e.missing) throw e;
        // A trace named by the page never came through the port: send them all and try once more.
        heldBy = 0;
        portedTo = 0;
        return analyseOnce(request, onStage, side);
      });
    },
    load(bytes, fileName, options, onProgress) {
      const share = ensurePort();
      const gen = compute.generation;
      return loader.call('load', { bytes, fileName, options, share }, { transfer: [bytes.buffer as ArrayBuffer], onProgress })
        .then((m) => {
          if (m.shared && m.result.ok && compute.generation === gen) {
            if (portedTo !== gen) { ported = new Set(); portedTo = gen; }
            for (const t of m.result.traces) ported.add(t.id);
          }
          return m.result;
        });
    },
    cancelLoad() { loader.cancelAll(); },
    fit(request) {
      if (compute.live() !== heldBy) sendInputs();
      return compute.call('fit', request);
    },
    batch(files, recipe, settings, onProgress) {
      // On the loading worker: a batch of large files then holds up neither the page nor the live analysis.
      const transfer = [...new Set(files.map((f) => f.bytes.buffer as ArrayBuffer))];
      return loader.call('batch', { files, recipe, settings }, { transfer, onProgress });
    },
    draw(refs, view) { return compute.call('draw', { refs, view }); },
    slice(refs, from, to) { return compute.call('slice', { refs, from, to }); },
    nearest(refs, x) { return compute.call('nearest', { refs, x }); },
  };
}

/** Backend running in the calling thread (tests, or when Worker is missing). */
export function inProcessBackend(): ComputeBackend {
  const held = new HeldTraces();
  let latest = 0;
  return {
    setInputs(t) { held.setInputs(t); },
    analyse(request, onStage, side) {
      const mine = side ? 0 : ++latest;
      // Started on a later task, as a worker would, so a newer request made in the same task wins at once.
      return macrotask().then(() => runStages(held.stages(request, !!side), onStage, () => !side && mine !== latest)).then((o) => o === 'done');
    },
    load(bytes, fileName, options, onProgress) {
      return Promise.resolve().then(() => held.load(bytes, fileName, options, onProgress ?? (() => undefined)));
    },
    cancelLoad() { /* an in-process load cannot be interrupted */ },
    fit(request) { return Promise.resolve().then(() => held.fit(request)); },
    batch(files, recipe, settings, onProgress) {
      // In this thread: the page repaints between files (a timer after each).
      return runBatch(files, recipe, STEP_REGISTRY, settings, (p) => { onProgress?.(p); return macrotask(); });
    },
    // In this thread every series is handed over whole, so nothing is ever kept apart to ask for.
    draw() { return Promise.reject(new Error('No series are kept apart when the analysis runs in the page.')); },
    slice() { return Promise.reject(new Error('No series are kept apart when the analysis runs in the page.')); },
    nearest() { return Promise.reject(new Error('No series are kept apart when the analysis runs in the page.')); },
  };
}

/**
 * Latest-wins scheduler over a backend: each request goes out at once (the
 * backend stops older work between stages); updates of a request that a
 * newer one has superseded are dropped, and its promise resolves to null.
 */
export class LatestOnly {
  private generation = 0;
  /** Jobs sent to the backend (for tests and timing). */
  sent = 0;

  constructor(private readonly backend: ComputeBackend) {}

  /** True when every stage landed; null when a newer request superseded this one. */
  run(request: AnalyseRequest, onStage: (u: StageUpdate) => void): Promise<boolean | null> {
    const mine = ++this.generation;
    this.sent++;
    return this.backend.analyse(request, (u) => { if (mine === this.generation) onStage(u); })
      .then((done) => (mine === this.generation ? done : null), (e: Error) => { if (mine === this.generation) throw e; return null; });
  }
}
