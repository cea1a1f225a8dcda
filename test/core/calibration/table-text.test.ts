/**
 * Small text tables (src/core/calibration/table-text.ts): delimiter and
 * decimal sign from the text, comments and blank lines skipped, problems
 * naming file and line (the project's rule for bad input).
 */
import { describe, expect, it } from 'vitest';
import { TABLE_MAX_CHARS, TABLE_MAX_ROWS, readTextTable, tableNumber, tableProblemText } from '../../../src/core/calibration/table-text.ts';

describe('readTextTable', () => {
  it('comma table: header, rows with their line numbers, comments and blank lines skipped, BOM dropped', () => {
    const r = readTextTable('\ufeffname,position\n# a comment\n\nA, 1.5\nB,2\n', 'p.csv', 'named-peak table');
    if (!r.ok) throw new Error(JSON.stringify(r.problems));
    expect(r.table.delimiter).toBe(',');
    expect(r.table.decimal).toBe('.');
    expect(r.table.header.cells).toEqual(['name', 'position']);
    expect(r.table.rows.map((x) => [x.line, ...x.cells])).toEqual([[4, 'A', '1.5'], [5, 'B', '2']]);
    expect(tableNumber(r.table.rows[0].cells[1], r.table)).toBe(1.5);
    expect(Number.isNaN(tableNumber('A', r.table))).toBe(true);
  });

  it('semicolon and tab tables read decimal commas; a mix of commas and points is refused, naming both lines', () => {
    const s = readTextTable('name;position\nA;1,5\nB;2,25\n', 'p.csv', 'table');
    if (!s.ok) throw new Error();
    expect(s.table.delimiter).toBe(';');
    expect(s.table.decimal).toBe(',');
    expect(tableNumber('2,25', s.table)).toBe(2.25);
    const t = readTextTable('name\tposition\nA\t1.5\n', 'p.txt', 'table');
    expect(t.ok && t.table.delimiter).toBe('\t');
    const mixed = readTextTable('name;position\nA;1,5\nB;2.25\n', 'p.csv', 'table');
    expect(mixed.ok).toBe(false);
    if (!mixed.ok) expect(tableProblemText(mixed.problems[0])).toBe('p.csv, line 3: The table mixes decimal commas (line 2) and decimal points (line 3); use one decimal sign throughout.');
  });

  it('refuses empty, binary, too long and too many rows, each with a sentence', () => {
    const empty = readTextTable('\n# only a comment\n', 'e.csv', 'standards table');
    expect(!empty.ok && tableProblemText(empty.problems[0])).toBe('e.csv: The standards table is empty: it needs a header line and at least one row.');
    const bin = readTextTable('a,b\n1,\u00002\n', 'b.csv', 'table');
    expect(!bin.ok && bin.problems[0].problem).toMatch(/binary data/);
    const long = readTextTable('x'.repeat(TABLE_MAX_CHARS + 1), 'l.csv', 'table');
    expect(!long.ok && long.problems[0].problem).toMatch(/at most 1000000 are read/);
    const many = readTextTable(`a\n${'1\n'.repeat(TABLE_MAX_ROWS + 1)}`, 'm.csv', 'table');
    expect(!many.ok && many.problems[0].problem).toMatch(/at most 10000 are read/);
  });
});
