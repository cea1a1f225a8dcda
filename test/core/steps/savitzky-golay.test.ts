// The Savitzky–Golay step (src/core/steps/savitzky-golay.ts): its noise gain,
// derivatives in x-units and its messages. The weights and the filter itself are
// tested in test/core/numeric/savgol.test.ts.
import { describe, expect, it } from 'vitest';
import {
  noiseGain,
  savgolCoefficients,
  savitzkyGolay,
  savitzkyGolayStep,
} from '../../../src/core/steps/savitzky-golay.ts';
import { normalArray } from '../../../src/core/numeric/random.ts';

/** Seeded normal numbers from the project's generator (mulberry32 + Box–Muller). */
const normals = normalArray;

function sd(a: Float64Array, from = 0, to = a.length): number {
  let m = 0;
  for (let i = from; i < to; i++) m += a[i];
  m /= to - from;
  let v = 0;
  for (let i = from; i < to; i++) v += (a[i] - m) ** 2;
  return Math.sqrt(v / (to - from - 1));
}

describe('noise gain of the weights', () => {
  it('white-noise gain √Σc² matches REFERENCES.md', () => {
    // REFERENCES.md, Savitzky–Golay table (4 decimals).
    const rows: [number, number, number][] = [
      [5, 2, 0.6969], [7, 2, 0.5774], [9, 2, 0.5054], [11, 2, 0.4555], [7, 4, 0.7531], [9, 4, 0.6459],
    ];
    for (const [w, o, g] of rows) expect(noiseGain(savgolCoefficients(w, o))).toBeCloseTo(g, 4);
  });

  it('white noise SD falls by √Σc²', () => {
    // Variance of a weighted sum of independent samples is σ²Σc² (any statistics text).
    // n = 20000 gives a relative SE of the SD of about 1/√(2n_eff); n_eff ≥ n/window for the smoothed series, so allow 4·√(w/(2n)).
    const n = 20000;
    const e = normals(11, n);
    for (const [w, o] of [[5, 2], [11, 2], [25, 4]]) {
      const g = noiseGain(savgolCoefficients(w, o));
      const s = savitzkyGolay(e, w, o);
      const ratio = sd(s, w, n - w) / sd(e, w, n - w);
      expect(Math.abs(ratio / g - 1)).toBeLessThan(4 * Math.sqrt(w / (2 * n)));
    }
  });
});

describe('savitzky-golay step', () => {
  const x = Float64Array.from({ length: 50 }, (_, i) => 2 + 0.1 * i);
  const y = x.map((v) => 3 * v * v - v);
  const input = { x, y };

  it('derivatives are divided by the mean x step (exact on a quadratic in x)', () => {
    // d/dx (3x² − x) = 6x − 1 and d²/dx² = 6: exact for a quadratic fit (least-squares property).
    const d1 = savitzkyGolayStep.apply(input, { ...savitzkyGolayStep.defaults, derivative: 1 }, {});
    const d2 = savitzkyGolayStep.apply(input, { ...savitzkyGolayStep.defaults, derivative: 2 }, {});
    for (let i = 0; i < x.length; i++) {
      expect(Math.abs(d1.y[i] - (6 * x[i] - 1))).toBeLessThan(1e-9);
      expect(Math.abs(d2.y[i] - 6)).toBeLessThan(1e-8);
    }
    expect(savitzkyGolayStep.validate({ ...savitzkyGolayStep.defaults, derivative: 1 }, input, {})).toBeNull();
  });

  it('validate explains bad settings', () => {
    const d = savitzkyGolayStep.defaults;
    expect(savitzkyGolayStep.validate({ ...d, window: 5, order: 5 }, input, {})).toMatch(/smaller than the window/);
    expect(savitzkyGolayStep.validate({ ...d, order: 7 }, input, {})).toMatch(/0 to 6/);
    expect(savitzkyGolayStep.validate({ ...d, order: 1, derivative: 2 }, input, {})).toMatch(/no derivative of order 2/);
    expect(savitzkyGolayStep.validate({ ...d, derivative: 3 }, input, {})).toMatch(/0, 1 or 2/);
  });
});
