// What one analysis is asked (src/core/analysis/request.ts). Sources: the
// detection (3) and quantitation (10) limits of ICH Q2(R1) (2005) §6; the
// pharmacopoeial noise window of at least 5 half-height widths (Ph. Eur. 2.2.46,
// current text; from memory); "plain data that crosses to the worker" checked
// with structuredClone, the algorithm postMessage uses.
import { describe, expect, it } from 'vitest';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, MAX_ALTERNATIVES, type AnalyseRequest } from '../../../src/core/analysis/request.ts';
import { DEFAULT_NOISE_SETTINGS as FROM_NOISE_REPORT } from '../../../src/core/measure/noise-report.ts';
import { recipeOf } from './fixture.ts';

describe('defaults', () => {
  it('peak settings use the ICH limits 3 and 10, H/σ, a 5-width pharmacopoeial window, and measure on the processed trace', () => {
    expect(DEFAULT_PEAK_SETTINGS.detectionLimit).toBe(3);
    expect(DEFAULT_PEAK_SETTINGS.quantitationLimit).toBe(10);
    expect(DEFAULT_PEAK_SETTINGS.snrDefinition).toBe('rms');
    expect(DEFAULT_PEAK_SETTINGS.pharmacopoeialMultiplier).toBe(5);
    expect(DEFAULT_PEAK_SETTINGS.measureOn).toBe('processed');
    expect(DEFAULT_PEAK_SETTINGS.negative).toBe(false);
  });

  it('the noise defaults are the noise report\'s own (one home), automatic and without a quiet range', () => {
    expect(DEFAULT_NOISE_SETTINGS).toBe(FROM_NOISE_REPORT);
    expect(DEFAULT_NOISE_SETTINGS).toEqual({ method: 'auto', quietRange: null });
    expect(MAX_ALTERNATIVES).toBeGreaterThanOrEqual(1);
  });
});

describe('a request is plain data', () => {
  it('survives structuredClone (what postMessage does) unchanged', () => {
    const request: AnalyseRequest = {
      sampleId: 's', blankId: 'b', scanIds: ['a', 'c'], recipe: recipeOf(['moving-average', { window: 7 }]),
      noise: { method: 'rms', quietRange: [1, 2] }, peaks: { ...DEFAULT_PEAK_SETTINGS, excluded: [[3, 4]] },
      alternatives: [{ id: 'x', label: '7-point average', recipe: recipeOf(['moving-average', { window: 7 }]) }],
    };
    expect(structuredClone(request)).toEqual(request);
  });
});
