import { expect, test } from 'vitest';
import { readFileSync } from 'node:fs';
import { exportTime, TOOL_VERSION } from '../../../src/core/export/version.ts';

test('the version written into exports is the one in package.json', () => {
  const pkg = JSON.parse(readFileSync(new URL('../../../package.json', import.meta.url), 'utf8')) as { version: string };
  expect(TOOL_VERSION).toBe(pkg.version);
});

test('export time is ISO 8601 UTC and an invalid date is refused', () => {
  expect(exportTime(new Date(Date.UTC(2000, 0, 1)))).toBe('2000-01-01T00:00:00.000Z');
  expect(() => exportTime(new Date(NaN))).toThrow(RangeError);
});
