/**
 * Named peaks: table checks, JSON form, CSV reader, and the matcher's rule
 * (our own rule, stated in src/core/calibration/named-peaks.ts: nearest or
 * tallest in the window, each name and each peak used once, best pairs first).
 */
import { describe, expect, it } from 'vitest';
import {
  emptyNamedPeakTable, nameTracePeaks, namedPeakFromPeak, namedPeaksToJson, parseNamedPeaks, readNamedPeaksCsv, validateNamedPeakTable,
} from '../../../src/core/calibration/named-peaks.ts';
import type { NamedPeakTable, PeakLike } from '../../../src/core/calibration/named-peaks.ts';
import { tableProblemText } from '../../../src/core/calibration/table-text.ts';

const table = (peaks: { name: string; position: number; window: number }[], rule: 'nearest' | 'largest' = 'nearest'): NamedPeakTable =>
  ({ ...emptyNamedPeakTable('min', rule), peaks });
const pk = (x: number, height: number, extra: Partial<PeakLike> = {}): PeakLike => ({ x, height, area: height * 0.1, ...extra });

describe('validation', () => {
  it('accepts a good table and warns about overlapping windows, naming both and the rule that settles it', () => {
    const r = validateNamedPeakTable(table([{ name: 'A', position: 4.3, window: 0.1 }, { name: 'B', position: 4.45, window: 0.1 }]));
    expect(r.problems).toEqual([]);
    expect(r.warnings).toEqual(['The windows of "A" (4.2–4.4 min) and "B" (4.35–4.55 min) overlap; a peak in both goes to the name whose expected position is nearer.']);
  });

  it('lists every problem with the peak it concerns', () => {
    const r = validateNamedPeakTable(table([
      { name: ' ', position: 1, window: 0.1 },
      { name: 'Caffeine', position: NaN, window: 0.1 },
      { name: 'caffeine', position: 2, window: 0 },
      { name: 'x'.repeat(81), position: 3, window: 0.1 },
      { name: 'tab\there', position: 3, window: 0.1 },
    ]));
    expect(r.problems).toEqual([
      'Named peak 1: the name is empty.',
      'Named peak 2 ("Caffeine"): the expected position must be a number in min; got NaN.',
      'Named peaks 2 and 3 are both called "caffeine" (names are compared ignoring case); each name must be used once.',
      'Named peak 3 ("caffeine"): the window must be a positive number of min (how far either side of the expected position the peak may lie); got 0.',
      `Named peak 4 ("${'x'.repeat(81)}"): the name is 81 characters long; at most 80 are allowed.`,
      'Named peak 5 ("tab\there"): the name holds control characters (line breaks, tabs); use plain text.',
    ]);
  });

  it('a clicked peak gives a named peak at its apex with its half-height width as window', () => {
    expect(namedPeakFromPeak(' Orchard Red ', { x: 4.31, fwhm: 0.19 })).toEqual({ name: 'Orchard Red', position: 4.31, window: 0.19 });
    expect(namedPeakFromPeak('B', { x: 1 }, 0.05).window).toBe(0.05);
    expect(() => namedPeakFromPeak('B', { x: 1 })).toThrow(/positive window/);
  });
});

describe('JSON form (saved with the processing method)', () => {
  const t = table([{ name: 'Orchard Red', position: 4.3, window: 0.15 }, { name: 'Lagoon Blue', position: 8.5, window: 0.3 }], 'largest');

  it('round-trips through JSON text', () => {
    const back = parseNamedPeaks(JSON.parse(JSON.stringify(namedPeaksToJson(t))));
    expect(back).toEqual({ ok: true, table: t, warnings: [] });
  });

  it('refuses a newer version, unknown fields, wrong types, with every problem listed', () => {
    expect(parseNamedPeaks({ ...namedPeaksToJson(t), version: 2 })).toEqual({ ok: false, problems: [expect.stringMatching(/newer version of Tracewright \(version 2; this one reads up to 1\)/)] });
    const bad = parseNamedPeaks({ format: 'tracewright-named-peaks', version: 1, rule: 'first', peaks: [{ name: 'A', position: '4', window: 1, colour: 'red' }, 7] });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.problems).toEqual(['"rule" must be one of nearest, largest.', 'Named peak 1: unknown field "colour".', 'Named peak 2 is not an object.']);
    const proto = parseNamedPeaks(JSON.parse('{"format":"tracewright-named-peaks","version":1,"peaks":[{"name":"A","position":1,"window":1,"__proto__":{"x":1}}]}'));
    expect(proto.ok).toBe(false);
    expect(parseNamedPeaks([])).toEqual({ ok: false, problems: ['The named-peak table is not a JSON object.'] });
  });
});

describe('CSV and pasted tables', () => {
  it('reads comma CSV with units in the header, comments and blank lines skipped', () => {
    const r = readNamedPeaksCsv('\uFEFF# expected dyes\nname,position (min),window (min),colour\n\nOrchard Red,4.3,0.15,red\n"Lagoon Blue, E133",8.5,0.3,blue\n', 'peaks.csv');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.table.xUnit).toBe('min');
    expect(r.table.peaks).toEqual([{ name: 'Orchard Red', position: 4.3, window: 0.15 }, { name: 'Lagoon Blue, E133', position: 8.5, window: 0.3 }]);
    expect(r.notices).toEqual(['Columns not used: "colour".']);
  });

  it('reads semicolon CSV with decimal commas and tab-separated cells pasted from a spreadsheet, columns in any order', () => {
    const semi = readNamedPeaksCsv('Window;Name;Retention time\n0,15;Orchard Red;4,3\n', 'p.csv');
    expect(semi.ok && semi.table.peaks).toEqual([{ name: 'Orchard Red', position: 4.3, window: 0.15 }]);
    const tab = readNamedPeaksCsv('name\tposition\twindow\r\nA\t1.25\t0.05\r\nB\t2.5\t0.1', 'pasted table');
    expect(tab.ok && tab.table.peaks.map((p) => p.position)).toEqual([1.25, 2.5]);
  });

  it('names the file and line of every problem', () => {
    const r = readNamedPeaksCsv('name,position,window\nA,4.3,0.1\n,5,0.1\nB,abc,-1\na,6,0.1\n', 'peaks.csv');
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems.map(tableProblemText)).toEqual([
      'peaks.csv, line 3: The name is empty.',
      'peaks.csv, line 4: The position "abc" is not a number; the window must be above zero (how far either side of the position the peak may lie); got -1.',
      'peaks.csv, line 5: "a" is already named on line 2 (names are compared ignoring case); each name must be used once.',
    ]);
  });

  it('says which column is missing, and refuses mixed decimal signs and empty tables', () => {
    const r = readNamedPeaksCsv('\n\nname,position\nA,1\n', 'peaks.csv');
    expect(!r.ok && tableProblemText(r.problems[0])).toMatch(/^peaks\.csv, line 3: The header has no "window" column\. The first line must name the columns name, position and window/);
    const mixed = readNamedPeaksCsv('name;position;window\nA;1,5;0.1\n', 'p.csv');
    expect(!mixed.ok && mixed.problems[0].problem).toMatch(/mixes decimal commas \(line 2\) and decimal points \(line 2\)/);
    expect(readNamedPeaksCsv('', 'e.csv')).toEqual({ ok: false, problems: [{ fileName: 'e.csv', line: null, problem: 'The named-peak table is empty: it needs a header line and at least one row.' }] });
    expect(readNamedPeaksCsv('name,position,window\n', 'e.csv').ok).toBe(false);
    expect(readNamedPeaksCsv('name,position (min),window (s)\nA,1,1\n', 'u.csv').ok).toBe(false);
  });
});

describe('matching a trace\'s peaks to the names', () => {
  it('nearest rule: the peak nearest the expected position in the window; others unnamed; missing listed', () => {
    const t = table([{ name: 'A', position: 4.3, window: 0.2 }, { name: 'B', position: 8.5, window: 0.2 }, { name: 'C', position: 10, window: 0.1 }]);
    const peaks = [pk(4.15, 9), pk(4.32, 1), pk(6, 5), pk(8.6, 2)];
    const before = JSON.stringify(peaks);
    const n = nameTracePeaks(t, peaks);
    expect(n.names).toEqual([null, 'A', null, 'B']);
    expect(n.missing).toEqual(['C']);
    expect(n.matches[0]).toEqual({ name: 'A', expected: 4.3, window: 0.2, peakIndex: 1, x: 4.32, offset: expect.closeTo(0.02, 12), candidates: 2, note: '2 peaks lay in the window; the nearest was taken.' });
    expect(n.matches[2].note).toBe('No peak within 10 ± 0.1 min.');
    expect(n.ruleInWords).toMatch(/nearest its expected position/);
    expect(JSON.stringify(peaks)).toBe(before);
  });

  it('largest rule: the tallest peak in the window', () => {
    const n = nameTracePeaks(table([{ name: 'A', position: 4.3, window: 0.2 }], 'largest'), [pk(4.15, 9), pk(4.32, 1)]);
    expect(n.names).toEqual(['A', null]);
    expect(n.matches[0].note).toBe('2 peaks lay in the window; the tallest was taken.');
  });

  it('each name and each peak once: when two names want one peak the nearer pair wins and the other falls back', () => {
    const t = table([{ name: 'A', position: 5.0, window: 0.5 }, { name: 'B', position: 5.2, window: 0.5 }]);
    const n = nameTracePeaks(t, [pk(5.15, 3), pk(4.7, 2)]);
    expect(n.names).toEqual(['B', 'A']);
    expect(n.matches[0].note).toBe('2 peaks lay in the window; the nearest was taken. A better-placed peak in its window went to "B".');
    const lone = nameTracePeaks(t, [pk(5.15, 3)]);
    expect(lone.names).toEqual(['B']);
    expect(lone.missing).toEqual(['A']);
    expect(lone.matches[0].note).toBe('The only peak in its window went to "B".');
  });

  it('never names dips or peaks the user removed; a window edge counts as inside', () => {
    const t = table([{ name: 'A', position: 2, window: 0.5 }]);
    expect(nameTracePeaks(t, [pk(2, -3), pk(2.1, 1, { removedByUser: true }), pk(2.5, 0.5)]).names).toEqual([null, null, 'A']);
  });

  it('is deterministic on ties: equal distance goes to the taller peak, then to table order', () => {
    const n = nameTracePeaks(table([{ name: 'A', position: 2, window: 0.5 }]), [pk(1.9, 1), pk(2.1, 2)]);
    expect(n.names).toEqual([null, 'A']);
  });
});
