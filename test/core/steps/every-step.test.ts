import { describe, expect, it } from 'vitest';
import { boxcarStep } from '../../../src/core/steps/boxcar.ts';
import { frequencyFilterStep } from '../../../src/core/steps/frequency-filter.ts';
import { localOrderStep } from '../../../src/core/steps/local-order.ts';
import { movingAverageStep } from '../../../src/core/steps/moving-average.ts';
import { resampleStep } from '../../../src/core/steps/resample.ts';
import { savitzkyGolayStep } from '../../../src/core/steps/savitzky-golay.ts';
import type { Signal, StepDefinition, StepParams } from '../../../src/core/steps/types.ts';
import { emptyRecipe, makeRecipeStep } from '../../../src/core/method.ts';
import { runPipeline } from '../../../src/core/pipeline.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';

const all = [movingAverageStep, boxcarStep, savitzkyGolayStep, localOrderStep, frequencyFilterStep, resampleStep] as unknown as StepDefinition<StepParams>[];

const n = 64;
const x = Float64Array.from({ length: n }, (_, i) => 1 + 0.25 * i);
const y = Float64Array.from({ length: n }, (_, i) => Math.exp(-0.5 * ((i - 30) / 4) ** 2) + 0.05 * Math.sin(i * 1.7));
const input: Signal = { x, y };

/** Every choice parameter value, one at a time, on top of the defaults. */
function variants(step: StepDefinition<StepParams>): StepParams[] {
  const out: StepParams[] = [{ ...step.defaults }];
  for (const p of step.params) {
    if (p.kind === 'choice') for (const c of p.choices) out.push({ ...step.defaults, [p.key]: c.value });
  }
  return out;
}

describe.each(all.map((s) => [s.id, s] as const))('%s', (_id, step) => {
  it('has a kebab-case id, a label, a 2–3 sentence summary and a unit on every parameter', () => {
    expect(step.id).toMatch(/^[a-z]+(-[a-z]+)*$/);
    expect(step.label.length).toBeGreaterThan(3);
    const sentences = step.summary.split(/(?<=\.)\s+/).filter((s) => s.length > 0);
    expect(sentences.length).toBeGreaterThanOrEqual(2);
    expect(sentences.length).toBeLessThanOrEqual(3);
    for (const p of step.params) expect(p.unit).toBeTruthy();
    for (const key of Object.keys(step.defaults)) expect(step.params.some((p) => p.key === key)).toBe(true);
  });

  it('leaves its input unchanged and turns finite data into finite data, for every choice', () => {
    const xs = Float64Array.from(x);
    const ys = Float64Array.from(y);
    for (const p of variants(step)) {
      const params = p.kind === 'notch' ? { ...p, centre: 0.5, width: 0.2 } : p;
      expect(step.validate(params, input, {})).toBeNull();
      const out = step.apply(input, params, {});
      expect(Array.from(input.x)).toEqual(Array.from(xs));
      expect(Array.from(input.y)).toEqual(Array.from(ys));
      expect(out.x).not.toBe(input.x);
      expect(out.y).not.toBe(input.y);
      expect(out.x.length).toBe(out.y.length);
      for (const v of out.y) expect(Number.isFinite(v)).toBe(true);
      for (let i = 1; i < out.x.length; i++) expect(out.x[i]).toBeGreaterThan(out.x[i - 1]);
      expect(out.notes.length).toBeGreaterThan(0);
    }
  });

  it('passes a constant through, every edge mode (zero padding of Savitzky–Golay excepted)', () => {
    // A constant is a polynomial of degree 0 and has only zero frequency: every smoother here must keep it.
    const c = new Float64Array(n).fill(-3.5);
    for (const p of variants(step)) {
      if (step.id === 'savitzky-golay' && p.edge === 'constant') continue; // pads with 0 by design (SciPy 'constant')
      const params = p.kind === 'notch' ? { ...p, centre: 0.5, width: 0.2 } : p;
      const out = step.apply({ x, y: c }, params, {});
      if (step.id === 'savitzky-golay' && p.derivative !== 0) continue;
      for (const v of out.y) expect(Math.abs(v + 3.5)).toBeLessThan(1e-12);
    }
  });

  it('on uneven x, the pipeline (the one place that checks even spacing) sends the user to the resample step for steps that assume it', () => {
    const uneven = { x: Float64Array.from({ length: n }, (_, i) => i + 0.01 * i * i), y };
    // The step's own check no longer speaks of spacing: one check, one wording.
    expect(step.validate(step.defaults, uneven, {})).toBeNull();
    const out = runPipeline(uneven, 'uneven', { ...emptyRecipe(), steps: [makeRecipeStep(step)] }, STEP_REGISTRY);
    if (step.needsEvenSpacing) {
      expect(out.runs[0].status).toBe('error');
      expect(out.runs[0].message).toBe(`${step.label} assumes evenly spaced x, but the spacing of this trace varies; add the "Resample to even spacing" step before it.`);
      expect(Array.from(out.final.y)).toEqual(Array.from(y));
    } else expect(out.runs[0].status).not.toBe('error');
  });

  it('validate answers bad numbers with a sentence instead of throwing', () => {
    for (const p of step.params) {
      if (p.kind !== 'int' && p.kind !== 'number') continue;
      for (const bad of [NaN, -1, 1e9, Infinity]) {
        const params = { ...step.defaults, [p.key]: bad };
        if (params.kind === 'low-pass' && ['centre', 'width', 'harmonics', 'notchTaper'].includes(p.key)) continue; // notch-only
        if (params.kind === 'notch' && ['cutoff', 'transition'].includes(p.key)) continue;
        const msg = step.validate(params, input, {});
        expect(msg, `${p.key} = ${bad}`).toMatch(/^[A-Z].{15,}[.)]$/);
      }
    }
  });
});

describe.each([
  [movingAverageStep.id, movingAverageStep, 'window', true],
  [savitzkyGolayStep.id, savitzkyGolayStep, 'window', true],
  [localOrderStep.id, localOrderStep, 'window', true],
  [boxcarStep.id, boxcarStep, 'size', false],
] as const)('window checks of %s', (_id, step, key, odd) => {
  const s = step as unknown as StepDefinition<StepParams>;
  it('rejects windows larger than the data, even, 0, negative, 1e9, NaN, fractional', () => {
    const cases: [number, RegExp][] = [
      [n + 1, /larger than the trace/],
      [0, /at least/],
      [-5, /at least/],
      [1e9, /at most/],
      [NaN, /not a number/],
      [5.5, /whole number/],
    ];
    if (odd) cases.push([12, /odd/], [n + 11, /at most|larger/]);
    for (const [v, re] of cases) {
      const msg = s.validate({ ...s.defaults, [key]: v }, input, {});
      expect(msg, `${key} = ${v}`).toMatch(re);
    }
    expect(s.validate(s.defaults, input, {})).toBeNull();
  });
});
