import { describe, expect, it } from 'vitest';
import { stepFigureText } from '../../src/ui/step-figures.ts';

// src/ui/step-figures.ts: a step's figures in plain words with units.
describe('stepFigureText', () => {
  it('words a known figure and keeps four significant digits', () => {
    // 1/√3 = 0.57735…: white-noise SD gain of a 3-point moving average (from the definition: SD falls by √n).
    expect(stepFigureText('noiseGain', 1 / Math.sqrt(3), 'mAU')).toBe('white noise kept (SD out ÷ SD in) 0.5774');
    expect(stepFigureText('n', 8, 'mAU')).toBe('traces averaged 8');
  });
  it('adds the trace’s y unit only to figures measured in y', () => {
    expect(stepFigureText('noiseBefore', 0.012345, 'mAU')).toBe('noise before (from point-to-point differences) 0.01235 mAU');
    expect(stepFigureText('noiseAfter', 2, '')).toBe('noise after 2 y-units');
    expect(stepFigureText('pointsIn', 1201, 'mAU')).toBe('points in 1201');
  });
  it('a figure it does not know is shown with its code name split into words, never hidden', () => {
    expect(stepFigureText('driftPerMinute', 0.5, 'mAU')).toBe('drift per minute 0.5');
    expect(stepFigureText('peakCount2Kept', 3, 'mAU')).toBe('peak count2 kept 3');
  });
  it('a non-finite figure is named as such', () => {
    expect(stepFigureText('noiseGain', Number.NaN, 'mAU')).toBe('white noise kept (SD out ÷ SD in) NaN');
  });
});
