// peak-types.ts is types apart from one number: the σ floor as a share of the
// detection signal's span, which rules needing σ take when σ is 0.
import { describe, expect, it } from 'vitest';
import { SIGMA_FLOOR_OF_SPAN } from '../../../src/core/measure/peak-types.ts';
import { noiseModel } from '../../../src/core/measure/peak-snr.ts';
import { defaultPeakOptions } from '../../../src/core/measure/peak-table.ts';

describe('SIGMA_FLOOR_OF_SPAN', () => {
  it('is a small positive share of the span (the module’s choice: at most 1e-6), so it only stands in where σ is 0', () => {
    expect(SIGMA_FLOOR_OF_SPAN).toBeGreaterThan(0);
    expect(SIGMA_FLOOR_OF_SPAN).toBeLessThanOrEqual(1e-6);
  });

  it('is the floor of the rule σ on a noiseless trace, and leaves a real σ alone', () => {
    const s = Float64Array.from({ length: 20 }, (_, i) => 3 * i);
    expect(noiseModel(s, defaultPeakOptions(0)).ruleSigmaAt(4)).toBe(SIGMA_FLOOR_OF_SPAN * 57);
    expect(noiseModel(s, defaultPeakOptions(0.01)).ruleSigmaAt(4)).toBe(0.01);
  });
});
