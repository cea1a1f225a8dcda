/** σ profiles (src/core/measure/noise-profile.ts) and their use for each peak's S/N. */
import { describe, expect, it } from 'vitest';
import { constantProfile, profileFromValues, profileMedian, profileRange, sigmaAt } from '../../../src/core/measure/noise-profile.ts';
import { analyse } from '../../../src/core/analysis/index.ts';
import { emptyRecipe } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { createTrace } from '../../../src/core/trace.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { addGaussian } from './families.ts';

describe('σ profile', () => {
  it('reads runs by index, clamps outside the grid, merges equal neighbours', () => {
    const p = profileFromValues(Float64Array.of(3, 2, 2, 2, 2, 5));
    expect(Array.from(p.starts)).toEqual([0, 1, 5]);
    expect([0, 1, 4, 5, -3, 99].map((i) => sigmaAt(p, i))).toEqual([3, 2, 2, 5, 3, 5]);
    expect(profileMedian(p)).toBe(2);
    expect(profileRange(p)).toEqual([2, 5]);
    expect(sigmaAt(constantProfile(10, 0.5), 7)).toBe(0.5);
  });
});

describe('each peak uses the σ near it', () => {
  it('two equal peaks, one where the noise is 5 × larger: S/N differs by about 5 ×', () => {
    const n = 40000, rng = makeRng(3);
    const y = new Float64Array(n);
    // Noise σ 1 on the first half, 5 on the second; the same level everywhere.
    for (let i = 0; i < n; i++) y[i] = (i < n / 2 ? 1 : 5) * rng.normal();
    addGaussian(y, 10000, 20, 200);
    addGaussian(y, 30000, 20, 200);
    const x = Float64Array.from({ length: n }, (_, i) => i);
    const t = createTrace({ id: 'h', name: 'h', x, y, source: { fileName: 'h.csv', sha256: '0'.repeat(64), rowsRead: n, rowsSkipped: 0 } });
    const r = analyse({ sampleId: 'h', scanIds: [], recipe: emptyRecipe() }, new Map([['h', t]]), STEP_REGISTRY);
    const low = r.peaks.find((p) => Math.abs(p.x - 10000) < 5)!, high = r.peaks.find((p) => Math.abs(p.x - 30000) < 5)!;
    expect(r.noise!.checks.find((c) => c.id === 'along')!.held).toBe(false);
    const ratio = low.snrRms! / high.snrRms!;
    expect(ratio).toBeGreaterThan(4);
    expect(ratio).toBeLessThan(6.25);
    // True S/N 200 and 40, within 15 %.
    expect(Math.abs(low.snrRms! / 200 - 1)).toBeLessThan(0.15);
    expect(Math.abs(high.snrRms! / 40 - 1)).toBeLessThan(0.15);
  });
});
