/**
 * The shared checks of the calibration's versioned JSON sub-objects
 * (src/core/calibration/json-form.ts), against the module's contract.
 */
import { describe, expect, it } from 'vitest';
import { checkFormatAndVersion, isPlainObject } from '../../../src/core/calibration/json-form.ts';

describe('isPlainObject', () => {
  it('objects yes; null, arrays, numbers and strings no', () => {
    expect(isPlainObject({})).toBe(true);
    expect([null, [], 1, 'x', undefined].map(isPlainObject)).toEqual([false, false, false, false, false]);
  });
});

describe('checkFormatAndVersion', () => {
  it('accepts the right format and a version it can read', () => {
    expect(checkFormatAndVersion({ format: 'f', version: 1 }, 'f', 2, 'table')).toEqual({ ok: true, value: { format: 'f', version: 1 }, problems: [] });
  });

  it('lists a wrong format and a bad version as problems, to be reported with the others', () => {
    const r = checkFormatAndVersion({ format: 'g', version: 1.5 }, 'f', 2, 'table');
    expect(r).toEqual({ ok: true, value: { format: 'g', version: 1.5 }, problems: ['"format" must be "f".', '"version" must be a whole number.'] });
  });

  it('a newer version stops everything with one sentence; a non-object is refused', () => {
    expect(checkFormatAndVersion({ format: 'g', version: 3 }, 'f', 2, 'named-peak table')).toEqual({
      ok: false,
      problems: ['The named-peak table was written by a newer version of Tracewright (version 3; this one reads up to 2). Open it with a newer version.'],
    });
    expect(checkFormatAndVersion([1], 'f', 2, 'table')).toEqual({ ok: false, problems: ['The table is not a JSON object.'] });
  });
});
