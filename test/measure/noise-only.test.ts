import { describe, expect, it } from 'vitest';
import { noiseOnly } from './noise-only.ts';

describe('noise-only traces of 10⁵ points with the defaults', () => {
  it('200 realisations: mean count at S/N ≥ 3 within ±15 % of the shown expected count; not one row quantifiable', () => {
    const r = noiseOnly(100_000, 200, 1000);
    expect(Math.abs(r.mean / r.shown - 1)).toBeLessThan(0.15);
    expect(r.quantifiable).toBe(0);
    // About 5 σ at most against a local baseline (the figure), far from 10.
    expect(r.largest).toBeLessThan(7);
  }, 900_000);
});
