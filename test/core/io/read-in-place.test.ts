/**
 * Data rows read in place (issue 16, the 0.5 s parse target): the loader no
 * longer cuts every row into strings; it hands each row's cells to the number
 * reader as offsets into the decoded text, and cuts only the rows that need
 * more than plain numbers. These checks hold the in-place reading to the
 * reading it replaced ("lines": every row cut and split, kept for this), and
 * the cell reader to the string reader, which the numbers tests hold to
 * ECMA-262's Number() (numbers-fast.test.ts).
 *
 * The reference for the long-line check is a plain split of the text on the
 * three line ends, written here.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseDelimited } from '../../../src/core/io/delimited.ts';
import { parseNumber, parseNumberIn } from '../../../src/core/io/numbers.ts';
import { overlongLine } from '../../../src/core/io/sniff.ts';
import type { LoadResult } from '../../../src/core/io/types.ts';

const enc = (s: string) => new TextEncoder().encode(s);

/** Cells a data row may hold: plain numbers and every kind of cell the general path handles. */
function cell(decimal: '.' | ','): fc.Arbitrary<string> {
  const number = fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 }).map((v) => String(v).replace('.', decimal));
  return fc.oneof(
    { weight: 8, arbitrary: number },
    { weight: 2, arbitrary: fc.integer({ min: -99999, max: 99999 }).map(String) },
    {
      weight: 4,
      arbitrary: fc.constantFrom(
        '', ' ', 'abc', 'NaN', '-inf', '1e5', '2.5E-3', ' 1.5 ', '\t7', '"2.5"', '" 3 "', '+3', '-0', '.5', '5.', '-.25',
        '12345678901234567.5', '0.1234567890123456789', '1,234.5', '1.234,5', '1.234', '1,234', '12 mV', '0x1F', '1_000', '1e400', '--1', '1e', 'e5', '1.2.3',
      ).map((c) => (decimal === ',' ? c.replace(/[.,]/g, (s) => (s === '.' ? ',' : '.')) : c)),
    },
  );
}

const ENDS = ['\n', '\r\n', '\r'] as const;

/** A file: a header, 8 plain rows (so the table is found), then rows of any cells, blank lines and odd widths. */
function messyFile(delimiter: ',' | ';' | '\t', decimal: '.' | ','): fc.Arbitrary<string> {
  const plain = fc.tuple(fc.integer({ min: 0, max: 1000 }), fc.integer({ min: -500, max: 500 }), fc.integer({ min: 0, max: 9 }))
    .map(([a, b, c]) => [`${a}${decimal}25`, `${b}${decimal}5`, String(c)]);
  const row = fc.oneof(
    { weight: 6, arbitrary: fc.array(cell(decimal), { minLength: 3, maxLength: 3 }) },
    { weight: 1, arbitrary: fc.array(cell(decimal), { minLength: 1, maxLength: 5 }) },
    { weight: 1, arbitrary: fc.constantFrom([''], ['  '], ['\t '], [' ', ' ', ' ']) },
  );
  return fc.tuple(
    fc.array(plain, { minLength: 8, maxLength: 8 }),
    fc.array(fc.tuple(row, fc.constantFrom(...ENDS)), { minLength: 0, maxLength: 40 }),
    fc.constantFrom(...ENDS),
    fc.boolean(),
  ).map(([good, rest, end, last]) => {
    let text = ['time (min)', 'signal (mV)', 'channel'].join(delimiter) + end;
    for (const r of good) text += r.join(delimiter) + end;
    rest.forEach(([cells, e], i) => { text += cells.join(delimiter) + (i < rest.length - 1 || last ? e : ''); });
    return text;
  });
}

/** The result without the traces' ids (a session counter, new on every load). */
function withoutIds(r: LoadResult): unknown {
  return r.ok ? { ...r, traces: r.traces.map((t) => ({ ...t, id: '' })) } : r;
}

const DIALECTS = [
  { delimiter: ',', decimal: '.' },
  { delimiter: ';', decimal: ',' },
  { delimiter: ';', decimal: '.' },
  { delimiter: '\t', decimal: '.' },
  { delimiter: '\t', decimal: ',' },
] as const;

describe('rows read in place', () => {
  for (const d of DIALECTS) {
    it(`give the same load result as rows cut into strings ("${d.delimiter === '\t' ? 'tab' : d.delimiter}", decimal "${d.decimal}"): traces, skipped rows, notices and problems`, () => {
      fc.assert(
        fc.property(messyFile(d.delimiter, d.decimal), fc.constantFrom(-1, 0, 1), (text, xColumn) => {
          const bytes = enc(text);
          const options = { xColumn };
          const inPlace = parseDelimited(bytes, 'messy.csv', options, 'fast');
          const cut = parseDelimited(bytes, 'messy.csv', options, 'lines');
          expect(withoutIds(inPlace)).toEqual(withoutIds(cut));
        }),
        { seed: 20261204, numRuns: 300 },
      );
    });
  }

  it('skip a row with a text cell among plain rows and name it by its line', () => {
    const text = 'time (min),signal (mV)\n' + Array.from({ length: 10 }, (_, i) => `${i}.5,${i * 2}.25`).join('\n') + '\n11.5,n/a\n12.5,3.5\n';
    const r = parseDelimited(enc(text), 'one-bad.csv', {}, 'fast');
    if (!r.ok) throw new Error(r.error.problem);
    expect(Array.from(r.traces[0].x)).toEqual([0.5, 1.5, 2.5, 3.5, 4.5, 5.5, 6.5, 7.5, 8.5, 9.5, 12.5]);
    expect(r.report.skipped).toHaveLength(1);
    expect(r.report.skipped[0]).toMatchObject({ line: 12, text: '11.5,n/a' });
  });
});

describe('a cell read in place', () => {
  it('equals the same cell read as a string, bit for bit, wherever it sits in a longer text', () => {
    const piece = fc.oneof(
      fc.double({ noNaN: true }).map(String),
      fc.stringMatching(/^[ \t"+\-0-9.,eE]{0,14}$/),
    );
    fc.assert(
      fc.property(fc.string({ maxLength: 6 }), piece, fc.string({ maxLength: 6 }), fc.constantFrom('.', ','), (before, c, after, decimal) => {
        const text = before + c + after;
        const got = parseNumberIn(text, before.length, before.length + c.length, decimal);
        return Object.is(got, parseNumber(c, decimal));
      }),
      { seed: 4, numRuns: 3000 },
    );
  });
});

/** The first line longer than `limit` by a plain split of the text (ASCII here, so characters are bytes). */
function firstLongLine(text: string, limit: number): { line: number; start: number; length: number } | null {
  if (text.length <= limit) return null;
  const re = /\r\n|\r|\n/g;
  let start = 0, line = 1;
  for (;;) {
    const m = re.exec(text);
    const end = m ? m.index : text.length;
    if (end - start > limit) return { line, start, length: end - start };
    if (!m) return null;
    start = m.index + m[0].length;
    line++;
    if (start >= text.length) return null;
  }
}

describe('the longest line', () => {
  it('is found (or not) as a plain split of the lines finds it, with its line number, for any line ends and limits', () => {
    const line = fc.tuple(fc.integer({ min: 0, max: 30 }), fc.constantFrom('\n', '\r\n', '\r'));
    fc.assert(
      fc.property(fc.array(line, { maxLength: 40 }), fc.integer({ min: 1, max: 25 }), fc.boolean(), (lines, limit, ended) => {
        let text = '';
        lines.forEach(([n, e], i) => { text += 'a'.repeat(n) + (i < lines.length - 1 || ended ? e : ''); });
        expect(overlongLine(enc(text), limit)).toEqual(firstLongLine(text, limit));
      }),
      { seed: 8, numRuns: 3000 },
    );
  });
});
