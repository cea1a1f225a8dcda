// The service layer over a fresh store each (zustand's testing advice: one
// store per test), with the same core in this thread instead of a worker.
// Expected peaks are the invented demo's own ground truth
// (public/demo/demo-truth.json, written by scripts/make-demo.mjs).
import { readFileSync } from 'node:fs';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { MAX_FILE_BYTES } from '../../src/core/io/types.ts';
import { currentResult } from '../../src/state/selectors.ts';
import { createService, DEMO_FILES } from '../../src/state/service.ts';
import { createAppStore } from '../../src/state/store.ts';
import { inProcessBackend, type ComputeBackend } from '../../src/worker/bridge.ts';

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

/**
 * The demo as the page fetches it: public/demo/ served by a stand-in `fetch`
 * that answers on a later task, as a network does (so an analysis asked for
 * between two files would start). `hold` keeps one file back until released;
 * `fail` answers HTTP 404 for one file; `empty` serves one file with no bytes.
 */
function serveDemo(opts: { hold?: string; fail?: string; empty?: string } = {}) {
  let release = (): void => undefined;
  const held = new Promise<void>((r) => { release = r; });
  let reached = (): void => undefined;
  const holding = new Promise<void>((r) => { reached = r; });
  vi.stubGlobal('document', { baseURI: 'http://demo.test/' });
  vi.stubGlobal('fetch', async (url: URL) => {
    const name = url.pathname.split('/').pop()!;
    expect(url.href).toBe(`http://demo.test/demo/${name}`);
    await new Promise((r) => setTimeout(r, 2));
    if (name === opts.hold) { reached(); await held; }
    if (name === opts.fail) return { ok: false, status: 404, arrayBuffer: () => Promise.reject(new Error('no body')) };
    const bytes = name === opts.empty ? new Uint8Array(0) : demo(name);
    return { ok: true, status: 200, arrayBuffer: () => Promise.resolve(bytes.buffer) };
  });
  return { release, holding };
}

/** A fresh store and service whose in-process backend counts the analyses asked for (the latest-only ones). */
function counted() {
  const store = createAppStore();
  const analyses = { n: 0 };
  const service = createService(store, () => {
    const inner = inProcessBackend();
    const backend: ComputeBackend = { ...inner, analyse: (req, on, side) => { if (!side) analyses.n += 1; return inner.analyse(req, on, side); } };
    return backend;
  });
  /** How many times the store's traces changed. */
  const changes = { traces: 0 };
  store.subscribe((s, prev) => { if (s.traces !== prev.traces) changes.traces += 1; });
  return { store, service, analyses, changes };
}

const titles = (store: ReturnType<typeof createAppStore>) => store.getState().notices.map((n) => n.title);

describe('the demo run arrives as one change of traces (issue 16)', () => {
  afterEach(() => { vi.unstubAllGlobals(); });

  it('ten files, one change replacing what was there, each with its role and its own load report; one analysis; one notice after it', async () => {
    const { store, service, analyses, changes } = counted();
    expect(await service.loadBytes(demo('demo-sample.csv'), 'mine.csv')).toBe(true);
    const stop = service.startController();
    try {
      changes.traces = 0;
      serveDemo();
      const noticesBefore = store.getState().notices.length;
      // The notice comes after the change: when the traces change, no "Demo loaded" notice is there yet.
      let noticeAtChange: boolean | null = null;
      const unsub = store.subscribe((s, prev) => { if (s.traces !== prev.traces) noticeAtChange = titles(store).some((t) => t.startsWith('Demo loaded')); });
      await service.loadDemo();
      unsub();
      await until(() => currentResult(store.getState())?.peaks !== undefined && !store.getState().busy);
      await new Promise((r) => setTimeout(r, 50));
      const s = store.getState();
      expect(changes.traces).toBe(1);
      expect(noticeAtChange).toBe(false);
      expect(analyses.n).toBe(1);
      // mine.csv is gone: the demo replaces what was there, as "Reload demo" always did.
      expect(s.traces.map((t) => t.source.fileName)).toEqual(DEMO_FILES.map((d) => d.file));
      expect(s.traces.map((t) => s.roles[t.id])).toEqual(DEMO_FILES.map((d) => d.role));
      expect(s.sampleId).toBe(s.traces[0].id);
      for (const t of s.traces) {
        expect(s.reports[t.id].fileName).toBe(t.source.fileName);
        // The same hash the loader gives each file read alone (same parse, same report).
        expect(s.reports[t.id].sha256).toBe(t.source.sha256);
      }
      expect(new Set(s.traces.map((t) => s.reports[t.id].sha256)).size).toBe(10);
      const added = s.notices.length - noticesBefore;
      expect(added).toBe(1);
      expect(titles(store).filter((t) => t.startsWith('Demo loaded'))).toEqual(['Demo loaded: an invented teaching-rig run (10 traces)']);
      expect(s.loading).toBeNull();
    } finally {
      stop();
    }
  });

  it('a file of the user’s opened while the demo is arriving wins: the demo adds nothing and the notice says so', async () => {
    const { store, service, changes } = counted();
    const { release, holding } = serveDemo({ hold: 'demo-scan-3.csv' });
    const demoDone = service.loadDemo();
    await holding;
    const bytes = demo('demo-blank.csv');
    const mine = { name: 'mine.csv', size: bytes.byteLength, arrayBuffer: () => Promise.resolve(bytes.buffer) } as unknown as File;
    await service.openFiles([mine]);
    release();
    await demoDone;
    const s = store.getState();
    expect(s.traces.map((t) => t.source.fileName)).toEqual(['mine.csv']);
    expect(s.sampleId).toBe(s.traces[0].id);
    expect(changes.traces).toBe(1);
    expect(titles(store).some((t) => t.startsWith('Demo loaded'))).toBe(false);
    const n = s.notices.find((x) => x.title === 'The demo was not loaded')!;
    expect(n.lines.join(' ')).toMatch(/the demo added nothing, your file is as you opened it/);
  });

  it('a demo file that cannot be fetched, and one that cannot be read, each give their notice; the other eight arrive in the one change', async () => {
    const { store, service, changes } = counted();
    serveDemo({ fail: 'demo-blank.csv', empty: 'demo-scan-4.csv' });
    await service.loadDemo();
    const s = store.getState();
    expect(changes.traces).toBe(1);
    const kept = DEMO_FILES.filter((d) => d.file !== 'demo-blank.csv' && d.file !== 'demo-scan-4.csv');
    expect(s.traces.map((t) => t.source.fileName)).toEqual(kept.map((d) => d.file));
    expect(s.traces.map((t) => s.roles[t.id])).toEqual(kept.map((d) => d.role));
    const t = titles(store);
    expect(t).toContain('The demo file demo-blank.csv could not be fetched');
    expect(s.notices.find((x) => x.title === 'The demo file demo-blank.csv could not be fetched')!.lines).toEqual(['HTTP 404']);
    // The loaders' own wording for the unreadable file, as for a file of the user's.
    expect(t).toContain('demo-scan-4.csv: The file is empty (0 bytes).');
    expect(t.filter((x) => x.startsWith('Demo loaded'))).toEqual(['Demo loaded: an invented teaching-rig run (8 traces)']);
  });

  it('"Reload demo" pressed while the demo is arriving: one change, one "Demo loaded" notice, and no word of a file of the user’s', async () => {
    const { store, service, changes } = counted();
    const { release, holding } = serveDemo({ hold: 'demo-scan-2.csv' });
    const first = service.loadDemo();
    await holding;
    const second = service.loadDemo();
    release();
    await Promise.all([first, second]);
    expect(changes.traces).toBe(1);
    expect(store.getState().traces).toHaveLength(10);
    expect(titles(store).filter((x) => x.startsWith('Demo loaded'))).toHaveLength(1);
    expect(titles(store).some((x) => /not loaded/.test(x))).toBe(false);
  });
});
