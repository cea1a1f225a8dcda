/**
 * worker/worker.ts, the worker's entry, driven in Node: a fake `self` (its
 * postMessage recorded) is put in place before the module is imported, and
 * messages are handed to the onmessage it sets. What the module's doc
 * promises: calls are answered with their method's result, an analysis is
 * posted stage by stage and a newer one stops an older one, and whatever
 * goes wrong is posted as 'failed' (with the call's id, or none), never
 * dropped; a trace the page named that never arrives gives the 'missing'
 * failure the bridge retries on (bridge.ts).
 */
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import { createTrace, type Trace } from '../../src/core/trace.ts';
import { analyse as coreAnalyse, STAGES, type AnalyseRequest } from '../../src/core/analysis/index.ts';
import { emptyRecipe, makeRecipeStep } from '../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../src/core/steps/registry.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { fromColumns } from '../../src/worker/transfer.ts';
import type { FromWorker, ToWorker } from '../../src/worker/api.ts';
import type { Peak } from '../../src/core/measure/peak-types.ts';

interface FakeScope {
  posted: FromWorker[];
  postMessage: (msg: FromWorker) => void;
  onmessage: ((ev: { data: unknown }) => void) | null;
  onmessageerror: ((ev: unknown) => void) | null;
}

let scope: FakeScope;

/** A fresh copy of the worker module (its held traces and job counter are module state) on a fresh fake scope. */
async function startWorker(): Promise<void> {
  scope = { posted: [], postMessage(msg) { this.posted.push(msg); }, onmessage: null, onmessageerror: null };
  vi.stubGlobal('self', scope);
  vi.resetModules();
  await import('../../src/worker/worker.ts');
  expect(typeof scope.onmessage).toBe('function');
}

const send = (msg: ToWorker | Record<string, unknown>) => scope.onmessage!({ data: msg });
const ofJob = (jobId: number | null) => scope.posted.filter((m) => 'jobId' in m && m.jobId === jobId);

/** Wait (real time) until a message ends the job: its result or a failure. */
async function ended(jobId: number | null, ms = 20_000): Promise<FromWorker> {
  const until = Date.now() + ms;
  for (;;) {
    const end = ofJob(jobId).find((m) => m.type === 'result' || m.type === 'failed');
    if (end) return end;
    if (Date.now() > until) throw new Error(`job ${jobId} did not end`);
    await new Promise((r) => setTimeout(r, 5));
  }
}

/** An invented trace: two Gaussian bands on white noise (seeded). */
function bands(id: string): Trace {
  const rng = makeRng(4);
  const x = Array.from({ length: 2000 }, (_, i) => i * 0.01);
  const y = x.map((t) => 5 * Math.exp(-0.5 * ((t - 6) / 0.1) ** 2) + 2 * Math.exp(-0.5 * ((t - 13) / 0.15) ** 2) + 0.05 * rng.normal());
  return createTrace({ id, name: id, x, y, source: { fileName: `${id}.csv`, sha256: '0'.repeat(64), rowsRead: 2000, rowsSkipped: 0 } });
}

function request(sampleId: string, window = 5): AnalyseRequest {
  const r = emptyRecipe();
  r.steps.push({ ...makeRecipeStep(stepDefinition('moving-average')!, { window }), uid: 'ma' });
  return { sampleId, scanIds: [], recipe: r, alternatives: [{ id: 'none', label: 'none', recipe: emptyRecipe() }] };
}

const analyseCall = (jobId: number, req: AnalyseRequest, side?: boolean) => ({ type: 'call', method: 'analyse', jobId, params: { request: req, side } }) as ToWorker;

beforeEach(startWorker);
afterEach(() => { vi.useRealTimers(); vi.unstubAllGlobals(); });

describe('analyses', () => {
  test('a call for analyse posts one stage message per stage in order, then its result (done); the numbers are core analyse()\'s', async () => {
    const a = bands('a');
    send({ type: 'inputs', traces: [a] });
    send(analyseCall(1, request('a')));
    const end = await ended(1);
    expect(end).toMatchObject({ type: 'result', method: 'analyse', jobId: 1, value: { outcome: 'done' } });
    const msgs = ofJob(1);
    expect(msgs.at(-1)).toBe(end);
    const stages = msgs.filter((m): m is Extract<FromWorker, { type: 'stage' }> => m.type === 'stage');
    expect(stages.map((m) => m.update.stage)).toEqual([...STAGES]);
    // The same numbers as the core's analysis of the same request: the processed trace (2000 points cross whole)
    // and the peak table, which crosses as columns.
    const core = coreAnalyse(request('a'), new Map([['a', a]]), STEP_REGISTRY);
    expect(Array.from(stages[0].update.patch.processed!.y)).toEqual(Array.from(core.processed.y));
    const peaksMsg = stages.find((m) => m.update.stage === 'peaks')!;
    expect(peaksMsg.update.patch.peaks).toBeUndefined();
    const peaks = fromColumns<Peak>(peaksMsg.peakColumns!);
    expect(core.peaks.length).toBeGreaterThanOrEqual(2);
    expect(peaks.map((p) => [p.x, p.area, p.height])).toEqual(core.peaks.map((p) => [p.x, p.area, p.height]));
  });

  test('a newer analysis stops the older one after its first stage (cancelled); a side job is neither cancelled nor cancels', async () => {
    send({ type: 'inputs', traces: [bands('a')] });
    send(analyseCall(1, request('a', 5)));
    send(analyseCall(2, request('a', 5), true));
    send(analyseCall(3, request('a', 9)));
    const [e1, e2, e3] = [await ended(1), await ended(2), await ended(3)];
    expect(e1).toMatchObject({ type: 'result', value: { outcome: 'cancelled' } });
    expect(e2).toMatchObject({ type: 'result', value: { outcome: 'done' } });
    expect(e3).toMatchObject({ type: 'result', value: { outcome: 'done' } });
    const stagesOf = (id: number) => ofJob(id).flatMap((m) => (m.type === 'stage' ? [m.update.stage] : []));
    // Job 1 pulled its first stage before job 3 arrived (the stager runs to its first yield at once); no more after.
    expect(stagesOf(1)).toEqual(['processed']);
    expect(stagesOf(2)).toEqual([...STAGES]);
    expect(stagesOf(3)).toEqual([...STAGES]);
  });
});

describe('whatever goes wrong is posted as failed', () => {
  test('a call that throws posts failed with its id and the error\'s name and message', async () => {
    send({ type: 'inputs', traces: [bands('a')] });
    send(analyseCall(7, request('gone')));
    expect(await ended(7)).toEqual({ type: 'failed', jobId: 7, message: 'Error: No trace with id gone' });
  });

  test('a message of unknown type posts failed with no job id, naming the type', async () => {
    send({ type: 'bogus' });
    const f = await ended(null);
    expect(f.type).toBe('failed');
    expect((f as Extract<FromWorker, { type: 'failed' }>).message).toContain('a message of unknown type "bogus"');
  });

  test('a message that could not be read (messageerror) posts failed with no job id', () => {
    scope.onmessageerror!({});
    expect(scope.posted).toHaveLength(1);
    expect(scope.posted[0]).toMatchObject({ type: 'failed', jobId: null });
  });

  // The module promises "Whatever goes wrong is posted as 'failed', never dropped": an unknown method included.
  test('a call of an unknown method posts failed with its id', async () => {
    send({ type: 'call', method: 'frobnicate', jobId: 9, params: {} });
    const f = await ended(9, 500);
    expect(f).toMatchObject({ type: 'failed', jobId: 9 });
  });

  test('an analysis naming a trace that never reached the worker fails with the missing marker after 5 s', async () => {
    vi.useFakeTimers({ toFake: ['setTimeout'] });
    send({ type: 'inputs', traces: [bands('a')], keep: ['a', 'never'] });
    send(analyseCall(4, request('a')));
    await vi.advanceTimersByTimeAsync(4900);
    expect(ofJob(4)).toEqual([]);
    await vi.advanceTimersByTimeAsync(200);
    expect(ofJob(4)).toEqual([{ type: 'failed', jobId: 4, message: 'A loaded trace did not reach the computation worker.', missing: true }]);
  });
});

describe('traces through the port', () => {
  test('an analysis waiting for a named trace runs when that trace comes through the port from the loading worker', async () => {
    const ch = new MessageChannel();
    try {
      send({ type: 'port', port: ch.port1 });
      send({ type: 'inputs', traces: [], keep: ['b'] });
      send(analyseCall(5, request('b')));
      await new Promise((r) => setTimeout(r, 20));
      expect(ofJob(5)).toEqual([]);
      ch.port2.postMessage({ type: 'traces', traces: [bands('b')] });
      expect(await ended(5)).toMatchObject({ type: 'result', value: { outcome: 'done' } });
      expect(ofJob(5).filter((m) => m.type === 'stage')).toHaveLength(STAGES.length);
    } finally { ch.port1.close(); ch.port2.close(); }
  });
});

describe('loads', () => {
  test('a call for load answers with the loaded traces; without a port nothing is shared', async () => {
    const bytes = new TextEncoder().encode('x,y\n0,1\n1,2\n2,3\n3,2\n4,1\n');
    send({ type: 'call', method: 'load', jobId: 11, params: { bytes, fileName: 'five.csv', share: true } });
    const end = await ended(11);
    expect(end.type).toBe('result');
    const value = (end as Extract<FromWorker, { method: 'load'; type: 'result' }>).value;
    expect(value.shared).toBe(false);
    expect(value.result.ok).toBe(true);
    if (value.result.ok) expect(Array.from(value.result.traces[0].y)).toEqual([1, 2, 3, 2, 1]);
  });
});
