// The sped-up smoothing kernels (folded Savitzky–Golay weights with four
// outputs per pass; moving average with a TwoSum running sum refreshed in
// blocks) against straightforward loops written here from the definitions:
//  - Savitzky–Golay: out[i] = Σₖ c[k]·y[i + k − h] with the centre weights of
//    savgolCoefficients (Savitzky & Golay 1964, Anal. Chem. 36:1627), samples
//    beyond the ends by SciPy's ndimage padding rules (SciPy reference guide,
//    scipy.ndimage "mode"), and for 'interp' the end window's fit evaluated at
//    the outer points (SciPy savgol_filter documentation);
//  - moving average: the plain mean of the padded or shrunk window.
// Lengths are chosen to cross the 4-output groups, the 4096-point blocks and
// the cases where the window is longer than the data.
//
// Tolerance: the fast and naive sums round differently; each differs from the
// exact sum by at most about w·ε·Σ|terms| (Higham 2002, Accuracy and Stability
// of Numerical Algorithms, §4.2), so 1e-12 relative to Σ|c_k·y| (w ≤ 201,
// ε = 2.2e-16, with margin) is a bound neither can exceed unless the kernel is wrong.
import { describe, expect, it } from 'vitest';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { padIndex } from '../../../src/core/numeric/convolve.ts';
import { savgolCoefficients, savitzkyGolay, type SavgolMode } from '../../../src/core/numeric/savgol.ts';
import { movingAverage, type MovingAverageEdge } from '../../../src/core/steps/moving-average.ts';

function signal(n: number, seed: number): Float64Array {
  const rng = makeRng(seed);
  const y = new Float64Array(n);
  // A drift far from zero plus noise and a few tall spikes, so sums cancel and rounding shows.
  for (let i = 0; i < n; i++) y[i] = 50 + 0.01 * i + rng.normal() + (rng.uniform() < 0.01 ? 1e3 * rng.uniform() : 0);
  return y;
}

function naiveSavgol(y: Float64Array, w: number, order: number, deriv: number, mode: SavgolMode, cval: number): { out: Float64Array; scale: Float64Array } {
  const n = y.length, h = (w - 1) / 2;
  const out = new Float64Array(n), scale = new Float64Array(n);
  const c = savgolCoefficients(w, order, deriv);
  for (let i = 0; i < n; i++) {
    let s = 0, a = 0;
    if (mode === 'interp' && (i < h || i > n - 1 - h)) {
      // The fit to the first (last) w points, evaluated at this point.
      const left = i < h;
      const base = left ? 0 : n - w;
      const ce = savgolCoefficients(w, order, deriv, i - base);
      for (let k = 0; k < w; k++) { s += ce[k] * y[base + k]; a += Math.abs(ce[k] * y[base + k]); }
    } else {
      for (let k = 0; k < w; k++) {
        const j = mode === 'interp' ? i + k - h : padIndex(i + k - h, n, mode);
        const v = j < 0 ? cval : y[j];
        s += c[k] * v;
        a += Math.abs(c[k] * v);
      }
    }
    out[i] = s;
    scale[i] = a;
  }
  return { out, scale };
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

function worst(fast: Float64Array, ref: { out: Float64Array; scale: Float64Array }): number {
  let e = 0;
  for (let i = 0; i < fast.length; i++) {
    const d = Math.abs(fast[i] - ref.out[i]) / Math.max(ref.scale[i], Number.MIN_VALUE);
    if (!(d <= e)) e = d; // a NaN in the output makes e NaN, which fails below
  }
  return e;
}

const REL = 1e-12;

describe('savitzkyGolay (folded interior) equals the direct correlation', () => {
  const modes: SavgolMode[] = ['interp', 'mirror', 'nearest', 'constant', 'wrap'];
  const shapes: [number, number, number][] = [[5, 2, 0], [7, 3, 1], [25, 2, 0], [25, 4, 2], [31, 3, 1], [101, 6, 0], [201, 3, 3]];
  for (const [w, order, deriv] of shapes) {
    for (const mode of modes) {
      it(`window ${w}, order ${order}, derivative ${deriv}, ${mode}`, () => {
        for (const n of [w, w + 1, w + 2, w + 3, w + 4, 9001]) {
          const y = signal(n, 1000 * w + n);
          const copy = Float64Array.from(y);
          const fast = savitzkyGolay(y, w, order, { deriv, mode, cval: 2.5 });
          expect(worst(fast, naiveSavgol(y, w, order, deriv, mode, 2.5))).toBeLessThan(REL);
          expect(y).toEqual(copy);
        }
      });
    }
    it(`window ${w}, order ${order}, derivative ${deriv}: data shorter than the window, padded modes`, () => {
      for (const n of [1, 2, 3, Math.max(1, w - 2)]) {
        const y = signal(n, 7 * n + w);
        for (const mode of ['mirror', 'nearest', 'constant', 'wrap'] as const) {
          const fast = savitzkyGolay(y, w, order, { deriv, mode, cval: -1 });
          expect(worst(fast, naiveSavgol(y, w, order, deriv, mode, -1))).toBeLessThan(REL);
        }
      }
    });
  }

  it('divides by the sample spacing once per derivative order', () => {
    const y = signal(3000, 5);
    const fast = savitzkyGolay(y, 11, 3, { deriv: 1, delta: 0.25 });
    const ref = naiveSavgol(y, 11, 3, 1, 'interp', 0);
    for (let i = 0; i < y.length; i++) {
      expect(Math.abs(fast[i] - ref.out[i] / 0.25)).toBeLessThan(REL * ref.scale[i] / 0.25);
    }
  });
});

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
