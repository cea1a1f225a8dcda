import { describe, expect, it } from 'vitest';
import { num } from '../../src/ui/format.ts';

// src/ui/format.ts: numbers for tables, four significant digits by default,
// exponent form outside 1e-3 … 1e6, a dash for a missing value.
describe('num', () => {
  it('keeps four significant digits and drops trailing zeros (toPrecision, ECMA-262)', () => {
    expect(num(3.14159265)).toBe('3.142');
    expect(num(12345.678)).toBe('12350');
    expect(num(2.5)).toBe('2.5');
    expect(num(100)).toBe('100');
    expect(num(-0.012345)).toBe('-0.01235');
  });
  it('takes the number of digits asked for', () => {
    expect(num(3.14159265, 2)).toBe('3.1');
    expect(num(3.14159265, 6)).toBe('3.14159');
  });
  it('writes very small and very large magnitudes in exponent form with the same digits', () => {
    expect(num(0.00012346)).toBe('1.235e-4'); // (0.00012345 is stored just below …45 in binary and rounds down)
    expect(num(0.001)).toBe('0.001');
    expect(num(999999)).toBe('1000000'); // rounds to 4 digits below the exponent threshold
    expect(num(1234567)).toBe('1.235e+6');
    expect(num(-2.5e-7, 3)).toBe('-2.50e-7');
  });
  it('zero is 0, not an exponent', () => {
    expect(num(0)).toBe('0');
  });
  it('a missing value is a dash; non-finite values are named, never a made-up number', () => {
    expect(num(null)).toBe('—');
    expect(num(undefined)).toBe('—');
    expect(num(Number.NaN)).toBe('NaN');
    expect(num(Number.POSITIVE_INFINITY)).toBe('Infinity');
  });
  it('what it writes reads back within half a unit of the last digit kept', () => {
    for (const v of [1.23456, 98765.4321, 0.0456789, 7.7e-9, 3.3e12, -42.4242]) {
      const back = Number(num(v));
      expect(Math.abs(back - v) / Math.abs(v)).toBeLessThanOrEqual(5e-4);
    }
  });
});
