import { describe, expect, it } from 'vitest';
import { noiseOnly } from './noise-only.ts';

describe('noise-only traces of 10⁶ points with the defaults (2·10⁸ noise points in all)', () => {
  it('200 realisations: mean count at S/N ≥ 3 within ±15 % of the shown expected count; not one row quantifiable', () => {
    const r = noiseOnly(1_000_000, 200, 5000);
    expect(Math.abs(r.mean / r.shown - 1)).toBeLessThan(0.15);
    expect(r.quantifiable).toBe(0);
    expect(r.largest).toBeLessThan(7);
  }, 1_800_000);
});
