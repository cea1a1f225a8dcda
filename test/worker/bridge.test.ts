/**
 * Traces cross to the computation worker once (issue 13: every load used to
 * send every trace again, a 50 MB trace at each file dropped later), and a
 * worker made anew after a fault is given them all again.
 */
import { describe, expect, test, vi } from 'vitest';
import { createTrace, type Trace } from '../../src/core/trace.ts';
import { LOADER_IDLE_MS, workerBackend } from '../../src/worker/bridge.ts';
import type { Call, FromWorker, ToWorker } from '../../src/worker/api.ts';
import { emptyRecipe } from '../../src/core/method.ts';

const mk = (id: string): Trace => createTrace({ id, name: id, x: [0, 1, 2, 3, 4], y: [1, 2, 3, 2, 1], source: { fileName: `${id}.csv`, sha256: '0'.repeat(64), rowsRead: 5, rowsSkipped: 0 } });

class FakeWorker {
  static made: FakeWorker[] = [];
  posted: ToWorker[] = [];
  onmessage: ((ev: MessageEvent) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  onmessageerror: ((ev: MessageEvent) => void) | null = null;
  constructor() { FakeWorker.made.push(this); }
  terminated = false;
  postMessage(msg: ToWorker) { this.posted.push(msg); }
  terminate() { this.terminated = true; }
}

describe('traces cross to the worker once', () => {
  test('only new traces are sent; the ids that stay are named; a new worker gets them all', () => {
    FakeWorker.made = [];
    const backend = workerBackend(() => new FakeWorker() as unknown as Worker);
    const [a, b, c] = [mk('a'), mk('b'), mk('c')];
    backend.setInputs([a]);
    backend.setInputs([a, b]);
    backend.setInputs([b, c]);
    const w = FakeWorker.made[0];
    const inputs = w.posted.filter((m) => m.type === 'inputs') as Extract<ToWorker, { type: 'inputs' }>[];
    expect(inputs.map((m) => [m.traces.map((t) => t.id), m.keep])).toEqual([[['a'], ['a']], [['b'], ['a', 'b']], [['c'], ['b', 'c']]]);
    // A fault: the worker is replaced, and the next analysis first hands it every current trace.
    w.onerror!({ message: 'boom' } as ErrorEvent);
    void backend.analyse({ sampleId: 'b', scanIds: [], recipe: emptyRecipe() }, () => undefined).catch(() => undefined);
    const w2 = FakeWorker.made.at(-1)!;
    expect(w2).not.toBe(w);
    expect(w2.posted.map((m) => (m.type === 'call' ? m.method : m.type))).toEqual(['inputs', 'analyse']);
    expect((w2.posted[0] as Extract<ToWorker, { type: 'inputs' }>).traces.map((t) => t.id)).toEqual(['b', 'c']);
  });
});

describe('a loaded file reaches the computation worker through the port, not through the page', () => {
  test('the page only names the traces the loading worker handed over', async () => {
    FakeWorker.made = [];
    const backend = workerBackend(() => new FakeWorker() as unknown as Worker);
    const a = mk('a');
    backend.setInputs([a]);
    const loading = backend.load(new Uint8Array([1, 2, 3]), 'b.csv');
    const [compute, loader] = FakeWorker.made;
    // Both workers got one end of the same channel.
    const cPort = compute.posted.find((m) => m.type === 'port') as Extract<ToWorker, { type: 'port' }>;
    const lPort = loader.posted.find((m) => m.type === 'port') as Extract<ToWorker, { type: 'port' }>;
    expect(cPort.port).toBeDefined();
    expect(lPort.port).toBeDefined();
    const job = loader.posted.find((m) => m.type === 'call' && m.method === 'load') as Extract<Call, { method: 'load' }>;
    expect(job.params.share).toBe(true);
    const b = mk('b');
    loader.onmessage!({ data: { type: 'result', method: 'load', jobId: job.jobId, value: { result: { ok: true, traces: [b], report: {} }, shared: true } } } as MessageEvent);
    const result = await loading;
    expect(result.ok && result.traces[0].id).toBe('b');
    backend.setInputs([a, b]);
    const last = compute.posted.filter((m) => m.type === 'inputs').at(-1) as Extract<ToWorker, { type: 'inputs' }>;
    expect(last.traces).toEqual([]);
    expect(last.keep).toEqual(['a', 'b']);
    cPort.port.close();
    lPort.port.close();
  });
});

describe('the loading worker is ended when idle (issue 16: it kept a loaded file\'s bytes and buffers as garbage)', () => {
  test('replaced LOADER_IDLE_MS after its last job, not while a job runs; the fresh one starts at once and gets a new port with the next load', async () => {
    vi.useFakeTimers();
    try {
      FakeWorker.made = [];
      const backend = workerBackend(() => new FakeWorker() as unknown as Worker);
      backend.setInputs([mk('a')]);
      const answered = new Set<number>();
      const answer = (w: FakeWorker, name: string) => {
        const job = w.posted.find((m) => m.type === 'call' && m.method === 'load' && !answered.has(m.jobId)) as Extract<Call, { method: 'load' }>;
        answered.add(job.jobId);
        w.onmessage!({ data: { type: 'result', method: 'load', jobId: job.jobId, value: { result: { ok: true, traces: [mk(name)], report: {} }, shared: true } } } as MessageEvent);
      };
      const first = backend.load(new Uint8Array([1]), 'b.csv');
      const second = backend.load(new Uint8Array([2]), 'c.csv');
      const [compute, loader] = FakeWorker.made;
      answer(loader, 'b');
      await first;
      vi.advanceTimersByTime(LOADER_IDLE_MS + 10);
      expect(loader.terminated).toBe(false); // the second load still runs there
      answer(loader, 'c');
      await second;
      vi.advanceTimersByTime(LOADER_IDLE_MS - 10);
      expect(loader.terminated).toBe(false);
      vi.advanceTimersByTime(20);
      expect(loader.terminated).toBe(true);
      expect(compute.terminated).toBe(false); // the computation worker keeps its traces and caches
      const loader2 = FakeWorker.made.at(-1)!;
      expect(loader2).not.toBe(loader); // made at once, before any load asks for it
      expect(FakeWorker.made).toHaveLength(3);
      const third = backend.load(new Uint8Array([3]), 'd.csv');
      expect(FakeWorker.made).toHaveLength(3);
      expect(loader2.posted.some((m) => m.type === 'port')).toBe(true);
      expect(compute.posted.filter((m) => m.type === 'port')).toHaveLength(2); // a new channel between the two
      answer(loader2, 'd');
      expect((await third).ok).toBe(true);
      for (const w of [compute, loader, loader2]) for (const m of w.posted) if (m.type === 'port') m.port.close();
    } finally {
      vi.useRealTimers();
    }
  });
});

describe('one typed method map; nothing that goes wrong is dropped', () => {
  const reply = (w: FakeWorker, msg: FromWorker) => w.onmessage!({ data: msg } as MessageEvent);

  test('each call is answered by its method\'s result; a failed call rejects with the worker\'s message', async () => {
    FakeWorker.made = [];
    const backend = workerBackend(() => new FakeWorker() as unknown as Worker);
    backend.setInputs([mk('a')]);
    const w = FakeWorker.made[0];
    const analysing = backend.analyse({ sampleId: 'a', scanIds: [], recipe: emptyRecipe() }, () => undefined);
    const fitting = backend.fit({ sampleId: 'a', scanIds: [], recipe: emptyRecipe(), settings: {} as never });
    const calls = w.posted.filter((m): m is Call => m.type === 'call');
    expect(calls.map((m) => m.method)).toEqual(['analyse', 'fit']);
    reply(w, { type: 'result', method: 'analyse', jobId: calls[0].jobId, value: { outcome: 'cancelled', ms: 3 } });
    expect(await analysing).toBe(false);
    reply(w, { type: 'failed', jobId: calls[1].jobId, message: 'RangeError: no region' });
    await expect(fitting).rejects.toThrow('RangeError: no region');
  });

  test('a failure that belongs to no waiting job, an unreadable message and a fault with nothing waiting reach the page', () => {
    FakeWorker.made = [];
    const said: string[][] = [];
    const backend = workerBackend(() => new FakeWorker() as unknown as Worker, (title, lines) => said.push([title, ...lines]));
    backend.setInputs([mk('a')]);
    const w = FakeWorker.made[0];
    reply(w, { type: 'failed', jobId: null, message: 'The computation worker could not take in a message: TypeError: x' });
    reply(w, { type: 'failed', jobId: 999, message: 'late failure of a job the page no longer waits for' });
    w.onmessageerror!({} as MessageEvent);
    w.onerror!({ message: 'out of memory' } as ErrorEvent);
    expect(said.map((s) => s[0])).toEqual([
      'The computation worker reported a problem',
      'The computation worker reported a problem',
      'A message from the computation worker could not be read',
      'The computation worker stopped',
    ]);
    expect(said[0][1]).toContain('TypeError: x');
    expect(said[1][1]).toContain('late failure');
    expect(said[3][1]).toBe('out of memory');
  });

  test('a batch goes to the loading worker with the files\' bytes handed over, and reports progress per file', async () => {
    FakeWorker.made = [];
    const backend = workerBackend(() => new FakeWorker() as unknown as Worker);
    backend.setInputs([mk('a')]);
    const bytes = new Uint8Array([1, 2, 3]);
    const seen: number[] = [];
    const running = backend.batch([{ name: 'f.csv', bytes }], emptyRecipe(), { now: new Date(0) }, (p) => seen.push(p.done));
    const loader = FakeWorker.made[1];
    const job = loader.posted.find((m) => m.type === 'call') as Extract<Call, { method: 'batch' }>;
    expect(job.method).toBe('batch');
    expect(job.params.files[0].name).toBe('f.csv');
    reply(loader, { type: 'progress', method: 'batch', jobId: job.jobId, progress: { done: 1, total: 1, file: 'f.csv' } });
    const zip = new Uint8Array([80, 75]);
    reply(loader, { type: 'result', method: 'batch', jobId: job.jobId, value: { zip, errors: [], combinedCsv: '', entries: [] } });
    expect((await running).zip).toBe(zip);
    expect(seen).toEqual([1]);
  });
});
