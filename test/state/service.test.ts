// The service layer over a fresh store each (zustand's testing advice: one
// store per test), with the same core in this thread instead of a worker.
// Expected peaks are the invented demo's own ground truth
// (public/demo/demo-truth.json, written by scripts/make-demo.mjs).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { MAX_FILE_BYTES } from '../../src/core/io/types.ts';
import { currentResult } from '../../src/state/selectors.ts';
import { createService } from '../../src/state/service.ts';
import { createAppStore } from '../../src/state/store.ts';
import { inProcessBackend } from '../../src/worker/bridge.ts';

const demo = (name: string) => new Uint8Array(readFileSync(new URL(`../../public/demo/${name}`, import.meta.url)));
const truth = JSON.parse(readFileSync(new URL('../../public/demo/demo-truth.json', import.meta.url), 'utf8')) as {
  peaks: { label: string; centre: number; height: number }[];
};

function fresh() {
  const store = createAppStore();
  return { store, service: createService(store, () => inProcessBackend()) };
}

async function until(ok: () => boolean, ms = 20000): Promise<void> {
  const t0 = Date.now();
  while (!ok()) {
    if (Date.now() - t0 > ms) throw new Error('timed out');
    await new Promise((r) => setTimeout(r, 10));
  }
}

describe('service layer (src/state/service.ts) over a store it is given', () => {
  it('loads a file into its own store only: the trace becomes the sample and a notice names it', async () => {
    const a = fresh();
    const b = fresh();
    expect(await a.service.loadBytes(demo('demo-sample.csv'), 'demo-sample.csv')).toBe(true);
    const s = a.store.getState();
    expect(s.traces).toHaveLength(1);
    expect(s.sampleId).toBe(s.traces[0].id);
    expect(s.traces[0].x.length).toBe(1201); // demo-truth.json: x.points
    expect(s.notices[0]).toMatchObject({ kind: 'info', title: `Loaded ${s.traces[0].name}` });
    expect(s.loading).toBeNull();
    expect(b.store.getState().traces).toHaveLength(0);
    expect(b.store.getState().notices).toHaveLength(0);
  });

  it('an empty file is refused with the loaders’ wording, naming the file; what was loaded stays', async () => {
    const { store, service } = fresh();
    await service.loadBytes(demo('demo-sample.csv'), 'demo-sample.csv');
    const before = store.getState().traces;
    expect(await service.loadBytes(new Uint8Array(0), 'empty.csv')).toBe(false);
    const n = store.getState().notices[0];
    expect(n.kind).toBe('error');
    expect(n.title).toBe('empty.csv: The file is empty (0 bytes).');
    expect(n.lines).toContain('Nothing already loaded was changed.');
    expect(store.getState().traces).toBe(before);
  });

  it('a picked file over the size limit is refused before it is read, with the same wording as the loaders', async () => {
    const { store, service } = fresh();
    let read = false;
    const big = { name: 'huge.csv', size: MAX_FILE_BYTES + 1, arrayBuffer: () => { read = true; return Promise.resolve(new ArrayBuffer(0)); } } as unknown as File;
    await service.openFiles([big]);
    expect(read).toBe(false);
    const n = store.getState().notices[0];
    expect(n.title).toMatch(/^huge\.csv: The file is 400 MB, more than the 400 MB the page can hold\.$/);
    expect(store.getState().traces).toHaveLength(0);
  });

  it('once started it analyses the sample when it arrives; the result is the current sample’s and finds the demo’s large peak', async () => {
    const { store, service } = fresh();
    service.addPeakByHand(4.3);
    expect(store.getState().handNote).toMatchObject({ kind: 'refused' });
    const stop = service.startController();
    try {
      await service.loadBytes(demo('demo-sample.csv'), 'demo-sample.csv');
      await until(() => currentResult(store.getState())?.peaks !== undefined && !store.getState().busy);
      const r = currentResult(store.getState())!;
      expect(r.sampleId).toBe(store.getState().sampleId);
      const large = truth.peaks.find((p) => p.label === 'large isolated peak')!;
      // Within one sample step (0.01 min) of the true centre.
      expect(r.peaks.some((p) => Math.abs(p.x - large.centre) <= 0.01)).toBe(true);
    } finally {
      stop();
    }
  });
});
