import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseNumber } from '../../../src/core/io/numbers.ts';

describe('parseNumber', () => {
  it('reads the forms the grammar in numbers.ts allows', () => {
    // Expected values: the decimal meaning of each literal (exact or nearest double, as JavaScript's Number() rounds).
    expect(parseNumber('12')).toBe(12);
    expect(parseNumber('-0.5')).toBe(-0.5);
    expect(parseNumber('+3.25')).toBe(3.25);
    expect(parseNumber('.5')).toBe(0.5);
    expect(parseNumber('5.')).toBe(5);
    expect(parseNumber('1e3')).toBe(1000);
    expect(parseNumber('2.5E-2')).toBe(0.025);
    expect(parseNumber('-1.5e+2')).toBe(-150);
    expect(parseNumber('  7.5\t')).toBe(7.5);
    expect(parseNumber('"4.25"')).toBe(4.25);
    expect(parseNumber(' " 4.25 " ')).toBe(4.25);
    expect(parseNumber('1,5', ',')).toBe(1.5);
    expect(parseNumber('-0,125e1', ',')).toBe(-1.25);
    expect(parseNumber('"2,75"', ',')).toBe(2.75);
  });

  it('refuses everything else, so the row is skipped and listed', () => {
    for (const bad of ['', '   ', '""', 'NaN', 'nan', 'Inf', 'Infinity', '-Infinity', 'abc', '1a', 'a1', '-', '+', '.', 'e5', '1e', '1e+',
      '0x1A', '1_000', '1 000', '1..2', '1.2.3', '--1', '1e999', '"1.5', '1.5"', 'n/a', '---']) {
      expect(parseNumber(bad), JSON.stringify(bad)).toBeNaN();
    }
  });

  it('does not guess thousands separators or mix decimal signs', () => {
    expect(parseNumber('1,234.5')).toBeNaN();
    expect(parseNumber('1.234,5', ',')).toBeNaN();
    expect(parseNumber('1,5')).toBeNaN(); // decimal point file: a comma is not part of a number
    expect(parseNumber('1.5', ',')).toBeNaN(); // decimal comma file: a point is not part of a number
  });

  it('round-trips every finite double written by JavaScript, with either decimal sign', () => {
    // ECMA-262 Number::toString gives the shortest string that reads back to the same double; the grammar accepts all of them.
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (d) => {
        const text = String(d);
        const expected = Object.is(d, -0) ? 0 : d; // String(-0) is "0"
        expect(parseNumber(text)).toBe(expected);
        expect(parseNumber(text.replace('.', ','), ',')).toBe(expected);
      }),
      { seed: 42, numRuns: 2000 },
    );
  });
});
