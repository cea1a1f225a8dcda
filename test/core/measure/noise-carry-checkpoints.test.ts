/**
 * The simulated route's checkpoints (src/core/measure/noise-carry.ts, issue 16): the stack's throw-away runs
 * on noisy copies start again where the sample's own run found its steps unchanged.
 *
 * The reference is the definition itself: the same carriage computed from scratch (checkpoints cleared, the
 * whole stack run on each noisy input). Running a stack in two pieces must give the same numbers bit for bit,
 * so every comparison here is exact (Object.is on every entry), never a tolerance.
 */
import { beforeEach, describe, expect, it, onTestFinished } from 'vitest';
import { carryCheckpointStats, carrySimulated, clearCarryCheckpoints, CHECKPOINT_BYTES, setCarryCheckpointBytes, type CarriedNoise, type NoiseSources } from '../../../src/core/measure/noise-carry.ts';
import { constantProfile } from '../../../src/core/measure/noise-profile.ts';
import { PipelineCache, runPipeline } from '../../../src/core/pipeline.ts';
import { emptyRecipe, makeRecipeStep, type Recipe } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import type { Registry } from '../../../src/core/method.ts';
import type { StepContext } from '../../../src/core/steps/types.ts';
import { createTrace, type Trace } from '../../../src/core/trace.ts';
import { normalArray } from '../../../src/core/numeric/random.ts';

function traceOf(y: Float64Array, id: string): Trace {
  const x = Float64Array.from({ length: y.length }, (_, i) => i * 0.01);
  return createTrace({ id, name: id, x, y, source: { fileName: `${id}.csv`, sha256: '0'.repeat(64), rowsRead: y.length, rowsSkipped: 0 } });
}

/** A trace with a drifting baseline, two peaks and a spike over seeded white noise (σ 1). */
function bench(n: number, seed: number, id: string): Trace {
  const e = normalArray(seed, n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / n;
    y[i] = 20 * t + 5 * Math.sin(3 * t) + 40 * Math.exp(-0.5 * ((i - 0.3 * n) / 12) ** 2) + 15 * Math.exp(-0.5 * ((i - 0.7 * n) / 30) ** 2) + e[i];
  }
  y[Math.floor(0.5 * n)] += 200;
  return traceOf(y, id);
}

function recipe(...steps: [string, Record<string, unknown>][]): Recipe {
  const r = emptyRecipe();
  for (const [id, p] of steps) r.steps.push(makeRecipeStep(STEP_REGISTRY.find((d) => d.id === id)!, p as never));
  return r;
}

/** The same recipe with entry i's parameters changed (a new object; uids kept, as the page keeps them). */
function edit(r: Recipe, i: number, params: Record<string, unknown>): Recipe {
  return { ...r, steps: r.steps.map((s, k) => (k === i ? { ...s, params: { ...s.params, ...params } as never } : s)) };
}

const sources = (n: number, ctx: StepContext): NoiseSources => {
  const src = (m: number) => ({ profile: constantProfile(m, 1), sigma: 1, rho: Float64Array.of(1, 0.3, 0.05) });
  return {
    sample: src(n),
    blank: ctx.blank ? src(ctx.blank.y.length) : undefined,
    scans: ctx.scans?.length ? new Map(ctx.scans.map((s) => [s.id, src(s.y.length)])) : undefined,
  };
};

/** Every number of a carriage, in order (profiles and ρ as plain arrays), for exact comparison. */
function numbers(c: CarriedNoise): number[] {
  return [c.sigma, c.gain, ...c.profile.sigma, ...c.profile.starts, ...c.rho];
}

function expectSameBits(a: CarriedNoise, b: CarriedNoise): void {
  const x = numbers(a), y = numbers(b);
  expect(x.length).toBe(y.length);
  const differing = x.filter((v, i) => !Object.is(v, y[i])).length;
  expect(differing).toBe(0);
  expect(a.description).toBe(b.description);
}

/** A registry whose steps count how often they are applied, by step id. */
function counting(): { registry: Registry; calls: Map<string, number> } {
  const calls = new Map<string, number>();
  const registry = STEP_REGISTRY.map((d) => ({
    ...d,
    apply: ((input, params, ctx) => { calls.set(d.id, (calls.get(d.id) ?? 0) + 1); return d.apply(input as never, params as never, ctx); }) as typeof d.apply,
  })) as unknown as Registry;
  return { registry, calls };
}

/**
 * Walk a sequence of recipes the way the page does (one pipeline cache for the sample, so its run says which
 * entries were taken from the cache), carrying σ with checkpoints at each, and compare each carriage with the
 * carriage from scratch.
 */
function walk(sample: Trace, ctx: StepContext, recipes: Recipe[]): void {
  const cache = new PipelineCache();
  const raw = { x: sample.x, y: sample.y };
  const noise = sources(sample.y.length, ctx);
  for (const r of recipes) {
    cache.beginRun();
    const run = runPipeline(raw, sample.id, r, STEP_REGISTRY, ctx, cache);
    const kept = carrySimulated(raw, run, r, STEP_REGISTRY, ctx, noise);
    const fresh = carrySimulated(raw, runPipeline(raw, sample.id, r, STEP_REGISTRY, ctx), r, STEP_REGISTRY, ctx, noise, undefined, false);
    expectSameBits(kept, fresh);
  }
  expect(carryCheckpointStats().count).toBeGreaterThan(0);
}

beforeEach(() => clearCarryCheckpoints());

describe('checkpoints of the simulated route give the numbers of the whole run', () => {
  const n = 20_000;

  it('a drag of the last step, an edit of a middle step, a step switched off and back (no companions)', () => {
    const s = bench(n, 31, 'sample');
    const a = recipe(['despike', {}], ['baseline', {}], ['savitzky-golay', { window: 11, order: 2 }], ['moving-average', { window: 5 }]);
    const b = edit(a, 3, { window: 7 });
    const c = edit(b, 3, { window: 9 });
    const d = edit(c, 1, { lambda: 1e4 });
    const e = edit(d, 3, { window: 5 });
    const off = { ...e, steps: e.steps.map((st, k) => (k === 2 ? { ...st, enabled: false } : st)) };
    walk(s, {}, [a, b, c, d, e, off, e, a]);
  });

  it('with a blank subtracted first: the blank follows the sample through the checkpoint', () => {
    const s = bench(n, 32, 'sample');
    const blank = bench(n, 33, 'blank');
    const a = recipe(['blank-subtraction', {}], ['despike', {}], ['moving-average', { window: 5 }]);
    walk(s, { blank }, [a, edit(a, 2, { window: 7 }), edit(a, 2, { window: 9 }), edit(edit(a, 2, { window: 9 }), 1, { threshold: 4 })]);
  });

  it('with a blank subtracted after a despiking that is kept: the suffix subtracts the blank as despiked', () => {
    const s = bench(n, 37, 'sample');
    const blank = bench(n, 38, 'blank');
    const a = recipe(['despike', {}], ['blank-subtraction', { scale: 1 }], ['moving-average', { window: 5 }]);
    walk(s, { blank }, [a, edit(a, 1, { scale: 0.9 }), edit(a, 1, { scale: 0.8 }), edit(a, 1, { scale: 0.7 })]);
  });

  it('with repeated scans averaged, then a second averaging added after the checkpoint (the scans must be processed further)', () => {
    const s = bench(n, 34, 'sample');
    const scans = [bench(n, 35, 'scan1'), bench(n, 36, 'scan2')];
    const a = recipe(['ensemble-average', {}], ['despike', {}], ['moving-average', { window: 5 }]);
    const b = edit(a, 2, { window: 7 });
    // The same first two entries (uids and values), then another averaging before the moving average:
    // a checkpoint after the despiking made under `b` holds scans the despiking never touched.
    const twice: Recipe = { ...b, steps: [b.steps[0], b.steps[1], makeRecipeStep(STEP_REGISTRY.find((d) => d.id === 'ensemble-average')!), b.steps[2]] };
    walk(s, { scans }, [a, b, twice, b]);
  });
});

describe('what the checkpoints save and hold', () => {
  it('from the second move of a drag of the last step on, only that step runs on the noisy inputs: once per sign and series', () => {
    const n = 20_000;
    const s = bench(n, 41, 'sample');
    const raw = { x: s.x, y: s.y };
    const noise = sources(n, {});
    const { registry, calls } = counting();
    const cache = new PipelineCache();
    const a = recipe(['despike', {}], ['baseline', {}], ['moving-average', { window: 5 }]);
    const b = edit(a, 2, { window: 7 });
    const c = edit(a, 2, { window: 9 });
    carrySimulated(raw, runPipeline(raw, s.id, a, registry, {}, cache), a, registry, {}, noise);
    // The first move finds the noisy inputs unprocessed (everything was new before it) and keeps them as
    // processed up to the moving average.
    const runB = runPipeline(raw, s.id, b, registry, {}, cache);
    calls.clear();
    carrySimulated(raw, runB, b, registry, {}, noise);
    expect(Object.fromEntries(calls)).toEqual({ despike: 8, baseline: 8, 'moving-average': 8 });
    const run = runPipeline(raw, s.id, c, registry, {}, cache);
    calls.clear();
    const out = carrySimulated(raw, run, c, registry, {}, noise);
    // 4 series of 2·10⁴ points (realisationsFor), each added and taken away: 8 runs of the moving average alone.
    expect(out.realisations).toBe(4);
    expect(Object.fromEntries(calls)).toEqual({ 'moving-average': 8 });
  });

  it('the page\'s way: steps added one by one, an alternative after the corrections, then a drag runs only the dragged step', () => {
    const n = 1 << 17; // 2 series per sign at this length (realisationsFor): groups of 4 inputs of 1 MiB
    const budget = setCarryCheckpointBytes(8 * 1024 * 1024); // two groups, as 32 MiB holds two at 10⁶ points
    onTestFinished(() => { setCarryCheckpointBytes(budget); });
    const s = bench(n, 43, 'sample');
    const raw = { x: s.x, y: s.y };
    const noise = sources(n, {});
    const { registry, calls } = counting();
    const cache = new PipelineCache();
    const carry = (r: Recipe) => { cache.beginRun(); const run = runPipeline(raw, s.id, r, registry, {}, cache); calls.clear(); return carrySimulated(raw, run, r, registry, {}, noise); };
    const full = recipe(['despike', {}], ['baseline', {}], ['savitzky-golay', { window: 11, order: 2 }], ['moving-average', { window: 9 }], ['moving-average', { window: 5 }]);
    for (let k = 1; k <= full.steps.length; k++) carry({ ...full, steps: full.steps.slice(0, k) });
    // An alternative: the corrections (despike, baseline) and another smoother, checkpointed after the corrections.
    carry({ ...full, steps: [full.steps[0], full.steps[1], makeRecipeStep(STEP_REGISTRY.find((d) => d.id === 'moving-average')!, { window: 3 } as never)] });
    for (const w of [7, 9, 11]) {
      carry(edit(full, 4, { window: w }));
      expect(Object.fromEntries(calls)).toEqual({ 'moving-average': 4 });
      const st = carryCheckpointStats();
      expect(st.groups).toEqual([4, 4]);
      expect(st.bytes).toBeLessThanOrEqual(8 * 1024 * 1024);
    }
  }, 120_000);

  it('the checkpoints stay within their byte budget, newest kept', () => {
    const n = 1 << 19; // 2 series per sign at this length (realisationsFor): 4 inputs of 4 MiB per recipe prefix
    const s = bench(n, 42, 'sample');
    const raw = { x: s.x, y: s.y };
    const noise = sources(n, {});
    const cache = new PipelineCache();
    let r = recipe(['despike', { window: 7 }], ['moving-average', { window: 3 }]);
    for (const w of [5, 7, 9, 11]) {
      r = edit(r, 1, { window: w });
      carrySimulated(raw, runPipeline(raw, s.id, r, STEP_REGISTRY, {}, cache), r, STEP_REGISTRY, {}, noise);
      // A different prefix each time (the despiking's window) as well, so old checkpoints pile up unless let go.
      r = edit(r, 0, { window: 7 + w });
      carrySimulated(raw, runPipeline(raw, s.id, r, STEP_REGISTRY, {}, cache), r, STEP_REGISTRY, {}, noise);
    }
    const st = carryCheckpointStats();
    expect(st.bytes).toBeLessThanOrEqual(CHECKPOINT_BYTES);
    expect(st.count).toBeGreaterThan(0);
  }, 120_000);
});
