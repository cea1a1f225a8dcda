/**
 * Traces cross to the computation worker once (issue 13: every load used to
 * send every trace again, a 50 MB trace at each file dropped later), and a
 * worker made anew after a fault is given them all again.
 */
import { describe, expect, test } from 'vitest';
import { createTrace, type Trace } from '../../src/core/trace.ts';
import { Engine } from '../../src/worker/engine.ts';
import { workerBackend } from '../../src/worker/bridge.ts';
import type { ToWorker } from '../../src/worker/protocol.ts';
import { emptyRecipe } from '../../src/core/recipe.ts';

const mk = (id: string): Trace => createTrace({ id, name: id, x: [0, 1, 2, 3, 4], y: [1, 2, 3, 2, 1], source: { fileName: `${id}.csv`, sha256: '0'.repeat(64), rowsRead: 5, rowsSkipped: 0 } });

class FakeWorker {
  static made: FakeWorker[] = [];
  posted: ToWorker[] = [];
  onmessage: ((ev: MessageEvent) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  constructor() { FakeWorker.made.push(this); }
  postMessage(msg: ToWorker) { this.posted.push(msg); }
  terminate() { /* nothing runs */ }
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
    expect(w2.posted.map((m) => m.type)).toEqual(['inputs', 'analyse']);
    expect((w2.posted[0] as Extract<ToWorker, { type: 'inputs' }>).traces.map((t) => t.id)).toEqual(['b', 'c']);
  });

  test('the engine keeps the traces it holds whose ids stay, adds the new ones and drops the rest', () => {
    const e = new Engine();
    const [a, b, c] = [mk('a'), mk('b'), mk('c')];
    e.setInputs([a, b]);
    e.setInputs([c], ['b', 'c']);
    const held = (e as unknown as { traces: Map<string, Trace> }).traces;
    expect([...held.keys()].sort()).toEqual(['b', 'c']);
    expect(held.get('b')).toBe(b);
    e.setInputs([a]);
    expect([...(e as unknown as { traces: Map<string, Trace> }).traces.keys()]).toEqual(['a']);
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
    const job = loader.posted.find((m) => m.type === 'load') as Extract<ToWorker, { type: 'load' }>;
    expect(job.share).toBe(true);
    const b = mk('b');
    loader.onmessage!({ data: { type: 'loaded', jobId: job.jobId, result: { ok: true, traces: [b], report: {} }, shared: true } } as MessageEvent);
    const result = await loading;
    expect(result.ok && result.traces[0].id).toBe('b');
    backend.setInputs([a, b]);
    const last = compute.posted.filter((m) => m.type === 'inputs').at(-1) as Extract<ToWorker, { type: 'inputs' }>;
    expect(last.traces).toEqual([]);
    expect(last.keep).toEqual(['a', 'b']);
    cPort.port.close();
    lPort.port.close();
  });

  test('the computation side takes a handed-over trace whether it comes before or after the page names it', () => {
    const e = new Engine();
    const [a, b, c] = [mk('a'), mk('b'), mk('c')];
    e.setInputs([a]);
    e.stage([b]);
    e.setInputs([], ['a', 'b', 'c']);
    expect(e.incomplete).toBe(true);
    e.stage([c]);
    expect(e.incomplete).toBe(false);
    const held = (e as unknown as { traces: Map<string, Trace> }).traces;
    expect([...held.keys()].sort()).toEqual(['a', 'b', 'c']);
  });
});
