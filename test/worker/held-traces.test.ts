/**
 * worker/held-traces.ts: the traces the computation worker holds, by id.
 * setInputs keeps only the listed ids (the new traces plus those of `keep`
 * it already holds or was handed), traces handed over through the port join
 * when named, `incomplete` says named traces are still on their way (the
 * worker turns that into its 'missing' failure, worker.ts), and its analyses
 * give the same numbers as core/analysis's analyse() for the same request and
 * traces (its doc: "the same analysis stage by stage").
 */
import { createHash } from 'node:crypto';
import { describe, expect, test } from 'vitest';
import { createTrace, type Trace } from '../../src/core/trace.ts';
import { HeldTraces } from '../../src/worker/held-traces.ts';
import { analyse, applyStage, isStageUpdate, type AnalyseRequest, type AnalyseResult } from '../../src/core/analysis/index.ts';
import { emptyRecipe, makeRecipeStep } from '../../src/core/method.ts';
import { STEP_REGISTRY, stepDefinition } from '../../src/core/steps/registry.ts';
import { makeRng } from '../../src/core/numeric/random.ts';

const mk = (id: string): Trace => createTrace({ id, name: id, x: [0, 1, 2, 3, 4], y: [1, 2, 3, 2, 1], source: { fileName: `${id}.csv`, sha256: '0'.repeat(64), rowsRead: 5, rowsSkipped: 0 } });
const heldOf = (e: HeldTraces) => (e as unknown as { traces: Map<string, Trace> }).traces;

/** An invented trace: two Gaussian bands on white noise (seeded). */
function bands(id: string, seed: number, scale = 1): Trace {
  const rng = makeRng(seed);
  const x = Array.from({ length: 2000 }, (_, i) => i * 0.01);
  const y = x.map((t) => scale * (5 * Math.exp(-0.5 * ((t - 6) / 0.1) ** 2) + 2 * Math.exp(-0.5 * ((t - 13) / 0.15) ** 2)) + 0.05 * rng.normal());
  return createTrace({ id, name: id, x, y, source: { fileName: `${id}.csv`, sha256: '0'.repeat(64), rowsRead: 2000, rowsSkipped: 0 } });
}

function request(sampleId: string, window: number): AnalyseRequest {
  const r = emptyRecipe();
  r.steps.push({ ...makeRecipeStep(stepDefinition('moving-average')!, { window }), uid: 'ma' });
  return { sampleId, scanIds: [], recipe: r, alternatives: [{ id: 'none', label: 'none', recipe: emptyRecipe() }] };
}

/** The numbers of a result that the page shows and exports. */
function numbers(r: AnalyseResult) {
  return {
    processed: Array.from(r.processed.y),
    residual: Array.from(r.residual.y),
    sigma: r.noise?.sigma.sigma,
    peaks: r.peaks.map((p) => [p.x, p.height, p.area, p.fwhm, p.noiseSigma]),
    ledgerRows: r.loss?.ledger.rows.length,
    outcomes: r.loss?.outcomes.map((o) => [o.id, o.noiseSigma, o.peakCount]),
  };
}

describe('traces kept by id', () => {
  // Moved from bridge.test.ts.
  test('the engine keeps the traces it holds whose ids stay, adds the new ones and drops the rest', () => {
    const e = new HeldTraces();
    const [a, b, c] = [mk('a'), mk('b'), mk('c')];
    e.setInputs([a, b]);
    e.setInputs([c], ['b', 'c']);
    const held = heldOf(e);
    expect([...held.keys()].sort()).toEqual(['b', 'c']);
    expect(held.get('b')).toBe(b);
    e.setInputs([a]);
    expect([...heldOf(e).keys()]).toEqual(['a']);
  });

  // Moved from bridge.test.ts.
  test('the computation side takes a handed-over trace whether it comes before or after the page names it', () => {
    const e = new HeldTraces();
    const [a, b, c] = [mk('a'), mk('b'), mk('c')];
    e.setInputs([a]);
    e.stage([b]);
    e.setInputs([], ['a', 'b', 'c']);
    expect(e.incomplete).toBe(true);
    e.stage([c]);
    expect(e.incomplete).toBe(false);
    const held = heldOf(e);
    expect([...held.keys()].sort()).toEqual(['a', 'b', 'c']);
  });

  test('a handed-over trace the page has not named is not analysed; once named it is', () => {
    const e = new HeldTraces();
    const b = bands('b', 1);
    e.stage([b]);
    expect(() => e.analyse(request('b', 5))).toThrow('No trace with id b');
    e.setInputs([], ['b']);
    expect(e.incomplete).toBe(false);
    expect(e.analyse(request('b', 5)).sampleId).toBe('b');
  });

  test('a request naming a trace it does not hold fails with the trace named, from analyse() and from the first stage alike', () => {
    const e = new HeldTraces();
    e.setInputs([bands('a', 1)]);
    expect(() => e.analyse(request('gone', 5))).toThrow('No trace with id gone');
    expect(() => e.stages(request('gone', 5)).next()).toThrow('No trace with id gone');
  });

  test('a named trace that never arrived keeps it incomplete (the state the worker reports as missing); a later setInputs without it clears that', () => {
    const e = new HeldTraces();
    e.setInputs([mk('a')], ['a', 'never']);
    expect(e.incomplete).toBe(true);
    e.setInputs([mk('a')], ['a']);
    expect(e.incomplete).toBe(false);
  });
});

describe('analyses', () => {
  test('analyse() gives the same numbers as core analyse() for the same request and traces', () => {
    const traces = [bands('a', 1), bands('b', 2)];
    const e = new HeldTraces();
    e.setInputs(traces);
    const req = request('a', 7);
    const ours = e.analyse(req);
    const core = analyse(req, new Map(traces.map((t) => [t.id, t])), STEP_REGISTRY);
    expect(ours.peaks.length).toBeGreaterThanOrEqual(2);
    expect(numbers(ours)).toEqual(numbers(core));
  });

  test('stages(), folded stage by stage, give the same numbers as core analyse(); the pauses are undefined and every stage lands in order', () => {
    const traces = [bands('a', 1)];
    const e = new HeldTraces();
    e.setInputs(traces);
    const req = request('a', 9);
    let folded: AnalyseResult | null = null;
    const order: string[] = [];
    for (const u of e.stages(req)) {
      if (!isStageUpdate(u)) continue;
      order.push(u.stage);
      folded = applyStage(folded, u);
    }
    expect(order).toEqual(['processed', 'residual', 'noise', 'peaks', 'bumps', 'alternative', 'loss']);
    const core = analyse(req, new Map(traces.map((t) => [t.id, t])), STEP_REGISTRY);
    expect(numbers(folded!)).toEqual(numbers(core));
  });

  test('new inputs under the same id are analysed afresh (the caches are cleared), and the inputs are not changed', () => {
    const e = new HeldTraces();
    const first = bands('a', 1);
    const yBefore = Array.from(first.y);
    e.setInputs([first]);
    const before = e.analyse(request('a', 5));
    const second = bands('a', 1, 2); // the same id, twice the signal
    e.setInputs([second]);
    const after = e.analyse(request('a', 5));
    const core = analyse(request('a', 5), new Map([['a', second]]), STEP_REGISTRY);
    expect(numbers(after)).toEqual(numbers(core));
    expect(after.processed.y[600]).not.toBeCloseTo(before.processed.y[600], 3);
    // Raw data is sacred: holding and analysing a trace does not change it.
    expect(Array.from(first.y)).toEqual(yBefore);
  });
});

describe('the pipeline cache through a drag (issue 16: the heap at 10^6 points)', () => {
  /** A Savitzky–Golay step before the moving average whose window is dragged. */
  function dragRequest(window: number): AnalyseRequest {
    const r = emptyRecipe();
    r.steps.push({ ...makeRecipeStep(stepDefinition('savitzky-golay')!, { window: 11, order: 2 }), uid: 'sg' });
    r.steps.push({ ...makeRecipeStep(stepDefinition('moving-average')!, { window }), uid: 'ma' });
    return { sampleId: 'a', scanIds: [], recipe: r };
  }
  const fold = (e: HeldTraces, req: AnalyseRequest, side = false): AnalyseResult => {
    let out: AnalyseResult | null = null;
    for (const u of e.stages(req, side)) if (isStageUpdate(u)) out = applyStage(out, u);
    return out!;
  };
  const cacheOf = (e: HeldTraces) => (e as unknown as { cache: { size: number } }).cache;

  test('each move reuses the step before the slider\'s and the previous value; older values are let go, and every result equals a fresh analysis', () => {
    const traces = [bands('a', 1)];
    const e = new HeldTraces();
    e.setInputs(traces);
    for (const w of [5, 7, 9, 11]) {
      const r = fold(e, dragRequest(w));
      if (w > 5) expect(r.runs.map((x) => x.cached)).toEqual([true, false]);
      expect(cacheOf(e).size).toBeLessThanOrEqual(3); // the Savitzky–Golay output, this value's and the one before
    }
    expect(fold(e, dragRequest(9)).runs[1].cached).toBe(true); // the value just left: kept
    expect(fold(e, dragRequest(11)).runs[1].cached).toBe(true); // and back
    expect(fold(e, dragRequest(5)).runs[1].cached).toBe(false); // let go long ago
    const core = analyse(dragRequest(5), new Map(traces.map((t) => [t.id, t])), STEP_REGISTRY);
    expect(numbers(fold(e, dragRequest(5)))).toEqual(numbers(core));
  });

  test('a side analysis (a standard\'s) does not start a run, so it does not push out the sample\'s outputs', () => {
    const e = new HeldTraces();
    e.setInputs([bands('a', 1), bands('s', 2)]);
    fold(e, dragRequest(5));
    fold(e, dragRequest(7));
    for (let k = 0; k < 3; k++) fold(e, { ...dragRequest(9), sampleId: 's' }, true);
    expect(fold(e, dragRequest(5)).runs.map((x) => x.cached)).toEqual([true, true]);
  });
});

describe('loads', () => {
  test('load() reads a CSV and stamps it with the SHA-256 of its bytes (node:crypto gives the check value)', async () => {
    const text = 'x,y\n0,1\n1,2\n2,3\n3,2\n4,1\n';
    const bytes = new TextEncoder().encode(text);
    const expected = createHash('sha256').update(bytes).digest('hex');
    const fractions: number[] = [];
    const r = await new HeldTraces().load(bytes, 'five.csv', undefined, (f) => fractions.push(f));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.traces).toHaveLength(1);
    expect(Array.from(r.traces[0].y)).toEqual([1, 2, 3, 2, 1]);
    expect(r.traces[0].source.sha256).toBe(expected);
    expect(r.traces[0].source.fileName).toBe('five.csv');
  });
});
