/**
 * Properties: hostile text and JSON never throw out of the readers (they
 * answer with messages), and the fits and intervals are unchanged in meaning
 * when amounts and responses are rescaled by large or small factors (units
 * change nothing: the numerics work in a scaled amount).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { predictAmount } from '../../../src/core/calibration/inverse.ts';
import { parseNamedPeaks, readNamedPeaksCsv, nameTracePeaks, emptyNamedPeakTable } from '../../../src/core/calibration/named-peaks.ts';
import { fitCurve } from '../../../src/core/calibration/regression.ts';
import type { CurveKind, Weighting } from '../../../src/core/calibration/regression.ts';
import { parseCalibrationSettings } from '../../../src/core/calibration/settings.ts';
import { parseStandards, readStandardsCsv } from '../../../src/core/calibration/standards.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

const cellish = fc.oneof(fc.string(), fc.constantFrom('1', '-1', '1,5', '1.5', 'NaN', 'Infinity', '1e400', '"a,b"', '', ' ', '#', '\u0000', '\uFEFF'));
const tableText = fc.tuple(fc.array(fc.array(cellish, { maxLength: 6 }), { maxLength: 8 }), fc.constantFrom(',', ';', '\t'), fc.constantFrom('\n', '\r\n', '\r'))
  .map(([rows, d, eol]) => rows.map((r) => r.join(d)).join(eol));

describe('hostile input gives messages, never exceptions', () => {
  it('table readers on arbitrary text', () => {
    fc.assert(fc.property(fc.oneof(fc.string({ maxLength: 300 }), tableText), (text) => {
      const a = readNamedPeaksCsv(text, 'x.csv');
      const b = readStandardsCsv(text, 'x.csv');
      for (const r of [a, b]) if (!r.ok) for (const p of r.problems) expect(p.problem.length).toBeGreaterThan(10);
      // A header that looks right with junk rows must still come back as messages.
      const c = readNamedPeaksCsv(`name,position,window\n${text}`, 'x.csv');
      const d = readStandardsCsv(`standard,A\n${text}`, 'x.csv');
      expect(typeof c.ok === 'boolean' && typeof d.ok === 'boolean').toBe(true);
    }), { numRuns: 400, seed: 2126 });
  });

  it('JSON forms on arbitrary JSON values', () => {
    fc.assert(fc.property(fc.jsonValue({ maxDepth: 4 }), (v) => {
      for (const r of [parseNamedPeaks(v), parseStandards(v), parseCalibrationSettings(v)]) {
        if (!r.ok) expect(r.problems.length).toBeGreaterThan(0);
      }
      const wrapped = { format: 'tracewright-named-peaks', version: 1, peaks: Array.isArray(v) ? v : [v] };
      expect(typeof parseNamedPeaks(wrapped).ok).toBe('boolean');
    }), { numRuns: 400, seed: 2127 });
  });

  it('the matcher on arbitrary peak lists and tables', () => {
    const num = fc.oneof(fc.double(), fc.constantFrom(NaN, Infinity, -Infinity, 0));
    fc.assert(fc.property(
      fc.array(fc.record({ name: fc.string({ minLength: 1, maxLength: 5 }), position: num, window: num }), { maxLength: 6 }),
      fc.array(fc.record({ x: num, height: num, area: num }), { maxLength: 12 }),
      (named, peaks) => {
        const n = nameTracePeaks({ ...emptyNamedPeakTable(), peaks: named }, peaks);
        const used = n.names.filter((v) => v !== null);
        expect(new Set(used).size).toBe(used.length);
        expect(n.matches.length).toBe(named.length);
      },
    ), { numRuns: 300, seed: 2128 });
  });
});

describe('units change nothing: rescaled amounts and responses', () => {
  const cases: { kind: CurveKind; weighting: Weighting; origin: boolean }[] = [
    { kind: 'line', weighting: 'none', origin: false },
    { kind: 'line', weighting: '1/x2', origin: true },
    { kind: 'quadratic', weighting: '1/x', origin: false },
  ];
  for (const c of cases) {
    for (const [ax, ay] of [[1e6, 1e-6], [1e-9, 1e9], [1e-3, 1e3]]) {
      it(`${c.kind}${c.origin ? ' through origin' : ''}, ${c.weighting}: amounts ×${ax}, responses ×${ay}`, () => {
        const rng = makeRng(77);
        const x = [1, 1, 2, 2, 5, 5, 10, 10];
        const y = x.map((v) => 0.3 + 2 * v - 0.03 * v * v + 0.05 * v * rng.normal());
        const model = { kind: c.kind, throughOrigin: c.origin, weighting: c.weighting };
        const f1 = fitCurve(x, y, model), f2 = fitCurve(x.map((v) => v * ax), y.map((v) => v * ay), model);
        if (!f1.ok || !f2.ok) throw new Error('fit');
        f1.fit.coefficients.forEach((b, j) => {
          const scale = ay / Math.pow(ax, f1.fit.powers[j]);
          expect(Math.abs(f2.fit.coefficients[j] / (b * scale) - 1)).toBeLessThan(1e-10);
          expect(Math.abs(f2.fit.standardErrors[j] / (f1.fit.standardErrors[j] * scale) - 1)).toBeLessThan(1e-10);
        });
        const e1 = predictAmount(f1.fit, 9), e2 = predictAmount(f2.fit, 9 * ay);
        expect(Math.abs(e2.amount! / (e1.amount! * ax) - 1)).toBeLessThan(1e-10);
        expect(Math.abs(e2.interval!.low! / (e1.interval!.low! * ax) - 1)).toBeLessThan(1e-9);
        expect(Math.abs(e2.interval!.high! / (e1.interval!.high! * ax) - 1)).toBeLessThan(1e-9);
      });
    }
  }
});
