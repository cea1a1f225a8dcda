/**
 * One verdict (src/core/measure/residual-tests.ts): the residual cannot read clean while
 * the runs test rejects at p < 0.001 or the loss check reports a quantifiable
 * feature weakened beyond the tolerance; a round-off residual reads "nothing
 * removed". Runs test: Wald & Wolfowitz 1940, normal approximation.
 */
import { describe, expect, it } from 'vitest';
import { combineVerdict, HEIGHT_LOSS_TOLERANCE, residualDiagnostics } from '../../../src/core/measure/residual-tests.ts';
import { analyse } from '../../../src/core/analysis/index.ts';
import { emptyRecipe, makeRecipeStep } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { createTrace } from '../../../src/core/trace.ts';
import { makeRng, normalArray } from '../../../src/core/numeric/random.ts';
import { movingAverage } from '../../../src/core/steps/moving-average.ts';
import { addGaussian } from './families.ts';

describe('residual verdict', () => {
  it('white noise reads clean', () => {
    const d = residualDiagnostics(normalArray(1, 2000), 10);
    expect(d.level).toBe('clean');
    expect(d.looksLikeNoise).toBe(true);
  });

  it('a residual of 1e-15 on a trace of size 1 reads "nothing removed", not "structure"', () => {
    const e = Float64Array.from(normalArray(2, 1000), (v, i) => 1e-15 * (v + Math.sin(i / 50)));
    const d = residualDiagnostics(e, 1);
    expect(d.level).toBe('nothing-removed');
    expect(d.verdict).toMatch(/^Nothing removed/);
  });

  it('a smoother residual with runs z ≫ 3 (p < 0.001) never reads clean', () => {
    const y = normalArray(3, 20000);
    const sm = movingAverage(y, 5);
    const e = Float64Array.from(y, (v, i) => v - sm[i]);
    const d = residualDiagnostics(e, 4);
    expect(d.runs.p).toBeLessThan(0.001);
    expect(d.level).toBe('caution');
    expect(d.looksLikeNoise).toBe(false);
  });

  it('a loss-check warning about a quantifiable feature makes it "structure", with the reason', () => {
    const d = residualDiagnostics(normalArray(4, 500), 10);
    expect(d.level).toBe('clean');
    const c = combineVerdict(d, ['The feature at 5.0 min keeps only 64 % of its raw height with the current stack.']);
    expect(c.level).toBe('structure');
    expect(c.verdict).toMatch(/64 %/);
    expect(combineVerdict(residualDiagnostics(new Float64Array(10), 1), ['x']).level).toBe('nothing-removed');
  });

  it('end to end: a peak that loses more than the tolerance turns the page verdict to "structure"', () => {
    const n = 4000, rng = makeRng(5);
    const y = Float64Array.from({ length: n }, () => 0.05 * rng.normal());
    addGaussian(y, 2000, 6, 5); // S/N 100, half-height width 6 points
    const x = Float64Array.from({ length: n }, (_, i) => i * 0.01);
    const t = createTrace({ id: 'v', name: 'v', x, y, source: { fileName: 'v.csv', sha256: '0'.repeat(64), rowsRead: n, rowsSkipped: 0 } });
    const recipe = emptyRecipe();
    recipe.steps.push(makeRecipeStep(STEP_REGISTRY.find((d) => d.id === 'moving-average')!, { window: 25 }));
    const r = analyse({ sampleId: 'v', scanIds: [], recipe }, new Map([['v', t]]), STEP_REGISTRY);
    // A 25-point average keeps about 1/√(1 + 624/(12·2.55²)) ≈ 33 % of a peak of σ = 2.55 points (REFERENCES.md approximation).
    expect(r.loss!.currentWeakened.length).toBeGreaterThan(0);
    expect(r.diagnostics!.level).toBe('structure');
    expect(HEIGHT_LOSS_TOLERANCE).toBe(0.2);
  });
});
