import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { csvCell, csvNumber, numbersLine, writeCsv } from '../../../src/core/io/csv-write.ts';
import type { CsvCellOptions } from '../../../src/core/io/csv-write.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';

const COMMA: CsvCellOptions = { delimiter: ',', decimal: '.' };
const SEMI: CsvCellOptions = { delimiter: ';', decimal: ',' };
const TAB: CsvCellOptions = { delimiter: '\t', decimal: '.' };

/** Read a number cell back as a spreadsheet or our loader would: decimal comma → point, then parseFloat. */
const readBack = (cell: string) => parseFloat(cell.replace(',', '.'));

/** Minimal RFC 4180 line splitter (quoted fields, doubled quotes), for checking what we wrote. */
function splitLine(line: string, delimiter: string): string[] {
  const out: string[] = [];
  let cur = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (quoted) {
      if (c === '"' && line[i + 1] === '"') {
        cur += '"';
        i++;
      } else if (c === '"') quoted = false;
      else cur += c;
    } else if (c === '"') quoted = true;
    else if (c === delimiter) {
      out.push(cur);
      cur = '';
    } else cur += c;
  }
  out.push(cur);
  return out;
}

describe('formula injection (OWASP "CSV Injection" guidance)', () => {
  // OWASP: cells beginning with =, +, -, @, tab (0x09) or carriage return (0x0D) are
  // neutralised by a leading single quote; the cell is then quoted as RFC 4180 requires.
  it.each([
    ['=SUM(A1)', "'=SUM(A1)"],
    ['+1', "'+1"],
    ['-cmd', "'-cmd"],
    ['@x', "'@x"],
    ['\tx', "'\tx"],
  ])('text %j → %j', (text, expected) => {
    expect(csvCell(text, COMMA)).toBe(expected);
  });

  it('carriage return start: neutralised and quoted (it is a line break character)', () => {
    expect(csvCell('\rx', COMMA)).toBe('"\'\rx"');
  });

  it('tab start with a tab delimiter: neutralised, then quoted', () => {
    expect(csvCell('\tx', TAB)).toBe('"\'\tx"');
  });

  it('neutralised text with the delimiter or quotes is quoted, quotes doubled', () => {
    expect(csvCell('=HYPERLINK("http://x","y")', COMMA)).toBe('"\'=HYPERLINK(""http://x"",""y"")"');
    expect(splitLine(csvCell('=1,2', COMMA), ',')).toEqual(["'=1,2"]);
  });

  it('numbers stay numbers: negative and positive values are not prefixed', () => {
    expect(csvCell(-5, COMMA)).toBe('-5');
    expect(csvCell(-0.125, SEMI)).toBe('-0,125');
    expect(csvCell(-1e-7, COMMA)).toBe('-1E-7');
    expect(csvCell(2.5e21, COMMA)).toBe('2.5E+21');
  });

  it('text that merely contains the characters later is left alone', () => {
    expect(csvCell('a=b', COMMA)).toBe('a=b');
    expect(csvCell('peak 2 - shoulder', COMMA)).toBe('peak 2 - shoulder');
  });

  it('comment lines: every piece a spreadsheet would split off is checked too, numbers left alone', () => {
    const out = writeCsv([], { delimiter: ',', decimal: '.', comments: ['file: a.csv,=cmd|x, -3,"@y'], newline: '\n' });
    expect(out).toBe("# file: a.csv,'=cmd|x, -3,\"'@y\n");
    const semi = writeCsv([], { delimiter: ';', decimal: ',', comments: ['recipe;+1+2;-1,5'], newline: '\n' });
    expect(semi).toBe("# recipe;'+1+2;-1,5\n");
  });
});

describe('numbers round-trip', () => {
  it('1000 seeded random doubles of every magnitude: write then parseFloat is exact, for each delimiter/decimal', () => {
    const rng = makeRng(2026);
    const values: number[] = [];
    const view = new DataView(new ArrayBuffer(8));
    while (values.length < 1000) {
      // Random bit patterns cover subnormals and the full exponent range; non-finite ones are drawn again.
      view.setUint32(0, Math.floor(rng.uniform() * 2 ** 32));
      view.setUint32(4, Math.floor(rng.uniform() * 2 ** 32));
      const v = view.getFloat64(0);
      if (Number.isFinite(v)) values.push(v);
    }
    values.push(0, -0, Number.MIN_VALUE, -Number.MAX_VALUE, 0.1 + 0.2, 1 / 3);
    for (const opts of [COMMA, SEMI, TAB, { delimiter: ';', decimal: '.' } as CsvCellOptions]) {
      const text = writeCsv(values.map((v, i) => [i, v]), { ...opts, comments: ['random doubles'] });
      const lines = text.split('\r\n').filter((l) => l !== '' && !l.startsWith('#'));
      expect(lines).toHaveLength(values.length);
      lines.forEach((line, i) => {
        const cells = line.split(opts.delimiter);
        expect(cells).toHaveLength(2);
        expect(Object.is(readBack(cells[1]), values[i])).toBe(true);
      });
    }
  });

  it('property (fast-check, fixed seed): any finite double survives write → parse', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.constantFrom(COMMA, SEMI, TAB), (v, opts) => {
        const cell = csvCell(v, opts);
        return Object.is(readBack(cell), v);
      }),
      { seed: 20260101, numRuns: 2000 },
    );
  });

  it('NaN and ±Infinity become empty cells', () => {
    expect(csvNumber(NaN)).toBe('');
    expect(csvCell(Infinity, COMMA)).toBe('');
    expect(csvCell(-Infinity, SEMI)).toBe('');
  });
});

describe('writeCsv', () => {
  it('comment header lines prefixed "# ", line breaks in a comment start new comment lines', () => {
    const out = writeCsv([['x (min)', 'y (mAU)'], [1.5, -2]], { delimiter: ';', decimal: ',', comments: ['file: run.csv', 'two\nlines'] });
    expect(out).toBe(`# file: run.csv\r\n# two\r\n# lines\r\n# ${numbersLine(undefined)}\r\nx (min);y (mAU)\r\n1,5;-2\r\n`);
  });

  it('tab delimiter with decimal point; quoting of delimiter, quote, newline and a leading #', () => {
    const out = writeCsv([['a\tb', 'say "hi"', 'two\nlines', '#not a comment', 'plain']], { ...TAB, newline: '\n' });
    expect(out).toBe('"a\tb"\t"say ""hi"""\t"two\nlines"\t"#not a comment"\tplain\n');
  });

  it('a comma in text is quoted only when the comma is the delimiter', () => {
    expect(csvCell('a,b', COMMA)).toBe('"a,b"');
    expect(csvCell('a,b', SEMI)).toBe('a,b');
    expect(csvCell('a;b', SEMI)).toBe('"a;b"');
  });

  it('refuses a decimal comma with a comma delimiter, and unknown options', () => {
    expect(() => writeCsv([[1]], { delimiter: ',', decimal: ',' })).toThrow(/decimal comma cannot be used with a comma delimiter/);
    expect(() => csvCell(1, { delimiter: ',', decimal: ',' })).toThrow(RangeError);
    expect(() => writeCsv([[1]], { delimiter: '|' as ',', decimal: '.' })).toThrow(/delimiter/);
  });

  it('does not change the rows it is given', () => {
    const rows: (string | number)[][] = [['=x', -1], ['a', 2]];
    const copy = JSON.parse(JSON.stringify(rows));
    writeCsv(rows, { delimiter: ',', decimal: '.' });
    expect(rows).toEqual(copy);
  });

  it('what we write splits back into the same cells (RFC 4180), text neutralised only at its start', () => {
    const row = ['name, with comma', 'quote "q"', '-cmd', -3.5, 'x'];
    const line = writeCsv([row], { delimiter: ',', decimal: '.', newline: '\n' }).replace(/\n$/, '');
    expect(splitLine(line, ',')).toEqual(['name, with comma', 'quote "q"', "'-cmd", '-3.5', 'x']);
  });
});
