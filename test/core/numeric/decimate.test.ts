import { describe, expect, it } from 'vitest';
import { decimateMinMax, lowerBound, thinTogether } from '../../../src/core/numeric/decimate.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

/** Seeded uniform numbers from the project's generator (mulberry32). */
const uniformFrom = (seed: number): (() => number) => makeRng(seed).uniform;


function noisy(n: number, seed: number) {
  const r = uniformFrom(seed);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) { x[i] = i * 0.01; y[i] = r() - 0.5; }
  return { x, y };
}

describe('decimateMinMax', () => {
  it('keeps the global min and max and the first and last points', () => {
    const { x, y } = noisy(100_000, 7);
    y[31_337] = 50; // a single-point spike must survive thinning
    y[77_777] = -40;
    const d = decimateMinMax(x, y, -Infinity, Infinity, 800);
    expect(d.thinned).toBe(true);
    expect(d.x.length).toBeLessThanOrEqual(2 * 800 + 4);
    expect(Math.max(...d.y)).toBe(50);
    expect(Math.min(...d.y)).toBe(-40);
    expect(d.x[0]).toBe(x[0]);
    expect(d.y[0]).toBe(y[0]);
    expect(d.x[d.x.length - 1]).toBe(x[x.length - 1]);
    expect(d.y[d.y.length - 1]).toBe(y[y.length - 1]);
  });

  it('keeps every column extreme: each bucket max of the full data appears', () => {
    const { x, y } = noisy(10_000, 3);
    const d = decimateMinMax(x, y, -Infinity, Infinity, 100);
    const kept = new Set(Array.from(d.x));
    // the max of any 100-point block is kept (buckets are 99-100 points wide)
    let hits = 0;
    for (let b = 0; b < 100; b++) {
      let iMax = b * 100;
      for (let i = b * 100; i < (b + 1) * 100; i++) if (y[i] > y[iMax]) iMax = i;
      if (kept.has(x[iMax])) hits++;
    }
    expect(hits).toBeGreaterThan(90);
  });

  it('output x stays ascending and inside the data', () => {
    const { x, y } = noisy(50_000, 11);
    const d = decimateMinMax(x, y, 100, 200, 300);
    for (let i = 1; i < d.x.length; i++) expect(d.x[i]).toBeGreaterThan(d.x[i - 1]);
    // one neighbour outside each end so the line reaches the plot edges
    expect(d.x[0]).toBeLessThanOrEqual(100);
    expect(d.x[d.x.length - 1]).toBeGreaterThanOrEqual(200);
  });

  it('returns small ranges whole and leaves its input unchanged', () => {
    const { x, y } = noisy(500, 5);
    const before = Array.from(y);
    const d = decimateMinMax(x, y, -Infinity, Infinity, 400);
    expect(d.thinned).toBe(false);
    expect(Array.from(d.y)).toEqual(before);
    expect(Array.from(y)).toEqual(before);
  });

  it('recomputes on zoom: a narrow window gets full resolution', () => {
    const { x, y } = noisy(1_000_000, 9);
    const wide = decimateMinMax(x, y, -Infinity, Infinity, 1000);
    const zoom = decimateMinMax(x, y, 5000, 5005, 1000);
    expect(wide.thinned).toBe(true);
    expect(zoom.thinned).toBe(false);
    expect(zoom.x.length).toBe(lowerBound(x, 5005) - lowerBound(x, 5000) + 2);
  });
});

describe('thinTogether (two spectra on one grid, for a small figure)', () => {
  // The definition is the reference: every run of consecutive points after the first keeps the places of both
  // series' minimum and maximum, so each series' extreme over any run is still drawn, and nothing else is made up.
  it('keeps the first point and, in every run, both series\' minimum and maximum at their own x, in x order', () => {
    const rng = makeRng(77);
    for (const [n, groups] of [[100_001, 1024], [5000, 10], [4098, 1024]] as const) {
      const x = Float64Array.from({ length: n }, (_, i) => i * 0.5);
      const a = Float64Array.from({ length: n }, () => Math.exp(3 * rng.normal()));
      const b = Float64Array.from({ length: n }, (_, i) => a[i] * (i % 97 === 0 ? 1e-6 : rng.uniform()));
      const t = thinTogether(x, a, b, groups);
      expect(t.thinned).toBe(true);
      expect(t.x[0]).toBe(x[0]);
      expect(t.x.length).toBeLessThanOrEqual(1 + 4 * groups);
      for (let i = 1; i < t.x.length; i++) expect(t.x[i]).toBeGreaterThan(t.x[i - 1]);
      // Every kept point is a point of the input, both series taken at the same index.
      for (let i = 0; i < t.x.length; i++) { const k = t.x[i] / 0.5; expect(t.a[i]).toBe(a[k]); expect(t.b[i]).toBe(b[k]); }
      const span = n - 1;
      for (let c = 0; c < groups; c++) {
        const from = 1 + Math.floor((c * span) / groups), to = Math.floor(((c + 1) * span) / groups);
        const kept = (v: Float64Array, w: Float64Array) => { const out: number[] = []; for (let i = 0; i < t.x.length; i++) { const k = t.x[i] / 0.5; if (k >= from && k <= to) out.push(w[i]); } return out; };
        const runA = Array.from(a.subarray(from, to + 1)), runB = Array.from(b.subarray(from, to + 1));
        expect(Math.max(...kept(a, t.a))).toBe(Math.max(...runA));
        expect(Math.min(...kept(a, t.a))).toBe(Math.min(...runA));
        expect(Math.max(...kept(b, t.b))).toBe(Math.max(...runB));
        expect(Math.min(...kept(b, t.b))).toBe(Math.min(...runB));
      }
    }
  });

  it('returns the arrays themselves when thinning would not shrink them', () => {
    const x = Float64Array.from({ length: 41 }, (_, i) => i), a = x.map((v) => v * v), b = x.map((v) => -v);
    const t = thinTogether(x, a, b, 10);
    expect(t.thinned).toBe(false);
    expect(t.x).toBe(x);
    expect(t.a).toBe(a);
    expect(t.b).toBe(b);
  });
});
