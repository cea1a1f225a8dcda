import { describe, expect, it } from 'vitest';
import { SNAP_POINTS, snapHandPeak } from '../../../src/core/measure/hand-peak.ts';

// Issue 17. Hand-made cases: the apex positions follow from the formulas used to make the data.
describe('snapHandPeak', () => {
  const x = Float64Array.from({ length: 201 }, (_, i) => i * 0.01);
  // A Gaussian top at index 100 (x = 1.00) and a plain rising line beyond x = 1.5.
  const y = Float64Array.from(x, (v, i) => (i <= 150 ? Math.exp(-0.5 * ((v - 1) / 0.1) ** 2) : (i - 150) * 0.01));
  it('moves a click within the stated distance to the top', () => {
    const r = snapHandPeak(x, y, 0.95);
    expect(r).toEqual({ ok: true, index: 100, x: x[100], moved: true });
    expect(snapHandPeak(x, y, 1.0)).toEqual({ ok: true, index: 100, x: x[100], moved: false });
  });
  it('refuses a click with no top within the distance, saying why', () => {
    const far = snapHandPeak(x, y, (100 - SNAP_POINTS - 3) * 0.01, { xUnit: 'min' });
    expect(far.ok).toBe(false);
    if (!far.ok) expect(far.reason).toMatch(/No top within 10 points of x = 0\.87 min: the trace only rises there/);
    const slope = snapHandPeak(x, y, 1.8);
    expect(slope.ok).toBe(false);
  });
  it('refuses a top that is already a peak, and places dips on their bottom', () => {
    const r = snapHandPeak(x, y, 0.97, { taken: [1.0] });
    expect(r.ok).toBe(false);
    const dip = Float64Array.from(y, (v) => -v);
    expect(snapHandPeak(x, dip, 1.04, { negative: true })).toEqual({ ok: true, index: 100, x: x[100], moved: true });
  });
  it('refuses a click outside the trace', () => {
    expect(snapHandPeak(x, y, 5).ok).toBe(false);
  });
});
