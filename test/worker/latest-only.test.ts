/**
 * The page's latest-only scheduler (worker/bridge.ts, LatestOnly): every
 * request goes out at once; once a newer one is made, the older one's
 * updates are dropped and its promise gives null; a failure of the newest
 * request reaches the caller, a failure of a superseded one does not.
 */
import { describe, expect, test } from 'vitest';
import { LatestOnly, type ComputeBackend } from '../../src/worker/bridge.ts';
import type { AnalyseRequest, StageUpdate } from '../../src/core/analysis/index.ts';
import { emptyRecipe } from '../../src/core/method.ts';

interface Pending { request: AnalyseRequest; onStage: (u: StageUpdate) => void; resolve: (done: boolean) => void; reject: (e: Error) => void }

function fakeBackend(): { backend: ComputeBackend; jobs: Pending[] } {
  const jobs: Pending[] = [];
  const backend = {
    analyse: (request: AnalyseRequest, onStage: (u: StageUpdate) => void) => new Promise<boolean>((resolve, reject) => { jobs.push({ request, onStage, resolve, reject }); }),
  } as unknown as ComputeBackend;
  return { backend, jobs };
}

const req = (id: string): AnalyseRequest => ({ sampleId: id, scanIds: [], recipe: emptyRecipe() });
const update = (sampleId: string): StageUpdate => ({ stage: 'processed', sampleId, patch: {}, pending: ['peaks'] });

describe('latest-only scheduling', () => {
  test('every request goes out at once; a newer one supersedes the older: its updates are dropped and it resolves to null', async () => {
    const { backend, jobs } = fakeBackend();
    const s = new LatestOnly(backend);
    const seen: string[] = [];
    const first = s.run(req('a'), (u) => seen.push(u.sampleId));
    jobs[0].onStage(update('a'));
    const second = s.run(req('b'), (u) => seen.push(u.sampleId));
    expect(jobs.map((j) => j.request.sampleId)).toEqual(['a', 'b']);
    expect(s.sent).toBe(2);
    // The older job's late stage and its end are ignored; the newer job's are taken.
    jobs[0].onStage(update('a'));
    jobs[1].onStage(update('b'));
    jobs[0].resolve(true);
    jobs[1].resolve(true);
    expect(await first).toBeNull();
    expect(await second).toBe(true);
    expect(seen).toEqual(['a', 'b']);
  });

  test('a request stopped by the worker (false) is told apart from a superseded one (null)', async () => {
    const { backend, jobs } = fakeBackend();
    const s = new LatestOnly(backend);
    const only = s.run(req('a'), () => undefined);
    jobs[0].resolve(false);
    expect(await only).toBe(false);
  });

  test('a failure of the newest request reaches the caller; one of a superseded request does not', async () => {
    const { backend, jobs } = fakeBackend();
    const s = new LatestOnly(backend);
    const old = s.run(req('a'), () => undefined);
    const now = s.run(req('b'), () => undefined);
    jobs[0].reject(new Error('stale failure'));
    jobs[1].reject(new Error('RangeError: window larger than the trace'));
    expect(await old).toBeNull();
    await expect(now).rejects.toThrow('RangeError: window larger than the trace');
  });
});
