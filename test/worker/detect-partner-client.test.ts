/**
 * worker/detect-partner-client.ts: the computation worker's side of the
 * second detection thread (issue 16). With a stand-in thread that measures
 * shares in this process (measureShareStepwise on the copies a message would
 * carry), the kept measures come back as detection alone makes them; x is
 * sent once per grid while the thread holds it; a cancel reaches the thread;
 * and when the thread fails, cannot start or does not answer, every job
 * settles without a result (detection then measures that half itself), the
 * reason is told once, and no later share is sent. The properties checked
 * are those the module's doc comments state.
 */
import { afterEach, describe, expect, test, vi } from 'vitest';
import { drain } from '../../src/core/analysis/pause.ts';
import { defaultPeakOptions, measureShareStepwise, type CandidateShare } from '../../src/core/measure/peak-table.ts';
import { prominentMaxima } from '../../src/core/measure/peak-detection.ts';
import {
  DetectPartnerClient, PARTNER_KEEPS_X, PARTNER_TIMEOUT_MS, type FromPartner, type PartnerThread, type ToPartner,
} from '../../src/worker/detect-partner-client.ts';
import { makeBenchTrace } from '../bench/bench-trace.ts';

afterEach(() => { vi.useRealTimers(); });

/** A thread in this process: it keeps x grids like detect-partner.ts and answers each share after a timer. */
class FakeThread implements PartnerThread {
  onmessage: ((ev: MessageEvent<FromPartner>) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  readonly sent: ToPartner[] = [];
  readonly grids = new Map<number, Float64Array>();
  terminated = false;
  constructor(private readonly behave: 'measure' | 'fail' | 'silent' = 'measure') {}
  postMessage(msg: ToPartner): void {
    const copy = structuredClone(msg);
    this.sent.push(copy);
    if (copy.type !== 'share') return;
    if (copy.x) { this.grids.set(copy.xId, copy.x); while (this.grids.size > PARTNER_KEEPS_X) this.grids.delete(this.grids.keys().next().value as number); }
    if (this.behave === 'silent') return;
    setTimeout(() => {
      if (this.terminated) return;
      if (this.behave === 'fail') { this.onmessage?.({ data: { type: 'failed', job: copy.job, message: 'out of memory' } } as MessageEvent<FromPartner>); return; }
      const x = this.grids.get(copy.xId)!;
      const kept = drain(measureShareStepwise({ x, y: copy.y, options: copy.options, index: copy.index, halfWidth: copy.halfWidth }));
      this.onmessage?.({ data: structuredClone({ type: 'kept', job: copy.job, at: kept.at, measures: kept.measures }) } as MessageEvent<FromPartner>);
    }, 0);
  }
  terminate(): void { this.terminated = true; }
}

function shareOf(n = 20_000, seed?: Float64Array): CandidateShare {
  const t = makeBenchTrace(n);
  const o = defaultPeakOptions(t.sigma, 0.001);
  const c = prominentMaxima(t.y, o.minProminence);
  return { x: seed ?? t.x, y: t.y, options: o, index: c.index.slice(0, c.count), halfWidth: c.halfWidth.slice(0, c.count) };
}

describe('DetectPartnerClient', () => {
  test('a share comes back with the measures detection makes alone; x crosses once while the thread holds it, y every time, as copies', async () => {
    const thread = new FakeThread();
    const make = vi.fn(() => thread);
    const client = new DetectPartnerClient(make);
    const share = shareOf();
    const alone = drain(measureShareStepwise(share));
    expect(alone.at.length).toBeGreaterThan(50);
    const job = client.start({ ...share, index: share.index.slice(), halfWidth: share.halfWidth.slice() })!;
    expect(job.result()).toBeUndefined();
    await job.settled;
    expect(job.result()).toEqual(alone);
    // The caller's arrays stay whole (copies were handed over).
    expect(share.y.length).toBe(20_000);
    const again = client.start({ ...share, index: share.index.slice(), halfWidth: share.halfWidth.slice() })!;
    await again.settled;
    expect(again.result()).toEqual(alone);
    const shares = thread.sent.filter((m): m is Extract<ToPartner, { type: 'share' }> => m.type === 'share');
    expect(shares.map((m) => m.x !== undefined)).toEqual([true, false]);
    expect(shares.every((m) => m.y.length === 20_000)).toBe(true);
    expect(make).toHaveBeenCalledTimes(1);
    expect(client.problem).toBeNull();
  });

  test('after PARTNER_KEEPS_X other grids the first grid is sent again (the client mirrors what the thread holds)', async () => {
    const thread = new FakeThread();
    const client = new DetectPartnerClient(() => thread);
    const base = shareOf(6_000);
    const grids = Array.from({ length: PARTNER_KEEPS_X + 1 }, () => base.x.slice());
    for (const x of [...grids, grids[0]]) await client.start({ ...base, x, index: base.index.slice(), halfWidth: base.halfWidth.slice() })!.settled;
    const sentX = thread.sent.filter((m) => m.type === 'share').map((m) => (m as { x?: Float64Array }).x !== undefined);
    expect(sentX).toEqual([...grids.map(() => true), true]);
  });

  test('cancel settles the job without a result and tells the thread', async () => {
    const thread = new FakeThread('silent');
    const client = new DetectPartnerClient(() => thread);
    const job = client.start(shareOf(6_000))!;
    job.cancel();
    await job.settled;
    expect(job.result()).toBeUndefined();
    expect(thread.sent.at(-1)).toEqual({ type: 'cancel', job: 1 });
  });

  test('a thread that fails: the job settles without a result, the reason is told once, no later share is sent', async () => {
    const thread = new FakeThread('fail');
    const told = vi.fn();
    const client = new DetectPartnerClient(() => thread, told);
    const job = client.start(shareOf(6_000))!;
    await job.settled;
    expect(job.result()).toBeUndefined();
    expect(told).toHaveBeenCalledTimes(1);
    expect(told.mock.calls[0][0]).toMatch(/could not measure its share: out of memory.*one thread \(the same table, only slower\)/);
    expect(thread.terminated).toBe(true);
    expect(client.start(shareOf(6_000))).toBeUndefined();
    expect(told).toHaveBeenCalledTimes(1);
  });

  test('a thread that cannot be started, or does not answer within PARTNER_TIMEOUT_MS, stops sharing', async () => {
    const told = vi.fn();
    const broken = new DetectPartnerClient(() => { throw new Error('workers are not allowed here'); }, told);
    expect(broken.start(shareOf(6_000))).toBeUndefined();
    expect(broken.problem).toMatch(/could not be started: workers are not allowed here/);
    vi.useFakeTimers();
    const client = new DetectPartnerClient(() => new FakeThread('silent'), told);
    const job = client.start(shareOf(6_000))!;
    vi.advanceTimersByTime(PARTNER_TIMEOUT_MS - 1);
    expect(client.problem).toBeNull();
    vi.advanceTimersByTime(1);
    await job.settled;
    expect(job.result()).toBeUndefined();
    expect(client.problem).toMatch(/did not answer within 20 s/);
    expect(told).toHaveBeenCalledTimes(2);
  });
});
