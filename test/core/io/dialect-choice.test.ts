/**
 * Fixing the delimiter or decimal sign, and the question the loader raises
 * when the numbers read two ways and nothing in the file settles it. The
 * expected numbers are the file's text read by hand.
 */
import { describe, expect, test } from 'vitest';
import { loadFile } from '../../../src/core/io/load.ts';

const bytes = (s: string) => new TextEncoder().encode(s);
const AMBIGUOUS = '0,1\n1,4\n2,9\n3,16\n4,25\n5,36\n';

describe('delimiter and decimal sign chosen by the caller', () => {
  test('"0,1" lines without a header read two ways: the report asks, the page is told', () => {
    const r = loadFile(bytes(AMBIGUOUS), 'squares.csv');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.report.questions).toEqual([{ kind: 'number-format', line: 1, message: 'Line 1 reads as comma, decimal point (2 columns: 0 | 1) or as semicolon, decimal comma (1 column: 0.1), and nothing in the file tells which.' }]);
    expect(r.report.notices).toContain(`${r.report.questions![0].message} It was read the first way; check the plot.`);
    expect(Array.from(r.traces[0].y)).toEqual([1, 4, 9, 16, 25, 36]);
  });

  test('a header naming two columns settles it', () => {
    const r = loadFile(bytes(`Time,Counts\n${AMBIGUOUS}`), 'squares.csv');
    expect(r.ok && r.report.questions).toBeUndefined();
  });

  test('--decimal comma: one column of decimal-comma numbers, no question left', () => {
    const r = loadFile(bytes(AMBIGUOUS), 'squares.csv', { dialect: { decimal: ',' } });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.report.questions).toBeUndefined();
    expect(Array.from(r.traces[0].y)).toEqual([0.1, 1.4, 2.9, 3.16, 4.25, 5.36]);
    expect(r.report.notices[0]).toMatch(/^Read as semicolon, decimal comma \(UTF-8\).*among the readings allowed by the choice given; the table starts at line 1\.$/);
  });

  test('--delimiter comma: two whole-number columns, no question left', () => {
    const r = loadFile(bytes(AMBIGUOUS), 'squares.csv', { dialect: { delimiter: ',' } });
    expect(r.ok && !r.report.questions && Array.from(r.traces[0].x)).toEqual([0, 1, 2, 3, 4, 5]);
  });

  test('quoted decimal-comma numbers in a comma file still read with --decimal comma', () => {
    const r = loadFile(bytes('"0,5","1,25"\n"1,5","2,25"\n"2,5","3,25"\n"3,5","4,25"\n"4,5","5,25"\n'), 'q.csv', { dialect: { decimal: ',' } });
    expect(r.ok && Array.from(r.traces[0].y)).toEqual([1.25, 2.25, 3.25, 4.25, 5.25]);
  });

  test('a choice under which no line holds numbers is refused, naming the choice', () => {
    const r = loadFile(bytes('0.5;1.5\n1.5;2.5\n2.5;3.5\n3.5;4.5\n4.5;5.5\n'), 'p.csv', { dialect: { delimiter: '\t', decimal: ',' } });
    expect(r.ok ? 'loaded' : r.error.problem).toBe('No line holds a number when the file is read as tab, decimal comma, as chosen.');
  });

  test('unambiguous files raise no question (decimal point, semicolon with decimal comma, spaces)', () => {
    for (const text of ['0.5,1.5\n1.5,2.5\n2.5,3.5\n3.5,4.5\n4.5,5.5\n', '0,5;1,5\n1,5;2,5\n2,5;3,5\n3,5;4,5\n4,5;5,5\n', '1 2\n2 3\n3 4\n4 5\n5 6\n']) {
      const r = loadFile(bytes(text), 'u.csv');
      expect(r.ok && r.report.questions, text).toBeUndefined();
    }
  });
});
