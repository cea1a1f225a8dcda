/**
 * Standards' amounts (src/core/calibration/standards.ts): CSV / pasted table
 * and JSON form. Plain input handling: the checks are about messages naming
 * file and line, and round trips. (Settings moved to settings.test.ts.)
 */
import { describe, expect, it } from 'vitest';
import { emptyNamedPeakTable } from '../../../src/core/calibration/named-peaks.ts';
import { checkStandardsAgainstNames, parseStandards, readStandardsCsv, standardsToJson } from '../../../src/core/calibration/standards.ts';
import { tableProblemText } from '../../../src/core/calibration/table-text.ts';

describe('standards table', () => {
  const csv = 'standard,Orchard Red (mg/L),Lagoon Blue (mg/L)\nstd-1a.csv,2,0.5\nstd-1b.csv,2,0.5\nstd-2a.csv,5,\n';

  it('reads levels and replicates with units; an empty cell means "not in this standard"', () => {
    const r = readStandardsCsv(csv, 'amounts.csv');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.table.names).toEqual(['Orchard Red', 'Lagoon Blue']);
    expect(r.table.units).toEqual(['mg/L', 'mg/L']);
    expect(r.table.rows.map((x) => [x.standard, x.line, x.amounts])).toEqual([
      ['std-1a.csv', 2, [2, 0.5]], ['std-1b.csv', 3, [2, 0.5]], ['std-2a.csv', 4, [5, null]],
    ]);
    expect(r.notices).toEqual([]);
  });

  it('reads a semicolon table with decimal commas, and asks for a unit where none is given', () => {
    const r = readStandardsCsv('Trace;Orchard Red\nS1;2,5\n', 'a.csv');
    expect(r.ok && r.table.rows[0].amounts).toEqual([2.5]);
    expect(r.ok && r.notices[0]).toMatch(/No amount unit for "Orchard Red": add it in brackets after the name, e\.g\. "Orchard Red \(mg\/L\)"/);
  });

  it('names the line of every bad row', () => {
    const r = readStandardsCsv('standard,A,B\nS1,1,x\nS1,2,3\n,1,1\nS3,-1,\nS4,,\nS5,1,2,3\n', 'amounts.csv');
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems.map(tableProblemText)).toEqual([
      'amounts.csv, line 2: The amount of "B", "x", is not a number.',
      'amounts.csv, line 3: Standard "S1" is already listed on line 2.',
      'amounts.csv, line 4: The standard\'s name (first column) is empty.',
      'amounts.csv, line 5: The amount of "A" is negative (-1).',
      'amounts.csv, line 6: The row gives no amount.',
      'amounts.csv, line 7: The row has 4 cells but the header only 3.',
    ]);
  });

  it('explains the expected header', () => {
    const r = readStandardsCsv('file name,A\nS,1\n', 'a.csv');
    expect(!r.ok && tableProblemText(r.problems[0])).toMatch(/^a\.csv, line 1: The first column must name the standard traces and be headed "standard"/);
    const dup = readStandardsCsv('standard,A,a\nS,1,2\n', 'a.csv');
    expect(!dup.ok && dup.problems[0].problem).toBe('Columns 2 and 3 are both "a"; give each named peak one column.');
  });

  it('checks its columns against the named peaks, pointing out a difference of case', () => {
    const r = readStandardsCsv(csv, 'a.csv');
    if (!r.ok) throw new Error('read');
    const named = { ...emptyNamedPeakTable('min'), peaks: [{ name: 'orchard red', position: 4.3, window: 0.1 }] };
    expect(checkStandardsAgainstNames(r.table, named)).toEqual([
      'The standards give amounts for "Orchard Red", but the named peak is spelled "orchard red"; use the same spelling.',
      'The standards give amounts for "Lagoon Blue", which is not a named peak. Named peaks: "orchard red".',
    ]);
  });

  it('round-trips through its JSON form; bad JSON is refused with reasons', () => {
    const r = readStandardsCsv(csv, 'a.csv');
    if (!r.ok) throw new Error('read');
    const back = parseStandards(JSON.parse(JSON.stringify(standardsToJson(r.table))));
    expect(back.ok && back.table.rows.map((x) => x.amounts)).toEqual(r.table.rows.map((x) => x.amounts));
    expect(parseStandards({ ...standardsToJson(r.table), rows: [{ standard: 'S', amounts: [1] }] })).toEqual({ ok: false, problems: ['Standard 1 must have a "standard" name and 2 amounts.'] });
  });
});
