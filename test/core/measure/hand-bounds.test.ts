import { describe, expect, it } from 'vitest';
import { applyPeakDecisions, defaultPeakOptions, detectPeaks } from '../../../src/core/measure/peak-table.ts';

// Issue 17: start and end set by hand. Reference: the area of a Gaussian, h·σ·√(2π)·erf(k/√2) between ±kσ
// (analytic), on a straight baseline that the hand line between the bounds reproduces exactly.
describe('start and end set by hand', () => {
  const n = 2001, dx = 0.01, c = 10, sd = 0.3, h = 5;
  const x = Float64Array.from({ length: n }, (_, i) => i * dx);
  const y = Float64Array.from(x, (v) => 0.2 + 0.05 * v + h * Math.exp(-0.5 * ((v - c) / sd) ** 2));
  const opts = defaultPeakOptions(0.01, dx);
  const found = detectPeaks(x, y, opts);
  const p = found.find((q) => Math.abs(q.x - c) < 0.05)!;

  it('measures area and height against the line between the trace at the new start and end', () => {
    const out = applyPeakDecisions(found, { added: [], removed: [], bounds: [{ x: p.x, start: c - 1.5, end: c + 1.5 }] }, x, y, opts);
    const q = out.find((r) => r.boundsByUser)!;
    expect(q.start).toBeCloseTo(c - 1.5, 9);
    expect(q.end).toBeCloseTo(c + 1.5, 9);
    expect(q.startKind).toBe('set-by-hand');
    // ±5σ: erf(5/√2) = 0.9999994267 (A&S 7.1); the line through the bounds lifts by the tails, 5·e^(−12.5) = 1.9e-5.
    const truth = h * sd * Math.sqrt(2 * Math.PI) * 0.9999994267 - 2 * 1.5 * h * Math.exp(-12.5);
    expect(Math.abs(q.area - truth) / truth).toBeLessThan(1e-4);
    expect(Math.abs(q.height - h) / h).toBeLessThan(1e-3);
    // Narrower bounds (±1σ): the line now cuts across the peak at e^(−0.5) of its height.
    const tight = applyPeakDecisions(found, { added: [], removed: [], bounds: [{ x: p.x, start: c - sd, end: c + sd }] }, x, y, opts).find((r) => r.boundsByUser)!;
    const tightTruth = h * sd * Math.sqrt(2 * Math.PI) * 0.6826894921 - 2 * sd * h * Math.exp(-0.5);
    expect(Math.abs(tight.area - tightTruth) / tightTruth).toBeLessThan(2e-3);
    expect(tight.height).toBeCloseTo(h * (1 - Math.exp(-0.5)), 2);
    expect(tight.area).toBeLessThan(q.area);
  });

  it('refuses bounds that leave the apex outside, saying so, and leaves the inputs alone', () => {
    const before = Float64Array.from(y);
    const out = applyPeakDecisions(found, { added: [], removed: [], bounds: [{ x: p.x, start: c + 0.5, end: c + 1 }] }, x, y, opts);
    const q = out.find((r) => Math.abs(r.x - p.x) < 1e-12)!;
    expect(q.boundsByUser).toBeUndefined();
    expect(q.area).toBe(p.area);
    expect(q.note).toMatch(/were not used: the apex must lie between them/);
    expect(y).toEqual(before);
  });
});
