/**
 * Property tests of every registered processing step (fast-check, fixed
 * seeds, 200 cases per property), on random evenly spaced signals of
 * 30 … 120 points with random finite y:
 *
 * * for each step, with its defaults and with random valid parameters
 *   (drawn from the parameter specs, kept when the step's own validate
 *   accepts them): apply does not throw; the input and the context traces
 *   are unchanged; the output length is as documented (boxcar: ⌊n/size⌋ with
 *   "drop", ⌈n/size⌉ with "keep"; resample: the point count, 0 = n; all
 *   others n, on the same x); finite in gives finite out; and the residual of
 *   src/core/measure/residual-tests.ts is raw − processed exactly (same grid), or is
 *   formed with a note when the grid changed;
 * * smoothers keep a constant (within 1e-9 relative: sums of n doubles
 *   round at about n·2⁻⁵³ ≈ 1e-14, so 1e-9 leaves room and still catches
 *   a wrong weight, whose error is at least 1e-3 of the constant);
 * * linear filters are linear: f(a·u + b·v) = a·f(u) + b·f(v) within 1e-9
 *   of the scale max(|a|·max|u| + |b|·max|v|, |a|·max|f(u)| + |b|·max|f(v)|)
 *   (same rounding argument; the second term covers derivatives, which divide by dx^k).
 *
 * The properties are the definitions of the methods (a smoother is a
 * weighted mean whose weights sum to 1; a convolution or a fixed gain per
 * frequency is linear): Savitzky & Golay 1964, Anal. Chem. 36:1627 (the
 * fit reproduces polynomials up to its order, constants included); the
 * Hampel test (Hampel 1974, JASA 69:383) replaces nothing in a constant
 * trace since no point differs from the median.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import type { ParamSpec, Signal, StepContext, StepDefinition, StepParams } from '../../../src/core/steps/types.ts';
import { createTrace } from '../../../src/core/trace.ts';
import { residual } from '../../../src/core/measure/residual-tests.ts';

const RUNS = 200;

interface Case { signal: Signal; dx: number; ctx: StepContext }

const source = { fileName: 'property.csv', sha256: '0'.repeat(64), rowsRead: 0, rowsSkipped: 0 };

const yValue = fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e3, max: 1e3 });

/** An evenly spaced signal plus a blank and two repeated scans on the same x. */
const caseArb: fc.Arbitrary<Case> = fc
  .record({
    n: fc.integer({ min: 30, max: 120 }),
    x0: fc.double({ noNaN: true, min: -100, max: 100 }),
    dx: fc.constantFrom(0.001, 0.02, 0.5, 1, 3),
  })
  .chain(({ n, x0, dx }) =>
    fc.record({
      y: fc.array(yValue, { minLength: n, maxLength: n }),
      blank: fc.array(yValue, { minLength: n, maxLength: n }),
      s1: fc.array(yValue, { minLength: n, maxLength: n }),
      s2: fc.array(yValue, { minLength: n, maxLength: n }),
    }).map(({ y, blank, s1, s2 }) => {
      const x = Float64Array.from({ length: n }, (_, i) => x0 + i * dx);
      const mk = (name: string, v: number[]) => createTrace({ name, x, y: v, source });
      return { signal: { x, y: Float64Array.from(y) }, dx, ctx: { blank: mk('blank', blank), scans: [mk('scan 1', s1), mk('scan 2', s2)] } };
    }),
  );

/** A value for one parameter, within its spec, sized to the signal. */
function specArb(spec: ParamSpec, n: number, dx: number): fc.Arbitrary<unknown> {
  switch (spec.kind) {
    case 'int': {
      const hi = Math.min(spec.max, spec.key === 'maxIter' ? 30 : Math.max(spec.min, 2 * n));
      if (spec.odd) {
        const lo = spec.min % 2 === 1 ? spec.min : spec.min + 1;
        const top = Math.min(hi, n % 2 === 1 ? n : n - 1);
        return fc.integer({ min: 0, max: Math.max(0, (top - lo) / 2) }).map((k) => lo + 2 * k);
      }
      return fc.integer({ min: spec.min, max: hi });
    }
    case 'number': {
      const ny = 1 / (2 * dx);
      if (spec.unit === 'cycles per x-unit') return fc.double({ noNaN: true, min: 0.02, max: 0.9 }).map((f) => f * ny);
      if (spec.log) {
        const lo = Math.log(Math.max(spec.min, 1e-6)), hi = Math.log(spec.max);
        return fc.double({ noNaN: true, min: lo, max: hi }).map(Math.exp);
      }
      return fc.double({ noNaN: true, min: spec.min, max: spec.max });
    }
    case 'choice':
      return fc.constantFrom(...spec.choices.map((c) => c.value));
    case 'boolean':
      return fc.boolean();
    case 'ranges':
      return fc.constant(null); // filled in from the signal's x below
  }
}

function withParams(def: StepDefinition, c: Case, overrides: Partial<Record<string, fc.Arbitrary<unknown>>> = {}): fc.Arbitrary<StepParams> {
  const n = c.signal.y.length;
  const rec: Record<string, fc.Arbitrary<unknown>> = {};
  for (const spec of def.params) rec[spec.key] = overrides[spec.key] ?? specArb(spec, n, c.dx);
  return fc.record(rec).map((p) => {
    const out: StepParams = { ...def.defaults };
    for (const spec of def.params) {
      if (spec.kind === 'ranges') {
        // Two stretches of about a fifth of the trace each, at the two ends.
        const x = c.signal.x;
        const k = Math.floor(n / 5);
        // trim keeps one range: the middle three fifths.
        out[spec.key] = def.id === 'trim' ? [[x[k], x[n - 1 - k]]] : [[x[0], x[k]], [x[n - 1 - k], x[n - 1]]];
      } else {
        out[spec.key] = p[spec.key] as StepParams[string];
      }
    }
    return out;
  });
}

const caseAndParams = (def: StepDefinition, overrides?: Partial<Record<string, fc.Arbitrary<unknown>>>) =>
  caseArb.chain((c) => withParams(def, c, overrides).map((p) => ({ c, p })));

function expectedLength(def: StepDefinition, p: StepParams, n: number): number {
  if (def.id === 'boxcar') return p.tail === 'keep' ? Math.ceil(n / (p.size as number)) : Math.floor(n / (p.size as number));
  if (def.id === 'resample') return (p.points as number) === 0 ? n : (p.points as number);
  if (def.id === 'trim') { const k = Math.floor(n / 5); return n - 2 * k; }
  return n;
}

const REGRIDDING = new Set(['boxcar', 'resample', 'trim']);

function checkStep(def: StepDefinition, c: Case, p: StepParams): void {
  const { signal, ctx } = c;
  const x0 = signal.x.slice(), y0 = signal.y.slice();
  const blank0 = ctx.blank!.y.slice(), scan0 = ctx.scans![0].y.slice();
  const out = def.apply(signal, p, ctx);
  // Input and context unchanged (raw data is sacred).
  expect(signal.x).toEqual(x0);
  expect(signal.y).toEqual(y0);
  expect(ctx.blank!.y).toEqual(blank0);
  expect(ctx.scans![0].y).toEqual(scan0);
  expect(out.y).not.toBe(signal.y);
  // Length as documented.
  const n = signal.y.length;
  const m = expectedLength(def, p, n);
  expect(out.x.length).toBe(m);
  expect(out.y.length).toBe(m);
  if (!REGRIDDING.has(def.id)) expect(out.x).toEqual(signal.x);
  // Finite in, finite out.
  expect(out.y.every(Number.isFinite), `${def.id} ${JSON.stringify(p)}`).toBe(true);
  expect(out.x.every(Number.isFinite)).toBe(true);
  // Residual: raw − processed exactly on the same grid.
  const r = residual(signal, out);
  if (!REGRIDDING.has(def.id)) {
    expect(r.note).toBeNull();
    const diff = Array.from(signal.y, (v, i) => v - out.y[i]);
    expect(Array.from(r.y)).toEqual(diff);
  } else {
    expect(r.y.length).toBe(m);
    expect(r.y.every(Number.isFinite)).toBe(true);
  }
}

describe('every registered step: length, input unchanged, finite out, residual exact', () => {
  it('the registry holds the eleven steps this test knows', () => {
    expect(STEP_REGISTRY.map((d) => d.id).sort()).toEqual(
      ['baseline', 'blank-subtraction', 'boxcar', 'despike', 'ensemble-average', 'frequency-filter', 'local-order', 'moving-average', 'resample', 'savitzky-golay', 'trim'],
    );
  });
  STEP_REGISTRY.forEach((def, k) => {
    it(`${def.id}: defaults`, () => {
      fc.assert(
        fc.property(caseArb, (c) => {
          const problem = def.validate(def.defaults, c.signal, c.ctx);
          // trim has no range until the user marks one: its defaults are refused with what to do (issue 17).
          if (def.id === 'trim') { expect(problem).toMatch(/No x-range chosen yet/); return; }
          expect(problem, problem ?? '').toBeNull();
          checkStep(def, c, def.defaults);
        }),
        { numRuns: RUNS, seed: 1000 + k },
      );
    });
    it(`${def.id}: random valid parameters`, () => {
      let accepted = 0;
      fc.assert(
        fc.property(caseAndParams(def), ({ c, p }) => {
          const problem = def.validate(p, c.signal, c.ctx);
          fc.pre(problem === null);
          accepted++;
          checkStep(def, c, p);
        }),
        { numRuns: RUNS, seed: 2000 + k },
      );
      expect(accepted).toBe(RUNS);
    });
  });
});

/** Largest |a − b| over the arrays. */
function maxDiff(a: Float64Array, b: Float64Array): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}
const maxAbs = (a: Float64Array) => a.reduce((m, v) => Math.max(m, Math.abs(v)), 0);

const def = (id: string) => STEP_REGISTRY.find((d) => d.id === id)!;

describe('smoothers keep a constant', () => {
  const constant = fc.double({ noNaN: true, min: -1e6, max: 1e6 });
  const smoothers: { id: string; overrides?: Partial<Record<string, fc.Arbitrary<unknown>>> }[] = [
    { id: 'moving-average' },
    { id: 'savitzky-golay', overrides: { derivative: fc.constant(0), edge: fc.constantFrom('interp', 'mirror', 'nearest') } },
    { id: 'boxcar' },
    { id: 'local-order' },
    { id: 'despike' },
    { id: 'frequency-filter', overrides: { kind: fc.constant('low-pass') } },
  ];
  smoothers.forEach(({ id, overrides }, k) => {
    it(id, () => {
      const d = def(id);
      fc.assert(
        fc.property(caseAndParams(d, overrides), constant, ({ c, p }, value) => {
          const flat: Signal = { x: c.signal.x, y: new Float64Array(c.signal.y.length).fill(value) };
          fc.pre(d.validate(p, flat, c.ctx) === null);
          const out = d.apply(flat, p, c.ctx);
          const tol = 1e-9 * Math.max(Math.abs(value), 1e-300);
          expect(maxDiff(out.y, new Float64Array(out.y.length).fill(value)), `${id} ${JSON.stringify(p)} c=${value}`).toBeLessThanOrEqual(tol);
        }),
        { numRuns: RUNS, seed: 3000 + k },
      );
    });
  });
});

describe('linear filters are linear', () => {
  const coef = fc.double({ noNaN: true, min: -10, max: 10 });
  const linear: { id: string; overrides?: Partial<Record<string, fc.Arbitrary<unknown>>> }[] = [
    { id: 'moving-average' },
    { id: 'savitzky-golay' },
    { id: 'frequency-filter' },
  ];
  linear.forEach(({ id, overrides }, k) => {
    it(id, () => {
      const d = def(id);
      fc.assert(
        fc.property(caseAndParams(d, overrides), fc.array(yValue, { minLength: 120, maxLength: 120 }), coef, coef, ({ c, p }, vRaw, a, b) => {
          const u = c.signal;
          fc.pre(d.validate(p, u, c.ctx) === null);
          const n = u.y.length;
          const v: Signal = { x: u.x, y: Float64Array.from(vRaw.slice(0, n)) };
          const mix: Signal = { x: u.x, y: Float64Array.from(u.y, (uy, i) => a * uy + b * v.y[i]) };
          const fu = d.apply(u, p, c.ctx).y, fv = d.apply(v, p, c.ctx).y, fm = d.apply(mix, p, c.ctx).y;
          const rhs = Float64Array.from(fu, (w, i) => a * w + b * fv[i]);
          // Derivatives divide by dx^k, so the outputs may be larger than the inputs: take the larger scale.
          const scale = Math.max(Math.abs(a) * maxAbs(u.y) + Math.abs(b) * maxAbs(v.y), Math.abs(a) * maxAbs(fu) + Math.abs(b) * maxAbs(fv));
          expect(maxDiff(fm, rhs), `${id} ${JSON.stringify(p)} a=${a} b=${b}`).toBeLessThanOrEqual(1e-9 * Math.max(scale, 1e-300));
        }),
        { numRuns: RUNS, seed: 4000 + k },
      );
    });
  });
});
