import { describe, expect, it } from 'vitest';
import { noiseOnly } from './noise-only.ts';

describe('noise-only traces of 10⁵ points with the defaults', () => {
  it('200 realisations: mean count at S/N ≥ 3 within ±15 % of the shown expected count; not one row quantifiable', () => {
    const r = noiseOnly(100_000, 200, 1000);
    expect(Math.abs(r.mean / r.shown - 1)).toBeLessThan(0.15);
    expect(r.quantifiable).toBe(0);
    // Against a local baseline the largest noise bump in 2·10⁷ points is about 5–7 σ (measured), far from 10.
    expect(r.largest).toBeLessThan(8);
  }, 900_000);
});
