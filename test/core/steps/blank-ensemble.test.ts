import { describe, expect, it } from 'vitest';
import { blankSubtractionStep, subtractBlank } from '../../../src/core/steps/blank-subtraction.ts';
import { gridCoverageProblem } from '../../../src/core/steps/checks.ts';
import { ensembleAverageStep, noiseFromDifferences } from '../../../src/core/steps/ensemble-average.ts';
import { createTrace, type Trace } from '../../../src/core/trace.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

const source = { fileName: 'made-in-test', sha256: '0'.repeat(64), rowsRead: 0, rowsSkipped: 0 };
const trace = (name: string, x: ArrayLike<number>, y: ArrayLike<number>): Trace => createTrace({ name, x, y, source });
const grid = (n: number, x0: number, dx: number) => Float64Array.from({ length: n }, (_, i) => x0 + i * dx);

describe('blank subtraction', () => {
  const x = grid(101, 0, 0.1);
  const y = Float64Array.from(x, (v) => 2 + v * v);
  const input = { x, y };

  it('subtracts a blank on the same grid exactly, times the scale factor', () => {
    const blank = trace('blank', x, Float64Array.from(x, (v) => 0.5 + v));
    for (const scale of [1, 0.5, 2]) {
      expect(blankSubtractionStep.validate({ scale }, input, { blank })).toBeNull();
      const out = blankSubtractionStep.apply(input, { scale }, { blank });
      for (let i = 0; i < x.length; i++) expect(out.y[i]).toBe(y[i] - scale * blank.y[i]);
    }
  });

  it('interpolates a blank on another grid linearly (exact for a straight-line blank) and says so', () => {
    // Linear interpolation reproduces a straight line exactly (to rounding): no outside value needed.
    const bx = grid(41, -0.5, 0.27);
    const blank = trace('blank', bx, Float64Array.from(bx, (v) => 0.5 + 3 * v));
    expect(blankSubtractionStep.validate({ scale: 1 }, input, { blank })).toBeNull();
    const out = blankSubtractionStep.apply(input, { scale: 1 }, { blank });
    for (let i = 0; i < x.length; i++) expect(out.y[i]).toBeCloseTo(y[i] - (0.5 + 3 * x[i]), 12);
    expect(out.notes.join(' ')).toMatch(/interpolated linearly/);
  });

  it('refuses a blank that does not overlap, or covers only part, naming the ranges', () => {
    const far = trace('far', grid(20, 50, 1), new Float64Array(20));
    const msg = blankSubtractionStep.validate({ scale: 1 }, input, { blank: far });
    expect(msg).toMatch(/do not overlap/);
    expect(msg).toMatch(/sample runs from x = 0 to 10/);
    expect(msg).toMatch(/from 50 to 69/);
    const part = trace('part', grid(50, 3, 0.2), new Float64Array(50));
    const msg2 = blankSubtractionStep.validate({ scale: 1 }, input, { blank: part });
    expect(msg2).toMatch(/does not cover the sample from x = 0 to 3 \(/);
    expect(msg2).toMatch(/extrapolation/);
    expect(gridCoverageProblem(x, grid(30, 2, 0.2), 'the blank')).toMatch(/x = 0 to 2 and from x = 7.8 to 10/);
    expect(() => subtractBlank(input, part)).toThrow(RangeError);
  });

  it('asks for a blank and checks the scale factor', () => {
    expect(blankSubtractionStep.validate({ scale: 1 }, input, {})).toMatch(/mark a loaded trace as blank/);
    const blank = trace('b', x, y);
    expect(blankSubtractionStep.validate({ scale: NaN }, input, { blank })).toMatch(/not a number/);
    expect(blankSubtractionStep.validate({ scale: -1 }, input, { blank })).toMatch(/from 0 to 10/);
  });

  it('leaves input and blank unchanged', () => {
    const blank = trace('b', grid(30, -1, 0.5), grid(30, 1, 0.1));
    const xc = Float64Array.from(x), yc = Float64Array.from(y), bc = Float64Array.from(blank.y);
    blankSubtractionStep.apply(input, { scale: 1.3 }, { blank });
    expect(x).toEqual(xc);
    expect(y).toEqual(yc);
    expect(blank.y).toEqual(bc);
  });
});

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
