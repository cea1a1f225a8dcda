/**
 * Issue 16: the peak table crosses from the worker as typed-array columns.
 * The round trip must give back exactly the rows that went in (every bit of
 * every number, null kept null, an absent field kept absent).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { columnBuffers, fromColumns, lazyRows, toColumns } from '../../src/worker/transfer.ts';
import { analyse } from '../../src/core/analysis/index.ts';
import { emptyRecipe } from '../../src/core/method.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import { createTrace } from '../../src/core/trace.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { fakeWorker } from './fake-worker.ts';

describe('rows as columns', () => {
  it('round-trips random rows exactly, structured-cloned as the worker sends them', () => {
    fc.assert(fc.property(
      fc.array(fc.record({
        a: fc.double(),
        b: fc.option(fc.double(), { nil: null }),
        c: fc.option(fc.string(), { nil: undefined }),
        d: fc.boolean(),
        e: fc.array(fc.constantFrom('x', 'y')),
        f: fc.option(fc.record({ g: fc.double() }), { nil: null }),
        h: fc.option(fc.boolean(), { nil: undefined }),
      }, { requiredKeys: ['a', 'd'] }), { maxLength: 30 }),
      (rows) => {
        const cols = structuredClone(toColumns(rows));
        const back = fromColumns<Record<string, unknown>>(cols);
        expect(back).toEqual(rows);
        // Every number keeps its bits (−0 and NaN included), and absent fields stay absent.
        rows.forEach((r, i) => {
          expect(Object.is(back[i].a, r.a)).toBe(true);
          expect(Object.keys(back[i]).sort()).toEqual(Object.keys(r).filter((k) => (r as Record<string, unknown>)[k] !== undefined).sort());
        });
      },
    ), { numRuns: 200 });
  });

  it('rows that all have every field (made from one template): the same rows, keys in the same order, bits kept', () => {
    fc.assert(fc.property(
      fc.array(fc.record({
        a: fc.double(),
        b: fc.option(fc.double(), { nil: null }),
        c: fc.string(),
        d: fc.boolean(),
        e: fc.array(fc.constantFrom('x', 'y')),
        f: fc.option(fc.record({ g: fc.double() }), { nil: null }),
      }), { maxLength: 30 }),
      (rows) => {
        const cols = structuredClone(toColumns(rows));
        for (const back of [fromColumns<Record<string, unknown>>(cols), lazyRows<Record<string, unknown>>(cols)]) {
          expect(back).toEqual(rows);
          // JSON compares key order and every value as written; Object.is every number's bits (−0, NaN).
          expect(JSON.stringify(back)).toBe(JSON.stringify(rows));
          rows.forEach((r, i) => { expect(Object.is(back[i].a, r.a)).toBe(true); expect(Object.is(back[i].b, r.b)).toBe(true); });
        }
      },
    ), { numRuns: 200 });
  });

  it('rows of different shapes and key orders: fields in the order first seen, each value in its own column, and back', () => {
    const rows: Record<string, unknown>[] = [{ a: 1, b: 'x' }, { b: 'y', a: -0 }, { c: true }, { a: 3, b: 'x', c: false }, { a: null, b: undefined }];
    const cols = toColumns(rows);
    expect(cols.fields).toEqual(['a', 'b', 'c']);
    expect(cols.columns.a).toEqual({ kind: 'number', values: Float64Array.of(1, -0, 0, 3, 0), kinds: Uint8Array.of(2, 2, 0, 2, 1) });
    expect(cols.columns.b).toEqual({ kind: 'string', dictionary: ['x', 'y'], codes: Uint32Array.of(0, 1, 0xffffffff, 0, 0xffffffff) });
    expect(cols.columns.c).toEqual({ kind: 'boolean', values: Uint8Array.of(2, 2, 1, 0, 2) });
    const back = fromColumns<Record<string, unknown>>(structuredClone(cols));
    expect(Object.is(back[1].a, -0)).toBe(true);
    expect(back).toEqual([{ a: 1, b: 'x' }, { b: 'y', a: -0 }, { c: true }, { a: 3, b: 'x', c: false }, { a: null }]);
  });

  it('a real peak table: numbers as Float64Array columns, words by dictionary, and back to the same rows', () => {
    const rng = makeRng(5);
    const x = Array.from({ length: 5000 }, (_, i) => i * 0.01);
    const y = x.map((t) => 4 * Math.exp(-0.5 * ((t - 10) / 0.2) ** 2) + 2 * Math.exp(-0.5 * ((t - 30) / 0.1) ** 2) + 0.05 * rng.normal());
    const t = createTrace({ name: 't', x, y, source: { fileName: 't.csv', sha256: '0'.repeat(64), rowsRead: 5000, rowsSkipped: 0 } });
    const r = analyse({ sampleId: t.id, scanIds: [], recipe: emptyRecipe() }, new Map([[t.id, t]]), STEP_REGISTRY);
    expect(r.peaks.length).toBeGreaterThan(2);
    const cols = toColumns(r.peaks as unknown as Record<string, unknown>[]);
    expect(cols.columns.x.kind).toBe('number');
    expect(cols.columns.flag.kind).toBe('string');
    expect(cols.columns.marks.kind).toBe('words');
    expect(cols.columns.pharmaNoise.kind).toBe('records');
    expect(Object.values(cols.columns).filter((c) => c.kind === 'plain')).toEqual([]);
    expect(columnBuffers(cols).length).toBeGreaterThan(20);
    expect(fromColumns(structuredClone(cols, { transfer: columnBuffers(cols) }))).toEqual(r.peaks);
  });
});

describe('lists of words and objects as columns', () => {
  // The peak table's marks (lists of words) and pharmacopoeial noise windows (objects) crossed as one array and one
  // object per row; they now cross as columns too. The round trip must still give back the same rows.
  const anyValue = fc.oneof(fc.double(), fc.string(), fc.boolean(), fc.constant(null), fc.array(fc.string(), { maxLength: 3 }));
  it('round-trips lists, objects (of several shapes, nested, null or absent) and their mixtures, through a transfer', () => {
    fc.assert(fc.property(
      fc.array(fc.record({
        marks: fc.option(fc.array(fc.constantFrom('a', 'b', 'thinly-sampled', '')), { nil: null }),
        words: fc.option(fc.array(fc.string(), { maxLength: 4 }), { nil: undefined }),
        window: fc.option(fc.record({
          h: fc.double(), points: fc.integer(), source: fc.string(), clipped: fc.boolean(),
          inner: fc.option(fc.record({ z: fc.option(fc.double(), { nil: null }), w: fc.array(fc.constantFrom('p', 'q')) }, { requiredKeys: [] }), { nil: undefined }),
        }, { requiredKeys: ['h'] }), { nil: null }),
        loose: fc.option(fc.dictionary(fc.constantFrom('k', 'l', 'm'), anyValue), { nil: undefined }),
        mixed: fc.oneof(fc.array(fc.string(), { maxLength: 2 }), fc.record({ a: fc.double() }), fc.array(fc.double(), { maxLength: 2 })),
      }, { requiredKeys: ['marks', 'mixed'] }), { maxLength: 30 }),
      (rows) => {
        const cols = toColumns(rows);
        const sent = structuredClone(cols, { transfer: columnBuffers(cols) });
        for (const back of [fromColumns<Record<string, unknown>>(sent), lazyRows<Record<string, unknown>>(sent)]) {
          expect(back).toEqual(rows);
          rows.forEach((r, i) => {
            // The row's fields (in the order first seen in the table: as before), absent ones still absent (toEqual
            // alone ignores undefined); each value as written, nested key order included (JSON), and −0 kept.
            expect(Object.keys(back[i]).sort()).toEqual(Object.keys(r).filter((k) => (r as Record<string, unknown>)[k] !== undefined).sort());
            for (const [k, v] of Object.entries(r)) expect(JSON.stringify(back[i][k])).toBe(JSON.stringify(v));
            const w = r.window, bw = back[i].window as typeof w;
            if (w) expect(Object.is(bw!.h, w.h)).toBe(true);
          });
        }
      },
    ), { numRuns: 200 });
  });

  it('takes lists of words and plain objects apart; anything else (numbers in a list, a class instance, a typed array) stays as it is', () => {
    const withHole: string[] = ['a'];
    withHole[2] = 'b'; // index 1 is a hole: not a list of words
    const rows: Record<string, unknown>[] = [
      { marks: ['x', 'y'], w: { h: 1, s: 'a' }, nums: [1, 2], when: new Date(0), arr: Float64Array.of(1), holes: withHole },
      { marks: [], w: null, nums: [], when: new Date(1), arr: Float64Array.of(2), holes: [] },
      { w: { h: -0, s: 'b' }, nums: null },
    ];
    const cols = toColumns(rows);
    expect(cols.columns.marks).toEqual({ kind: 'words', dictionary: ['x', 'y'], starts: Uint32Array.of(0, 2, 2, 2), codes: Uint32Array.of(0, 1), kinds: Uint8Array.of(2, 2, 0) });
    const w = cols.columns.w;
    expect(w.kind).toBe('records');
    if (w.kind !== 'records') return;
    expect(w.at).toEqual(Int32Array.of(0, -2, 1));
    expect(w.rows.fields).toEqual(['h', 's']);
    expect(w.rows.columns.h).toEqual({ kind: 'number', values: Float64Array.of(1, -0) });
    for (const f of ['nums', 'when', 'arr', 'holes']) expect(cols.columns[f].kind).toBe('plain');
    const back = fromColumns<Record<string, unknown>>(structuredClone(cols));
    expect(back).toEqual(rows);
    expect(Object.is((back[2].w as { h: number }).h, -0)).toBe(true);
    expect(Object.keys(back[2].w as object)).toEqual(['h', 's']);
    // Objects with other keys, or the same keys in another order, stay as they are (each keeps its key order).
    for (const other of [{ s: 'b', h: 2 }, { h: 2 }, { h: 2, s: 'b', t: 1 }]) {
      const c2 = toColumns([{ w: { h: 1, s: 'a' } }, { w: other }]);
      expect(c2.columns.w.kind).toBe('plain');
      expect(JSON.stringify(fromColumns(structuredClone(c2)))).toBe(JSON.stringify([{ w: { h: 1, s: 'a' } }, { w: other }]));
    }
    expect('marks' in back[2]).toBe(false);
  });

  it('objects nested deeper than four levels stay plain below that, and come back the same', () => {
    const deep = (k: number): Record<string, unknown> => (k === 0 ? { v: k } : { v: k, d: deep(k - 1) });
    const rows = [{ d: deep(6) }, { d: deep(6) }];
    const cols = toColumns(rows);
    let c = cols, depth = 0;
    while (c.columns.d?.kind === 'records') { c = c.columns.d.rows; depth++; }
    expect(depth).toBe(4);
    expect(c.columns.d.kind).toBe('plain');
    expect(fromColumns(structuredClone(cols))).toEqual(rows);
  });
});

describe('the page side of the bridge', () => {
  it('puts a stage’s peak columns back as rows before the store sees the update, and ends the job on done', async () => {
    const { backend, posted, answer } = fakeWorker();
    const rows = [{ x: 1.5, snr: null, flag: 'detectable', marks: [] }, { x: 2.5, snr: 12.25, flag: 'quantifiable', marks: ['thinly-sampled'] }];
    const seen: unknown[] = [];
    const job = backend.analyse({ sampleId: 's', scanIds: [], recipe: emptyRecipe() }, (u) => seen.push(u.patch.peaks));
    const jobId = (posted.find((m) => m.type === 'call' && m.method === 'analyse') as { jobId: number }).jobId;
    answer({ type: 'stage', jobId, update: { stage: 'peaks', sampleId: 's', pending: ['loss'], patch: {} }, peakColumns: toColumns(rows) });
    answer({ type: 'result', method: 'analyse', jobId, value: { outcome: 'done', ms: 1 } });
    expect(await job).toBe(true);
    expect(seen).toEqual([rows]);
  });
});

describe('rows made as they are read', () => {
  it('behaves as the array fromColumns makes: indexing, length, iteration, array methods, JSON, the same object each time', () => {
    fc.assert(fc.property(
      fc.array(fc.record({ a: fc.double(), b: fc.option(fc.string(), { nil: undefined }), c: fc.option(fc.double(), { nil: null }) }, { requiredKeys: ['a'] }), { maxLength: 25 }),
      (rows) => {
        const cols = structuredClone(toColumns(rows));
        const eager = fromColumns<Record<string, unknown>>(cols);
        const lazy = lazyRows<Record<string, unknown>>(cols);
        expect(Array.isArray(lazy)).toBe(true);
        expect(lazy.length).toBe(rows.length);
        if (rows.length) expect(lazy[rows.length - 1]).toBe(lazy[rows.length - 1]);
        expect(lazy[rows.length]).toBeUndefined();
        expect(lazy.map((r) => r.a)).toEqual(eager.map((r) => r.a));
        expect(lazy.filter((r) => r.c === null).length).toBe(eager.filter((r) => r.c === null).length);
        expect([...lazy]).toEqual(eager);
        expect(lazy.slice()).toEqual(eager);
        expect(JSON.stringify(lazy)).toBe(JSON.stringify(eager));
        expect(Object.keys(lazy)).toEqual(Object.keys(eager));
        if (rows.length) expect(lazy.indexOf(lazy[0])).toBe(0);
        expect(lazy).toEqual(eager);
      },
    ), { numRuns: 150 });
  });
});
