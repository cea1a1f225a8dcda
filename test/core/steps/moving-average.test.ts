import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { movingAverage, movingAverageStep } from '../../../src/core/steps/moving-average.ts';
import type { MovingAverageEdge } from '../../../src/core/steps/moving-average.ts';
import { normalArray } from '../../../src/core/numeric/random.ts';

interface Reference {
  scipy: string;
  signal: number[];
  uniformFilter1d: { size: number; mode: 'reflect' | 'mirror' | 'nearest'; y: number[] }[];
  gaussianHeightRatio: { window: number; order: number; ratio: number }[];
}
const ref = JSON.parse(readFileSync(new URL('../../reference/smoothing.json', import.meta.url), 'utf8')) as Reference;

/** Seeded normal numbers from the project's generator (mulberry32 + Box–Muller). */
const normals = normalArray;

function sd(a: Float64Array, from: number, to: number): number {
  let m = 0;
  for (let i = from; i < to; i++) m += a[i];
  m /= to - from;
  let v = 0;
  for (let i = from; i < to; i++) v += (a[i] - m) ** 2;
  return Math.sqrt(v / (to - from - 1));
}

describe('movingAverage', () => {
  it('3-point ends of [1,2,3,4,5] match REFERENCES.md (SciPy ndimage modes)', () => {
    // REFERENCES.md filter rows: reflect (repeat edge) 1.3333 / 4.6667; mirror 1.6667 / 4.3333.
    const y = Float64Array.from([1, 2, 3, 4, 5]);
    const rows: [MovingAverageEdge, number, number][] = [
      ['reflect', 4 / 3, 14 / 3],
      ['mirror', 5 / 3, 13 / 3],
      ['repeat', 4 / 3, 14 / 3], // 'nearest' gives the same ends for a 3-point window
    ];
    for (const [edge, first, last] of rows) {
      const s = movingAverage(y, 3, edge);
      expect(s[0]).toBeCloseTo(first, 4);
      expect(s[4]).toBeCloseTo(last, 4);
      expect(s[2]).toBeCloseTo(3, 14);
    }
    // Shrink: the end points average only themselves (our definition), next points average 3.
    expect(Array.from(movingAverage(y, 5, 'shrink'))).toEqual([1, 2, 3, 4, 5]);
  });

  it(`matches scipy.ndimage.uniform_filter1d on the noisy test signal (SciPy ${ref.scipy})`, () => {
    // uniform_filter1d outputs in test/reference/smoothing.json (make_smoothing.py).
    const y = Float64Array.from(ref.signal);
    const map = { reflect: 'reflect', mirror: 'mirror', nearest: 'repeat' } as const;
    expect(ref.uniformFilter1d.length).toBe(9);
    for (const r of ref.uniformFilter1d) {
      const s = movingAverage(y, r.size, map[r.mode]);
      for (let i = 0; i < y.length; i++) {
        expect(Math.abs(s[i] - r.y[i])).toBeLessThan(Math.max(1e-12, 1e-9 * Math.abs(r.y[i])));
      }
    }
  });

  it('gain at f = 0.1 cycles/sample for N = 5 is sin(πNf)/(N sin πf) = 0.647214', () => {
    // REFERENCES.md moving-average gain row; measured by filtering a long sine and comparing amplitudes.
    const n = 20000;
    const y = Float64Array.from({ length: n }, (_, i) => Math.sin(2 * Math.PI * 0.1 * i + 0.4));
    const s = movingAverage(y, 5, 'mirror');
    // Amplitude by least squares against sin and cos at the known frequency, away from the ends.
    let ss = 0, sc = 0, cc = 0, ys = 0, yc = 0;
    for (let i = 100; i < n - 100; i++) {
      const a = Math.sin(2 * Math.PI * 0.1 * i + 0.4), b = Math.cos(2 * Math.PI * 0.1 * i + 0.4);
      ss += a * a; sc += a * b; cc += b * b; ys += s[i] * a; yc += s[i] * b;
    }
    const det = ss * cc - sc * sc;
    const amp = Math.hypot((ys * cc - yc * sc) / det, (yc * ss - ys * sc) / det);
    expect(amp).toBeCloseTo(0.647214, 6);
    // And a zero of the gain: f = 1/N removes the sine (REFERENCES.md).
    const z = movingAverage(Float64Array.from({ length: 1000 }, (_, i) => Math.sin(2 * Math.PI * 0.2 * i)), 5, 'mirror');
    for (let i = 10; i < 990; i++) expect(Math.abs(z[i])).toBeLessThan(1e-12);
  });

  it('Gaussian of σ = 5 points: height ratio 0.961326 (N = 5) and 0.831139 (N = 11)', () => {
    // REFERENCES.md (exact sums); also uniform_filter1d in smoothing.json.
    const g = Float64Array.from({ length: 401 }, (_, i) => Math.exp(-0.5 * ((i - 200) / 5) ** 2));
    expect(movingAverage(g, 5)[200]).toBeCloseTo(0.961326, 6);
    expect(movingAverage(g, 11)[200]).toBeCloseTo(0.831139, 6);
    for (const r of ref.gaussianHeightRatio.filter((h) => h.order === -1)) {
      expect(Math.abs(movingAverage(g, r.window)[200] - r.ratio)).toBeLessThan(1e-13);
    }
  });

  it('white noise SD falls by √k', () => {
    // Var of a mean of k independent samples is σ²/k (REFERENCES.md "k-point average divides noise SD by √k").
    // Relative SE of a sample SD is about 1/√(2·n_eff), n_eff ≈ n/k for the smoothed series: allow 4·√(k/(2n)).
    const n = 20000;
    const e = normals(99, n);
    for (const k of [3, 5, 25]) {
      const s = movingAverage(e, k);
      const ratio = sd(s, k, n - k) / sd(e, k, n - k);
      expect(Math.abs(ratio * Math.sqrt(k) - 1)).toBeLessThan(4 * Math.sqrt(k / (2 * n)));
    }
  });

  it('constants pass every edge mode; windows longer than the data still give finite means', () => {
    const c = new Float64Array(30).fill(7.125);
    for (const edge of ['shrink', 'mirror', 'repeat', 'reflect'] as const) {
      for (const w of [1, 3, 9, 29, 61]) {
        for (const v of movingAverage(c, w, edge)) expect(Math.abs(v - 7.125)).toBeLessThan(1e-13);
      }
    }
  });

  it('running sums do not drift over 2·10⁶ points with a large offset', () => {
    // Compare with direct sums at spread-out points; the data sit on an offset of 10⁶ with unit noise.
    const n = 2_000_000;
    const e = normals(5, n);
    const y = e.map((v) => 1e6 + v);
    const w = 7;
    const s = movingAverage(y, w, 'mirror');
    for (const i of [3, 1000, 654321, 1_500_001, n - 4]) {
      let d = 0;
      for (let j = i - 3; j <= i + 3; j++) d += y[j] - 1e6;
      expect(Math.abs(s[i] - (1e6 + d / w))).toBeLessThan(1e-9);
    }
  });

  it('shrink mode equals symmetric direct means at the ends', () => {
    const y = normals(8, 50);
    const s = movingAverage(y, 9, 'shrink');
    for (const i of [0, 1, 2, 3, 4, 45, 46, 47, 48, 49]) {
      const h = Math.min(4, i, 49 - i);
      let d = 0;
      for (let j = i - h; j <= i + h; j++) d += y[j];
      expect(s[i]).toBeCloseTo(d / (2 * h + 1), 13);
    }
  });
});

describe('moving-average step', () => {
  it('notes say what happened at the ends', () => {
    const x = Float64Array.from({ length: 20 }, (_, i) => i);
    const out = movingAverageStep.apply({ x, y: x }, { window: 7, edge: 'shrink' }, {});
    expect(out.notes.join(' ')).toMatch(/first and last 3 points/);
    // A straight line is kept by a centred symmetric average (shrink keeps it at the ends too).
    for (let i = 0; i < 20; i++) expect(out.y[i]).toBeCloseTo(i, 12);
  });
});
