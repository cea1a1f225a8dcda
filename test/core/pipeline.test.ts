import { describe, expect, it } from 'vitest';
import { type Recipe, jsonDepth, makeRecipeStep, parseRecipeText, recipeInWords, recipeToJson, validateRecipe, RECIPE_VERSION } from '../../src/core/method.ts';
import { PipelineCache, runPipeline } from '../../src/core/pipeline.ts';
import type { StepDefinition } from '../../src/core/steps/types.ts';

// Two tiny steps defined here only to exercise the recipe and pipeline
// machinery (the real steps have their own tests against SciPy).
const offsetStep: StepDefinition<{ amount: number }> = {
  id: 'test-offset', label: 'Offset', summary: 'Adds a constant.',
  params: [{ key: 'amount', label: 'Amount', kind: 'number', unit: 'none', min: -1e6, max: 1e6 }],
  defaults: { amount: 1 },
  validate: (p) => (p.amount === 13 ? 'Thirteen is refused by this test step.' : null),
  apply: (s, p) => ({ x: s.x.slice(), y: s.y.map((v) => v + p.amount), notes: [] }),
};
let windowCalls = 0;
const windowStep: StepDefinition<{ window: number; edge: string }> = {
  id: 'test-window', label: 'Window', summary: 'Counts calls.',
  params: [
    { key: 'window', label: 'Window', kind: 'int', unit: 'points', min: 1, max: 101, odd: true },
    { key: 'edge', label: 'Edge', kind: 'choice', unit: 'none', choices: [{ value: 'a', label: 'A' }, { value: 'b', label: 'B' }] },
  ],
  defaults: { window: 3, edge: 'a' },
  validate: (p, s) => (p.window > s.y.length ? `Window ${p.window} is longer than the ${s.y.length} points.` : null),
  apply: (s) => { windowCalls++; return { x: s.x.slice(), y: s.y.map((v) => v * 2), notes: [] }; },
};
const registry = [offsetStep, windowStep] as unknown as readonly StepDefinition[];

const signal = { x: Float64Array.from([0, 1, 2, 3, 4, 5]), y: Float64Array.from([1, 2, 3, 4, 5, 6]) };

describe('recipe validation', () => {
  it('accepts a good recipe, fills defaults and round-trips through JSON', () => {
    const check = parseRecipeText(JSON.stringify({ format: 'tracewright-recipe', version: 1, steps: [{ step: 'test-window', params: { window: 5 } }] }), registry);
    expect(check.ok).toBe(true);
    if (!check.ok) return;
    expect(check.recipe.steps[0].params).toEqual({ window: 5, edge: 'a' });
    const again = parseRecipeText(recipeToJson(check.recipe), registry);
    expect(again.ok && again.recipe.steps).toEqual(check.recipe.steps);
  });

  it.each([
    [{ format: 'tracewright-recipe', version: RECIPE_VERSION + 1, steps: [] }, /newer version/],
    [{ format: 'tracewright-recipe', version: 1, steps: [{ step: 'no-such-step' }] }, /unknown step "no-such-step"/],
    [{ format: 'tracewright-recipe', version: 1, steps: [{ step: 'test-window', params: { window: 4 } }] }, /must be odd/],
    [{ format: 'tracewright-recipe', version: 1, steps: [{ step: 'test-window', params: { window: 0 } }] }, /between 1 and 101/],
    [{ format: 'tracewright-recipe', version: 1, steps: [{ step: 'test-window', params: { window: -5 } }] }, /between 1 and 101/],
    [{ format: 'tracewright-recipe', version: 1, steps: [{ step: 'test-window', params: { window: 1e9 } }] }, /between 1 and 101/],
    [{ format: 'tracewright-recipe', version: 1, steps: [{ step: 'test-window', params: { window: 2.5 } }] }, /whole number/],
    [{ format: 'tracewright-recipe', version: 1, steps: [{ step: 'test-window', params: { window: 'big' } }] }, /must be a number/],
    [{ format: 'tracewright-recipe', version: 1, steps: [{ step: 'test-window', params: { edge: 'z' } }] }, /one of a, b/],
    [{ format: 'tracewright-recipe', version: 1, steps: [{ step: 'test-window', params: { colour: 1 } }] }, /unknown parameter "colour"/],
    [{ format: 'something-else', version: 1, steps: [] }, /"format"/],
    [[1, 2, 3], /expected a JSON object/],
  ])('refuses %j', (value, message) => {
    const check = validateRecipe(value, registry);
    expect(check.ok).toBe(false);
    if (!check.ok) expect(check.problems.join(' ')).toMatch(message);
  });

  it('NaN parameters are refused (JSON has no NaN: it arrives as null or text)', () => {
    const check = parseRecipeText('{"format":"tracewright-recipe","version":1,"steps":[{"step":"test-offset","params":{"amount":null}}]}', registry);
    expect(check.ok).toBe(false);
    const check2 = parseRecipeText('{"format":"tracewright-recipe","version":1,"steps":[{"step":"test-offset","params":{"amount":NaN}}]}', registry);
    expect(check2.ok).toBe(false);
    if (!check2.ok) expect(check2.problems[0]).toMatch(/not valid JSON/);
  });

  it('refuses a deeply nested JSON bomb before parsing it', () => {
    const bomb = '['.repeat(100000) + ']'.repeat(100000);
    expect(jsonDepth(bomb)).toBeGreaterThan(16);
    const check = parseRecipeText(bomb, registry);
    expect(check.ok).toBe(false);
    if (!check.ok) expect(check.problems[0]).toMatch(/nested more than/);
    // brackets inside strings do not count
    expect(jsonDepth('{"a":"[[[[[[[[[[[[[[[[[[[[[[["}')).toBe(1);
  });

  it('describes the recipe in words', () => {
    const words = recipeInWords({ format: 'tracewright-recipe', version: 1, steps: [makeRecipeStep(windowStep as unknown as StepDefinition, { window: 7 })] }, registry);
    expect(words[0]).toBe('1. Window: Window 7 points; Edge a.');
  });
});

describe('pipeline', () => {
  it('applies steps in order, skips switched-off steps and never changes its input', () => {
    const before = Array.from(signal.y);
    const recipe: Recipe = { format: 'tracewright-recipe' as const, version: 1, steps: [
      { uid: 'a', step: 'test-offset', enabled: true, params: { amount: 1 } },
      { uid: 'b', step: 'test-window', enabled: false, params: { window: 3, edge: 'a' } },
      { uid: 'c', step: 'test-window', enabled: true, params: { window: 3, edge: 'a' } },
    ] };
    const r = runPipeline(signal, 'in', recipe, registry);
    expect(Array.from(r.final.y)).toEqual([4, 6, 8, 10, 12, 14]);
    expect(r.runs.map((x) => x.status)).toEqual(['ok', 'off', 'ok']);
    expect(Array.from(signal.y)).toEqual(before);
  });

  it('reports a step that does not fit and passes its input on', () => {
    const recipe: Recipe = { format: 'tracewright-recipe' as const, version: 1, steps: [
      { uid: 'a', step: 'test-window', enabled: true, params: { window: 99, edge: 'a' } },
      { uid: 'b', step: 'test-offset', enabled: true, params: { amount: 13 } },
    ] };
    const r = runPipeline(signal, 'in', recipe, registry);
    expect(r.runs[0].status).toBe('error');
    expect(r.runs[0].message).toMatch(/longer than the 6 points/);
    expect(r.runs[1].message).toMatch(/Thirteen/);
    expect(Array.from(r.final.y)).toEqual(Array.from(signal.y));
  });

  it('editing step k reruns only steps k onward', () => {
    const cache = new PipelineCache();
    const mk = (amount: number): Recipe => ({ format: 'tracewright-recipe' as const, version: 1, steps: [
      { uid: 'a', step: 'test-window', enabled: true, params: { window: 3, edge: 'a' } },
      { uid: 'b', step: 'test-offset', enabled: true, params: { amount } },
      { uid: 'c', step: 'test-window', enabled: true, params: { window: 5, edge: 'a' } },
    ] });
    windowCalls = 0;
    runPipeline(signal, 'in', mk(1), registry, {}, cache);
    expect(windowCalls).toBe(2);
    const r = runPipeline(signal, 'in', mk(2), registry, {}, cache);
    expect(windowCalls).toBe(3); // the first window step came from the cache
    expect(r.runs.map((x) => x.cached)).toEqual([true, false, false]);
    expect(Array.from(r.final.y)).toEqual(Array.from(signal.y).map((v) => (2 * v + 2) * 2));
  });

  // Issue 16 (the heap at 10^6 points): a drag must not keep every value the slider passed.
  it('after beginRun, the first new output lets go of outputs neither this run nor the one before used; the unchanged steps before the edited one stay', () => {
    const cache = new PipelineCache();
    const mk = (amount: number): Recipe => ({ format: 'tracewright-recipe' as const, version: 1, steps: [
      { uid: 'a', step: 'test-window', enabled: true, params: { window: 3, edge: 'a' } },
      { uid: 'b', step: 'test-offset', enabled: true, params: { amount } },
    ] });
    const drag = (amount: number) => { cache.beginRun(); return runPipeline(signal, 'in', mk(amount), registry, {}, cache); };
    windowCalls = 0;
    drag(1);
    for (const amount of [2, 3, 4, 5]) expect(drag(amount).runs.map((x) => x.cached)).toEqual([true, false]);
    expect(windowCalls).toBe(1); // the step before the edited one ran once in five runs
    expect(cache.size).toBe(3); // the window step's output, and the offsets of this run and the one before
    expect(drag(4).runs[1].cached).toBe(true); // the value just left: kept
    expect(drag(5).runs[1].cached).toBe(true); // and back again
    expect(cache.size).toBe(3);
    expect(drag(2).runs[1].cached).toBe(false); // let go long ago
    expect(cache.size).toBe(3); // 5 is now the value just left; 4 went
    const fresh = runPipeline(signal, 'in', mk(2), registry);
    expect(Array.from(drag(2).final.y)).toEqual(Array.from(fresh.final.y));
  });

  it('without beginRun calls only the entry and byte bounds apply (every value stays while they allow)', () => {
    const cache = new PipelineCache();
    const mk = (amount: number): Recipe => ({ format: 'tracewright-recipe' as const, version: 1, steps: [{ uid: 'b', step: 'test-offset', enabled: true, params: { amount } }] });
    for (const amount of [1, 2, 3, 4, 5]) runPipeline(signal, 'in', mk(amount), registry, {}, cache);
    expect(cache.size).toBe(5);
    expect(runPipeline(signal, 'in', mk(1), registry, {}, cache).runs[0].cached).toBe(true);
  });

  it('a step that returns a copy of its input\'s grid has the input\'s x array in its output (shared, same bits); another grid stays its own', () => {
    const cache = new PipelineCache();
    const one: Recipe = { format: 'tracewright-recipe' as const, version: 1, steps: [{ uid: 'b', step: 'test-offset', enabled: true, params: { amount: 1 } }] };
    const r = runPipeline(signal, 'in', one, registry, {}, cache);
    expect(r.runs[0].output!.x).toBe(signal.x); // offsetStep returns s.x.slice(): the pipeline keeps the input's array instead
    expect(r.final.x).toBe(signal.x);
    expect(Array.from(r.final.y)).toEqual(Array.from(signal.y).map((v) => v + 1));
    const two: Recipe = { ...one, steps: [...one.steps, { uid: 'c', step: 'test-offset', enabled: true, params: { amount: 2 } }] };
    const r2 = runPipeline(signal, 'in', two, registry, {}, cache);
    expect(r2.runs[1].output!.x).toBe(signal.x);
    expect(cache.bytes).toBe(signal.x.byteLength + 2 * signal.y.byteLength); // two outputs: their own y each, one x between them
    // A zero of the other sign is another number (its bits differ): that grid is not the input's.
    const minusZero = { x: Float64Array.from([-0, 1, 2, 3, 4, 5]), y: signal.y };
    const z = runPipeline(minusZero, 'mz', one, registry);
    expect(Object.is(z.final.x[0], -0)).toBe(true);
    const shifted: StepDefinition<{ amount: number }> = { ...offsetStep, id: 'test-shift', apply: (s) => ({ x: s.x.map((v) => v + 0.5), y: s.y.slice(), notes: [] }) };
    const moved = runPipeline(signal, 'in', { format: 'tracewright-recipe', version: 1, steps: [{ uid: 's', step: 'test-shift', enabled: true, params: { amount: 0 } }] }, [shifted] as unknown as readonly StepDefinition[]);
    expect(moved.final.x).not.toBe(signal.x);
    expect(Array.from(moved.final.x)).toEqual([0.5, 1.5, 2.5, 3.5, 4.5, 5.5]);
  });
});
