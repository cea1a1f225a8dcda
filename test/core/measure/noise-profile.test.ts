/** σ profiles (src/core/measure/noise-profile.ts) and their use for each peak's S/N. */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { constantProfile, ProfileBuilder, profileFromValues, profileMedian, profileRange, sigmaAt, type SigmaProfile } from '../../../src/core/measure/noise-profile.ts';
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

  // The merging rule written out point by point, as profileFromValues was before stretches (issue 16): a value joins
  // the run when it is within relTol of the run's first value, relative to the larger of the two.
  function pointByPoint(values: number[], relTol = 1e-6): SigmaProfile {
    const starts: number[] = [], sig: number[] = [];
    let runStart = 0, runValue = values[0];
    for (let i = 1; i <= values.length; i++) {
      const v = i < values.length ? values[i] : NaN;
      if (i < values.length && Math.abs(v - runValue) <= relTol * Math.max(Math.abs(runValue), Math.abs(v))) continue;
      starts.push(runStart); sig.push(runValue);
      runStart = i; runValue = v;
    }
    return { points: values.length, starts: Int32Array.from(starts), sigma: Float64Array.from(sig) };
  }

  it('fed stretches of equal values (ProfileBuilder) it makes the runs the point-by-point rule makes: near-equal values, zeros, NaN and infinities (fast-check)', () => {
    const value = fc.oneof(
      fc.constantFrom(1, 1 + 5e-7, 1 + 2e-6, 1 - 9e-7, 0, -0, 2, NaN, Infinity, -Infinity),
      fc.double({ min: 0, max: 10, noNaN: true }),
    );
    fc.assert(fc.property(fc.array(fc.tuple(value, fc.integer({ min: 0, max: 5 })), { maxLength: 30 }), (stretches) => {
      const b = new ProfileBuilder();
      const flat: number[] = [];
      for (const [v, count] of stretches) { b.push(v, count); for (let k = 0; k < count; k++) flat.push(v); }
      const want = pointByPoint(flat);
      expect(b.done()).toEqual(want);
      expect(profileFromValues(Float64Array.from(flat))).toEqual(want);
    }), { numRuns: 500 });
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
