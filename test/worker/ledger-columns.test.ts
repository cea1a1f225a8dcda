/**
 * Issue 16: the loss check's ledger crosses from the worker as columns
 * (worker/ledger-columns.ts). The round trip must give back exactly the
 * ledger that went in: every row, every cell of every column (null kept
 * null, every number's bits), every sentence, in the same order, and the
 * same JSON (the report and exports read it).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { analyse, type AlternativeRequest } from '../../src/core/analysis/index.ts';
import { emptyRecipe, makeRecipeStep, type Recipe } from '../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../src/core/steps/registry.ts';
import { loadFile } from '../../src/core/io/load.ts';
import { createTrace } from '../../src/core/trace.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { ledgerBuffers, ledgerFromColumns, ledgerToColumns } from '../../src/worker/ledger-columns.ts';
import type { Ledger } from '../../src/core/measure/loss-matching.ts';
import { fakeWorker } from './fake-worker.ts';

function recipeWith(step: string, params: Record<string, number>): Recipe {
  const r = emptyRecipe();
  r.steps.push(makeRecipeStep(stepDefinition(step)!, params));
  return r;
}
const alt = (label: string, step: string, params: Record<string, number>): AlternativeRequest => ({ id: label, label, recipe: recipeWith(step, params) });

/** The ledger through columns and a structured clone with its buffers transferred, as worker.ts posts it. */
function crossed(ledger: Ledger): Ledger {
  const cols = ledgerToColumns(ledger);
  const moved = structuredClone(cols, { transfer: ledgerBuffers(cols) });
  expect(cols.sentenceEnds.byteLength).toBe(0); // handed over, not copied
  return ledgerFromColumns(moved);
}

describe('the ledger as columns', () => {
  it('the demo with three alternatives and the noise-level rows: the same ledger back, and the same JSON', () => {
    const loaded = loadFile(new Uint8Array(readFileSync('public/demo/demo-sample.csv')), 'demo-sample.csv');
    if (!loaded.ok) throw new Error('demo did not load');
    const t = loaded.traces[0];
    const r = analyse({
      sampleId: t.id, scanIds: [], recipe: recipeWith('moving-average', { window: 3 }), ledgerNoiseLevel: true,
      alternatives: [alt('5-point moving average', 'moving-average', { window: 5 }), alt('25-point moving average', 'moving-average', { window: 25 }), alt('61-point moving average', 'moving-average', { window: 61 })],
    }, new Map([[t.id, t]]), STEP_REGISTRY);
    const ledger = r.loss!.ledger;
    expect(ledger.rows.length).toBeGreaterThan(5);
    expect(ledger.rows.some((row) => row.crossed)).toBe(true);
    expect(ledger.rows.some((row) => row.cells.some((c) => !c.found))).toBe(true); // nulls in the cells
    const back = crossed(ledger);
    expect(back).toEqual(ledger);
    expect(JSON.stringify(back)).toBe(JSON.stringify(ledger));
    back.rows.forEach((row, k) => row.cells.forEach((c, i) => {
      const was = ledger.rows[k].cells[i];
      for (const f of ['x', 'snr', 'heightKept', 'widthChange', 'apexShift', 'apexShiftPoints', 'areaChange'] as const) expect(Object.is(c[f], was[f])).toBe(true);
    }));
  });

  it('a long noisy trace at the default settings: the rows the page is sent, exactly, as typed arrays', () => {
    const rng = makeRng(161);
    const n = 20_000;
    const x = Array.from({ length: n }, (_, i) => i * 0.01);
    const y = x.map((v, i) => 3 * Math.exp(-0.5 * ((v - 60) / 0.4) ** 2) + 0.2 * Math.sin(i / 900) + 0.1 * rng.normal());
    const t = createTrace({ name: 't', x, y, source: { fileName: 't.csv', sha256: '0'.repeat(64), rowsRead: n, rowsSkipped: 0 } });
    const r = analyse({ sampleId: t.id, scanIds: [], recipe: recipeWith('moving-average', { window: 9 }), alternatives: [alt('SG 25/2', 'savitzky-golay', { window: 25, order: 2 })] }, new Map([[t.id, t]]), STEP_REGISTRY);
    const ledger = r.loss!.ledger;
    expect(ledger.rows.length).toBeGreaterThan(0);
    const cols = ledgerToColumns(ledger);
    expect(cols.rows.columns.position.kind).toBe('number');
    expect(cols.cells.columns.snr.kind).toBe('number');
    expect(cols.cells.length).toBe(ledger.rows.length * ledger.alternatives.length);
    expect(cols.sentences).toBeNull(); // the ledger's sentences are its rows' in order, sent once
    expect(crossed(ledger)).toEqual(ledger);
  });

  it('a ledger whose own sentence list is not its rows’ keeps its own', () => {
    const cell = { found: true, peakIndex: 0, x: 1, snr: 4, standing: 'detectable', height: 1, area: 1, fwhm: 0.1, heightKept: null, widthChange: null, apexShift: null, apexShiftPoints: null, areaChange: null, crossed: null } as const;
    const ledger: Ledger = {
      alternatives: [{ id: 'raw', label: 'raw' }],
      rows: [{ position: 1, tolerance: 0.2, firstFoundIn: 0, cells: [cell], crossed: false, sentences: ['one', 'two'] }, { position: 2, tolerance: 0.2, firstFoundIn: 0, cells: [{ ...cell, x: 2 }], crossed: false, sentences: [] }],
      sentences: ['two'],
      rule: 'a rule',
    };
    expect(crossed(ledger)).toEqual(ledger);
    expect(() => ledgerToColumns({ ...ledger, rows: [{ ...ledger.rows[0], cells: [] }] })).toThrow(/0 cells for 1 columns/);
  });
});

describe('the page side of the bridge', () => {
  it('puts a loss stage’s ledger back from its columns before the store sees the update', async () => {
    const { backend, posted, answer } = fakeWorker();
    const cell = { found: false, peakIndex: -1, x: null, snr: null, standing: 'lost', height: null, area: null, fwhm: null, heightKept: null, widthChange: null, apexShift: null, apexShiftPoints: null, areaChange: null, crossed: 'down' } as const;
    const ledger: Ledger = { alternatives: [{ id: 'raw', label: 'raw' }], rows: [{ position: 3.25, tolerance: 0.1, firstFoundIn: 0, cells: [cell], crossed: true, sentences: ['lost'] }], sentences: ['lost'], rule: 'r' };
    const seen: unknown[] = [];
    const job = backend.analyse({ sampleId: 's', scanIds: [], recipe: emptyRecipe() }, (u) => seen.push(u.patch.loss?.ledger));
    const jobId = (posted.find((m) => m.type === 'call' && m.method === 'analyse') as { jobId: number }).jobId;
    const patch = { loss: { ledger: { alternatives: [], rows: [], sentences: [], rule: '' }, outcomes: [], noiseLevelRows: 0, noiseLevelShown: false } };
    answer({ type: 'stage', jobId, update: { stage: 'loss', sampleId: 's', pending: [], patch }, ledgerColumns: ledgerToColumns(ledger) });
    answer({ type: 'result', method: 'analyse', jobId, value: { outcome: 'done', ms: 1 } });
    expect(await job).toBe(true);
    expect(seen).toEqual([ledger]);
  });
});
