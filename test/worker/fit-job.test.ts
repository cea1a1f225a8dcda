// Issue 18: the fit job the worker runs beside the analysis, on the demo's shoulder (invented data,
// scripts/make-demo.mjs; truth in public/demo/demo-truth.json: main peak at 6.0 min carrying a shoulder
// at 6.35 min of true S/N 4.4). The numeric checks of the fit itself live in test/core/measure/fit-*.test.ts
// (noiseless recovery, seeded Monte Carlo, SciPy curve_fit); here: the wiring gives the same answers.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { emptyRecipe, makeRecipeStep } from '../../src/core/method.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import { supportedPeakCount } from '../../src/core/measure/fit/count.ts';
import { createTrace } from '../../src/core/trace.ts';
import { HeldTraces } from '../../src/worker/held-traces.ts';
import { inProcessBackend } from '../../src/worker/bridge.ts';
import type { FitRequest } from '../../src/worker/fit-job.ts';

function demo() {
  const xs: number[] = [], ys: number[] = [];
  for (const line of readFileSync(new URL('../../public/demo/demo-sample.csv', import.meta.url), 'utf8').split(/\r?\n/)) {
    const m = /^\s*(-?[\d.]+)\s*,\s*(-?[\d.]+)\s*$/.exec(line);
    if (m) { xs.push(Number(m[1])); ys.push(Number(m[2])); }
  }
  return createTrace({ name: 'demo-sample.csv: y', x: Float64Array.from(xs), y: Float64Array.from(ys), xName: 'Time', xUnit: 'min', yName: 'A', yUnit: 'mAU', source: { fileName: 'demo-sample.csv', sha256: '0'.repeat(64), rowsRead: xs.length, rowsSkipped: 0 } });
}

const stack = (width: number) => {
  const r = emptyRecipe();
  const def = STEP_REGISTRY.find((d) => d.id === 'moving-average')!;
  r.steps.push(makeRecipeStep(def, { window: width }));
  return r;
};

describe('fit job in the worker engine', () => {
  const trace = demo();
  const request = (over: Partial<FitRequest['settings']> = {}): FitRequest => ({
    sampleId: trace.id, scanIds: [], recipe: stack(5), alternatives: [{ id: 'a', label: '21-point moving average', recipe: stack(21) }],
    settings: { from: 5.4, to: 6.9, on: 'raw', shape: 'gaussian', baseline: 'quadratic', maxPeaks: 3, ...over },
  });

  it('raw trace: two peaks supported, the same fit the core gives directly', () => {
    const engine = new HeldTraces();
    engine.setInputs([trace]);
    const out = engine.fit(request());
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.result.count).toBe(2);
    expect(out.result.fittedLabel).toBe('raw');
    const direct = supportedPeakCount(trace.x, trace.y, { from: 5.4, to: 6.9, shape: 'gaussian', baseline: 'quadratic', maxPeaks: 3 });
    expect(direct.ok && direct.result.count).toBe(2);
    if (direct.ok) expect(out.result.fit.peaks[1].area.value).toBeCloseTo(direct.result.fit.peaks[1].area.value, 6);
    // k vs k + 1: the last comparison is 2 vs 3, not supported, said plainly.
    expect(out.result.decisive?.larger.peaks.length).toBe(3);
    expect(out.result.lead).toBe('The fit on the raw trace supports 2 Gaussian peaks.');
    expect(out.result.statement).toMatch(/The extra peak is not supported: BIC is [\d.]+ higher with 3 peaks than with 2/);
    expect(out.result.steps.map((s) => s.supported)).toEqual([true, false]);
  });

  it('processing check: one row per version, raw first, with the ledger sentence', () => {
    const engine = new HeldTraces();
    engine.setInputs([trace]);
    const out = engine.fit(request());
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const p = out.result.processing!;
    expect(p.rows.map((r) => r.label)).toEqual(['raw', 'the current stack', '21-point moving average']);
    expect(p.referenceCount).toBe(2);
    for (const row of p.rows) expect(row.statement.length).toBeGreaterThan(10);
    expect(p.summary).toContain('raw');
  });

  it('a processed fit without any step says so; a bad region is a message, not an exception', async () => {
    const engine = new HeldTraces();
    engine.setInputs([trace]);
    const none = engine.fit({ ...request({ on: 'processed' }), recipe: emptyRecipe() });
    expect(none.ok).toBe(false);
    if (!none.ok) expect(none.message).toMatch(/no processed trace/);
    const backwards = engine.fit(request({ from: 6.9, to: 5.4 }));
    expect(backwards.ok).toBe(false);
    const backend = inProcessBackend();
    backend.setInputs([trace]);
    const viaBridge = await backend.fit(request({ on: 'processed' }));
    expect(viaBridge.ok && viaBridge.result.fittedLabel).toBe('the current stack');
  });
});
