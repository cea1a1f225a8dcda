import { describe, expect, it } from 'vitest';
import { decimateMinMax, lowerBound } from '../../../src/core/numeric/decimate.ts';
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
