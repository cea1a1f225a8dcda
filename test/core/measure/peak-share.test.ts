/**
 * Peak detection sharing its later candidates with another thread (issue 16;
 * core/measure/peak-table.ts, `detectPeaksStepwise` and
 * `measureShareStepwise`). Every candidate's measure depends on that
 * candidate alone, so the table must be the one detection makes alone, byte
 * for byte: the digests of test/reference/peak-table-digests.json (made at
 * 4591a42, see peak-table-digests.test.ts), whether the share is measured
 * elsewhere (here: after a timer, on copies made by structuredClone as a
 * message between threads makes them), fails, is cancelled, or is never
 * answered.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it, vi } from 'vitest';
import { drain, isShareOffer } from '../../../src/core/analysis/pause.ts';
import {
  defaultPeakOptions, detectPeaks, detectPeaksStepwise, measureShareStepwise, SHARE_FRACTION, SHARE_MIN_CANDIDATES,
  type CandidateShare, type SharedJob, type SharedKept,
} from '../../../src/core/measure/peak-table.ts';
import type { Peak, PeakOptions } from '../../../src/core/measure/peak-types.ts';
import { prominentMaxima } from '../../../src/core/measure/peak-detection.ts';
import { makeBenchTrace } from '../../bench/bench-trace.ts';
import { digestCases, digestOfTable, type Digest } from './peak-table-digests.ts';

const FILE = new URL('../../reference/peak-table-digests.json', import.meta.url);
const want = (JSON.parse(readFileSync(FILE, 'utf8')) as { cases: Record<string, Digest> }).cases;

/** A share measured "elsewhere": on structured copies, after a timer, its result copied back. */
function elsewhere(share: CandidateShare, log: { started: number; cancelled: number }): SharedJob {
  log.started++;
  const copy = structuredClone(share);
  let result: SharedKept | undefined;
  let stopped = false;
  const settled = new Promise<void>((resolve) => {
    setTimeout(() => {
      if (!stopped) result = structuredClone(drain(measureShareStepwise(copy)));
      resolve();
    }, 0);
  });
  return { settled, result: () => result, cancel: () => { if (!result) { stopped = true; log.cancelled++; } } };
}

/** Run detection as the worker's stager does: offers answered by `answer`, promises awaited. */
async function detectWith(x: Float64Array, y: Float64Array, o: PeakOptions, answer: (s: CandidateShare) => SharedJob | undefined): Promise<{ peaks: Peak[]; offers: number }> {
  const steps = detectPeaksStepwise(x, y, o);
  let reply: SharedJob | undefined;
  let offers = 0;
  for (;;) {
    const r = steps.next(reply);
    reply = undefined;
    if (r.done) return { peaks: r.value, offers };
    const v = r.value;
    if (isShareOffer(v)) { offers++; reply = answer(v.share); } else if (v instanceof Promise) await v;
  }
}

// The digest cases with enough candidates to be offered: the bench trace (10⁶ and 10⁵ as dips) and the drifting,
// banded and AR(1) traces at 10⁵ (test/core/measure/long-traces.ts).
const LONG = digestCases().filter((c) => c.name.startsWith('bench trace') || c.name.includes(' 1e5 seed '));

describe('detection with its later candidates measured on another thread', () => {
  it('gives the table detection makes alone, byte for byte, on every long digest case; each with enough candidates was shared once', async () => {
    expect(LONG.map((c) => c.name)).toHaveLength(8);
    let shared = 0;
    for (const c of LONG) {
      const { x, y, options } = c.make();
      const candidates = prominentMaxima(options.negative ? y.map((v) => -v) : y, options.minProminence).count;
      const log = { started: 0, cancelled: 0 };
      const { peaks, offers } = await detectWith(x, y, options, (s) => elsewhere(s, log));
      const expected = candidates >= SHARE_MIN_CANDIDATES ? 1 : 0;
      expect(offers, c.name).toBe(expected);
      expect(log, c.name).toEqual({ started: expected, cancelled: 0 });
      expect(digestOfTable(options, peaks), c.name).toEqual(want[c.name]);
      shared += expected;
    }
    // Not a vacuous pass: the bench traces and the drifting and banded traces are shared (the AR(1) ones have fewer maxima).
    expect(shared).toBeGreaterThanOrEqual(6);
  }, 240_000);

  it('a share that fails, or is never answered (drain), leaves the half to detection itself: the same table', async () => {
    const t = makeBenchTrace(100_000);
    const o = defaultPeakOptions(t.sigma, 0.001);
    const alone = JSON.stringify(detectPeaks(t.x, t.y, o));
    const failed: SharedJob = { settled: Promise.resolve(), result: () => undefined, cancel: vi.fn() };
    const r = await detectWith(t.x, t.y, o, () => failed);
    expect(r.offers).toBe(1);
    expect(JSON.stringify(r.peaks)).toBe(alone);
    expect(failed.cancel).toHaveBeenCalled();
    // An offer answered with nothing: no job, the whole loop here.
    expect(JSON.stringify((await detectWith(t.x, t.y, o, () => undefined)).peaks)).toBe(alone);
    expect(JSON.stringify(drain(detectPeaksStepwise(t.x, t.y, o)))).toBe(alone);
  }, 60_000);

  it('the offer is the later SHARE_FRACTION of the candidates, in order, and is made only from SHARE_MIN_CANDIDATES on', async () => {
    const t = makeBenchTrace(100_000);
    const o = defaultPeakOptions(t.sigma, 0.001);
    let share: CandidateShare | undefined;
    await detectWith(t.x, t.y, o, (s) => { share = s; return undefined; });
    expect(share).toBeDefined();
    expect(share!.index.length).toBe(share!.halfWidth.length);
    // The later candidates: the last SHARE_FRACTION of them (rounded down), the rest measured here.
    const all = prominentMaxima(t.y, o.minProminence);
    expect(share!.index.length).toBe(Math.floor(all.count * SHARE_FRACTION));
    expect(Array.from(share!.index)).toEqual(Array.from(all.index.subarray(all.count - share!.index.length, all.count)));
    for (let k = 1; k < share!.index.length; k++) expect(share!.index[k]).toBeGreaterThan(share!.index[k - 1]);
    // The share's x and y are the call's own arrays (the worker copies what it sends).
    expect(share!.y).toBe(t.y);
    // A short trace has too few candidates to be worth a message.
    const s = makeBenchTrace(5_000);
    expect((await detectWith(s.x, s.y, defaultPeakOptions(s.sigma, 0.001), () => { throw new Error('offered'); })).offers).toBe(0);
  }, 60_000);

  it('a detection stopped while it measures (a newer request) cancels its share', async () => {
    const t = makeBenchTrace(100_000);
    const log = { started: 0, cancelled: 0 };
    const steps = detectPeaksStepwise(t.x, t.y, defaultPeakOptions(t.sigma, 0.001));
    let r = steps.next();
    while (!isShareOffer(r.value)) r = steps.next();
    r = steps.next(elsewhere(r.value.share, log));
    expect(r.done).toBe(false);
    steps.return([]);
    expect(log).toEqual({ started: 1, cancelled: 1 });
  });
});
