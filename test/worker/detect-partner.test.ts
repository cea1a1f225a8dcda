/**
 * worker/detect-partner.ts, the second detection thread's entry, driven in
 * Node: a fake `self` (its postMessage recorded) is put in place before the
 * module is imported, and messages are handed to the onmessage it sets. What
 * the module's doc promises: a share is answered with the kept measures
 * detection makes alone (measureShareStepwise), x grids are kept by id (the
 * last PARTNER_KEEPS_X), a cancel is seen at a pause of the measuring loop,
 * and a share that cannot be measured is answered 'failed', never dropped.
 */
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import { drain } from '../../src/core/analysis/pause.ts';
import { prominentMaxima } from '../../src/core/measure/peak-detection.ts';
import { defaultPeakOptions, measureShareStepwise } from '../../src/core/measure/peak-table.ts';
import { PARTNER_KEEPS_X, type FromPartner, type ToPartner } from '../../src/worker/detect-partner-client.ts';
import { makeBenchTrace } from '../bench/bench-trace.ts';

interface FakeScope {
  posted: FromPartner[];
  postMessage: (msg: FromPartner) => void;
  onmessage: ((ev: { data: ToPartner }) => void) | null;
}

let scope: FakeScope;

beforeEach(async () => {
  scope = { posted: [], postMessage(msg) { this.posted.push(structuredClone(msg)); }, onmessage: null };
  vi.stubGlobal('self', scope);
  vi.resetModules();
  await import('../../src/worker/detect-partner.ts');
  expect(typeof scope.onmessage).toBe('function');
});

afterEach(() => { vi.unstubAllGlobals(); });

const send = (msg: ToPartner) => scope.onmessage!({ data: structuredClone(msg) });

async function answerTo(job: number, ms = 20_000): Promise<FromPartner> {
  const until = Date.now() + ms;
  for (;;) {
    const m = scope.posted.find((p) => p.job === job);
    if (m) return m;
    if (Date.now() > until) throw new Error(`job ${job} was not answered`);
    await new Promise((r) => setTimeout(r, 5));
  }
}

function share(n: number) {
  const t = makeBenchTrace(n);
  const options = defaultPeakOptions(t.sigma, 0.001);
  const c = prominentMaxima(t.y, options.minProminence);
  return { x: t.x, y: t.y, options, index: c.index.slice(0, c.count), halfWidth: c.halfWidth.slice(0, c.count) };
}

describe('the detection partner thread', () => {
  test('answers a share with the measures detection makes alone; a later share on the same grid needs no x', async () => {
    const s = share(30_000);
    const alone = drain(measureShareStepwise(s));
    expect(alone.at.length).toBeGreaterThan(50);
    send({ type: 'share', job: 1, xId: 5, x: s.x, y: s.y, options: s.options, index: s.index, halfWidth: s.halfWidth });
    expect(await answerTo(1)).toEqual({ type: 'kept', job: 1, at: alone.at, measures: alone.measures });
    send({ type: 'share', job: 2, xId: 5, y: s.y, options: s.options, index: s.index, halfWidth: s.halfWidth });
    expect(await answerTo(2)).toEqual({ type: 'kept', job: 2, at: alone.at, measures: alone.measures });
  });

  test('keeps the last PARTNER_KEEPS_X grids: a share on a grid pushed out, or never sent, is answered failed', async () => {
    const s = share(6_000);
    for (let id = 1; id <= PARTNER_KEEPS_X + 1; id++) {
      send({ type: 'share', job: id, xId: id, x: s.x, y: s.y, options: s.options, index: s.index, halfWidth: s.halfWidth });
      expect((await answerTo(id)).type).toBe('kept');
    }
    send({ type: 'share', job: 10, xId: 1, y: s.y, options: s.options, index: s.index, halfWidth: s.halfWidth });
    const lost = await answerTo(10);
    expect(lost).toEqual({ type: 'failed', job: 10, message: 'Error: the x grid 1 was not sent' });
    send({ type: 'share', job: 11, xId: PARTNER_KEEPS_X + 1, y: s.y, options: s.options, index: s.index, halfWidth: s.halfWidth });
    expect((await answerTo(11)).type).toBe('kept');
  });

  test('a cancel sent while a long share is measured stops it at a pause: answered cancelled', async () => {
    const s = share(1_000_000);
    send({ type: 'share', job: 7, xId: 1, x: s.x, y: s.y, options: s.options, index: s.index, halfWidth: s.halfWidth });
    // The cancel arrives as a message, seen when the loop yields to the event loop.
    setTimeout(() => send({ type: 'cancel', job: 7 }), 0);
    expect(await answerTo(7)).toEqual({ type: 'cancelled', job: 7 });
  }, 60_000);

  test('a share whose options cannot be measured is answered failed with the reason', async () => {
    const s = share(6_000);
    send({ type: 'share', job: 3, xId: 1, x: s.x, y: s.y.subarray(0, 100), options: s.options, index: s.index, halfWidth: s.halfWidth });
    const m = await answerTo(3);
    expect(m.type).toBe('failed');
    expect((m as { message: string }).message).toMatch(/RangeError: x has 6000 values but y has 100/);
  });
});
