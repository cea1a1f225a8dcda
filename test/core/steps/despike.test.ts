import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { despikeStep, type DespikeParams } from '../../../src/core/steps/despike.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

const rng = makeRng(303);
const n = 1500;
const x = Float64Array.from({ length: n }, (_, i) => 2 + i * 0.01);
const y = Float64Array.from(x, (v) => 0.2 + Math.exp(-0.5 * ((v - 9) / 0.9) ** 2) + 0.01 * rng.normal());
const spikes = [40, 700, 1320];
for (const s of spikes) y[s] += 0.5;
const input = { x, y };
const d = despikeStep.defaults;

describe('despike step', () => {
  it('has a stable id and documents its edges', () => {
    expect(despikeStep.id).toBe('despike');
    expect(despikeStep.params.find((p) => p.key === 'window')?.help).toMatch(/cut short/);
  });

  it('Hampel: lists every replaced point as an event and changes nothing else', () => {
    // Spikes of 50σ, t = 6, 41-point window (design check; Hampel 1974 rule as in REFERENCES.md).
    const params: DespikeParams = { method: 'hampel', window: 41, threshold: 6 };
    expect(despikeStep.validate(params, input, {})).toBeNull();
    const out = despikeStep.apply(input, params, {});
    expect(out.events!.map((e) => e.index)).toEqual(spikes);
    for (const e of out.events!) {
      expect(e.x).toBe(x[e.index]);
      expect(e.original).toBe(y[e.index]);
      expect(e.replacement).toBe(out.y[e.index]);
      expect(Math.abs(e.replacement - (e.original - 0.5))).toBeLessThan(0.05);
    }
    for (let i = 0; i < n; i++) if (!spikes.includes(i)) expect(out.y[i]).toBe(y[i]);
    expect(out.notes[0]).toMatch(/3 points were/);
    expect(out.notes.join(' ')).not.toMatch(/probably noise/);
  });

  it('running median: every changed value is an event', () => {
    const out = despikeStep.apply(input, { ...d, method: 'median', window: 5 }, {});
    let changed = 0;
    for (let i = 0; i < n; i++) if (out.y[i] !== y[i]) changed++;
    expect(out.events!.length).toBe(changed);
    expect(changed).toBeGreaterThan(n / 2);
    for (const s of spikes) expect(out.events!.some((e) => e.index === s)).toBe(true);
  });

  it('leaves the input unchanged and gives finite output', () => {
    const xc = Float64Array.from(x), yc = Float64Array.from(y);
    for (const method of ['hampel', 'median'] as const) {
      const out = despikeStep.apply(input, { ...d, method }, {});
      expect(out.y.every(Number.isFinite)).toBe(true);
    }
    expect(x).toEqual(xc);
    expect(y).toEqual(yc);
  });

  it('explains bad windows and thresholds in words', () => {
    const small = { x: x.slice(0, 9), y: y.slice(0, 9) };
    const v = (p: Partial<DespikeParams>, inp = input) => despikeStep.validate({ ...d, ...p } as DespikeParams, inp, {});
    expect(v({ window: 8 })).toMatch(/8 is even \(try 9\)/);
    expect(v({ window: 0 })).toMatch(/at least 3/);
    expect(v({ window: -5 })).toMatch(/at least 3/);
    expect(v({ window: NaN })).toMatch(/not a number/);
    expect(v({ window: 4.5 })).toMatch(/whole number/);
    expect(v({ window: 11 }, small)).toMatch(/larger than the trace \(9 points\)/);
    expect(v({ window: 9 }, small)).toBeNull();
    expect(v({ threshold: NaN })).toMatch(/threshold is not a number/);
    expect(v({ threshold: 0.5 })).toMatch(/from 1 to 10/);
    expect(v({ method: 'median', threshold: NaN })).toBeNull();
    expect(v({ method: 'x' as 'hampel' })).toMatch(/Unknown method/);
  });
});

describe('despike on the demo sample (public/demo, written by scripts/make-demo.mjs)', () => {
  // The demo's ground truth names the spike it planted (index, x, size); the CSV is read here with a
  // plain split so this test does not depend on the loaders.
  const truth = JSON.parse(readFileSync(new URL('../../../public/demo/demo-truth.json', import.meta.url), 'utf8')) as {
    noiseSd: number;
    spike: { file: string; index: number; x: number; size: number };
    peaks: { centre: number; sigma: number }[];
  };
  const rows = readFileSync(new URL(`../../../public/demo/${truth.spike.file}`, import.meta.url), 'utf8')
    .split(/\r?\n/)
    .map((l) => l.split(','))
    .filter((f) => f.length === 2 && f[0].trim() !== '' && Number.isFinite(Number(f[0])) && Number.isFinite(Number(f[1])));
  const demo = { x: Float64Array.from(rows, (r) => Number(r[0])), y: Float64Array.from(rows, (r) => Number(r[1])) };

  it('the default Hampel settings find the planted spike and put it back near the surrounding level', () => {
    const out = despikeStep.apply(demo, despikeStep.defaults, {});
    const hit = out.events!.find((e) => e.index === truth.spike.index);
    expect(hit).toBeDefined();
    expect(hit!.x).toBeCloseTo(truth.spike.x, 9);
    // The replacement is a 15-point median of noisy neighbours: within 4 noise SDs of (spiked value − spike size).
    expect(Math.abs(hit!.replacement - (hit!.original - truth.spike.size))).toBeLessThan(4 * truth.noiseSd);
    // Defaults (15 points, t = 5) were chosen to keep false replacements on noise rare: under 0.5 % of points here.
    expect(out.events!.length).toBeLessThan(0.005 * demo.y.length);
    // ...and the sharpest demo peak keeps its top.
    const sharp = truth.peaks.reduce((a, b) => (b.sigma < a.sigma ? b : a));
    expect(out.events!.some((e) => Math.abs(e.x - sharp.centre) <= sharp.sigma)).toBe(false);
  });

  it('a wide window cuts the top of the sharpest demo peak: the cost the summary names', () => {
    // The sharpest peak has σ = 2 points (FWHM ≈ 4.7 points); a 21-point window is more than 4 × that.
    const sharp = truth.peaks.reduce((a, b) => (b.sigma < a.sigma ? b : a));
    const narrow = despikeStep.apply(demo, { method: 'hampel', window: 7, threshold: 3 }, {});
    const wide = despikeStep.apply(demo, { method: 'hampel', window: 21, threshold: 3 }, {});
    const nearTop = (e: { x: number }) => Math.abs(e.x - sharp.centre) <= sharp.sigma;
    expect(narrow.events!.some(nearTop)).toBe(false);
    expect(wide.events!.some(nearTop)).toBe(true);
    expect(wide.events!.some((e) => e.index === truth.spike.index)).toBe(true);
  });
});
