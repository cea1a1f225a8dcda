import { describe, expect, test, vi } from 'vitest';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS } from '../../src/core/analysis/index.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { createTrace } from '../../src/core/trace.ts';
import { createAppStore } from '../../src/state/store.ts';
import {
  JOURNAL_KEY, mergeJournal, SESSION_CHUNK, SESSION_UNDO_STEPS, sessionFromRecords, sessionJournal, sessionMeta, startSessionAutosave,
  storageProblem, traceFromRecords, traceToRecords, type ChunkKey, type SaveOutcome, type SessionSnapshot,
} from '../../src/state/session-db.ts';
import { recipeOf } from '../core/export/helpers.ts';

/** A snapshot as one meta record and the chunk records of all its traces (what a first save writes). */
function sessionToRecords(snapshot: SessionSnapshot, generation: number, savedAt: Date, chunkSize: number = SESSION_CHUNK) {
  return { meta: sessionMeta(snapshot, generation, savedAt, chunkSize), chunks: snapshot.traces.flatMap((t) => traceToRecords(t, chunkSize).chunks) };
}

function bigTrace(n: number) {
  const rng = makeRng(99);
  const x = new Float64Array(n), y = new Float64Array(n);
  for (let i = 0; i < n; i++) { x[i] = i * 0.001 + 5; y[i] = rng.normal(); }
  return createTrace({ id: 'big-1', name: 'big.csv: y', x, y, xUnit: 's', yUnit: 'V', source: { fileName: 'big.csv', sha256: 'cd'.repeat(32), rowsRead: n, rowsSkipped: 0 }, metadata: { Operator: 'A. N. Other' } });
}

const lookup = (chunks: { key: ChunkKey; data: Float64Array }[]) => {
  const m = new Map(chunks.map((c) => [c.key.join('|'), c.data]));
  return (k: ChunkKey) => m.get(k.join('|'));
};

describe('session records', () => {
  test('a trace of 3 chunks + 5 points splits into 4 chunks per axis and comes back identical', () => {
    const n = 3 * SESSION_CHUNK + 5;
    const t = bigTrace(n);
    const { head, chunks } = traceToRecords(t);
    expect(head.chunks).toBe(4);
    expect(chunks).toHaveLength(8);
    expect(chunks.map((c) => c.data.length)).toEqual([SESSION_CHUNK, SESSION_CHUNK, SESSION_CHUNK, 5, SESSION_CHUNK, SESSION_CHUNK, SESSION_CHUNK, 5]);
    // Each chunk owns its buffer (a view would drag the whole trace into every record).
    for (const c of chunks) expect(c.data.buffer.byteLength).toBe(c.data.length * 8);
    const back = traceFromRecords(head, lookup(chunks));
    // Element by element with Object.is (deep equality of 3 million elements is too slow in the matcher).
    let differ = 0;
    for (let i = 0; i < n; i++) if (!Object.is(back.x[i], t.x[i]) || !Object.is(back.y[i], t.y[i])) differ++;
    expect(back.x.length).toBe(n);
    expect(differ).toBe(0);
    expect(back.id).toBe(t.id);
    expect(back.source).toEqual(t.source);
    expect(back.metadata).toEqual(t.metadata);
  });

  test('a missing chunk is named, not silently filled', () => {
    const t = bigTrace(25);
    const { head, chunks } = traceToRecords(t, 10);
    expect(head.chunks).toBe(3);
    const get = lookup(chunks.filter((c) => !(c.key[1] === 'y' && c.key[2] === 1)));
    expect(() => traceFromRecords(head, get)).toThrow(/part 2 of its y values/);
  });

  test('a whole session round-trips: roles, sample, recipe, settings, decisions; a trace that cannot be rebuilt is left out with a note', () => {
    const a = bigTrace(40);
    const b = createTrace({ id: 'blank-1', name: 'blank', x: [1, 2, 3, 4, 5], y: [0, 0, 1, 0, 0], source: { fileName: 'b.csv', sha256: 'ef'.repeat(32), rowsRead: 5, rowsSkipped: 0 } });
    const snap: SessionSnapshot = {
      traces: [a, b], roles: { 'big-1': 'sample', 'blank-1': 'blank' }, sampleId: 'big-1', reports: {},
      recipe: recipeOf('savitzky-golay', 'baseline'), noiseSettings: { method: 'rms', quietRange: [5, 5.01] },
      peakSettings: { ...DEFAULT_PEAK_SETTINGS, minSnr: 4 }, decisions: { added: [5.02], removed: [5.03] },
      alternatives: [{ id: 'alt-1', label: '5-point moving average', recipe: recipeOf('moving-average') }],
      past: [recipeOf(), recipeOf('savitzky-golay')], future: [recipeOf('savitzky-golay', 'baseline', 'despike')],
    };
    const { meta, chunks } = sessionToRecords(snap, 3, new Date(0), 16);
    // What is stored must survive structured cloning (IndexedDB) — JSON is stricter and also fine for meta.
    const stored = JSON.parse(JSON.stringify(meta));
    const out = sessionFromRecords(stored, lookup(chunks));
    expect(out && out.ok).toBe(true);
    if (!out || !out.ok) return;
    expect(out.notes).toEqual([]);
    expect(out.snapshot.traces.map((t) => t.id)).toEqual(['big-1', 'blank-1']);
    expect(out.snapshot.traces[0].y).toEqual(a.y);
    expect(out.snapshot.roles).toEqual(snap.roles);
    expect(out.snapshot.sampleId).toBe('big-1');
    expect(out.snapshot.recipe).toEqual(snap.recipe);
    expect(out.snapshot.noiseSettings).toEqual(snap.noiseSettings);
    expect(out.snapshot.peakSettings.minSnr).toBe(4);
    expect(out.snapshot.decisions).toEqual(snap.decisions);
    expect(out.snapshot.alternatives).toEqual(snap.alternatives);
    expect(out.snapshot.past).toEqual(snap.past);
    expect(out.snapshot.future).toEqual(snap.future);

    const partial = sessionFromRecords(stored, lookup(chunks.filter((c) => c.key[0] !== 'blank-1')));
    expect(partial && partial.ok && partial.snapshot.traces.map((t) => t.id)).toEqual(['big-1']);
    expect(partial && partial.ok && partial.snapshot.roles).toEqual({ 'big-1': 'sample' });
    expect(partial && partial.ok && partial.notes.length).toBe(1);
  });

  test('a recipe with an unknown step is not restored; the rest is', () => {
    const a = bigTrace(10);
    const { meta, chunks } = sessionToRecords({
      traces: [a], roles: { 'big-1': 'sample' }, sampleId: 'big-1', reports: {}, recipe: recipeOf('savitzky-golay'),
      noiseSettings: DEFAULT_NOISE_SETTINGS, peakSettings: DEFAULT_PEAK_SETTINGS, decisions: { added: [], removed: [] },
      alternatives: [{ id: 'alt-1', label: 'broken later', recipe: recipeOf('moving-average') }], past: [], future: [],
    }, 1, new Date(0));
    (meta.alternatives![0].recipe as { steps: { step: string }[] }).steps[0].step = 'gone-step';
    (meta.recipe as { steps: { step: string }[] }).steps[0].step = 'no-such-step';
    const out = sessionFromRecords(meta, lookup(chunks));
    expect(out && out.ok && out.snapshot.recipe.steps).toEqual([]);
    expect(out && out.ok && out.notes[0]).toMatch(/no-such-step/);
    // An alternative that no longer validates is left out with a note; nothing half-applied.
    expect(out && out.ok && out.snapshot.alternatives).toEqual([]);
    expect(out && out.ok && out.notes[1]).toMatch(/broken later/);
    expect(sessionFromRecords({ ...meta, version: 99 }, lookup(chunks))).toEqual({ ok: false, problem: expect.stringMatching(/newer version/) });
  });

  test('a quota error becomes a problem value that says the earlier session is kept', () => {
    const p = storageProblem({ name: 'QuotaExceededError', message: 'The quota has been exceeded.' }, 'save');
    expect(p.ok).toBe(false);
    expect(p.problem).toMatch(/storage quota/);
    expect(p.problem).toMatch(/kept unchanged/);
  });
});

describe('undo history, the journal and keeping every edit', () => {
  const trace = () => bigTrace(30);
  const snapshot = (over: Partial<SessionSnapshot> = {}): SessionSnapshot => ({
    traces: [trace()], roles: { 'big-1': 'sample' }, sampleId: 'big-1', reports: {}, recipe: recipeOf('savitzky-golay'),
    noiseSettings: DEFAULT_NOISE_SETTINGS, peakSettings: DEFAULT_PEAK_SETTINGS, decisions: { added: [], removed: [] },
    alternatives: [], past: [], future: [], ...over,
  });

  test(`the undo history is kept up to ${SESSION_UNDO_STEPS} steps each way, the newest ones`, () => {
    const past = Array.from({ length: 80 }, (_, i) => ({ ...recipeOf('moving-average'), steps: recipeOf('moving-average').steps.map((st) => ({ ...st, params: { ...st.params, window: 3 + 2 * i } })) }));
    const meta = sessionMeta(snapshot({ past, future: past.slice(0, 60) }), 1, new Date(0));
    expect(meta.past).toHaveLength(SESSION_UNDO_STEPS);
    expect(meta.future).toHaveLength(SESSION_UNDO_STEPS);
    // The step just before the current one is the last kept.
    expect((meta.past!.at(-1) as { steps: { params: { window: number } }[] }).steps[0].params.window).toBe(3 + 2 * 79);
    expect((meta.future![0] as { steps: { params: { window: number } }[] }).steps[0].params.window).toBe(3);
  });

  test('a journal at least as new as the stored generation wins for every small part; an older one is ignored', () => {
    const stored = sessionMeta(snapshot(), 1, new Date(1000), SESSION_CHUNK, 1000);
    const later = snapshot({
      recipe: recipeOf('savitzky-golay', 'despike'), past: [recipeOf('savitzky-golay')],
      noiseSettings: { method: 'rms', quietRange: [0.001, 0.004] }, decisions: { added: [0.012], removed: [] },
      alternatives: [{ id: 'alt-9', label: 'wider', recipe: recipeOf('moving-average') }],
    });
    const journal = sessionJournal(later, 2000);
    const merged = mergeJournal(stored, journal);
    expect(merged.notes).toEqual([]);
    const out = sessionFromRecords(merged.meta, lookup(traceToRecords(trace()).chunks));
    expect(out && out.ok).toBe(true);
    if (!out || !out.ok) return;
    expect(out.snapshot.recipe).toEqual(later.recipe);
    expect(out.snapshot.past).toEqual(later.past);
    expect(out.snapshot.noiseSettings.quietRange).toEqual([0.001, 0.004]);
    expect(out.snapshot.decisions.added).toEqual([0.012]);
    expect(out.snapshot.alternatives.map((a) => a.label)).toEqual(['wider']);
    // Older than what IndexedDB holds: not applied.
    expect(mergeJournal(stored, sessionJournal(later, 500)).meta).toBe(stored);
  });

  test('a trace the journal names but the database never stored is named in a note, not invented', () => {
    const stored = sessionMeta(snapshot(), 1, new Date(1000), SESSION_CHUNK, 1000);
    const extra = createTrace({ id: 'late-1', name: 'late.csv: y', x: [1, 2, 3, 4, 5], y: [1, 2, 3, 4, 5], source: { fileName: 'late.csv', sha256: '00'.repeat(32), rowsRead: 5, rowsSkipped: 0 } });
    const j = sessionJournal(snapshot({ traces: [trace(), extra], roles: { 'big-1': 'sample', 'late-1': 'blank' } }), 3000);
    const merged = mergeJournal(stored, j);
    expect(merged.notes).toEqual(['Not stored before the page closed, so load again: late.csv: y.']);
    const out = sessionFromRecords(merged.meta, lookup(traceToRecords(trace()).chunks));
    expect(out && out.ok && out.snapshot.roles).toEqual({ 'big-1': 'sample' });
    // When the missing trace was the sample, the stored sample is processed instead (said in a note), never nothing.
    const j2 = sessionJournal(snapshot({ traces: [trace(), extra], roles: { 'big-1': 'ignore', 'late-1': 'sample' }, sampleId: 'late-1', recipe: recipeOf('despike') }), 3000);
    const m2 = mergeJournal(stored, j2);
    expect(m2.notes[1]).toMatch(/sample from the stored session is processed instead/);
    const out2 = sessionFromRecords(m2.meta, lookup(traceToRecords(trace()).chunks));
    expect(out2 && out2.ok && out2.snapshot.sampleId).toBe('big-1');
    expect(out2 && out2.ok && out2.snapshot.roles).toEqual({ 'big-1': 'sample' });
    expect(out2 && out2.ok && out2.snapshot.recipe.steps.map((st) => st.step)).toEqual(['despike']);
  });

  test('autosave: an edit is in the journal when the page is hidden, at once and synchronously', () => {
    const mem = new Map<string, string>();
    const storage = { getItem: (k: string) => mem.get(k) ?? null, setItem: (k: string, v: string) => { mem.set(k, v); }, removeItem: (k: string) => { mem.delete(k); } };
    const was = (globalThis as { localStorage?: unknown }).localStorage;
    (globalThis as { localStorage?: unknown }).localStorage = storage;
    try {
      const store = createAppStore();
      const listeners = new Map<string, () => void>();
      const win = { addEventListener: (t: string, f: () => void) => { listeners.set(t, f); }, removeEventListener: (t: string) => { listeners.delete(t); } };
      const doc = { visibilityState: 'visible', addEventListener: (t: string, f: () => void) => { listeners.set(`doc:${t}`, f); }, removeEventListener: (t: string) => { listeners.delete(`doc:${t}`); } };
      // Long delays: only the page events can write within this test.
      const stop = startSessionAutosave(store, { delayMs: 60_000, journalDelayMs: 60_000, page: { window: win, document: doc } });
      store.getState().addStep('savitzky-golay');
      store.getState().setNoiseSettings({ quietRange: [1, 2] });
      expect(mem.has(JOURNAL_KEY)).toBe(false);
      listeners.get('pagehide')!();
      const j = JSON.parse(mem.get(JOURNAL_KEY)!);
      expect(j.recipe.steps.map((s: { step: string }) => s.step)).toEqual(['savitzky-golay']);
      expect(j.past).toHaveLength(1);
      expect(j.noiseSettings.quietRange).toEqual([1, 2]);
      store.getState().addPeakAt(1.5);
      doc.visibilityState = 'hidden';
      listeners.get('doc:visibilitychange')!();
      expect(JSON.parse(mem.get(JOURNAL_KEY)!).decisions.added).toEqual([1.5]);
      stop();
      expect(listeners.size).toBe(0);
    } finally {
      (globalThis as { localStorage?: unknown }).localStorage = was;
    }
  });

  test('traces loaded while a save runs are stored as soon as it ends, however many small edits follow, each restarting the wait', async () => {
    vi.useFakeTimers();
    try {
      const store = createAppStore();
      const saves: { at: number; traces: number }[] = [];
      // A stand-in for the database: each save takes 50 ms and records what it held.
      const save = (st: SessionSnapshot) => new Promise<SaveOutcome>((resolve) => {
        setTimeout(() => { saves.push({ at: Date.now(), traces: st.traces.length }); resolve({ ok: true, generation: saves.length }); }, 50);
      });
      const t0 = Date.now();
      const stop = startSessionAutosave(store, { delayMs: 1000, journalDelayMs: 60_000, page: {}, save });
      const report = (f: string) => ({ fileName: f, sha256: 'cd'.repeat(32), format: 'test', rowsRead: 30, skipped: [], notices: [], metadata: {} });
      store.getState().addTraces([bigTrace(30)], report('big.csv'));
      await vi.advanceTimersByTimeAsync(10); // the first save is running
      const late = createTrace({ id: 'late-1', name: 'late.csv: y', x: [1, 2, 3, 4, 5], y: [1, 2, 3, 4, 5], source: { fileName: 'late.csv', sha256: '00'.repeat(32), rowsRead: 5, rowsSkipped: 0 } });
      store.getState().addTraces([late], report('late.csv'));
      // Small edits every 300 ms for 3 s: each restarts the 1 s wait of an ordinary edit.
      for (let k = 0; k < 10; k++) { await vi.advanceTimersByTimeAsync(300); store.getState().addStep('moving-average'); }
      const both = saves.find((v) => v.traces === 2);
      expect(both).toBeDefined();
      // Right after the first save (50 ms) ended, not a second after the edits stopped.
      expect(both!.at - t0).toBeLessThan(200);
      stop();
    } finally {
      vi.useRealTimers();
    }
  });

  test('no storage at all (a private window): the store is told once, and the page state is untouched', async () => {
    const store = createAppStore();
    const stop = startSessionAutosave(store, { delayMs: 0, journalDelayMs: 0, page: {} });
    const t = trace();
    store.getState().addTraces([t], { fileName: 'big.csv', sha256: 'cd'.repeat(32), format: 'test', rowsRead: 30, skipped: [], notices: [], metadata: {} });
    await new Promise((r) => setTimeout(r, 20));
    const problem = store.getState().sessionProblem;
    expect(problem).toMatch(/cannot be kept|refuses the page/);
    store.getState().addStep('moving-average');
    await new Promise((r) => setTimeout(r, 20));
    expect(store.getState().sessionProblem).toBe(problem);
    expect(store.getState().traces[0]).toBe(t);
    expect(store.getState().recipe.steps).toHaveLength(1);
    stop();
  });
});

describe('issue 17: report fields, hand-change reasons and hand-set start and end are kept with the session', () => {
  const base = (): SessionSnapshot => ({
    traces: [bigTrace(20)], roles: { 'big-1': 'sample' }, sampleId: 'big-1', reports: {},
    recipe: recipeOf('savitzky-golay'), noiseSettings: { ...DEFAULT_NOISE_SETTINGS }, peakSettings: { ...DEFAULT_PEAK_SETTINGS },
    decisions: { added: [5.004], removed: [5.01], bounds: [{ x: 5.012, start: 5.008, end: 5.016 }] },
    alternatives: [], past: [], future: [],
  });

  test('they round-trip through the stored records and the journal', () => {
    const snap: SessionSnapshot = {
      ...base(),
      reportFields: { analyst: 'A. Chemist', sample: 'Lot 42', instrument: 'LC-2', run: '7' },
      handReasons: [{ kind: 'removed', x: 5.01, reason: 'carry-over from the wash' }, { kind: 'bounds', x: 5.012, reason: 'tail into the next peak' }],
    };
    const { meta, chunks } = sessionToRecords(snap, 1, new Date(0), 16);
    const out = sessionFromRecords(JSON.parse(JSON.stringify(meta)), lookup(chunks));
    expect(out && out.ok).toBe(true);
    if (!out || !out.ok) return;
    expect(out.snapshot.reportFields).toEqual(snap.reportFields);
    expect(out.snapshot.handReasons).toEqual(snap.handReasons);
    expect(out.snapshot.decisions).toEqual(snap.decisions);
    const journal = JSON.parse(JSON.stringify(sessionJournal(snap, 10)));
    const merged = mergeJournal({ ...meta, reportFields: undefined, handReasons: undefined, takenAt: 0 }, journal).meta;
    expect(merged.reportFields).toEqual(snap.reportFields);
    expect(merged.handReasons).toEqual(snap.handReasons);
  });

  test('a session saved before they existed still loads, with empty fields and no reasons; malformed entries are dropped', () => {
    const { meta, chunks } = sessionToRecords(base(), 1, new Date(0), 16);
    const old = JSON.parse(JSON.stringify(meta));
    delete old.reportFields; delete old.handReasons;
    const out = sessionFromRecords(old, lookup(chunks));
    expect(out && out.ok && out.snapshot.reportFields).toEqual({ analyst: '', sample: '', instrument: '', run: '' });
    expect(out && out.ok && out.snapshot.handReasons).toEqual([]);
    const odd = sessionFromRecords({ ...old, reportFields: { analyst: 7, run: 'r1' }, handReasons: [{ kind: 'moved', x: 1, reason: 'a' }, { kind: 'added', x: 'x', reason: 'b' }, { kind: 'added', x: 5.004, reason: 'shoulder' }] }, lookup(chunks));
    expect(odd && odd.ok && odd.snapshot.reportFields).toEqual({ analyst: '', sample: '', instrument: '', run: 'r1' });
    expect(odd && odd.ok && odd.snapshot.handReasons).toEqual([{ kind: 'added', x: 5.004, reason: 'shoulder' }]);
  });
});
