// The staged result (src/core/analysis/result.ts): the order stages land in and
// when σ and S/N are provisional (definitions in the module).
import { describe, expect, it } from 'vitest';
import { STAGES, sigmaProvisional, snrProvisional } from '../../../src/core/analysis/result.ts';
import type { NoiseReport } from '../../../src/core/measure/noise-report.ts';

const noise = (provisional: boolean) => ({ provisional }) as NoiseReport;

describe('STAGES', () => {
  it('processed, residual, noise, peaks, bumps, alternative, loss: noise before peaks (peaks need σ), loss last', () => {
    expect([...STAGES]).toEqual(['processed', 'residual', 'noise', 'peaks', 'bumps', 'alternative', 'loss']);
  });
});

describe('provisional σ and S/N', () => {
  it('σ is provisional while the noise stage is pending or the report says so', () => {
    expect(sigmaProvisional(['noise', 'peaks'], noise(false))).toBe(true);
    expect(sigmaProvisional(['peaks'], noise(true))).toBe(true);
    expect(sigmaProvisional(['peaks'], noise(false))).toBe(false);
    expect(sigmaProvisional([], null)).toBe(false);
  });

  it('S/N is provisional while σ is, or while the peak table is pending', () => {
    expect(snrProvisional(['peaks'], noise(false))).toBe(true);
    expect(snrProvisional(['bumps', 'loss'], noise(false))).toBe(false);
    expect(snrProvisional(['bumps'], noise(true))).toBe(true);
    expect(snrProvisional(['noise'], null)).toBe(true);
  });
});
