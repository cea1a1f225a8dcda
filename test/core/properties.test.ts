// The optimised kernels (running sums, sorted-window medians, banded LDLᵀ,
// stack sweeps for prominences) give the same numbers as straightforward
// implementations written here from the published definitions, on random
// inputs (fast-check, fixed seeds, ≥ 200 cases per property).
//
// Tolerance: 1e-9 relative to the size of what is summed (stated per
// property). The fast and naive versions round differently (running versus
// fresh sums, banded versus dense elimination), so exact equality is only
// asked where both do the same few operations on the same values (medians,
// maxima, prominences, replaced-point lists).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { movingAverage, type MovingAverageEdge } from '../../src/core/steps/moving-average.ts';
import { savgolCoefficients, savitzkyGolay, type SavgolMode } from '../../src/core/numeric/savgol.ts';
import { hampel, slidingMedian, type MedianEdge } from '../../src/core/numeric/sliding-median.ts';
import { solveBandedSymmetric, whittaker } from '../../src/core/numeric/banded.ts';
import { baselineAsls } from '../../src/core/steps/baseline.ts';
import { findLocalMaxima, peakProminences, peakWidths, selectByDistance } from '../../src/core/measure/peak-detection.ts';
import { hullUnder, lineAt, locatingCopy } from '../../src/core/measure/peak-bounds.ts';
import { noiseModel } from '../../src/core/measure/peak-snr.ts';
import { defaultPeakOptions } from '../../src/core/measure/peak-table.ts';

const REL = 1e-9;
const RUNS = 200;

// ---------------------------------------------------------------------------
// Helpers written from the definitions, deliberately naive.

function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]));
  return m;
}

/** Largest |a − b| over the arrays (lengths must agree). */
function maxDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  expect(a.length).toBe(b.length);
  let e = 0;
  for (let i = 0; i < a.length; i++) e = Math.max(e, Math.abs(a[i] - b[i]));
  return e;
}

/**
 * Index a padding rule assigns to virtual index j, by folding step by step
 * (SciPy reference guide, scipy.ndimage "mode": reflect d c b a | a b c d,
 * mirror d c b | a b c d, nearest a a a | a b c d, wrap a b c d | a b c d).
 */
function naivePad(j: number, n: number, mode: 'reflect' | 'mirror' | 'nearest' | 'wrap'): number {
  if (mode === 'nearest') return Math.min(n - 1, Math.max(0, j));
  if (mode === 'wrap') { while (j < 0) j += n; while (j >= n) j -= n; return j; }
  if (n === 1) return 0;
  while (j < 0 || j >= n) {
    if (mode === 'reflect') j = j < 0 ? -j - 1 : 2 * n - 1 - j;
    else j = j < 0 ? -j : 2 * (n - 1) - j;
  }
  return j;
}

function naiveMovingAverage(y: Float64Array, w: number, edge: MovingAverageEdge): Float64Array {
  const n = y.length, h = (w - 1) / 2, out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = 0;
    if (edge === 'shrink') {
      const hi = Math.min(h, i, n - 1 - i);
      for (let j = i - hi; j <= i + hi; j++) s += y[j];
      out[i] = s / (2 * hi + 1);
    } else {
      const mode = edge === 'repeat' ? 'nearest' : edge;
      for (let j = i - h; j <= i + h; j++) s += y[naivePad(j, n, mode)];
      out[i] = s / w;
    }
  }
  return out;
}

function medianOf(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
}

function naiveSlidingMedian(y: Float64Array, w: number, edge: MedianEdge): Float64Array {
  const n = y.length, h = (w - 1) / 2, out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const win: number[] = [];
    for (let j = i - h; j <= i + h; j++) {
      if (j >= 0 && j < n) win.push(y[j]);
      else if (edge === 'constant') win.push(0);
      else if (edge !== 'shrink') win.push(y[naivePad(j, n, edge)]);
    }
    out[i] = medianOf(win);
  }
  return out;
}

/** Hampel (1974) test with the window cut at the ends; 1.4826 = 1/Φ⁻¹(3/4). */
function naiveHampel(y: Float64Array, k: number, t: number) {
  const n = y.length, out = Float64Array.from(y), median = new Float64Array(n), sigma = new Float64Array(n);
  const replaced: number[] = [];
  for (let i = 0; i < n; i++) {
    const win = Array.from(y.subarray(Math.max(0, i - k), Math.min(n, i + k + 1)));
    const m = medianOf(win);
    const sd = 1.4826 * medianOf(win.map((v) => Math.abs(v - m)));
    median[i] = m; sigma[i] = sd;
    if (Math.abs(y[i] - m) > t * sd) { out[i] = m; replaced.push(i); }
  }
  return { y: out, replaced, median, sigma };
}

/**
 * Savitzky–Golay by direct correlation with savgolCoefficients: padded
 * modes pad and correlate; 'interp' evaluates the fit of the first (last)
 * window at each outer point, asking for the weights at that position
 * directly (Savitzky & Golay 1964; SciPy savgol_filter's edge rule).
 */
function naiveSavgol(y: Float64Array, w: number, order: number, deriv: number, delta: number, mode: SavgolMode, cval: number): Float64Array {
  const n = y.length, h = (w - 1) / 2, out = new Float64Array(n), unit = delta ** deriv;
  const c = savgolCoefficients(w, order, deriv);
  const at = (j: number): number => {
    if (j >= 0 && j < n) return y[j];
    return mode === 'constant' ? cval : y[naivePad(j, n, mode === 'interp' ? 'nearest' : mode)];
  };
  for (let i = 0; i < n; i++) {
    let s = 0;
    if (mode === 'interp' && (i < h || i > n - 1 - h)) {
      const start = i < h ? 0 : n - w;
      const ce = savgolCoefficients(w, order, deriv, i - start);
      for (let k = 0; k < w; k++) s += ce[k] * y[start + k];
    } else {
      for (let k = 0; k < w; k++) s += c[k] * at(i - h + k);
    }
    out[i] = s / unit;
  }
  return out;
}

/** Solve A x = b by Gaussian elimination with partial pivoting (dense, O(n³)). */
function denseSolve(a: number[][], b: number[]): number[] {
  const n = b.length;
  const m = a.map((r, i) => [...r, b[i]]);
  for (let col = 0; col < n; col++) {
    let piv = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r][col]) > Math.abs(m[piv][col])) piv = r;
    [m[col], m[piv]] = [m[piv], m[col]];
    for (let r = col + 1; r < n; r++) {
      const f = m[r][col] / m[col][col];
      for (let c = col; c <= n; c++) m[r][c] -= f * m[col][c];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = m[r][n];
    for (let c = r + 1; c < n; c++) s -= m[r][c] * x[c];
    x[r] = s / m[r][r];
  }
  return x;
}

function binomial(d: number, j: number): number {
  let v = 1;
  for (let k = 1; k <= j; k++) v = (v * (d - k + 1)) / k;
  return v;
}

/** Whittaker smoother as the dense system (W + λ DᵀD) z = W y (Eilers 2003, Anal. Chem. 75:3631). */
function naiveWhittaker(y: Float64Array, lambda: number, d: number, w: Float64Array): number[] {
  const n = y.length;
  // Row r of D: (−1)^(d−j) C(d, j) at column r + j.
  const D: number[][] = [];
  for (let r = 0; r < n - d; r++) {
    const row = new Array<number>(n).fill(0);
    for (let j = 0; j <= d; j++) row[r + j] = (-1) ** (d - j) * binomial(d, j);
    D.push(row);
  }
  const A: number[][] = [];
  for (let i = 0; i < n; i++) {
    const row = new Array<number>(n).fill(0);
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let r = 0; r < n - d; r++) s += D[r][i] * D[r][j];
      row[j] = lambda * s + (i === j ? w[i] : 0);
    }
    A.push(row);
  }
  return denseSolve(A, Array.from(y, (v, i) => w[i] * v));
}

/** AsLS (Eilers & Boelens 2005): weights p above the fit, 1 − p on or below, from all ones, until they stop changing. */
function naiveAsls(y: Float64Array, lambda: number, p: number, maxIter: number) {
  const n = y.length;
  let w = new Float64Array(n).fill(1);
  let z: number[] = [];
  for (let it = 1; it <= maxIter; it++) {
    z = naiveWhittaker(y, lambda, 2, w);
    const next = Float64Array.from(y, (v, i) => (v > z[i] ? p : 1 - p));
    if (next.every((v, i) => v === w[i])) return { z, iterations: it, converged: true };
    w = next;
  }
  return { z, iterations: maxIter, converged: false };
}

/** Local maxima by plateaus: a run of equal samples, not touching an end, with lower samples either side; its middle (rounded down). */
function naiveLocalMaxima(y: Float64Array): number[] {
  const out: number[] = [];
  let a = 0;
  while (a < y.length) {
    let b = a;
    while (b + 1 < y.length && y[b + 1] === y[a]) b++;
    if (a > 0 && b < y.length - 1 && y[a - 1] < y[a] && y[b + 1] < y[a]) out.push((a + b) >> 1);
    a = b + 1;
  }
  return out;
}

/**
 * Prominence by SciPy's definition (scipy.signal.peak_prominences): on each
 * side the stretch up to the nearest strictly higher sample (or the window
 * edge, peak ± floor(ceil(wlen)/2)); its lowest sample is the base (the one
 * nearest the peak on ties); prominence = peak − the higher base.
 */
function naiveProminence(y: Float64Array, peak: number, wlen?: number): [number, number, number] {
  const n = y.length, v = y[peak];
  const half = wlen === undefined ? n : Math.floor(Math.ceil(wlen) / 2);
  const iMin = Math.max(0, peak - half), iMax = Math.min(n - 1, peak + half);
  let L = iMin;
  for (let j = peak - 1; j >= iMin; j--) if (y[j] > v) { L = j + 1; break; }
  let R = iMax;
  for (let j = peak + 1; j <= iMax; j++) if (y[j] > v) { R = j - 1; break; }
  // The nearest of the lowest samples: the largest index among equal minima on the left, the smallest on the right.
  let lMin = Infinity, lb = peak;
  for (let j = L; j <= peak; j++) lMin = Math.min(lMin, y[j]);
  for (let j = L; j <= peak; j++) if (y[j] === lMin) lb = j;
  let rMin = Infinity, rb = peak;
  for (let j = peak; j <= R; j++) rMin = Math.min(rMin, y[j]);
  for (let j = R; j >= peak; j--) if (y[j] === rMin) rb = j;
  return [v - Math.max(lMin, rMin), lb, rb];
}

/** Width at y[peak] − relHeight·prominence by SciPy's definition (scipy.signal.peak_widths). */
function naiveWidth(y: Float64Array, peak: number, rel: number, prom: number, lb: number, rb: number): [number, number, number, number] {
  const h = y[peak] - prom * rel;
  let i = lb;
  for (let j = peak; j > lb; j--) if (y[j] <= h) { i = j; break; }
  let left = i;
  if (y[i] < h) left += (h - y[i]) / (y[i + 1] - y[i]);
  i = rb;
  for (let j = peak; j < rb; j++) if (y[j] <= h) { i = j; break; }
  let right = i;
  if (y[i] < h) right -= (h - y[i]) / (y[i - 1] - y[i]);
  return [right - left, h, left, right];
}

// ---------------------------------------------------------------------------
// Arbitraries

/** Signals of finite doubles, with some repeated small integers so ties and plateaus occur. */
const signal = (minLength: number, maxLength: number) =>
  fc.array(fc.oneof(fc.double({ min: -1000, max: 1000, noNaN: true }), fc.integer({ min: -3, max: 3 })), { minLength, maxLength })
    .map((a) => Float64Array.from(a));

const oddWindow = (max: number) => fc.integer({ min: 0, max: (max - 1) / 2 }).map((h) => 2 * h + 1);

// ---------------------------------------------------------------------------

describe('smoothing kernels equal their naive definitions', () => {
  it('moving average: running compensated sum = fresh sum over each window, every edge rule', () => {
    fc.assert(fc.property(
      signal(1, 2500), oddWindow(81), fc.constantFrom<MovingAverageEdge>('shrink', 'mirror', 'repeat', 'reflect'),
      (y, w, edge) => {
        const copy = Float64Array.from(y);
        const got = movingAverage(y, w, edge);
        // A mean of values up to max|y| carries rounding of order eps·max|y| in either order of summation.
        expect(maxDiff(got, naiveMovingAverage(y, w, edge))).toBeLessThanOrEqual(REL * Math.max(maxAbs(y), 1e-300));
        expect(y).toEqual(copy);
      },
    ), { seed: 81001, numRuns: RUNS });
  });

  it('running median, windows up to 61 (sorted window) = sorting every window, every edge rule (exact)', () => {
    fc.assert(fc.property(
      signal(1, 300), oddWindow(61), fc.constantFrom<MedianEdge>('reflect', 'mirror', 'nearest', 'constant', 'shrink'),
      (y, w, edge) => {
        const copy = Float64Array.from(y);
        // A median selects a sample (or averages two): both ways give the same double.
        expect(maxDiff(slidingMedian(y, w, edge), naiveSlidingMedian(y, w, edge))).toBe(0);
        expect(y).toEqual(copy);
      },
    ), { seed: 81002, numRuns: RUNS });
  });

  // Longer windows: the deepest searches of the sorted window, then the two heaps (signals shorter and longer than the window).
  for (const { what, hMin, hMax, maxLength, seed, numRuns } of [
    { what: 'windows 63–127 (sorted window, deepest search)', hMin: 31, hMax: 63, maxLength: 400, seed: 81012, numRuns: 60 },
    { what: 'windows 129–513 (two heaps)', hMin: 64, hMax: 256, maxLength: 700, seed: 81013, numRuns: 40 },
  ]) {
    it(`running median, ${what} = sorting every window, every edge rule (exact)`, () => {
      fc.assert(fc.property(
        signal(1, maxLength), fc.integer({ min: hMin, max: hMax }).map((h) => 2 * h + 1), fc.constantFrom<MedianEdge>('reflect', 'mirror', 'nearest', 'constant', 'shrink'),
        (y, w, edge) => {
          const copy = Float64Array.from(y);
          expect(maxDiff(slidingMedian(y, w, edge), naiveSlidingMedian(y, w, edge))).toBe(0);
          expect(y).toEqual(copy);
        },
      ), { seed, numRuns });
    });
  }

  it('running median on long tie-heavy runs (a few distinct levels, 5000 points) = sorting every window', () => {
    // Long stretches exercise many block and ring turnovers; few distinct values make equal values the rule.
    fc.assert(fc.property(
      fc.integer({ min: 1, max: 2 ** 31 - 1 }), fc.constantFrom(3, 7, 25, 31, 33, 127, 129, 301), fc.constantFrom<MedianEdge>('nearest', 'reflect', 'shrink'),
      (seed, w, edge) => {
        let state = seed;
        const y = new Float64Array(5000);
        for (let i = 0; i < y.length; i++) { state = (Math.imul(state, 48271) >>> 0) % 2147483647; y[i] = (state % 5) - 2 + (i % 1000 < 500 ? 0 : 0.5); }
        const got = slidingMedian(y, w, edge);
        const want = naiveSlidingMedian(y, w, edge);
        expect(maxDiff(got, want)).toBe(0);
      },
    ), { seed: 81014, numRuns: 10 });
  });

  it('Hampel: sorted-window median and merged MAD = sorting every window (same replaced points)', () => {
    fc.assert(fc.property(
      signal(1, 300), fc.integer({ min: 1, max: 15 }), fc.constantFrom(1, 2, 3, 4.5),
      (y, k, t) => {
        const copy = Float64Array.from(y);
        const got = hampel(y, k, t);
        const want = naiveHampel(y, k, t);
        expect(maxDiff(got.median, want.median)).toBe(0);
        expect(maxDiff(got.sigma, want.sigma)).toBe(0);
        expect(got.replaced).toEqual(want.replaced);
        expect(maxDiff(got.y, want.y)).toBe(0);
        expect(y).toEqual(copy);
      },
    ), { seed: 81003, numRuns: RUNS });
  });

  it('Savitzky–Golay: padded correlation and end fits = direct correlation with the weights at each position', () => {
    const shape = fc.record({
      w: oddWindow(31),
      orderPick: fc.integer({ min: 0, max: 6 }),
      deriv: fc.integer({ min: 0, max: 2 }),
      delta: fc.constantFrom(1, 0.25, 3),
      mode: fc.constantFrom<SavgolMode>('interp', 'mirror', 'nearest', 'constant', 'wrap'),
      cval: fc.double({ min: -5, max: 5, noNaN: true }),
    });
    fc.assert(fc.property(shape, signal(1, 200), (s, y0) => {
      const order = Math.min(s.orderPick, s.w - 1);
      // 'interp' needs a full window of data.
      const y = s.mode === 'interp' && y0.length < s.w ? Float64Array.from({ length: s.w }, (_, i) => y0[i % y0.length]) : y0;
      const copy = Float64Array.from(y);
      const got = savitzkyGolay(y, s.w, order, { deriv: s.deriv, delta: s.delta, mode: s.mode, cval: s.cval });
      const want = naiveSavgol(y, s.w, order, s.deriv, s.delta, s.mode, s.cval);
      // Bound of any output: Σ|c|·max|input| / Δx^deriv; rounding is relative to it.
      let cAbs = 0;
      for (let p = 0; p < s.w; p++) {
        const c = savgolCoefficients(s.w, order, s.deriv, p);
        cAbs = Math.max(cAbs, c.reduce((a, v) => a + Math.abs(v), 0));
      }
      const scale = (cAbs * Math.max(maxAbs(y), Math.abs(s.cval), 1e-300)) / s.delta ** s.deriv;
      expect(maxDiff(got, want)).toBeLessThanOrEqual(REL * scale);
      expect(y).toEqual(copy);
    }), { seed: 81004, numRuns: RUNS });
  });
});

describe('banded solvers equal dense Gaussian elimination', () => {
  it('LDLᵀ banded solve = dense elimination on random diagonally dominant banded matrices', () => {
    fc.assert(fc.property(
      fc.integer({ min: 1, max: 40 }), fc.integer({ min: 0, max: 4 }), fc.integer({ min: 0, max: 2 ** 31 - 1 }),
      (n, m, seed) => {
        // Entries from a seeded linear congruential stream so one integer drives the whole matrix.
        let s = seed >>> 0;
        const u = () => { s = (Math.imul(s, 1664525) + 1013904223) >>> 0; return s / 4294967296; };
        const bands: Float64Array[] = [];
        for (let k = 0; k <= m; k++) bands.push(Float64Array.from({ length: Math.max(0, n - k) }, () => 2 * u() - 1));
        const A = Array.from({ length: n }, () => new Array<number>(n).fill(0));
        for (let k = 1; k <= m; k++) for (let i = 0; i + k < n; i++) { A[i][i + k] = bands[k][i]; A[i + k][i] = bands[k][i]; }
        // Strict diagonal dominance with a margin ≥ 0.5 keeps the condition number below about 4m + 4.
        for (let i = 0; i < n; i++) {
          const off = A[i].reduce((a, v, j) => a + (j === i ? 0 : Math.abs(v)), 0);
          bands[0][i] = off + 0.5 + 1.5 * u();
          A[i][i] = bands[0][i];
        }
        const b = Float64Array.from({ length: n }, () => 20 * u() - 10);
        const copies = bands.map((band) => Float64Array.from(band));
        const got = solveBandedSymmetric(bands, b);
        const want = denseSolve(A, Array.from(b));
        expect(maxDiff(got, want)).toBeLessThanOrEqual(REL * Math.max(maxAbs(want), 1e-300));
        bands.forEach((band, k) => expect(band).toEqual(copies[k]));
      },
    ), { seed: 81005, numRuns: RUNS });
  });

  it('Whittaker smoother = dense solve of (W + λDᵀD) z = W y', () => {
    fc.assert(fc.property(
      fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { minLength: 6, maxLength: 40 }).map((a) => Float64Array.from(a)),
      fc.integer({ min: 1, max: 3 }), fc.double({ min: -2, max: 3, noNaN: true }),
      fc.array(fc.oneof(fc.constant(0), fc.double({ min: 0.1, max: 1, noNaN: true })), { minLength: 40, maxLength: 40 }),
      fc.boolean(),
      (y, d, logLambda, wAll, weighted) => {
        const n = y.length;
        const w = weighted ? Float64Array.from(wAll.slice(0, n)) : new Float64Array(n).fill(1);
        // Positive weights on the first and last d points keep the system well conditioned (cond ≲ 1e5).
        for (let i = 0; i < d; i++) { w[i] = Math.max(w[i], 0.5); w[n - 1 - i] = Math.max(w[n - 1 - i], 0.5); }
        const lambda = 10 ** logLambda;
        const copy = Float64Array.from(y), wCopy = Float64Array.from(w);
        const got = whittaker(y, lambda, d, weighted ? w : undefined);
        const want = naiveWhittaker(y, lambda, d, w);
        // Both solves lose about cond·eps of max|y|; cond stays below ~1e5 here, so 1e-9 of max|y| holds.
        expect(maxDiff(got, want)).toBeLessThanOrEqual(REL * Math.max(maxAbs(y), 1e-300));
        expect(y).toEqual(copy);
        expect(w).toEqual(wCopy);
      },
    ), { seed: 81006, numRuns: RUNS });
  });

  it('AsLS baseline = the same reweighting loop with dense solves (same solves, same baseline)', () => {
    fc.assert(fc.property(
      fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 5, maxLength: 30 }).map((a) => Float64Array.from(a)),
      fc.double({ min: 0, max: 2, noNaN: true }), fc.constantFrom(0.01, 0.05, 0.1, 0.3), fc.integer({ min: 1, max: 15 }),
      (y, logLambda, p, maxIter) => {
        const lambda = 10 ** logLambda;
        const copy = Float64Array.from(y);
        const got = baselineAsls(y, lambda, p, maxIter);
        const want = naiveAsls(y, lambda, p, maxIter);
        expect(got.iterations).toBe(want.iterations);
        expect(got.converged).toBe(want.converged);
        // Weights ≥ 0.01 and λ ≤ 100 keep cond below ~1e6: 1e-9 of max|y| covers both solves' rounding.
        expect(maxDiff(got.baseline, want.z)).toBeLessThanOrEqual(REL * Math.max(maxAbs(y), 1e-300));
        expect(y).toEqual(copy);
      },
    ), { seed: 81007, numRuns: RUNS });
  });
});

describe('peak primitives equal SciPy’s definitions written out naively', () => {
  const peakSignal = fc.oneof(
    fc.array(fc.integer({ min: 0, max: 5 }), { minLength: 0, maxLength: 400 }).map((a) => Float64Array.from(a)),
    fc.array(fc.double({ min: -50, max: 50, noNaN: true }), { minLength: 0, maxLength: 400 }).map((a) => Float64Array.from(a)),
  );

  it('local maxima: plateau middles, ends excluded (exact)', () => {
    fc.assert(fc.property(peakSignal, (y) => {
      const copy = Float64Array.from(y);
      expect(Array.from(findLocalMaxima(y))).toEqual(naiveLocalMaxima(y));
      expect(y).toEqual(copy);
    }), { seed: 81008, numRuns: RUNS });
  });

  it('prominences and bases: stack sweep / walk = nearest-higher-sample definition, with and without wlen (exact)', () => {
    fc.assert(fc.property(
      peakSignal.filter((y) => y.length >= 3),
      fc.oneof(fc.constant(undefined), fc.double({ min: 1.5, max: 60, noNaN: true })),
      fc.boolean(), fc.array(fc.nat(), { maxLength: 60 }),
      (y, wlen, useMaxima, picks) => {
        // All maxima (≥ 32 of them on long inputs takes the sweep) or arbitrary samples in any order, repeats allowed.
        const peaks = useMaxima ? Array.from(findLocalMaxima(y)) : picks.map((p) => p % y.length);
        const copy = Float64Array.from(y);
        const got = peakProminences(y, peaks, wlen);
        peaks.forEach((pk, k) => {
          const [p, lb, rb] = naiveProminence(y, pk, wlen);
          expect([got.prominences[k], got.leftBases[k], got.rightBases[k]]).toEqual([p, lb, rb]);
        });
        expect(y).toEqual(copy);
      },
    ), { seed: 81009, numRuns: RUNS });
  });

  it('widths: walk and linear interpolation = first sample at or below the level on each side', () => {
    fc.assert(fc.property(
      peakSignal.filter((y) => y.length >= 3), fc.constantFrom(0, 0.25, 0.5, 0.75, 1, 1.5),
      (y, rel) => {
        const peaks = findLocalMaxima(y);
        const pd = peakProminences(y, peaks);
        const got = peakWidths(y, peaks, rel, pd);
        const scale = Math.max(1, maxAbs(y), y.length);
        peaks.forEach((pk, k) => {
          const [w, h, l, r] = naiveWidth(y, pk, rel, pd.prominences[k], pd.leftBases[k], pd.rightBases[k]);
          // Same interpolation formula on the same samples: differences are rounding only.
          expect(Math.abs(got.widths[k] - w)).toBeLessThanOrEqual(REL * scale);
          expect(Math.abs(got.widthHeights[k] - h)).toBeLessThanOrEqual(REL * scale);
          expect(Math.abs(got.leftIps[k] - l)).toBeLessThanOrEqual(REL * scale);
          expect(Math.abs(got.rightIps[k] - r)).toBeLessThanOrEqual(REL * scale);
        });
      },
    ), { seed: 81010, numRuns: RUNS });
  });

  it('distance rule: highest first, each removes the kept peaks closer than ceil(distance) (distinct heights)', () => {
    fc.assert(fc.property(
      fc.array(fc.double({ min: -50, max: 50, noNaN: true }), { minLength: 3, maxLength: 400 }).map((a) => Float64Array.from(a)),
      fc.double({ min: 1, max: 40, noNaN: true }),
      (y, distance) => {
        const peaks = Array.from(findLocalMaxima(y));
        fc.pre(new Set(peaks.map((p) => y[p])).size === peaks.length);
        const keep = new Array<boolean>(peaks.length).fill(true);
        const gap = Math.ceil(distance);
        const order = peaks.map((_, k) => k).sort((a, b) => y[peaks[b]] - y[peaks[a]]);
        for (const k of order) {
          if (!keep[k]) continue;
          peaks.forEach((p, j) => { if (j !== k && Math.abs(p - peaks[k]) < gap) keep[j] = false; });
        }
        expect(Array.from(selectByDistance(peaks, y, distance))).toEqual(peaks.filter((_, k) => keep[k]));
      },
    ), { seed: 81011, numRuns: RUNS });
  });
});

describe('the hull line under a peak (peak-bounds.ts, run once per candidate) equals its definition', () => {
  // Definition: the box averages g_j (half-width r, the ends repeated) of samples lo..hi; the lower convex
  // envelope of the points (x_j, g_j) at x_i is min over a ≤ i ≤ b of the chord from a to b at x_i; the line
  // returned must meet the envelope there and lie nowhere above any g_j (a supporting line).
  const input = fc.record({
    y: fc.array(fc.double({ min: -20, max: 20, noNaN: true }), { minLength: 5, maxLength: 160 }),
    steps: fc.array(fc.double({ min: 0.1, max: 3, noNaN: true }), { minLength: 160, maxLength: 160 }),
    r: fc.integer({ min: 0, max: 6 }),
    a: fc.nat(), b: fc.nat(), at: fc.nat(),
  });
  it('one fused pass (running box sum + monotone chain) = brute-force envelope and supporting line, 1e-9 relative', () => {
    fc.assert(fc.property(input, ({ y: ys, steps, r, a, b, at }) => {
      const n = ys.length;
      const s = Float64Array.from(ys);
      const x = new Float64Array(n);
      for (let j = 1; j < n; j++) x[j] = x[j - 1] + steps[j];
      const lo = Math.min(a % n, b % n), hi = Math.max(a % n, b % n);
      const i = lo + (at % (hi - lo + 1));
      const c = { x, s, noise: noiseModel(s, defaultPeakOptions(1)), loc: locatingCopy(s) };
      const copy = Float64Array.from(s);
      const line = { ...hullUnder(c, i, lo, hi, r) };
      expect(s).toEqual(copy);
      const g = (j: number) => {
        let sum = 0;
        for (let k = j - r; k <= j + r; k++) sum += s[Math.min(n - 1, Math.max(0, k))];
        return sum / (2 * r + 1);
      };
      let env = g(i);
      for (let p = lo; p <= i; p++) {
        for (let q = i; q <= hi; q++) {
          if (p === q) continue;
          env = Math.min(env, g(p) + ((g(q) - g(p)) * (x[i] - x[p])) / (x[q] - x[p]));
        }
      }
      const tol = REL * Math.max(1, maxAbs(s)) * Math.max(1, x[n - 1]);
      expect(Math.abs(lineAt(line, x[i]) - env)).toBeLessThanOrEqual(tol);
      for (let j = lo; j <= hi; j++) expect(lineAt(line, x[j])).toBeLessThanOrEqual(g(j) + tol);
    }), { seed: 81012, numRuns: RUNS });
  });
});
