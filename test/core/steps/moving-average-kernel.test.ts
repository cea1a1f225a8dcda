// The sped-up moving-average kernel (a TwoSum running sum refreshed in blocks)
// against the plain mean of the padded or shrunk window, written here from the
// definition. Lengths cross the 4096-point blocks and the cases where the window
// is longer than the data. (Was test/core/numeric/kernels-fast.test.ts; its Savitzky–Golay half moved to
// test/core/numeric/savgol.test.ts.)
//
// Tolerance: the fast and naive sums round differently; each differs from the
// exact sum by at most about w·ε·Σ|terms| (Higham 2002, Accuracy and Stability
// of Numerical Algorithms, §4.2), so 1e-12 relative to Σ|c_k·y| (w ≤ 201,
// ε = 2.2e-16, with margin) is a bound neither can exceed unless the kernel is wrong.
import { describe, expect, it } from 'vitest';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { padIndex } from '../../../src/core/numeric/convolve.ts';
import { worst } from '../numeric/worst-error.ts';
import { movingAverage, type MovingAverageEdge } from '../../../src/core/steps/moving-average.ts';

function signal(n: number, seed: number): Float64Array {
  const rng = makeRng(seed);
  const y = new Float64Array(n);
  // A drift far from zero plus noise and a few tall spikes, so sums cancel and rounding shows.
  for (let i = 0; i < n; i++) y[i] = 50 + 0.01 * i + rng.normal() + (rng.uniform() < 0.01 ? 1e3 * rng.uniform() : 0);
  return y;
}

function naiveMovingAverage(y: Float64Array, w: number, edge: MovingAverageEdge): { out: Float64Array; scale: Float64Array } {
  const n = y.length, h = (w - 1) / 2;
  const out = new Float64Array(n), scale = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = 0, a = 0, count = w;
    if (edge === 'shrink') {
      const hi = Math.min(h, i, n - 1 - i);
      for (let j = i - hi; j <= i + hi; j++) { s += y[j]; a += Math.abs(y[j]); }
      count = 2 * hi + 1;
    } else {
      const mode = edge === 'repeat' ? 'nearest' : edge;
      for (let j = i - h; j <= i + h; j++) { const v = y[padIndex(j, n, mode)]; s += v; a += Math.abs(v); }
    }
    out[i] = s / count;
    scale[i] = a / count;
  }
  return { out, scale };
}

const REL = 1e-12;

describe('movingAverage (block running sum) equals the plain window mean', () => {
  const edges: MovingAverageEdge[] = ['shrink', 'mirror', 'repeat', 'reflect'];
  for (const w of [1, 3, 25, 101, 2049]) {
    for (const edge of edges) {
      it(`window ${w}, ${edge}`, () => {
        // 4096 and 8192 are block edges; 20011 spans several blocks with a remainder.
        for (const n of [1, 2, w, w + 1, 4095, 4096, 4097, 8193, 20011]) {
          const y = signal(n, 31 * w + n);
          const copy = Float64Array.from(y);
          const fast = movingAverage(y, w, edge);
          expect(worst(fast, naiveMovingAverage(y, w, edge))).toBeLessThan(REL);
          expect(y).toEqual(copy);
        }
      });
    }
  }

  it('a constant stays that constant along a million points (no drift of the running sum)', () => {
    // 0.1 is not a binary fraction, so every add and subtract rounds; a plain running sum would drift.
    const y = new Float64Array(1_000_000).fill(0.1);
    for (const edge of edges) {
      const out = movingAverage(y, 25, edge);
      let e = 0;
      for (let i = 0; i < out.length; i++) e = Math.max(e, Math.abs(out[i] - 0.1));
      expect(e).toBeLessThan(1e-16);
    }
  });
});
