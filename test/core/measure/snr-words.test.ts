// The one wording of S/N definitions and flags (src/core/measure/snr-words.ts).
// Sources: ICH Q2(R1) (2005) §6 for H/σ and the limits 3 and 10; USP <621> and
// Ph. Eur. 2.2.46 for 2H/h with h the range of the noise.
import { describe, expect, it } from 'vitest';
import { FLAG_TEXT, SNR_DEFINITION_WORDS, SNR_NAME, SNR_SHORT } from '../../../src/core/measure/snr-words.ts';
import { snrFlag } from '../../../src/core/measure/peak-snr.ts';

const limits = { detection: 3, quantitation: 10 };

describe('flag words for S/N against the detection (3) and quantitation (10) limits', () => {
  it('S/N 2.9 reads below the detection limit, 3 and 9.9 detected but not quantifiable, 10 quantifiable', () => {
    expect(FLAG_TEXT[snrFlag(2.9, limits)]).toBe('below detection limit');
    expect(FLAG_TEXT[snrFlag(3, limits)]).toBe('detected, not quantifiable');
    expect(FLAG_TEXT[snrFlag(9.9, limits)]).toBe('detected, not quantifiable');
    expect(FLAG_TEXT[snrFlag(10, limits)]).toBe('quantifiable');
    expect(FLAG_TEXT[snrFlag(null, limits)]).toBe('S/N not measured');
  });

  it('every flag has different words', () => {
    const words = Object.values(FLAG_TEXT);
    expect(new Set(words).size).toBe(words.length);
    expect(Object.keys(FLAG_TEXT).sort()).toEqual(['below-detection', 'detectable', 'not-measured', 'quantifiable']);
  });
});

describe('definition words', () => {
  it('H/σ names the standard deviation of the noise; 2H/h names the range (largest minus smallest) and the pharmacopoeias', () => {
    expect(SNR_SHORT).toEqual({ rms: 'H/σ', pharmacopoeial: '2H/h', region: 'mean/SD' });
    expect(SNR_DEFINITION_WORDS.rms).toMatch(/^S\/N = H\/σ: .*standard deviation σ of the noise/);
    expect(SNR_DEFINITION_WORDS.pharmacopoeial).toMatch(/^S\/N = 2H\/h: twice the peak height .*range h \(largest minus smallest value\)/);
    expect(SNR_DEFINITION_WORDS.pharmacopoeial).toMatch(/pharmacopoeial/);
    expect(SNR_DEFINITION_WORDS.region).toMatch(/mean\/SD/);
  });

  it('each short name is the start of its long name, so page and exports cannot drift apart', () => {
    for (const k of ['rms', 'pharmacopoeial', 'region'] as const) {
      expect(SNR_NAME[k].startsWith(SNR_SHORT[k])).toBe(true);
      expect(SNR_DEFINITION_WORDS[k]).toContain(SNR_SHORT[k]);
    }
  });
});
