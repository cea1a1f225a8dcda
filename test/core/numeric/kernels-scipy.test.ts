// The fast kernels against outside references: SciPy's median_filter (its own
// double-heap code) for long windows, short signals and every padding rule, and
// NumPy's median for the median by selection. Values from
// test/reference/make_kernels.py (versions recorded in kernels.json).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { slidingMedian, type MedianEdge } from '../../../src/core/numeric/sliding-median.ts';
import { medianInPlace, medianOf } from '../../../src/core/numeric/median.ts';
import { runsTest } from '../../../src/core/measure/residual-tests.ts';
import { plainRuns } from '../measure/runs-rule.ts';

interface KernelsRef {
  scipy: string;
  numpy: string;
  median: {
    signals: Record<'long' | 'short', number[]>;
    cases: { input: 'long' | 'short'; window: number; mode: MedianEdge; outputIndex: number[] }[];
  };
  arrayMedian: Record<string, { values: number[]; median: number }>;
}

const ref = JSON.parse(readFileSync(new URL('../../reference/kernels.json', import.meta.url), 'utf8')) as KernelsRef;

describe(`slidingMedian against scipy.ndimage.median_filter (SciPy ${ref.scipy})`, () => {
  for (const c of ref.median.cases) {
    const y = Float64Array.from(ref.median.signals[c.input]);
    const path = c.window > 127 ? 'two heaps' : 'sorted window';
    it(`${c.input} signal (${y.length} points), window ${c.window} (${path}), mode ${c.mode}`, () => {
      // Source: scipy.ndimage.median_filter(y, size, mode, cval=0), make_kernels.py. A median picks a value: exact.
      const expected = c.outputIndex.map((k) => (k < 0 ? 0 : y[k]));
      expect(Array.from(slidingMedian(y, c.window, c.mode))).toEqual(expected);
    });
  }
});

describe(`median by selection against numpy.median (NumPy ${ref.numpy}) and against sorting`, () => {
  for (const [name, c] of Object.entries(ref.arrayMedian)) {
    it(`${name} (${c.values.length} values)`, () => {
      // Source: numpy.median (make_kernels.py). Odd counts pick a value; even counts average two, as NumPy does.
      const v = Float64Array.from(c.values);
      const copy = Float64Array.from(v);
      expect(medianOf(v)).toBe(c.median);
      expect(v).toEqual(copy);
    });
  }

  it('equals sorting and taking the middle on random, sorted, reversed, constant and organ-pipe arrays (fast-check, exact)', () => {
    const sortMedian = (a: Float64Array): number => {
      const s = Float64Array.from(a).sort();
      const h = s.length >> 1;
      return s.length & 1 ? s[h] : 0.5 * (s[h - 1] + s[h]);
    };
    const shaped = fc.tuple(
      fc.array(fc.oneof(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: -2, max: 2 })), { minLength: 1, maxLength: 400 }),
      fc.constantFrom('as-is', 'sorted', 'reversed', 'organ-pipe', 'constant'),
    ).map(([a, shape]) => {
      const v = Float64Array.from(a);
      if (shape === 'sorted') v.sort();
      else if (shape === 'reversed') v.sort().reverse();
      else if (shape === 'constant') v.fill(v[0]);
      else if (shape === 'organ-pipe') {
        v.sort();
        const o = new Float64Array(v.length);
        for (let i = 0; i < v.length; i++) o[i % 2 ? v.length - 1 - (i >> 1) : i >> 1] = v[i];
        return o;
      }
      return v;
    });
    fc.assert(fc.property(shaped, (v) => {
      expect(medianOf(v)).toBe(sortMedian(v));
      expect(medianInPlace(Float64Array.from(v))).toBe(sortMedian(v));
    }), { seed: 81021, numRuns: 400 });
    expect(Number.isNaN(medianOf([]))).toBe(true);
  });

  it('the runs test about the median counts the same runs as with a sorted median (10^5-point residual)', () => {
    // Same definition as before the change (Wald & Wolfowitz 1940): only how the median is found differs.
    let state = 12345;
    const e = new Float64Array(100_001);
    for (let i = 0; i < e.length; i++) { state = (Math.imul(state, 48271) >>> 0) % 2147483647; e[i] = (state / 2147483647) - 0.5 + (i % 7 === 0 ? 0 : 0.1); }
    const s = Float64Array.from(e).sort();
    const med = s[s.length >> 1];
    const { runs, n1, n2 } = plainRuns(e, med);
    const r = runsTest(e);
    expect(r.runs).toBe(runs);
    expect(r.expected).toBe((2 * n1 * n2) / (n1 + n2) + 1);
  });
});
