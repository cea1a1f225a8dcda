/**
 * worker/stager.ts: runStages hands on every stage's update in order, yields
 * to the event loop (a macrotask) after each update and at a pause inside a
 * stage once PAUSE_AFTER_MS of work went by, stops with 'cancelled' when
 * stale() says a newer request came, always closes the stage generator, and
 * lets an error of a stage (or of post) reach its caller. The properties
 * checked are those the module's own doc comments state.
 */
import { afterEach, describe, expect, test, vi } from 'vitest';
import { macrotask, PAUSE_AFTER_MS, runStages } from '../../src/worker/stager.ts';
import type { StageUpdate } from '../../src/core/analysis/index.ts';
import type { Pause } from '../../src/core/analysis/pause.ts';
import type { SharedJob } from '../../src/core/measure/peak-table.ts';

const upd = (stage: StageUpdate['stage']): StageUpdate => ({ stage, sampleId: 's', patch: {}, pending: [] });

afterEach(() => { vi.restoreAllMocks(); vi.unstubAllGlobals(); });

describe('runStages', () => {
  test('posts every update in the order the stages yield them, skips the pauses, ends with done and closes the generator', async () => {
    let closed = false;
    function* gen(): Generator<StageUpdate | Pause, void, SharedJob | undefined> {
      try {
        yield upd('processed');
        yield undefined;
        yield upd('residual');
        yield upd('noise');
        yield undefined;
        yield upd('peaks');
      } finally { closed = true; }
    }
    const seen: string[] = [];
    expect(await runStages(gen(), (u) => seen.push(u.stage), () => false)).toBe('done');
    expect(seen).toEqual(['processed', 'residual', 'noise', 'peaks']);
    expect(closed).toBe(true);
  });

  test('stale before the first stage: nothing is pulled, cancelled', async () => {
    let pulled = 0;
    function* gen(): Generator<StageUpdate | Pause, void, SharedJob | undefined> { pulled++; yield upd('processed'); }
    const post = vi.fn();
    expect(await runStages(gen(), post, () => true)).toBe('cancelled');
    expect(pulled).toBe(0);
    expect(post).not.toHaveBeenCalled();
  });

  // Moved from staged.test.ts.
  test('runStages stops before the next stage once stale, and closes the generator', async () => {
    let closed = false;
    function* gen(): Generator<StageUpdate | Pause, void, SharedJob | undefined> {
      try {
        for (const stage of ['processed', 'residual', 'noise'] as const) yield { stage, sampleId: 's', patch: {}, pending: [] };
      } finally { closed = true; }
    }
    const seen: string[] = [];
    let stale = false;
    const outcome = await runStages(gen(), (u) => { seen.push(u.stage); stale = true; }, () => stale);
    expect(outcome).toBe('cancelled');
    expect(seen).toEqual(['processed']);
    expect(closed).toBe(true);
  });

  // Moved from staged.test.ts.
  test('runStages stops inside a long stage: at a pause, once the work since the last yield passed PAUSE_AFTER_MS and a newer request came', async () => {
    let closed = false;
    let pulled = 0, firstStart = 0, lastEnd = 0;
    function* gen(): Generator<StageUpdate | Pause, void, SharedJob | undefined> {
      try {
        yield { stage: 'noise', sampleId: 's', patch: {}, pending: ['peaks'] };
        // A long stage: 200 pieces of 2 ms of work, a pause after each.
        for (let k = 0; k < 200; k++) {
          // The newer request arrives as a message while the stage works: a timer, which runs only when the stager yields.
          if (k === 0) setTimeout(() => { stale = true; }, 0);
          pulled++;
          if (k === 0) firstStart = performance.now();
          const until = performance.now() + 2;
          while (performance.now() < until) { /* work */ }
          lastEnd = performance.now();
          yield undefined;
        }
        yield { stage: 'peaks', sampleId: 's', patch: {}, pending: [] };
      } finally { closed = true; }
    }
    const seen: string[] = [];
    let stale = false;
    const outcome = runStages(gen(), (u) => { seen.push(u.stage); }, () => stale);
    expect(await outcome).toBe('cancelled');
    expect(seen).toEqual(['noise']);
    expect(closed).toBe(true);
    // It did not yield at every pause: only after PAUSE_AFTER_MS of work; and it stopped
    // there, long before the stage's end.
    expect(pulled).toBeGreaterThan(1);
    expect(lastEnd - firstStart).toBeGreaterThanOrEqual(PAUSE_AFTER_MS - 1);
    expect(pulled).toBeLessThan(200);
  });

  test('at a pause it lets a queued message run first only once PAUSE_AFTER_MS of work went by (clock under the test\'s control)', async () => {
    let clock = 0;
    vi.spyOn(performance, 'now').mockImplementation(() => clock);
    const log: string[] = [];
    function* gen(): Generator<StageUpdate | Pause, void, SharedJob | undefined> {
      // A message queued while the stage works (a port message: the same task source as macrotask()'s).
      const ch = new MessageChannel();
      ch.port1.onmessage = () => { ch.port1.close(); log.push('message'); };
      ch.port2.postMessage(null);
      log.push('piece 1');
      clock += PAUSE_AFTER_MS - 1; // less work than PAUSE_AFTER_MS: the stager pulls on at once
      yield undefined;
      log.push('piece 2');
      clock += 2; // now PAUSE_AFTER_MS + 1 since the start: the stager yields, the message runs
      yield undefined;
      log.push('piece 3');
      yield upd('peaks');
    }
    expect(await runStages(gen(), (u) => log.push(u.stage), () => false)).toBe('done');
    expect(log).toEqual(['piece 1', 'piece 2', 'message', 'piece 3', 'peaks']);
  });

  test('the stale check runs after each yield, so a message that marks the request stale stops it at that pause', async () => {
    let clock = 0;
    vi.spyOn(performance, 'now').mockImplementation(() => clock);
    let stale = false;
    let pieces = 0;
    function* gen(): Generator<StageUpdate | Pause, void, SharedJob | undefined> {
      const ch = new MessageChannel();
      ch.port1.onmessage = () => { ch.port1.close(); stale = true; };
      ch.port2.postMessage(null);
      for (let k = 0; k < 10; k++) { pieces++; clock += PAUSE_AFTER_MS; yield undefined; }
      yield upd('peaks');
    }
    const post = vi.fn();
    expect(await runStages(gen(), post, () => stale)).toBe('cancelled');
    expect(pieces).toBe(1);
    expect(post).not.toHaveBeenCalled();
  });

  test('a throwing stage rejects runStages with its error (not swallowed, not reported as done) after the earlier updates went out', async () => {
    function* gen(): Generator<StageUpdate | Pause, void, SharedJob | undefined> {
      yield upd('processed');
      throw new RangeError('window larger than the trace');
    }
    const seen: string[] = [];
    await expect(runStages(gen(), (u) => seen.push(u.stage), () => false)).rejects.toThrow(new RangeError('window larger than the trace'));
    expect(seen).toEqual(['processed']);
  });

  test('a throwing post rejects runStages too, and the generator is still closed (its finally runs)', async () => {
    let closed = false;
    function* gen(): Generator<StageUpdate | Pause, void, SharedJob | undefined> {
      try { yield upd('processed'); yield upd('residual'); } finally { closed = true; }
    }
    await expect(runStages(gen(), () => { throw new Error('could not post'); }, () => false)).rejects.toThrow('could not post');
    expect(closed).toBe(true);
  });
});

describe('runStages with work shared to another thread (pause.ts offers and waits)', () => {
  const share = { x: new Float64Array(3), y: new Float64Array(3), options: {} as never, index: new Int32Array(0), halfWidth: new Float64Array(0) };

  test('an offer is answered with the sharer\'s job (the value next() gets), without a yield to the event loop; a wait is awaited', async () => {
    const job = { settled: Promise.resolve(), result: () => undefined, cancel: () => {} };
    const got: unknown[] = [];
    const log: string[] = [];
    let release!: () => void;
    const waited = new Promise<void>((resolve) => { release = resolve; });
    function* gen(): Generator<StageUpdate | Pause, void, SharedJob | undefined> {
      got.push(yield { share });
      setTimeout(() => { log.push('released'); release(); }, 5);
      yield waited;
      log.push('resumed');
      yield upd('peaks');
    }
    const sharer = vi.fn(() => job);
    expect(await runStages(gen(), (u) => log.push(u.stage), () => false, sharer)).toBe('done');
    expect(sharer).toHaveBeenCalledWith(share);
    expect(got).toEqual([job]);
    expect(log).toEqual(['released', 'resumed', 'peaks']);
  });

  test('without a sharer an offer gets undefined (the stage does the work itself)', async () => {
    const got: unknown[] = [];
    function* gen(): Generator<StageUpdate | Pause, void, SharedJob | undefined> { got.push(yield { share }); }
    expect(await runStages(gen(), () => {}, () => false)).toBe('done');
    expect(got).toEqual([undefined]);
  });

  test('a newer request stops a wait that would not end, within about PAUSE_AFTER_MS, and closes the generator', async () => {
    let closed = false, stale = false;
    function* gen(): Generator<StageUpdate | Pause, void, SharedJob | undefined> {
      try {
        setTimeout(() => { stale = true; }, 10);
        yield new Promise<void>(() => {});
        yield upd('peaks');
      } finally { closed = true; }
    }
    const post = vi.fn();
    const t0 = performance.now();
    expect(await runStages(gen(), post, () => stale)).toBe('cancelled');
    expect(performance.now() - t0).toBeLessThan(10 + 3 * PAUSE_AFTER_MS + 200);
    expect(closed).toBe(true);
    expect(post).not.toHaveBeenCalled();
  });
});

describe('macrotask', () => {
  test('is a task, not a microtask: a message posted before it runs first, and microtasks queued after it do too', async () => {
    const log: string[] = [];
    const ch = new MessageChannel();
    ch.port1.onmessage = () => { ch.port1.close(); log.push('message'); };
    ch.port2.postMessage(null);
    const done = macrotask().then(() => log.push('macrotask'));
    void Promise.resolve().then(() => log.push('microtask'));
    await done;
    expect(log).toEqual(['microtask', 'message', 'macrotask']);
  });

  test('without MessageChannel it falls back to a timer, behind timers already set', async () => {
    vi.stubGlobal('MessageChannel', undefined);
    const log: string[] = [];
    setTimeout(() => log.push('timer'), 0);
    await macrotask().then(() => log.push('macrotask'));
    expect(log).toEqual(['timer', 'macrotask']);
  });
});
