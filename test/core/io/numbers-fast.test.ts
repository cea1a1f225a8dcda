import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseNumber } from '../../../src/core/io/numbers.ts';

// The exact fast path (Clinger 1990) must give what JavaScript's own Number() gives (ECMA-262: correctly
// rounded) for every decimal text it accepts; the reference here is Number() on the same text.
const decimalText = fc.record({
  sign: fc.constantFrom('', '-', '+'),
  int: fc.stringMatching(/^[0-9]{0,17}$/),
  frac: fc.stringMatching(/^[0-9]{0,17}$/),
  exp: fc.option(fc.integer({ min: -40, max: 40 }), { nil: undefined }),
}).filter((r) => r.int.length + r.frac.length > 0);

describe('parseNumber fast path', () => {
  it('equals Number() bit for bit on random decimal texts (point and comma), 2000 cases', () => {
    fc.assert(fc.property(decimalText, (r) => {
      const body = `${r.int}${r.frac ? `.${r.frac}` : ''}${r.exp === undefined ? '' : `e${r.exp}`}`;
      const text = `${r.sign}${body}`;
      const want = Number(text);
      const got = parseNumber(text, '.');
      const gotComma = parseNumber(text.replace('.', ','), ',');
      if (!Number.isFinite(want)) return Number.isNaN(got);
      return Object.is(got, want) && Object.is(gotComma, want);
    }), { seed: 20261202, numRuns: 2000 });
  });

  it('handles the edges of the fast path exactly', () => {
    for (const t of ['9007199254740993', '0.1', '1e22', '1e23', '123456789012345e-22', '123456789012345e-23', '-0.0', '4.35', '0.000001', '999999999999999', '1234567890123456']) {
      expect(Object.is(parseNumber(t), Number(t))).toBe(true);
    }
  });
});
