/**
 * The hostile-input catalogue (test/hostile-catalogue.md): every entry is
 * driven through the real entry points (loadFile for data files,
 * parseRecipeText for recipes, runPipeline for recipes that parse) and must
 * give exactly the outcome the table states: a named error (text fragment),
 * or a load with the stated notices (no more, no fewer) and correct values.
 *
 * Expected values are written out from the fixture text itself (the files are
 * made by test/fixtures/hostile/make-hostile.mjs); "correct" means the numbers
 * in the file, parsed by ECMAScript Number() (the round-trip rule of
 * ECMA-262 Number::toString), not whatever the loader happened to return.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { loadFile } from '../../src/core/io/load.ts';
import type { LoadResult } from '../../src/core/io/types.ts';
import { parseRecipeText } from '../../src/core/recipe.ts';
import { runPipeline } from '../../src/core/pipeline.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import { bigCsv, hostileFiles, longLine } from '../fixtures/hostile/make-hostile.mjs';

const FIX = 'test/fixtures/';
const read = (rel: string) => new Uint8Array(readFileSync(FIX + rel));

type Loaded = Extract<LoadResult, { ok: true }>;

interface LoadEntry {
  id: string;
  /** Path under test/fixtures, or a generator for inputs made at run time. */
  file: string | (() => Uint8Array);
  name?: string;
  error?: string | RegExp;
  errorLine?: number;
  /** Stated notices, each matched by one notice; the count must be equal. */
  notices?: (string | RegExp)[];
  traces?: number;
  points?: number;
  values?: (r: Loaded) => void;
}

const READ_AS = (how: string, line: number) => new RegExp(`^Read as ${how.replace(/[()]/g, '\\$&')}.*the table starts at line ${line}\\.$`);
const SKIPPED = (n: number, line: number) => new RegExp(`^${n} rows? (was|were) skipped .*first at line ${line}\\)`);
const NOT_LOADED = (what: string) => `Not loaded (they do not hold numbers): ${what}.`;
const PEAK_X = [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9];
// Written in the fixture as round(100·exp(−(i−5)²/4), 3); make-hostile.mjs.
const PEAK_Y = [0.193, 1.832, 10.54, 36.788, 77.88, 100, 77.88, 36.788, 10.54, 1.832];

const arr = (a: Float64Array) => Array.from(a);

// Generated at run time, never committed (issue 9: "a 50 MB file").
let big: ReturnType<typeof bigCsv> | null = null;
const bigInput = () => (big ??= bigCsv(50 * 1024 * 1024)).bytes;

const LOAD_ENTRIES: LoadEntry[] = [
  { id: 'empty', file: 'text/empty.csv', error: 'The file is empty (0 bytes).' },
  { id: 'whitespace-only', file: 'text/whitespace-only.txt', error: 'only blank lines and spaces' },
  { id: 'png', file: 'text/picture.csv', error: 'This is a PNG image' },
  { id: 'zip', file: 'text/workbook.xlsx', error: 'This is a ZIP archive' },
  { id: 'gzip', file: 'hostile/compressed.csv.gz', error: 'This is a gzip-compressed file' },
  { id: 'pdf', file: 'hostile/report.pdf', error: 'This is a PDF document' },
  { id: 'random-bytes', file: 'hostile/random-bytes.bin', error: /^The file is binary, not text\. It contains NUL bytes \(the first at byte 237\)/ },
  { id: 'nul-inside-text', file: 'hostile/nul-inside.csv', error: 'It contains NUL bytes (the first at byte 21)' },
  {
    id: 'utf16le-bom', file: 'text/utf16le.csv', traces: 1, points: 5,
    notices: [READ_AS('comma, decimal point (UTF-16LE)', 2), 'The file is UTF-16LE text (it starts with a byte-order mark); it was decoded as such.'],
  },
  {
    id: 'utf16be-bom', file: 'hostile/utf16be.csv', traces: 1, points: 10,
    notices: [READ_AS('comma, decimal point (UTF-16BE)', 2), 'The file is UTF-16BE text (it starts with a byte-order mark); it was decoded as such.'],
    values: (r) => {
      expect(arr(r.traces[0].x)).toEqual(PEAK_X);
      expect(arr(r.traces[0].y)).toEqual(PEAK_Y);
      expect([r.traces[0].xUnit, r.traces[0].yUnit]).toEqual(['s', 'mV']);
    },
  },
  { id: 'utf16-no-bom', file: 'hostile/utf16le-no-bom.csv', error: 'UTF-16 text without a byte-order mark' },
  {
    id: 'latin1-degree', file: 'text/latin1-degree.csv', traces: 1, points: 5,
    notices: [READ_AS('comma, decimal point (Latin-1)', 2), /^The file is not valid UTF-8 \(first bad byte at line 1\), so it was read as Latin-1/],
    values: (r) => {
      expect(r.traces[0].xUnit).toBe('°C');
      expect(arr(r.traces[0].x)).toEqual([20, 25, 30, 35, 40]);
      expect(arr(r.traces[0].y)).toEqual([0.512, 0.498, 0.481, 0.467, 0.45]);
    },
  },
  {
    id: 'latin1-micro-semicolon', file: 'hostile/latin1-micro.csv', traces: 1, points: 10,
    notices: [READ_AS('semicolon, decimal comma (Latin-1)', 3), /^The file is not valid UTF-8 \(first bad byte at line 1\)/],
    values: (r) => {
      expect(r.traces[0].yUnit).toBe('µA');
      expect(r.report.metadata.Oven).toBe('40 °C');
      expect(arr(r.traces[0].y)).toEqual(PEAK_Y);
    },
  },
  { id: 'one-row', file: 'hostile/one-row.csv', error: 'Only 1 row of numbers could be read; a trace needs at least 5 points.', errorLine: 1 },
  { id: 'four-rows', file: 'hostile/four-rows.csv', error: 'Only 4 rows of numbers could be read', errorLine: 2 },
  {
    id: 'five-rows', file: 'hostile/five-rows.csv', traces: 1, points: 5, notices: [READ_AS('comma, decimal point (UTF-8)', 2)],
    values: (r) => expect(arr(r.traces[0].y)).toEqual([1, 2, 3, 4, 5]),
  },
  { id: 'header-only', file: 'hostile/header-only.csv', error: 'The file holds only text: no line has a number that could be read.' },
  { id: 'two-text-columns', file: 'hostile/two-text-columns.csv', error: 'The file holds only text' },
  { id: 'prose', file: 'text/only-text.txt', error: 'only text' },
  {
    id: 'nan-infinity-column', file: 'hostile/nan-infinity-column.csv', traces: 1, points: 10,
    notices: [READ_AS('comma, decimal point (UTF-8)', 2), NOT_LOADED('column 3 (Broken)')],
    values: (r) => { expect(r.traces[0].yName).toBe('Signal'); expect(arr(r.traces[0].y)).toEqual(PEAK_Y); },
  },
  {
    id: 'nan-infinity-rows', file: 'hostile/nan-rows.csv', traces: 1, points: 8,
    notices: [READ_AS('comma, decimal point (UTF-8)', 2), SKIPPED(2, 5)],
    values: (r) => {
      expect(r.report.skipped.map((s) => s.line)).toEqual([5, 8]);
      expect(arr(r.traces[0].x)).toEqual([0, 0.1, 0.2, 0.4, 0.5, 0.7, 0.8, 0.9]);
      expect(arr(r.traces[0].y)).toEqual([0.193, 1.832, 10.54, 77.88, 100, 36.788, 10.54, 1.832]);
    },
  },
  {
    id: 'thousands-comma', file: 'text/thousands.csv', traces: 1, points: 5,
    notices: [READ_AS('comma, decimal point (UTF-8)', 2), SKIPPED(1, 4)],
    values: (r) => expect(arr(r.traces[0].y)).toEqual([1.5, 2.5, 3.5, 4.5, 5.5]),
  },
  {
    id: 'thousands-semicolon', file: 'hostile/thousands-semicolon.csv', traces: 1, points: 6,
    notices: [READ_AS('semicolon, decimal comma (UTF-8)', 2), SKIPPED(1, 4)],
    values: (r) => {
      expect(r.report.skipped[0].reason).toContain('"1.234,5"');
      expect(arr(r.traces[0].y)).toEqual([1.5, 2.5, 3.5, 4.5, 5.5, 6.5]);
    },
  },
  {
    id: 'exponent-decimal-comma', file: 'hostile/exponent-decimal-comma.csv', traces: 1, points: 6,
    notices: [READ_AS('semicolon, decimal comma (UTF-8)', 2)],
    values: (r) => expect(arr(r.traces[0].y)).toEqual([1.5e-3, 2.25e2, -3, 41.25, 0.5, 6.75]),
  },
  {
    id: 'mixed-delimiters', file: 'hostile/mixed-delimiters.csv', traces: 1, points: 7,
    notices: [READ_AS('comma, decimal point (UTF-8)', 2), SKIPPED(3, 4)],
    values: (r) => {
      expect(r.report.skipped.map((s) => s.line)).toEqual([4, 7, 9]);
      expect(arr(r.traces[0].x)).toEqual([0, 1, 3, 4, 6, 8, 9]);
      expect(arr(r.traces[0].y)).toEqual([10, 11, 13, 14, 16, 18, 19]);
    },
  },
  {
    id: 'ragged-rows', file: 'hostile/ragged.csv', traces: 2, points: 6,
    notices: [READ_AS('comma, decimal point (UTF-8)', 2), SKIPPED(3, 4)],
    values: (r) => {
      expect(r.report.skipped.map((s) => [s.line, s.reason])).toEqual([
        [4, 'has 2 fields; the table has 3'], [6, 'has 4 fields; the table has 3'], [8, 'has 1 field; the table has 3'],
      ]);
      expect(arr(r.traces[0].x)).toEqual([0, 1, 3, 5, 7, 8]);
      expect(arr(r.traces[1].y)).toEqual([2, 3, 5, 7, 9, 10]);
    },
  },
  {
    id: 'quoted-delimiters-newlines', file: 'hostile/quoted-newlines.csv', traces: 1, points: 6,
    notices: [READ_AS('comma, decimal point (UTF-8)', 2), NOT_LOADED('column 3 (Note)')],
    values: (r) => {
      expect([r.traces[0].xName, r.traces[0].xUnit, r.traces[0].yName, r.traces[0].yUnit]).toEqual(['Time, corrected', 'min', 'Signal', 'mV']);
      expect(arr(r.traces[0].x)).toEqual([0, 1, 2, 3, 4, 5]);
      expect(arr(r.traces[0].y)).toEqual([1, 2, 3, 4, 5, 6]);
      expect(r.report.skipped).toEqual([]);
    },
  },
  {
    id: 'preamble-200-lines', file: 'hostile/preamble-200.csv', traces: 1, points: 10,
    notices: [READ_AS('comma, decimal point (UTF-8)', 202)],
    values: (r) => {
      expect(Object.keys(r.report.metadata)).toHaveLength(200);
      expect(r.report.metadata['Setting 200']).toBe('value 200');
      expect(arr(r.traces[0].y)).toEqual(PEAK_Y);
    },
  },
  {
    id: 'x-descending', file: 'hostile/x-descending.csv', traces: 1, points: 10,
    notices: [READ_AS('comma, decimal point (UTF-8)', 2), /^x was not in ascending order \(at line 3 it falls from 4000 to 3900\), so the rows were sorted by x/],
    values: (r) => {
      // File: x = 4000 − 100 i, y = 50 + i; ascending x must carry its own y.
      expect(arr(r.traces[0].x)).toEqual([3100, 3200, 3300, 3400, 3500, 3600, 3700, 3800, 3900, 4000]);
      expect(arr(r.traces[0].y)).toEqual([59, 58, 57, 56, 55, 54, 53, 52, 51, 50]);
    },
  },
  {
    id: 'x-duplicates', file: 'text/duplicates.csv', traces: 1, points: 6,
    notices: [READ_AS('comma, decimal point (UTF-8)', 2), /^3 rows repeat an x value already present, in 2 sets \(first: x = 0\.1 at lines 3 and 4\)/],
    values: (r) => {
      expect(arr(r.traces[0].x)).toEqual([0, 0.1, 0.2, 0.3, 0.4, 0.5]);
      expect(arr(r.traces[0].y)).toEqual([1, 3, 5, 8, 7, 3]);
    },
  },
  { id: 'x-all-same', file: 'hostile/x-all-same.csv', error: 'After averaging rows with the same x only 1 distinct x value remain', errorLine: 2 },
  {
    id: 'x-huge-gap', file: 'hostile/x-huge-gap.csv', traces: 1, points: 7, notices: [READ_AS('comma, decimal point (UTF-8)', 2)],
    values: (r) => {
      expect(arr(r.traces[0].x)).toEqual([0, 1, 2, 3, 1000003, 1000004, 1000005]);
      expect(arr(r.traces[0].y)).toEqual([1, 2, 3, 4, 5, 6, 7]);
    },
  },
  {
    id: 'constant-y', file: 'hostile/constant-y.csv', traces: 1, points: 12, notices: [READ_AS('comma, decimal point (UTF-8)', 2)],
    values: (r) => expect(arr(r.traces[0].y).every((v) => v === 0.1)).toBe(true),
  },
  {
    id: 'extreme-magnitudes', file: 'hostile/extreme-y.csv', traces: 1, points: 6,
    notices: [READ_AS('comma, decimal point (UTF-8)', 2), SKIPPED(1, 7)],
    values: (r) => {
      // Kept exactly, subnormals included; 1e999 overflows and is skipped, not turned into Infinity.
      expect(arr(r.traces[0].y)).toEqual([1e300, 1e-300, -1e300, 4.9e-324, Number.MAX_VALUE, -2.5e-310]);
      expect(r.report.skipped[0].reason).toContain('"1e999"');
      expect(arr(r.traces[0].x)).toEqual([0, 1, 2, 3, 4, 6]);
    },
  },
  {
    id: 'last-line-cut', file: 'hostile/last-line-cut.csv', traces: 1, points: 10,
    notices: [READ_AS('comma, decimal point (UTF-8)', 2), SKIPPED(1, 12)],
    values: (r) => { expect(arr(r.traces[0].y)).toEqual(PEAK_Y); expect(r.report.skipped[0].text).toBe('1.0,'); },
  },
  {
    id: 'cr-only', file: 'text/cr-only.csv', traces: 1, points: 6, notices: [READ_AS('comma, decimal point (UTF-8)', 2)],
    values: (r) => expect(arr(r.traces[0].y)).toEqual([0.25, 1, 5, 1, 0.25, 0.125]),
  },
  {
    id: 'mixed-newlines', file: 'hostile/mixed-newlines.csv', traces: 1, points: 6, notices: [READ_AS('comma, decimal point (UTF-8)', 2)],
    values: (r) => expect(arr(r.traces[0].y)).toEqual([1, 2, 3, 4, 5, 6]),
  },
  {
    id: 'markup-in-header', file: 'hostile/markup-header.csv', traces: 1, points: 10, notices: [READ_AS('comma, decimal point (UTF-8)', 2)],
    values: (r) => expect(r.traces[0].yName).toBe('<img src=x onerror="window.__pwned=1">=cmd|calc'),
  },
  {
    id: 'control-characters', file: 'hostile/control-chars.csv', traces: 1, points: 10, notices: [READ_AS('comma, decimal point (UTF-8)', 3)],
    values: (r) => expect(arr(r.traces[0].y)).toEqual(PEAK_Y),
  },
  {
    id: 'fifty-megabytes', file: bigInput, name: 'big-50MB.csv', traces: 1, notices: [READ_AS('comma, decimal point (UTF-8)', 2)],
    values: (r) => {
      const b = big!;
      const t = r.traces[0];
      expect(t.x.length).toBe(b.rows);
      expect([t.x[0], t.y[0]]).toEqual(b.first);
      expect([t.x[t.x.length - 1], t.y[t.y.length - 1]]).toEqual(b.last);
    },
  },
  { id: 'one-long-line', file: () => longLine(1_000_000), name: 'long-line.csv', error: /Only 0 rows|only text|numbers/ },
  {
    id: 'jcamp-named-csv', file: 'hostile/jcamp-named.csv', traces: 1, points: 9, notices: [],
    values: (r) => {
      expect(r.report.format).toMatch(/JCAMP-DX/);
      expect(arr(r.traces[0].x)).toEqual([400, 405, 410, 415, 420, 425, 430, 435, 440]);
      expect(arr(r.traces[0].y)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8]);
      expect(r.traces[0].xUnit).toBe('nm');
    },
  },
  { id: 'jcamp-wrong-npoints', file: 'jcamp/npoints-wrong.jdx', error: '##NPOINTS= (line 10) says 12 points, but ##XYDATA= holds 10 y values.', errorLine: 10 },
  { id: 'jcamp-truncated', file: 'jcamp/truncated.jdx', error: 'The block has no ##END= line, so the file looks cut short.', errorLine: 10 },
  { id: 'jcamp-garbage-data', file: 'hostile/jcamp-garbage-data.jdx', error: 'Line 11 holds a character that is not part of any JCAMP-DX number form', errorLine: 11 },
  { id: 'jcamp-dif-check', file: 'jcamp/dif-check-bad.jdx', error: 'DIF y-check failed on line 13', errorLine: 13 },
  { id: 'netcdf-missing-ordinate', file: 'hostile/netcdf-no-ordinate.cdf', error: 'The variable ordinate_values (the detector signal) is missing' },
  { id: 'netcdf-missing-timing', file: 'hostile/netcdf-no-timing.cdf', error: 'The variable actual_sampling_interval is missing' },
  { id: 'netcdf-nan', file: 'hostile/netcdf-nan.cdf', error: 'ordinate_values at point 8 is not a finite number (NaN).' },
  { id: 'netcdf-truncated', file: 'hostile/netcdf-truncated.cdf', error: 'The file is cut short: the variable ordinate_values needs bytes up to 664, but the file has only 624.' },
];

interface RecipeEntry {
  id: string;
  file: string | (() => string);
  /** Problem fragments; absent means the recipe must parse. */
  problems?: (string | RegExp)[];
}

const RECIPE_ENTRIES: RecipeEntry[] = [
  { id: 'recipe-json-bomb-array', file: 'hostile/recipe-bomb-array.json', problems: ['nested more than 16 levels deep'] },
  { id: 'recipe-json-bomb-object', file: 'hostile/recipe-bomb-object.json', problems: ['nested more than 16 levels deep'] },
  { id: 'recipe-over-1mb', file: () => ' '.repeat(1_000_001), problems: ['recipes are at most 1000000'] },
  { id: 'recipe-unknown-step', file: 'hostile/recipe-unknown-step.json', problems: ['Step 1: unknown step "magic-clean". Known steps:'] },
  { id: 'recipe-window-zero', file: 'hostile/recipe-window-zero.json', problems: ['Step 1 (Moving average): Window must be between 3 and 100001 points; got 0.'] },
  { id: 'recipe-window-even', file: 'hostile/recipe-window-even.json', problems: ['Step 1 (Savitzky–Golay): Window must be odd (3, 5, 7, …) so the window has a centre; got 10.'] },
  { id: 'recipe-window-negative', file: 'hostile/recipe-window-negative.json', problems: ['Step 1 (Remove spikes): Window must be between 3 and 1001 points; got -5.'] },
  { id: 'recipe-window-1e9', file: 'hostile/recipe-window-1e9.json', problems: ['Step 1 (Moving average): Window must be between 3 and 100001 points; got 1000000000.'] },
  { id: 'recipe-window-larger-than-trace', file: 'hostile/recipe-window-larger-than-trace.json' },
  { id: 'recipe-nan-string', file: 'hostile/recipe-nan-string.json', problems: ['Step 1 (Frequency filter): Cutoff must be a finite number.'] },
  { id: 'recipe-nan-literal', file: 'hostile/recipe-nan-literal.json', problems: [/^The recipe file is not valid JSON: /] },
  { id: 'recipe-null-param', file: 'hostile/recipe-null-param.json', problems: ['Step 1 (Savitzky–Golay): Polynomial order must be a number.'] },
  { id: 'recipe-proto-key', file: 'hostile/recipe-proto-key.json', problems: ['Step 1 (Moving average): unknown parameter "__proto__".'] },
  { id: 'recipe-too-many-steps', file: 'hostile/recipe-too-many-steps.json', problems: ['The recipe has 51 steps; at most 50 are allowed.'] },
  { id: 'recipe-newer-version', file: 'hostile/recipe-newer-version.json', problems: [/written by a newer version of Tracewright \(recipe version 99/] },
];

function matches(text: string, want: string | RegExp): boolean {
  return typeof want === 'string' ? text.includes(want) : want.test(text);
}

describe('hostile data files: loadFile gives the stated outcome', () => {
  for (const e of LOAD_ENTRIES) {
    it(e.id, { timeout: 120_000 }, () => {
      const bytes = typeof e.file === 'string' ? read(e.file) : e.file();
      const copy = bytes.slice();
      const name = e.name ?? (typeof e.file === 'string' ? e.file.split('/').pop()! : e.id);
      const r = loadFile(bytes, name);
      expect(Buffer.compare(bytes, copy)).toBe(0); // raw bytes are only read
      if (e.error !== undefined) {
        expect(r.ok, r.ok ? `loaded, notices ${JSON.stringify(r.report.notices)}` : '').toBe(false);
        if (r.ok) return;
        expect(r.error.fileName).toBe(name);
        expect(matches(r.error.problem, e.error), r.error.problem).toBe(true);
        expect(r.error.advice.length).toBeGreaterThan(10);
        if (e.errorLine !== undefined) expect(r.error.line).toBe(e.errorLine);
        return;
      }
      expect(r.ok, r.ok ? '' : JSON.stringify(r.error)).toBe(true);
      if (!r.ok) return;
      if (e.traces !== undefined) expect(r.traces).toHaveLength(e.traces);
      if (e.points !== undefined) for (const t of r.traces) expect(t.x.length).toBe(e.points);
      const notices = r.report.notices;
      expect(notices, JSON.stringify(notices)).toHaveLength(e.notices!.length);
      for (const want of e.notices!) expect(notices.some((n) => matches(n, want)), `${String(want)} in ${JSON.stringify(notices)}`).toBe(true);
      for (const t of r.traces) {
        let ascending = true;
        for (let i = 1; i < t.x.length; i++) if (!(t.x[i] > t.x[i - 1])) ascending = false;
        expect(ascending).toBe(true);
        expect(t.y.every(Number.isFinite)).toBe(true);
      }
      e.values?.(r);
    });
  }
});

describe('hostile recipes: parseRecipeText names every problem', () => {
  for (const e of RECIPE_ENTRIES) {
    it(e.id, () => {
      const text = typeof e.file === 'string' ? readFileSync(FIX + e.file, 'utf8') : e.file();
      const r = parseRecipeText(text, STEP_REGISTRY);
      if (!e.problems) { expect(r.ok, r.ok ? '' : r.problems.join(' | ')).toBe(true); return; }
      expect(r.ok).toBe(false);
      if (r.ok) return;
      expect(r.problems).toHaveLength(e.problems.length);
      e.problems.forEach((want, i) => expect(matches(r.problems[i], want), r.problems[i]).toBe(true));
    });
  }

  it('a recipe with windows larger than the trace runs: those steps come back as errors with a message, the others run', () => {
    const r = parseRecipeText(readFileSync(FIX + 'hostile/recipe-window-larger-than-trace.json', 'utf8'), STEP_REGISTRY);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    // 41 evenly spaced points of an invented ramp with a bump.
    const n = 41;
    const x = Float64Array.from({ length: n }, (_, i) => i * 0.5);
    const y = Float64Array.from({ length: n }, (_, i) => 0.1 * i + 5 * Math.exp(-((i - 20) ** 2) / 8));
    const x0 = x.slice(), y0 = y.slice();
    let result: ReturnType<typeof runPipeline> | undefined;
    expect(() => { result = runPipeline({ x, y }, 'hostile', r.recipe, STEP_REGISTRY); }).not.toThrow();
    const runs = result!.runs;
    expect(runs.map((s) => s.status)).toEqual(['ok', 'error', 'error', 'error', 'error', 'error', 'ok']);
    expect(runs[1].message).toBe('The window (101 points) is larger than the trace (41 points); choose at most 41.');
    expect(runs[2].message).toBe('The window (101 points) is larger than the trace (41 points); choose at most 41.');
    for (const s of runs.slice(1, 6)) expect(s.message!.length).toBeGreaterThan(20);
    expect(runs[5].message).toBe('The group size (1000 points) is larger than the trace (41 points).');
    expect(result!.final.y.length).toBe(n);
    expect(arr(x)).toEqual(arr(x0));
    expect(arr(y)).toEqual(arr(y0));
  });

  it('a huge gap in x: steps that need even spacing report it instead of running', () => {
    const loaded = loadFile(read('hostile/x-huge-gap.csv'), 'x-huge-gap.csv');
    expect(loaded.ok).toBe(true);
    if (!loaded.ok) return;
    const r = parseRecipeText(JSON.stringify({ format: 'tracewright-recipe', version: 1, steps: [{ step: 'savitzky-golay', params: { window: 5 } }] }), STEP_REGISTRY);
    if (!r.ok) throw new Error(r.problems.join('; '));
    const t = loaded.traces[0];
    const out = runPipeline({ x: t.x, y: t.y }, t.id, r.recipe, STEP_REGISTRY);
    expect(out.runs[0].status).toBe('error');
    expect(out.runs[0].message).toMatch(/evenly spaced/);
    expect(arr(out.final.y)).toEqual(arr(t.y));
  });
});

describe('the catalogue table and the fixture files agree', () => {
  it('every entry has one row in test/hostile-catalogue.md and the table has no extra rows', () => {
    const md = readFileSync('test/hostile-catalogue.md', 'utf8');
    const ids = [...md.matchAll(/^\| *\d+ *\| *`([\w-]+)` *\|/gm)].map((m) => m[1]);
    const want = [...LOAD_ENTRIES.map((e) => e.id), ...RECIPE_ENTRIES.map((e) => e.id)];
    expect(ids.slice().sort()).toEqual(want.slice().sort());
    expect(want.length).toBeGreaterThanOrEqual(40);
  });

  it('the committed hostile files are exactly what make-hostile.mjs writes', () => {
    for (const [name, bytes] of Object.entries(hostileFiles())) expect(Buffer.compare(read(`hostile/${name}`), bytes), name).toBe(0);
  });
});
