/**
 * The computation worker's side of the detection partner (issue 16): starts
 * the partner thread (detect-partner.ts) when a detection first offers work,
 * sends it shares, and hands back each share's result as a
 * {@link SharedJob}. If the thread cannot be started, fails, or does not
 * answer within {@link PARTNER_TIMEOUT_MS}, the job settles without a result
 * and detection measures that share itself (the same table, only slower); the
 * reason is kept in {@link DetectPartnerClient.problem}.
 */
import type { CandidateShare, SharedJob, SharedKept } from '../core/measure/peak-table.ts';
import type { LocalMeasure } from '../core/measure/peak-bounds.ts';
import type { PeakOptions } from '../core/measure/peak-types.ts';

/** How many x grids the partner keeps (the sample's, and one of a resampling stack). */
export const PARTNER_KEEPS_X = 2;
/** A share not answered in this long is given up (its share is then measured by the worker). */
export const PARTNER_TIMEOUT_MS = 20_000;

export type ToPartner =
  | { type: 'share'; job: number; xId: number; x?: Float64Array; y: Float64Array; options: PeakOptions; index: Int32Array; halfWidth: Float64Array }
  | { type: 'cancel'; job: number };

export type FromPartner =
  | { type: 'kept'; job: number; at: Int32Array; measures: LocalMeasure[] }
  | { type: 'cancelled'; job: number }
  | { type: 'failed'; job: number; message: string };

/** The least of a Worker this client uses (a fake one in tests). */
export interface PartnerThread {
  postMessage(msg: ToPartner, transfer: Transferable[]): void;
  onmessage: ((ev: MessageEvent<FromPartner>) => void) | null;
  onerror: ((ev: ErrorEvent) => void) | null;
  terminate(): void;
}

interface Pending {
  done: (kept: SharedKept | undefined) => void;
  timer: ReturnType<typeof setTimeout>;
}

export class DetectPartnerClient {
  /** Why sharing stopped, if it did (the thread failed to start or to answer); detection then works alone. */
  problem: string | null = null;
  private thread: PartnerThread | null = null;
  private readonly pending = new Map<number, Pending>();
  private nextJob = 1;
  /** Ids of the x grids sent, by array (a trace's x keeps its identity in the worker's caches). */
  private readonly xIds = new WeakMap<Float64Array, number>();
  private nextX = 1;
  /** The ids the partner holds, oldest first (its own list, mirrored: messages arrive in order). */
  private readonly held: number[] = [];

  /** @param onProblem told once, when sharing stops (the page shows it as a notice). */
  constructor(private readonly make: () => PartnerThread, private readonly onProblem: (message: string) => void = () => {}) {}

  /** Start measuring a share on the partner thread; undefined once sharing has stopped (see {@link problem}). */
  start(share: CandidateShare): SharedJob | undefined {
    if (this.problem) return undefined;
    const thread = this.ensure();
    if (!thread) return undefined;
    const job = this.nextJob++;
    let xId = this.xIds.get(share.x);
    if (xId === undefined) { xId = this.nextX++; this.xIds.set(share.x, xId); }
    const sendX = !this.held.includes(xId);
    if (sendX) {
      this.held.push(xId);
      while (this.held.length > PARTNER_KEEPS_X) this.held.shift();
    }
    // Copies, handed over: the worker's arrays stay in its caches (and a view would send its whole buffer).
    const y = share.y.slice();
    const x = sendX ? share.x.slice() : undefined;
    const msg: ToPartner = { type: 'share', job, xId, y, options: share.options, index: share.index, halfWidth: share.halfWidth };
    if (x) msg.x = x;
    let result: SharedKept | undefined;
    let over = false;
    const settled = new Promise<void>((resolve) => {
      const timer = setTimeout(() => {
        this.stop(`The second thread for peak detection did not answer within ${PARTNER_TIMEOUT_MS / 1000} s.`);
      }, PARTNER_TIMEOUT_MS);
      this.pending.set(job, { timer, done: (kept) => { result = kept; over = true; resolve(); } });
    });
    try {
      thread.postMessage(msg, [y.buffer, ...(x ? [x.buffer] : []), share.index.buffer, share.halfWidth.buffer]);
    } catch (e) {
      this.stop(`A share of peak detection could not be sent to the second thread: ${e instanceof Error ? e.message : String(e)}`);
    }
    return {
      settled,
      result: () => result,
      cancel: () => {
        if (over) return;
        this.finish(job, undefined);
        this.thread?.postMessage({ type: 'cancel', job }, []);
      },
    };
  }

  private ensure(): PartnerThread | null {
    if (this.thread) return this.thread;
    try {
      const t = this.make();
      t.onmessage = (ev) => this.receive(ev.data);
      t.onerror = (ev) => { ev.preventDefault?.(); this.stop(`The second thread for peak detection failed: ${ev.message || 'no message given'}.`); };
      this.thread = t;
      return t;
    } catch (e) {
      this.stop(`The second thread for peak detection could not be started: ${e instanceof Error ? e.message : String(e)}`);
      return null;
    }
  }

  private receive(msg: FromPartner): void {
    if (msg.type === 'kept') this.finish(msg.job, { at: msg.at, measures: msg.measures });
    else if (msg.type === 'cancelled') this.finish(msg.job, undefined);
    else this.stop(`The second thread for peak detection could not measure its share: ${msg.message}`);
  }

  private finish(job: number, kept: SharedKept | undefined): void {
    const p = this.pending.get(job);
    if (!p) return;
    this.pending.delete(job);
    clearTimeout(p.timer);
    p.done(kept);
  }

  /** Sharing stops for good: every job settles without a result (detection measures those shares itself). */
  private stop(problem: string): void {
    if (!this.problem) this.onProblem(`${problem} Peak detection now measures every candidate on one thread (the same table, only slower).`);
    this.problem = problem;
    for (const job of [...this.pending.keys()]) this.finish(job, undefined);
    this.thread?.terminate();
    this.thread = null;
  }
}
