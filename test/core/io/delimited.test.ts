/**
 * The delimited-text loader on the odd files in test/fixtures/text (see the
 * README there for what each must produce). Expected values are the numbers
 * written into each fixture by hand; averages of repeated x are worked out in
 * the comments.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync, readdirSync } from 'node:fs';
import fc from 'fast-check';
import { decideDialect, parseColumnHeader, parseDelimited, parseTraceHeader, splitFields } from '../../../src/core/io/delimited.ts';
import type { RowSplitter } from '../../../src/core/io/delimited.ts';
import type { LoadOptions, LoadResult } from '../../../src/core/io/types.ts';
import { checkTraceData } from '../../../src/core/trace.ts';

const DIR = new URL('../../fixtures/text/', import.meta.url);
const fixture = (name: string) => new Uint8Array(readFileSync(new URL(name, DIR)));
const fixtureNames = readdirSync(DIR).filter((f) => f !== 'README.md').sort();

interface ExpectedTrace {
  xName: string; xUnit: string; yName: string; yUnit: string;
  x: number[]; y: number[];
}
interface ExpectedOk {
  format: string;
  traces: ExpectedTrace[];
  skippedLines?: number[];
  notice?: RegExp;
  metadata?: Record<string, string>;
}
interface ExpectedError {
  error: RegExp;
  line?: number;
}

const T = (xName: string, xUnit: string, yName: string, yUnit: string, x: number[], y: number[]): ExpectedTrace => ({ xName, xUnit, yName, yUnit, x, y });
const range = (n: number, step: number, from = 0) => Array.from({ length: n }, (_, i) => Number((from + i * step).toFixed(10)));

/** What every fixture must give (the same table as test/fixtures/text/README.md). */
const EXPECTED: Record<string, ExpectedOk | ExpectedError> = {
  'comma.csv': { format: 'comma, decimal point, UTF-8', traces: [T('Time', 'min', 'Absorbance', 'AU', range(8, 0.01), [0.0012, 0.0015, 0.0110, 0.0523, 0.1207, 0.0518, 0.0109, 0.0014])] },
  'semicolon-decimal-comma.csv': { format: 'semicolon, decimal comma', traces: [T('Time', 'min', 'Signal', 'mV', range(6, 0.5), [1.25, 1.5, 2.75, 8.5, 3.25, 1.75])] },
  'semicolon-point.csv': { format: 'semicolon, decimal point', traces: [T('Time', 's', 'Signal', 'mV', range(6, 1), [10.5, 11.25, 12, 30.75, 12.5, 11])] },
  'tab.tsv': { format: 'tab, decimal point', traces: [T('Wavelength', 'nm', 'Absorbance', 'AU', range(7, 10, 400), [0.101, 0.152, 0.348, 0.512, 0.330, 0.140, 0.095])] },
  'tab-decimal-comma.txt': { format: 'tab, decimal comma', traces: [T('Zeit', 'min', 'Signal', 'mV', range(6, 0.25), [0.5, 0.75, 4.25, 9.5, 4, 1])] },
  'whitespace.txt': {
    format: 'spaces, decimal point',
    traces: [
      T('Time', 'min', 'Signal', 'mV', range(6, 0.1), [-0.02, 0.05, 0.61, 2.40, 0.58, 0.04]),
      T('Time', 'min', 'Pressure', 'bar', range(6, 0.1), [1, 1.5, 2, 2.5, 3, 3.5]),
    ],
  },
  'preamble.csv': {
    format: 'comma, decimal point',
    traces: [T('Time', 'min', 'Signal', 'mV', range(7, 0.1), [2, 2.5, 6, 12.5, 6.5, 2.25, 2])],
    metadata: { Run: 'dye check 3', Operator: 'A. Example', Rig: 'bench 2', 'line 4': 'detector lamp warmed 20 min', 'line 5': 'this line is free text' },
    notice: /table starts at line 8/,
  },
  'bom.csv': { format: 'UTF-8 with byte-order mark', traces: [T('Time', 'min', 'Signal', 'mV', range(5, 0.2), [3, 3.5, 9, 3.25, 3])] },
  'quoted.csv': {
    format: 'comma, decimal point',
    traces: [T('Time, corrected', 'min', 'Signal', 'mV', range(6, 0.1), [1.5, 1.75, 4.5, 9.25, 4, 1.5])],
    notice: /Not loaded .*column 3 \(Note\)/,
  },
  'quoted-decimal-comma.csv': { format: 'comma, decimal comma', traces: [T('Time', 'min', 'Signal', 'mV', range(6, 0.5), [0.25, 0.5, 3.75, 0.5, 0.25, 0.125])] },
  'units-header.csv': {
    format: 'comma, decimal point',
    traces: [
      T('Time', 'min', 'Absorbance', 'AU', range(5, 0.05), [0.010, 0.020, 0.150, 0.020, 0.010]),
      T('Time', 'min', 'Signal', 'mV', range(5, 0.05), [5, 5.5, 20, 6, 5]),
    ],
  },
  // "Rig,bench 2" has two text cells like a names line, but "Time,Signal" are not units, so it stays metadata.
  'preamble-plain-header.csv': {
    format: 'comma, decimal point',
    traces: [T('Time', '', 'Signal', '', range(5, 0.5), [1.5, 2.5, 6.5, 2, 1])],
    metadata: { Rig: 'bench 2' },
  },
  'units-row.csv': { format: 'comma, decimal point', traces: [T('Time', 'min', 'Absorbance', 'mAU', range(5, 0.01), [0.5, 0.75, 3.5, 0.5, 0.25])] },
  'text-in-cells.csv': {
    format: 'comma, decimal point',
    // Lines 3 n/a, 5 NaN, 7 Inf, 8 ---, 9 empty, 12 "oops" as x, 14 three fields.
    traces: [T('Time', 'min', 'Signal', 'mV', [0, 0.2, 0.4, 0.8, 0.9, 1.0], [1, 2, 3, 4, 5, 7])],
    skippedLines: [3, 5, 7, 8, 9, 12, 14],
  },
  'unsorted.csv': { format: 'comma, decimal point', traces: [T('Time', 'min', 'Signal', 'mV', range(6, 0.1), [0, 10, 20, 30, 40, 50])], notice: /not in ascending order \(at point 2 as read it falls from 0\.3 to 0\.1\)/ },
  'single-column.txt': { format: 'comma, decimal point', traces: [T('Point', '', 'Signal', 'mV', range(6, 1), [1.5, 2.5, 7.25, 3, 1.75, 1.5])], notice: /x is the point index/ },
  'crlf.csv': { format: 'comma, decimal point', traces: [T('Time', 'min', 'Signal', 'mV', range(5, 0.1), [0.5, 1.5, 6.5, 1.25, 0.75])] },
  'cr-only.csv': { format: 'comma, decimal point', traces: [T('Time', 'min', 'Signal', 'mV', range(6, 0.1), [0.25, 1, 5, 1, 0.25, 0.125])] },
  // x = 0.1 twice: (2 + 4) / 2 = 3; x = 0.3 three times: (6 + 8 + 10) / 3 = 8.
  'duplicates.csv': {
    format: 'comma, decimal point',
    traces: [T('Time', 'min', 'Signal', 'mV', range(6, 0.1), [1, 3, 5, 8, 7, 3])],
    notice: /3 points repeat an x value already present, in 2 sets \(first: x = 0\.1 at points 2 and 3 as read\)/,
  },
  'latin1-degree.csv': { format: 'Latin-1', traces: [T('Temperature', '\u00b0C', 'Absorbance', 'AU', range(5, 5, 20), [0.512, 0.498, 0.481, 0.467, 0.450])], notice: /not valid UTF-8/ },
  'utf16le.csv': { format: 'UTF-16LE', traces: [T('Time', 'min', 'Signal', 'mV', range(5, 0.1), [1, 2, 8, 2, 1])] },
  'exponents.csv': { format: 'comma, decimal point', traces: [T('x', '', 'y', '', [0.001, 0.002, 0.003, 0.004, 0.005], [25, -0.035, 0.5, 5, 125])] },
  // "1,234.5" is three fields, not one thousand two hundred and thirty-four: thousands separators are never guessed.
  'thousands.csv': { format: 'comma, decimal point', traces: [T('Time', 'min', 'Signal', 'mV', [0, 0.1, 0.3, 0.4, 0.5], [1.5, 2.5, 3.5, 4.5, 5.5])], skippedLines: [4] },
  'empty.csv': { error: /empty \(0 bytes\)/ },
  'whitespace-only.txt': { error: /only blank lines/ },
  'only-text.txt': { error: /only text/ },
  'few-points.csv': { error: /Only 3 rows of numbers.*at least 5 points/, line: 2 },
  'scattered.csv': { error: /No column holds numbers/, line: 2 },
  // Binary files reach parseDelimited only when called directly; loadFile refuses them first (see load.test.ts).
  'binary.dat': { error: /./ },
  'picture.csv': { error: /./ },
  'workbook.xlsx': { error: /./ },
};

function check(name: string, r: LoadResult): void {
  const want = EXPECTED[name];
  if ('error' in want) {
    expect(r.ok, name).toBe(false);
    if (r.ok) return;
    expect(r.error.fileName).toBe(name);
    expect(r.error.problem).toMatch(want.error);
    expect(r.error.advice.length).toBeGreaterThan(10);
    if (want.line !== undefined) expect(r.error.line).toBe(want.line);
    return;
  }
  expect(r.ok, `${name}: ${r.ok ? '' : r.error.problem}`).toBe(true);
  if (!r.ok) return;
  expect(r.report.format).toContain(want.format);
  expect(r.traces.length).toBe(want.traces.length);
  want.traces.forEach((t, i) => {
    const got = r.traces[i];
    expect(got.name).toBe(`${name}: ${t.yName}`);
    expect([got.xName, got.xUnit, got.yName, got.yUnit]).toEqual([t.xName, t.xUnit, t.yName, t.yUnit]);
    expect(got.x.length).toBe(t.x.length);
    // The file's decimal text converts to the nearest double; only the range() helper's own rounding needs a tolerance.
    t.x.forEach((v, k) => expect(got.x[k]).toBeCloseTo(v, 12));
    expect(Array.from(got.y)).toEqual(t.y);
    expect(got.source.fileName).toBe(name);
    expect(got.source.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(got.source.rowsSkipped).toBe(want.skippedLines?.length ?? 0);
    expect(checkTraceData(got.x, got.y)).toBeNull();
  });
  expect(r.report.skipped.map((s) => s.line)).toEqual(want.skippedLines ?? []);
  if (want.notice) expect(r.report.notices.join('\n')).toMatch(want.notice);
  if (want.metadata) {
    expect(r.report.metadata).toEqual(want.metadata);
    expect(r.traces[0].metadata).toEqual(want.metadata);
  }
}

describe('fixtures', () => {
  it('has an expectation for every fixture file and at least 15 files', () => {
    expect(fixtureNames.length).toBeGreaterThanOrEqual(15);
    expect(Object.keys(EXPECTED).sort()).toEqual(fixtureNames);
  });

  for (const name of fixtureNames) {
    it(`${name} gives what the README says`, () => {
      const bytes = fixture(name);
      const copy = bytes.slice();
      check(name, parseDelimited(bytes, name));
      expect(bytes).toEqual(copy); // raw data is never changed
    });
  }

  it('lists skipped rows with line, reason and text', () => {
    const r = parseDelimited(fixture('text-in-cells.csv'), 'text-in-cells.csv');
    if (!r.ok) throw new Error(r.error.problem);
    expect(r.report.skipped[0]).toEqual({ line: 3, reason: 'not a number in column 2 (Signal): "n/a"', text: '0.1,n/a' });
    expect(r.report.skipped[5].reason).toMatch(/column 1 \(Time\): "oops"/);
    expect(r.report.skipped[6].reason).toBe('has 3 fields; the table has 2');
    expect(r.report.rowsRead).toBe(6);
  });
});

/** Everything but the random trace ids, so two reads of the same file can be compared. */
function comparable(r: LoadResult): unknown {
  if (!r.ok) return r;
  return { report: r.report, traces: r.traces.map(({ id: _id, ...rest }) => ({ ...rest, x: Array.from(rest.x), y: Array.from(rest.y) })) };
}
const read = (bytes: Uint8Array, name: string, splitter: RowSplitter, options: LoadOptions = {}) => comparable(parseDelimited(bytes, name, options, splitter));

describe('fast path and PapaParse path', () => {
  it('agree on every fixture without quote marks, and the automatic choice agrees with PapaParse on all', () => {
    let compared = 0;
    for (const name of fixtureNames) {
      const bytes = fixture(name);
      const papa = read(bytes, name, 'papa');
      expect(read(bytes, name, 'auto'), name).toEqual(papa);
      if (!Buffer.from(bytes).includes('"')) {
        expect(read(bytes, name, 'fast'), name).toEqual(papa);
        compared++;
      }
    }
    expect(compared).toBeGreaterThanOrEqual(20);
  });

  it('differ where quotes hide a delimiter, which is why quoted files go to PapaParse', () => {
    const bytes = fixture('quoted.csv');
    expect(read(bytes, 'quoted.csv', 'fast')).not.toEqual(read(bytes, 'quoted.csv', 'papa'));
  });

  it('agree on random quote-free tables', () => {
    // Random files from an alphabet of digits, signs, both decimal signs, every delimiter and line ending.
    const alphabet = fc.constantFrom(...'0123456789012345678901234567890123456789.,;\t  \n\n\r-eE x'.split(''));
    fc.assert(
      fc.property(fc.array(alphabet, { maxLength: 400 }), (chars) => {
        const bytes = new TextEncoder().encode(chars.join(''));
        expect(read(bytes, 'random.txt', 'fast')).toEqual(read(bytes, 'random.txt', 'papa'));
      }),
      { seed: 7, numRuns: 300 },
    );
  });
});

describe('robustness', () => {
  it('never throws and never fails unexpectedly on random bytes or random text', () => {
    const alphabet = fc.constantFrom(...'0123456789.,;\t "\n\r-eEabc:#()[]'.split(''));
    const inputs = fc.oneof(
      fc.uint8Array({ maxLength: 300 }),
      fc.array(alphabet, { maxLength: 500 }).map((c) => new TextEncoder().encode(c.join(''))),
    );
    fc.assert(
      fc.property(inputs, (bytes) => {
        const r = parseDelimited(bytes, 'fuzz.bin');
        if (r.ok) for (const t of r.traces) expect(checkTraceData(t.x, t.y)).toBeNull();
        else expect(r.error.problem).not.toMatch(/unexpected error/);
      }),
      { seed: 3, numRuns: 500 },
    );
  });

  it('turns a wrong column choice into a message', () => {
    const bytes = fixture('units-header.csv');
    const bad = (options: LoadOptions) => {
      const r = parseDelimited(bytes, 'units-header.csv', options);
      if (r.ok) throw new Error('expected a problem');
      return r.error.problem;
    };
    expect(bad({ xColumn: 3 })).toMatch(/Column 3 cannot be x: the file has 3 column/);
    expect(bad({ yColumns: [7] })).toMatch(/Column 7 cannot be y/);
    expect(bad({ xColumn: 1, yColumns: [1] })).toMatch(/both x and y/);
    expect(bad({ yColumns: [] })).toMatch(/No column is left for y/);
    const quoted = parseDelimited(fixture('quoted.csv'), 'quoted.csv', { yColumns: [2] });
    expect(quoted.ok ? '' : quoted.error.problem).toMatch(/column 3 \(Note\), does not hold numbers/);
  });
});

describe('column choice', () => {
  it('loads the chosen x and y columns', () => {
    const one = parseDelimited(fixture('units-header.csv'), 'units-header.csv', { yColumns: [2] });
    if (!one.ok) throw new Error(one.error.problem);
    expect(one.traces.map((t) => t.yName)).toEqual(['Signal']);
    expect(Array.from(one.traces[0].y)).toEqual([5, 5.5, 20, 6, 5]);
    // Signal as x, Pressure as y: rows sorted by signal -0.02, 0.04, 0.05, 0.58, 0.61, 2.40 (file lines 2, 7, 3, 6, 4, 5).
    const r = parseDelimited(fixture('whitespace.txt'), 'whitespace.txt', { xColumn: 1, yColumns: [2] });
    if (!r.ok) throw new Error(r.error.problem);
    expect([r.traces[0].xName, r.traces[0].xUnit, r.traces[0].yName]).toEqual(['Signal', 'mV', 'Pressure']);
    expect(Array.from(r.traces[0].x)).toEqual([-0.02, 0.04, 0.05, 0.58, 0.61, 2.40]);
    expect(Array.from(r.traces[0].y)).toEqual([1, 3.5, 1.5, 3, 2, 2.5]);
    expect(r.report.notices.join(' ')).toMatch(/sorted by x/);
  });

  it('refuses a choice that leaves fewer than 5 distinct x values', () => {
    const r = parseDelimited(fixture('units-header.csv'), 'units-header.csv', { xColumn: 1, yColumns: [2] });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.problem).toMatch(/only 3 distinct x values remain/);
  });

  it('uses the point index when asked, and makes the second y its own trace', () => {
    const r = parseDelimited(fixture('whitespace.txt'), 'whitespace.txt', { xColumn: -1, yColumns: [2] });
    if (!r.ok) throw new Error(r.error.problem);
    expect(r.traces.length).toBe(1);
    expect(r.traces[0].xName).toBe('Point');
    expect(Array.from(r.traces[0].x)).toEqual([0, 1, 2, 3, 4, 5]);
    expect(Array.from(r.traces[0].y)).toEqual([1, 1.5, 2, 2.5, 3, 3.5]);
    expect(r.traces[0].source.yColumn).toBe(2);
    expect(r.report.notices.join(' ')).toMatch(/point index/);
  });
});

describe('progress on large files', () => {
  function bigFile(rows: number, quoted: boolean): Uint8Array {
    const parts: string[] = ['Time (min),Signal (mV)\n'];
    for (let i = 0; i < rows; i++) {
      const t = (i * 0.001).toFixed(3), y = ((i * 7919) % 1000 / 10).toFixed(1);
      parts.push(quoted ? `"${t}","${y}"\n` : `${t},${y}\n`);
    }
    return new TextEncoder().encode(parts.join(''));
  }

  for (const quoted of [false, true]) {
    it(`calls onProgress repeatedly, rising to 1 (${quoted ? 'PapaParse' : 'fast'} path), and leaves the bytes unchanged`, () => {
      const rows = 300_000;
      const bytes = bigFile(rows, quoted);
      const copy = bytes.slice();
      const calls: number[] = [];
      const r = parseDelimited(bytes, 'big.csv', { onProgress: (f) => calls.push(f) });
      if (!r.ok) throw new Error(r.error.problem);
      expect(r.traces[0].x.length).toBe(rows);
      expect(r.traces[0].y[12345]).toBe(Number(((12345 * 7919) % 1000 / 10).toFixed(1)));
      // 300 000 lines at one call per 65 536 lines: 4 calls while parsing, plus the final 1.
      expect(calls.length).toBeGreaterThanOrEqual(5);
      for (let i = 1; i < calls.length; i++) expect(calls[i]).toBeGreaterThanOrEqual(calls[i - 1]);
      expect(calls[0]).toBeGreaterThan(0);
      expect(calls[calls.length - 1]).toBe(1);
      expect(Buffer.from(bytes).equals(Buffer.from(copy))).toBe(true);
    });
  }
});

describe('deciding the delimiter and decimal sign', () => {
  it('tells decimal commas from comma delimiters by consistent numeric field counts', () => {
    const lines = (row: string) => Array.from({ length: 10 }, () => row);
    expect(decideDialect(lines('1,5;2,7'))).toEqual({ delimiter: ';', decimal: ',' });
    expect(decideDialect(lines('1,5,2,7'))).toEqual({ delimiter: ',', decimal: '.' });
    expect(decideDialect(lines('1.5;2.7'))).toEqual({ delimiter: ';', decimal: '.' });
    expect(decideDialect(lines('1,5\t2,7'))).toEqual({ delimiter: '\t', decimal: ',' });
    expect(decideDialect(lines('1.5\t2.7'))).toEqual({ delimiter: '\t', decimal: '.' });
    expect(decideDialect(lines('  1,5   2,7'))).toEqual({ delimiter: 'whitespace', decimal: ',' });
    expect(decideDialect(lines('1.5 2.7'))).toEqual({ delimiter: 'whitespace', decimal: '.' });
    expect(decideDialect(lines('"1,5","2,7"'))).toEqual({ delimiter: ',', decimal: ',' });
    expect(decideDialect(lines('S1;1,5;2,7'))).toEqual({ delimiter: ';', decimal: ',' }); // a text column does not hide the table
    expect(decideDialect(['Notes', 'no numbers here'])).toBeNull();
  });

  it('splits fields the way PapaParse does for quotes', () => {
    expect(splitFields('"a, b",2,"say ""hi""",', ',')).toEqual(['a, b', '2', 'say "hi"', '']);
    expect(splitFields('  1.5\t 2  "x y" ', 'whitespace')).toEqual(['1.5', '2', 'x y']);
    expect(splitFields('1;;3', ';')).toEqual(['1', '', '3']);
  });
});

describe('column headers', () => {
  it('splits names and units in the three usual forms', () => {
    expect(parseColumnHeader('Time (min)')).toEqual({ name: 'Time', unit: 'min' });
    expect(parseColumnHeader(' "Absorbance [AU]" ')).toEqual({ name: 'Absorbance', unit: 'AU' });
    expect(parseColumnHeader('Signal / mV')).toEqual({ name: 'Signal', unit: 'mV' });
    expect(parseColumnHeader('Absorbance 520 nm (mAU)')).toEqual({ name: 'Absorbance 520 nm', unit: 'mAU' });
    expect(parseColumnHeader('Ratio A/B')).toEqual({ name: 'Ratio A/B', unit: '' });
    expect(parseColumnHeader('Signal')).toEqual({ name: 'Signal', unit: '' });
  });

  // Issue 17: name_unit only for the stated list (SUFFIX_UNITS) and a name longer than one letter.
  it('reads name_unit for trace columns when the suffix is a listed unit', () => {
    expect(parseTraceHeader('time_s')).toEqual({ name: 'time', unit: 's' });
    expect(parseTraceHeader('voltage_mV')).toEqual({ name: 'voltage', unit: 'mV' });
    expect(parseTraceHeader('signal_MAU')).toEqual({ name: 'signal', unit: 'MAU' });
    expect(parseTraceHeader('detector_2_counts')).toEqual({ name: 'detector_2', unit: 'counts' });
    expect(parseTraceHeader('x_s')).toEqual({ name: 'x_s', unit: '' });
    expect(parseTraceHeader('peak_a')).toEqual({ name: 'peak_a', unit: '' });
    expect(parseTraceHeader('run_07')).toEqual({ name: 'run_07', unit: '' });
    expect(parseTraceHeader('Time_s (min)')).toEqual({ name: 'Time_s', unit: 'min' });
    // The calibration tables keep the plain forms: a compound called vitamin_nm is not read as nanometres there.
    expect(parseColumnHeader('voltage_mV')).toEqual({ name: 'voltage_mV', unit: '' });
  });

  it('gives units to a whole file written with underscores', () => {
    const r = parseDelimited(new TextEncoder().encode('time_s,voltage_mV\n0,1\n1,2\n2,3\n3,2\n4,1\n5,0\n'), 'logger.csv');
    expect(r.ok).toBe(true);
    if (r.ok) expect([r.traces[0].xName, r.traces[0].xUnit, r.traces[0].yName, r.traces[0].yUnit]).toEqual(['time', 's', 'voltage', 'mV']);
  });

  it('takes units from a line under the names when they are bracketed or known units', () => {
    const text = 'Time;Absorbance;Current\n(min);[mAU];nA\n0;1;7\n1;2;8\n2;3;9\n3;4;8\n4;5;7\n';
    const r = parseDelimited(new TextEncoder().encode(text), 'u.csv');
    if (!r.ok) throw new Error(r.error.problem);
    expect(r.report.columns).toEqual([{ name: 'Time', unit: 'min' }, { name: 'Absorbance', unit: 'mAU' }, { name: 'Current', unit: 'nA' }]);
  });
});

describe('a number format stated by the user settles what the file cannot (issue 13)', () => {
  const file = (name: string) => new Uint8Array(readFileSync(`test/fixtures/hostile/${name}`));

  it('"1.100" under a decimal comma: refused on its own, read as 1100 when grouping is stated, not a number when it is denied', () => {
    const bytes = file('thousands-dot-ambiguous.csv');
    const auto = parseDelimited(bytes, 'a.csv');
    expect(auto.ok).toBe(false);
    if (!auto.ok) {
      expect(auto.error.advice).toMatch(/State how the numbers are written/);
      // What the page offers to settle it: the one statement that makes the reading certain.
      expect(auto.error.settle).toEqual({ label: 'Read “.” as a thousands separator (“1.100” = 1100)', numberFormat: { decimal: ',', grouping: true } });
    }
    const grouped = parseDelimited(bytes, 'a.csv', { numberFormat: { decimal: ',', grouping: true } });
    expect(grouped.ok).toBe(true);
    if (grouped.ok) {
      // File: x = i + 0.5 written "i,5"; y = (1 + i)·1000 + 100 + 17 i written "1.100", "2.117", …
      expect(Array.from(grouped.traces[0].x)).toEqual([0.5, 1.5, 2.5, 3.5, 4.5, 5.5, 6.5, 7.5]);
      expect(Array.from(grouped.traces[0].y)).toEqual(Array.from({ length: 8 }, (_, i) => (1 + i) * 1000 + 100 + 17 * i));
    }
    const plain = parseDelimited(bytes, 'a.csv', { numberFormat: { decimal: ',', grouping: false } });
    expect(plain.ok).toBe(false);
    if (!plain.ok) expect(plain.error.problem).toMatch(/uses a decimal point, but the file uses a decimal comma/);
  });

  it('a stated format that matches the file gives the same reading as the loader’s own decision', () => {
    const bytes = file('decimal-comma-thousands-dot.csv');
    const auto = parseDelimited(bytes, 'b.csv');
    const stated = parseDelimited(bytes, 'b.csv', { numberFormat: { decimal: ',', grouping: true } });
    expect(auto.ok && stated.ok).toBe(true);
    if (auto.ok && stated.ok) expect(Array.from(stated.traces[0].y)).toEqual(Array.from(auto.traces[0].y));
    const bad = parseDelimited(bytes, 'b.csv', { numberFormat: { decimal: ';' as ',', grouping: true } });
    expect(bad.ok).toBe(false);
  });
});
