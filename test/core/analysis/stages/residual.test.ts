// Stage 2 (src/core/analysis/stages/residual.ts): the residual raw − processed,
// minus what baseline correction and blank subtraction removed on purpose.
// Definitions from the module, checked by hand.
import { describe, expect, it } from 'vitest';
import { maxAbs, rawScaleOf, residualOfRun, residualTests } from '../../../../src/core/analysis/stages/residual.ts';
import { processSample } from '../../../../src/core/analysis/stages/process.ts';
import { STEP_REGISTRY } from '../../../../src/core/steps/registry.ts';
import { recipeOf, synthetic } from '../fixture.ts';

const t = synthetic(2, 400);

describe('maxAbs', () => {
  it('largest absolute value; 0 for an empty array', () => {
    expect(maxAbs(Float64Array.of(1, -7, 3))).toBe(7);
    expect(maxAbs(new Float64Array(0))).toBe(0);
  });
  it('rawScaleOf: the same value, kept per array (two arrays of one length keep their own)', () => {
    const a = Float64Array.of(1, -7, 3), b = Float64Array.of(2, 5, -4);
    expect(rawScaleOf(a)).toBe(7);
    expect(rawScaleOf(b)).toBe(5);
    expect(rawScaleOf(a)).toBe(7);
  });
});

describe('residualOfRun', () => {
  it('after a smoothing step it is raw − processed, point by point', () => {
    const run = processSample(t, t.id, recipeOf(['moving-average', { window: 9 }]), STEP_REGISTRY, {});
    const r = residualOfRun(t, run);
    expect(r.ok).toBe(true);
    for (let i = 0; i < t.y.length; i += 37) expect(r.residual.y[i]).toBeCloseTo(t.y[i] - run.final.y[i], 12);
  });

  it('a baseline step alone leaves a zero residual: its removal is deliberate, not a loss', () => {
    const run = processSample(t, t.id, recipeOf(['baseline', { method: 'polynomial', order: 1, ranges: [[0, 1]] }]), STEP_REGISTRY, {});
    expect(run.runs[0].status).toBe('ok');
    const r = residualOfRun(t, run);
    expect(r.ok).toBe(true);
    expect(maxAbs(r.residual.y)).toBeLessThan(1e-12);
    expect(r.note).toMatch(/removed on purpose/);
  });

  it('baseline then smoothing: the residual is what the smoothing took, not the baseline', () => {
    const run = processSample(t, t.id, recipeOf(['baseline', { method: 'polynomial', order: 1, ranges: [[0, 1]] }], ['moving-average', { window: 9 }]), STEP_REGISTRY, {});
    const smoothedOnly = processSample(t, t.id, recipeOf(['moving-average', { window: 9 }]), STEP_REGISTRY, {});
    const a = residualOfRun(t, run).residual.y, b = residualOfRun(t, smoothedOnly).residual.y;
    // A moving average passes a straight line unchanged away from the ends, so both residuals agree there.
    for (let i = 10; i < t.y.length - 10; i += 13) expect(a[i]).toBeCloseTo(b[i], 10);
  });
});

describe('residualTests', () => {
  it('none when nothing was processed or the residual is too short; diagnostics otherwise', () => {
    const run = processSample(t, t.id, recipeOf(['moving-average', { window: 9 }]), STEP_REGISTRY, {});
    const r = residualOfRun(t, run).residual;
    expect(residualTests(t, r, false)).toBeNull();
    expect(residualTests(t, { x: r.x.subarray(0, 2), y: r.y.subarray(0, 2) }, true)).toBeNull();
    expect(residualTests(t, r, true)).not.toBeNull();
  });
});
