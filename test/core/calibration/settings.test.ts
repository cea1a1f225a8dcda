/**
 * Calibration settings (src/core/calibration/settings.ts): versioned JSON form,
 * per-peak changes, checks naming what is wrong. Moved from
 * standards-settings.test.ts.
 */
import { describe, expect, it } from 'vitest';
import {
  calibrationSettingsToJson, defaultCalibrationSettings, parseCalibrationSettings, settingsForPeak, validateCalibrationSettings,
} from '../../../src/core/calibration/settings.ts';

describe('calibration settings', () => {
  it('defaults: area, by test, with intercept, unweighted, σ from residual SD, 95 %, α 0.05', () => {
    const d = defaultCalibrationSettings();
    expect([d.response, d.model, d.throughOrigin, d.weighting, d.limitSigma, d.confidence, d.alpha, d.internalStandard]).toEqual(['area', 'auto', false, 'none', 'residual', 0.95, 0.05, null]);
    expect(validateCalibrationSettings(d)).toEqual([]);
  });

  it('per-peak changes override the defaults for that peak only', () => {
    const s = { ...defaultCalibrationSettings(), perPeak: [{ name: 'B', settings: { weighting: '1/x2' as const, model: 'line' as const } }] };
    expect(settingsForPeak(s, 'B')).toMatchObject({ weighting: '1/x2', model: 'line', response: 'area' });
    expect(settingsForPeak(s, 'A').weighting).toBe('none');
  });

  it('round-trips through JSON; missing members take defaults; bad values and newer versions are refused', () => {
    const s = { ...defaultCalibrationSettings(), internalStandard: 'IS', perPeak: [{ name: 'B', settings: { weighting: '1/x' as const } }] };
    expect(parseCalibrationSettings(JSON.parse(JSON.stringify(calibrationSettingsToJson(s))))).toEqual({ ok: true, settings: s });
    expect(parseCalibrationSettings({ format: 'tracewright-calibration-settings', version: 1 })).toEqual({ ok: true, settings: defaultCalibrationSettings() });
    const bad = parseCalibrationSettings({ format: 'tracewright-calibration-settings', version: 1, weighting: '1/y', confidence: 95, colour: 1, perPeak: [{ name: 'A', settings: { model: 'cubic' } }] });
    expect(bad).toEqual({ ok: false, problems: ['Unknown setting "colour".'] });
    const bad2 = parseCalibrationSettings({ format: 'tracewright-calibration-settings', version: 1, weighting: '1/y', confidence: 95, perPeak: [{ name: 'A', settings: { model: 'cubic' } }] });
    expect(bad2).toEqual({
      ok: false,
      problems: [
        '"weighting" must be one of none, 1/x, 1/x2.',
        '"confidence" must be a level between 0.5 and 0.999 (0.95 for 95 %); got 95.',
        'Settings for "A" (1): "model" must be one of auto, line, quadratic.',
      ],
    });
    expect(parseCalibrationSettings({ format: 'tracewright-calibration-settings', version: 9 })).toEqual({ ok: false, problems: [expect.stringMatching(/newer version/)] });
  });

  it('checks names against the named peaks', () => {
    const s = { ...defaultCalibrationSettings(), internalStandard: 'IS', perPeak: [{ name: 'Z', settings: {} }] };
    expect(validateCalibrationSettings(s, ['A', 'B'])).toEqual(['Settings for "Z" (1): "Z" is not a named peak.', 'The internal standard "IS" is not a named peak.']);
  });
});
