// The raw reference (src/core/analysis/stages/reference.ts): the raw trace
// measured with the user's settings, hand decisions left out, worked out once
// per trace and settings (module contract).
import { describe, expect, it } from 'vitest';
import { rawReferenceStepwise } from '../../../../src/core/analysis/stages/reference.ts';
import { measurePeaks } from '../../../../src/core/analysis/stages/measure.ts';
import { AnalysisMemo } from '../../../../src/core/analysis/memo.ts';
import { drain } from '../../../../src/core/analysis/pause.ts';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, type AnalyseRequest } from '../../../../src/core/analysis/request.ts';
import { emptyRecipe } from '../../../../src/core/method.ts';
import { synthetic } from '../fixture.ts';

const t = synthetic(4);

describe('rawReferenceStepwise', () => {
  it('equals measuring the raw trace directly, ignores hand decisions and measureOn, and is kept in the memo', () => {
    const memo = new AnalysisMemo();
    const request: AnalyseRequest = {
      sampleId: t.id, scanIds: [], recipe: emptyRecipe(),
      peaks: { ...DEFAULT_PEAK_SETTINGS, measureOn: 'raw' },
      decisions: { added: [{ x: 3 }], removed: [7], bounds: [] } as never,
    };
    const ref = drain(rawReferenceStepwise(request, t, {}, memo));
    const direct = measurePeaks(t, t, DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, {}, null);
    expect(ref.peaks.map((p) => [p.x, p.snr])).toEqual(direct.peaks.map((p) => [p.x, p.snr]));
    expect(ref.peaks.some((p) => p.origin === 'added-by-user' || p.removedByUser)).toBe(false);
    // Same trace and settings: the same object from the memo.
    expect(drain(rawReferenceStepwise(request, t, {}, memo))).toBe(ref);
    // Other settings: measured again.
    expect(drain(rawReferenceStepwise({ ...request, peaks: { ...DEFAULT_PEAK_SETTINGS, minSnr: 5 } }, t, {}, memo))).not.toBe(ref);
  });
});
