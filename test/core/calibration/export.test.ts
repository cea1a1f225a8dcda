/**
 * The calibration export object (src/core/calibration/export.ts) from one
 * calibration of invented standards (wiring-fixture.ts): plain JSON that parses
 * back to the same numbers, not-finite figures as null, the caution and the
 * methods named. (calibrate.test.ts checks the same on its own calibration.)
 */
import { describe, expect, it } from 'vitest';
import { CALIBRATION_EXPORT_FORMAT, CALIBRATION_EXPORT_VERSION, MODEL_CHOICE_RULE, calibrationExport, calibrationExportJson } from '../../../src/core/calibration/export.ts';
import { CAUTION } from '../../../src/core/export/version.ts';
import { exp, samples, set } from './wiring-fixture.ts';

describe('calibrationExport', () => {
  it('parses back to the same object; no NaN or Infinity in the text', () => {
    const text = calibrationExportJson(exp);
    expect(text.endsWith('\n')).toBe(true);
    expect(JSON.parse(text)).toEqual(JSON.parse(JSON.stringify(exp)));
    expect(text).not.toMatch(/NaN|Infinity/);
  });

  it('names its format, version, time, caution and the model-choice rule', () => {
    expect(exp.format).toBe(CALIBRATION_EXPORT_FORMAT);
    expect(exp.version).toBe(CALIBRATION_EXPORT_VERSION);
    expect(exp.caution).toBe(CAUTION);
    expect(exp.modelChoiceRule).toBe(MODEL_CHOICE_RULE);
    expect(MODEL_CHOICE_RULE).toMatch(/Never R²/);
    expect(calibrationExport(set, samples, '2027-01-01T00:00:00.000Z')).toMatchObject({ format: CALIBRATION_EXPORT_FORMAT });
  });

  it('carries every standard of both named peaks and the sample amounts with their intervals', () => {
    expect(exp.calibrations.map((c) => c.name)).toEqual(['A', 'B']);
    for (const c of exp.calibrations) expect(c.standards).toHaveLength(6);
    const a = exp.samples[0].amounts.find((v) => v.name === 'A')!;
    expect(a.interval!.low).toBeLessThan(a.amount as number);
    expect(a.interval!.high).toBeGreaterThan(a.amount as number);
    // The fitted line through A's standards (3·amount + 0.1 with scatter ≤ 0.02) reads 3·2.5 + 0.1 back as about 2.5.
    expect(Math.abs((a.amount as number) - 2.5)).toBeLessThan(0.05);
  });

  it('a figure that is not finite becomes null, never NaN in JSON', () => {
    const broken = { ...set, calibrations: set.calibrations.map((c) => ({ ...c, fit: c.fit && { ...c.fit, residualSd: NaN } })) };
    const e = calibrationExport(broken as typeof set, samples, '2027-01-01T00:00:00.000Z');
    expect(e.calibrations[0].residualSd).toBeNull();
    expect(calibrationExportJson(e)).not.toMatch(/NaN/);
  });
});
