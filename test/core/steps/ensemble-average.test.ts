import { describe, expect, it } from 'vitest';
import { ensembleAverageStep, noiseFromDifferences } from '../../../src/core/steps/ensemble-average.ts';
import { createTrace, type Trace } from '../../../src/core/trace.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

const source = { fileName: 'made-in-test', sha256: '0'.repeat(64), rowsRead: 0, rowsSkipped: 0 };
const trace = (name: string, x: ArrayLike<number>, y: ArrayLike<number>): Trace => createTrace({ name, x, y, source });
const grid = (n: number, x0: number, dx: number) => Float64Array.from({ length: n }, (_, i) => x0 + i * dx);

describe('ensemble average', () => {
  it('n seeded white-noise scans: noise falls by √n within sampling error', () => {
    // REFERENCES.md, Gaussian peaks and averaging: averaging n scans of white noise gives S/N × √n.
    // Tolerance: each robust noise estimate uses 3999 differences; the MAD-based SD has relative SE
    // ≈ √(1.36/N) (Rousseeuw & Croux 1993, from memory), inflated to ≈ 2.4 % for correlated differences;
    // the ratio of two such estimates has ≈ 3.4 %; 4 SE ≈ 14 %.
    const rng = makeRng(4242);
    const n = 4000, nScans = 9, sigma = 0.1;
    const x = grid(n, 0, 0.01);
    const signal = Float64Array.from(x, (v) => Math.exp(-0.5 * ((v - 20) / 0.5) ** 2));
    const noisy = () => Float64Array.from(signal, (s) => s + sigma * rng.normal());
    const input = { x, y: noisy() };
    const scans = Array.from({ length: nScans - 1 }, (_, k) => trace(`scan ${k + 2}`, x, noisy()));
    expect(ensembleAverageStep.validate(ensembleAverageStep.defaults, input, { scans })).toBeNull();
    const out = ensembleAverageStep.apply(input, ensembleAverageStep.defaults, { scans });
    const f = out.figures!;
    expect(f.n).toBe(nScans);
    expect(f.expectedGain).toBeCloseTo(3, 12);
    expect(Math.abs(f.noiseBefore / f.noiseAfter / 3 - 1)).toBeLessThan(0.14);
    // The noise estimate itself: robust SD of the input close to the true σ (same SE argument, 4 SE ≈ 10 %).
    expect(Math.abs(f.noiseBefore / sigma - 1)).toBeLessThan(0.1);
    // The plain SD of (mean − true signal) is σ/√n (SE of an SD ≈ 1/√(2N) = 1.1 %; 4 SE ≈ 5 %).
    let ss = 0;
    for (let i = 0; i < n; i++) ss += (out.y[i] - signal[i]) ** 2;
    expect(Math.abs(Math.sqrt(ss / n) / (sigma / 3) - 1)).toBeLessThan(0.05);
    expect(out.notes[0]).toMatch(/Averaged 9 scans/);
  });

  it('counts a scan identical to the input once, interpolates other grids, and refuses non-overlap', () => {
    const x = grid(50, 0, 1);
    const y = Float64Array.from(x, (v) => v);
    const same = trace('itself', x, y);
    const shifted = trace('shifted', grid(60, -2.5, 1), Float64Array.from(grid(60, -2.5, 1), (v) => v + 2));
    const xc = Float64Array.from(x), yc = Float64Array.from(y), sc = Float64Array.from(shifted.y);
    const out = ensembleAverageStep.apply({ x, y }, ensembleAverageStep.defaults, { scans: [same, shifted] });
    expect(x).toEqual(xc);
    expect(y).toEqual(yc);
    expect(shifted.y).toEqual(sc);
    expect(out.y.every(Number.isFinite)).toBe(true);
    expect(out.figures!.n).toBe(2);
    // Mean of v and (v + 2) is v + 1; linear interpolation of a line is exact.
    for (let i = 0; i < x.length; i++) expect(out.y[i]).toBeCloseTo(x[i] + 1, 12);
    expect(out.notes.join(' ')).toMatch(/counted once/);
    const far = trace('far', grid(10, 100, 1), new Float64Array(10));
    expect(ensembleAverageStep.validate(ensembleAverageStep.defaults, { x, y }, { scans: [far] })).toMatch(/do not overlap/);
    const part = trace('part', grid(10, 10, 1), new Float64Array(10));
    expect(ensembleAverageStep.validate(ensembleAverageStep.defaults, { x, y }, { scans: [part] })).toMatch(/does not cover/);
    expect(ensembleAverageStep.validate(ensembleAverageStep.defaults, { x, y }, {})).toMatch(/no repeated scans/);
    expect(ensembleAverageStep.validate(ensembleAverageStep.defaults, { x, y }, { scans: [] })).toMatch(/no repeated scans/);
  });

  it('noiseFromDifferences of white noise is σ (1.4826·MAD of differences / √2, common practice)', () => {
    const rng = makeRng(8);
    const y = Float64Array.from({ length: 20000 }, () => 0.3 * rng.normal());
    const yc = Float64Array.from(y);
    // Relative SE ≈ √(1.36/20000) × 1.2 ≈ 1 %; 4 SE.
    expect(Math.abs(noiseFromDifferences(y) / 0.3 - 1)).toBeLessThan(0.04);
    expect(y).toEqual(yc);
  });
});

describe('noiseFromDifferences, exact cases', () => {
  it('a straight line has no noise; a strict alternation ±a has differences of size 2a, giving 1.4826·2a/√2', () => {
    // 1.4826·MAD of the differences / √2 (Hampel 1974 constant; common practice).
    expect(noiseFromDifferences(Float64Array.from({ length: 50 }, (_, i) => 3 + 0.5 * i))).toBe(0);
    const a = 0.25;
    const alt = Float64Array.from({ length: 101 }, (_, i) => (i % 2 ? a : -a));
    // Differences are ±2a: median 0 or ±2a by count; with 50 of +2a and 50 of −2a the median is 0 and |d − 0| = 2a.
    expect(noiseFromDifferences(alt)).toBeCloseTo((1.4826 * 2 * a) / Math.SQRT2, 3);
    expect(() => noiseFromDifferences(Float64Array.of(1, 2))).toThrow(/at least 3/);
  });

  it('declares itself linear only without alignment (alignment decides shifts from the data)', () => {
    const lin = ensembleAverageStep.linear as (p: typeof ensembleAverageStep.defaults) => boolean;
    expect(lin(ensembleAverageStep.defaults)).toBe(true);
    expect(lin({ ...ensembleAverageStep.defaults, align: true })).toBe(false);
  });
});
