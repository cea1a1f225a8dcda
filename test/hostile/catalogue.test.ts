/**
 * The hostile-input catalogue: every case of test/hostile/catalogue.json (the
 * machine-readable list; test/hostile-catalogue.md shows it as tables) is
 * driven through the real entry points (loadFile for data files,
 * parseRecipeText for recipes, runPipeline for recipes that parse) and must
 * give exactly the outcome stated: a named error (text fragment or pattern,
 * and the line), or a load with the stated notices (no more, no fewer) and
 * the values checked below case by case.
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
import { MAX_Y_COLUMNS } from '../../src/core/io/types.ts';
import { parseRecipeText } from '../../src/core/method.ts';
import { runPipeline } from '../../src/core/pipeline.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import * as makers from '../fixtures/hostile/make-hostile.mjs';
import { withTables } from './catalogue-md.mjs';

const FIX = 'test/fixtures/';
const read = (rel: string) => new Uint8Array(readFileSync(FIX + rel));

type Loaded = Extract<LoadResult, { ok: true }>;
type Message = string | { pattern: string };

interface Case {
  id: string;
  /** Path under test/fixtures, or a generator of make-hostile.mjs for inputs made at run time. */
  file?: string;
  generate?: { fn: string; args: number[] };
  name?: string;
  input: string;
  odd: string;
  shows: string;
  expect: 'load' | 'refuse';
  message?: Message;
  line?: number;
  notices?: Message[];
  traces?: number;
  points?: number;
  problems?: Message[];
}

const CATALOGUE = JSON.parse(readFileSync('test/hostile/catalogue.json', 'utf8')) as { format: string; version: number; data: Case[]; recipes: Case[] };

const PEAK_X = [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9];
// Written in the fixture as round(100·exp(−(i−5)²/4), 3); make-hostile.mjs.
const PEAK_Y = [0.193, 1.832, 10.54, 36.788, 77.88, 100, 77.88, 36.788, 10.54, 1.832];

const arr = (a: Float64Array) => Array.from(a);

// Generated inputs are made once per run (the 50 MB CSV is also checked value by value below).
const made = new Map<string, unknown>();
function generated(g: { fn: string; args: number[] }): Uint8Array {
  const key = `${g.fn}(${g.args.join(',')})`;
  if (!made.has(key)) {
    const fn = (makers as unknown as Record<string, (...a: number[]) => unknown>)[g.fn];
    if (typeof fn !== 'function') throw new Error(`make-hostile.mjs has no generator ${g.fn}`);
    made.set(key, fn(...g.args));
  }
  const v = made.get(key);
  return v instanceof Uint8Array ? v : (v as { bytes: Uint8Array }).bytes;
}
const bytesOf = (c: Case) => (c.file !== undefined ? read(c.file) : generated(c.generate!));
const nameOf = (c: Case) => c.name ?? (c.file !== undefined ? c.file.split('/').pop()! : c.id);

/** Checks beyond counts and notices, case by case (the numbers in the file). */
const VALUES: Record<string, (r: Loaded) => void> = {
  'utf16be-bom': (r) => {
      expect(arr(r.traces[0].x)).toEqual(PEAK_X);
      expect(arr(r.traces[0].y)).toEqual(PEAK_Y);
      expect([r.traces[0].xUnit, r.traces[0].yUnit]).toEqual(['s', 'mV']);
    },
  'latin1-degree': (r) => {
      expect(r.traces[0].xUnit).toBe('°C');
      expect(arr(r.traces[0].x)).toEqual([20, 25, 30, 35, 40]);
      expect(arr(r.traces[0].y)).toEqual([0.512, 0.498, 0.481, 0.467, 0.45]);
    },
  'latin1-micro-semicolon': (r) => {
      expect(r.traces[0].yUnit).toBe('µA');
      expect(r.report.metadata.Oven).toBe('40 °C');
      expect(arr(r.traces[0].y)).toEqual(PEAK_Y);
    },
  'five-rows': (r) => expect(arr(r.traces[0].y)).toEqual([1, 2, 3, 4, 5]),
  'nan-infinity-column': (r) => { expect(r.traces[0].yName).toBe('Signal'); expect(arr(r.traces[0].y)).toEqual(PEAK_Y); },
  'nan-infinity-rows': (r) => {
      expect(r.report.skipped.map((s) => s.line)).toEqual([5, 8]);
      expect(arr(r.traces[0].x)).toEqual([0, 0.1, 0.2, 0.4, 0.5, 0.7, 0.8, 0.9]);
      expect(arr(r.traces[0].y)).toEqual([0.193, 1.832, 10.54, 77.88, 100, 36.788, 10.54, 1.832]);
    },
  'thousands-comma': (r) => expect(arr(r.traces[0].y)).toEqual([1.5, 2.5, 3.5, 4.5, 5.5]),
  'thousands-semicolon': (r) => {
      // "1.234,5" holds both signs, so it is 1234.5; the rest of the column is plain decimal comma.
      expect(r.report.skipped).toEqual([]);
      expect(arr(r.traces[0].y)).toEqual([1.5, 2.5, 1234.5, 3.5, 4.5, 5.5, 6.5]);
    },
  'exponent-decimal-comma': (r) => expect(arr(r.traces[0].y)).toEqual([1.5e-3, 2.25e2, -3, 41.25, 0.5, 6.75]),
  'mixed-delimiters': (r) => {
      expect(r.report.skipped.map((s) => s.line)).toEqual([4, 7, 9]);
      expect(arr(r.traces[0].x)).toEqual([0, 1, 3, 4, 6, 8, 9]);
      expect(arr(r.traces[0].y)).toEqual([10, 11, 13, 14, 16, 18, 19]);
    },
  'ragged-rows': (r) => {
      expect(r.report.skipped.map((s) => [s.line, s.reason])).toEqual([
        [4, 'has 2 fields; the table has 3'], [6, 'has 4 fields; the table has 3'], [8, 'has 1 field; the table has 3'],
      ]);
      expect(arr(r.traces[0].x)).toEqual([0, 1, 3, 5, 7, 8]);
      expect(arr(r.traces[1].y)).toEqual([2, 3, 5, 7, 9, 10]);
    },
  'quoted-delimiters-newlines': (r) => {
      expect([r.traces[0].xName, r.traces[0].xUnit, r.traces[0].yName, r.traces[0].yUnit]).toEqual(['Time, corrected', 'min', 'Signal', 'mV']);
      expect(arr(r.traces[0].x)).toEqual([0, 1, 2, 3, 4, 5]);
      expect(arr(r.traces[0].y)).toEqual([1, 2, 3, 4, 5, 6]);
      expect(r.report.skipped).toEqual([]);
    },
  'preamble-200-lines': (r) => {
      expect(Object.keys(r.report.metadata)).toHaveLength(200);
      expect(r.report.metadata['Setting 200']).toBe('value 200');
      expect(arr(r.traces[0].y)).toEqual(PEAK_Y);
    },
  'x-descending': (r) => {
      // File: x = 4000 − 100 i, y = 50 + i; ascending x must carry its own y.
      expect(arr(r.traces[0].x)).toEqual([3100, 3200, 3300, 3400, 3500, 3600, 3700, 3800, 3900, 4000]);
      expect(arr(r.traces[0].y)).toEqual([59, 58, 57, 56, 55, 54, 53, 52, 51, 50]);
    },
  'x-duplicates': (r) => {
      expect(arr(r.traces[0].x)).toEqual([0, 0.1, 0.2, 0.3, 0.4, 0.5]);
      expect(arr(r.traces[0].y)).toEqual([1, 3, 5, 8, 7, 3]);
    },
  'x-huge-gap': (r) => {
      expect(arr(r.traces[0].x)).toEqual([0, 1, 2, 3, 1000003, 1000004, 1000005]);
      expect(arr(r.traces[0].y)).toEqual([1, 2, 3, 4, 5, 6, 7]);
    },
  'constant-y': (r) => expect(arr(r.traces[0].y).every((v) => v === 0.1)).toBe(true),
  'extreme-magnitudes': (r) => {
      // Kept exactly, subnormals included; 1e999 overflows and is skipped, not turned into Infinity.
      expect(arr(r.traces[0].y)).toEqual([1e300, 1e-300, -1e300, 4.9e-324, Number.MAX_VALUE, -2.5e-310]);
      expect(r.report.skipped[0].reason).toContain('"1e999"');
      expect(arr(r.traces[0].x)).toEqual([0, 1, 2, 3, 4, 6]);
    },
  'last-line-cut': (r) => { expect(arr(r.traces[0].y)).toEqual(PEAK_Y); expect(r.report.skipped[0].text).toBe('1.0,'); },
  'cr-only': (r) => expect(arr(r.traces[0].y)).toEqual([0.25, 1, 5, 1, 0.25, 0.125]),
  'mixed-newlines': (r) => expect(arr(r.traces[0].y)).toEqual([1, 2, 3, 4, 5, 6]),
  'markup-in-header': (r) => expect(r.traces[0].yName).toBe('<img src=x onerror="window.__pwned=1">=cmd|calc'),
  'control-characters': (r) => expect(arr(r.traces[0].y)).toEqual(PEAK_Y),
  'fifty-megabytes': (r) => {
    const b = makers.bigCsv(50 * 1024 * 1024);
    const t = r.traces[0];
    expect(t.x.length).toBe(b.rows);
    expect([t.x[0], t.y[0]]).toEqual(b.first);
    expect([t.x[t.x.length - 1], t.y[t.y.length - 1]]).toEqual(b.last);
  },
  'tiny-x-spacing': (r) => {
    expect(arr(r.traces[0].x)).toEqual([0, 5e-324, 1e-323, 1.5e-323, 2e-323, 2.5e-323, 3e-323, 3.5e-323]);
    expect(arr(r.traces[0].y)).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
  },
  'huge-1e308': (r) => expect(arr(r.traces[0].y)).toEqual(PEAK_Y.map((v, i) => (i === 4 ? 1e308 : v))),
  'huge-pair': (r) => expect(arr(r.traces[0].y)).toEqual(PEAK_Y.map((v, i) => (i === 3 ? 1.5e308 : i === 6 ? -1.5e308 : v))),
  'decimal-comma-thousands-dot': (r) => {
    // File: x = 1000 + 0.5 i, y = 1234.5 + 11 i, written "1.000,5;1.245,5".
    expect(arr(r.traces[0].x)).toEqual(Array.from({ length: 10 }, (_, i) => 1000 + 0.5 * i));
    expect(arr(r.traces[0].y)).toEqual(Array.from({ length: 10 }, (_, i) => 1234.5 + 11 * i));
    expect([r.traces[0].xName, r.traces[0].xUnit, r.traces[0].yName, r.traces[0].yUnit]).toEqual(['Zeit', 's', 'Signal', 'mV']);
  },
  'thousands-comma-tab': (r) => expect(arr(r.traces[0].y)).toEqual(Array.from({ length: 8 }, (_, i) => 1234.5 + 1000 * i)),
  'thousands-quoted': (r) => {
    expect(arr(r.traces[0].x)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    expect(arr(r.traces[0].y)).toEqual(Array.from({ length: 8 }, (_, i) => 1234.5 + 1000 * i));
  },
  'thousands-dot-two-groups': (r) => expect(arr(r.traces[0].y)).toEqual(Array.from({ length: 8 }, (_, i) => 1234567 + 1111111 * i)),
  'semicolon-1-250': (r) => expect(arr(r.traces[0].y)).toEqual(Array.from({ length: 8 }, (_, i) => Number(`1.${250 + i}`))),
  'header-fewer-names': (r) => {
    expect(arr(r.traces[0].y)).toEqual(Array.from({ length: 8 }, (_, i) => 1.5 + i));
    expect(arr(r.traces[1].y)).toEqual(Array.from({ length: 8 }, (_, i) => 2.5 + i));
  },
  'partly-1e309': (r) => partlyNumeric(r),
  'partly-hex': (r) => partlyNumeric(r),
  'partly-underscore': (r) => partlyNumeric(r),
  'second-y-all-nan': (r) => { expect(r.traces[0].yName).toBe('A'); expect(arr(r.traces[0].y)).toEqual(PEAK_Y); },
  'only-x-like-column': (r) => { expect(arr(r.traces[0].y)).toEqual(PEAK_X); expect(r.traces[0].xName).toBe('Point'); },
  'utf32le-bom': (r) => { expect(arr(r.traces[0].x)).toEqual(PEAK_X); expect(arr(r.traces[0].y)).toEqual(PEAK_Y); expect(r.traces[0].yUnit).toBe('mV'); },
  'utf32be-bom': (r) => { expect(arr(r.traces[0].x)).toEqual(PEAK_X); expect(arr(r.traces[0].y)).toEqual(PEAK_Y); },
  'wide-100000-columns': (r) => wide(r),
  'wide-3000-columns': (r) => wide(r),
};

/** Column A whole; column B without the two bad rows (lines 4 and 9), each point with its own x. */
function partlyNumeric(r: Loaded) {
  const [a, b] = r.traces;
  expect(arr(a.y)).toEqual(PEAK_Y);
  expect(arr(b.x)).toEqual(PEAK_X.filter((_, i) => i !== 2 && i !== 7));
  expect(arr(b.y)).toEqual([0, 2, 6, 8, 10, 12, 16, 18]);
}

/** The first MAX_Y_COLUMNS columns: cell (i, j) is (i + j) mod 10. */
function wide(r: Loaded) {
  expect(r.traces).toHaveLength(MAX_Y_COLUMNS);
  r.traces.forEach((t, j) => {
    expect(t.yName).toBe(`c${j + 1}`);
    expect(arr(t.y)).toEqual(Array.from({ length: 12 }, (_, i) => (i + j) % 10));
  });
}

function matches(text: string, want: Message): boolean {
  return typeof want === 'string' ? text.includes(want) : new RegExp(want.pattern).test(text);
}
const show = (m: Message) => (typeof m === 'string' ? m : `/${m.pattern}/`);

describe('hostile data files: loadFile gives the stated outcome', () => {
  for (const e of CATALOGUE.data) {
    it(e.id, { timeout: 120_000 }, () => {
      const bytes = bytesOf(e);
      const copy = bytes.slice();
      const name = nameOf(e);
      const r = loadFile(bytes, name);
      expect(Buffer.compare(bytes, copy)).toBe(0); // raw bytes are only read
      if (e.expect === 'refuse') {
        expect(r.ok, r.ok ? `loaded, notices ${JSON.stringify(r.report.notices)}` : '').toBe(false);
        if (r.ok) return;
        expect(r.error.fileName).toBe(name);
        expect(matches(r.error.problem, e.message!), `${r.error.problem} should show ${show(e.message!)}`).toBe(true);
        expect(r.error.advice.length).toBeGreaterThan(10);
        if (e.line !== undefined) expect(r.error.line).toBe(e.line);
        return;
      }
      expect(r.ok, r.ok ? '' : JSON.stringify(r.error)).toBe(true);
      if (!r.ok) return;
      if (e.traces !== undefined) expect(r.traces).toHaveLength(e.traces);
      if (e.points !== undefined) for (const t of r.traces) expect(t.x.length).toBe(e.points);
      const notices = r.report.notices;
      expect(notices, JSON.stringify(notices)).toHaveLength(e.notices!.length);
      for (const want of e.notices!) expect(notices.some((n) => matches(n, want)), `${show(want)} in ${JSON.stringify(notices)}`).toBe(true);
      for (const t of r.traces) {
        let ascending = true;
        for (let i = 1; i < t.x.length; i++) if (!(t.x[i] > t.x[i - 1])) ascending = false;
        expect(ascending).toBe(true);
        expect(t.y.every(Number.isFinite)).toBe(true);
      }
      VALUES[e.id]?.(r);
    });
  }
});

describe('hostile recipes: parseRecipeText names every problem', () => {
  for (const e of CATALOGUE.recipes) {
    it(e.id, () => {
      const text = new TextDecoder().decode(bytesOf(e));
      const r = parseRecipeText(text, STEP_REGISTRY);
      if (e.expect === 'load') { expect(r.ok, r.ok ? '' : r.problems.join(' | ')).toBe(true); return; }
      expect(r.ok).toBe(false);
      if (r.ok) return;
      expect(r.problems).toHaveLength(e.problems!.length);
      e.problems!.forEach((want, i) => expect(matches(r.problems[i], want), r.problems[i]).toBe(true));
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

describe('the catalogue, its tables and the fixture files agree', () => {
  it('catalogue.json is well formed: unique ids, an input, an outcome and its message for every case', () => {
    expect(CATALOGUE.format).toBe('tracewright-hostile-catalogue');
    const all = [...CATALOGUE.data, ...CATALOGUE.recipes];
    expect(new Set(all.map((e) => e.id)).size).toBe(all.length);
    for (const e of all) {
      expect((e.file === undefined) !== (e.generate === undefined), `${e.id}: exactly one of file and generate`).toBe(true);
      expect(['load', 'refuse']).toContain(e.expect);
      if (e.expect === 'refuse') expect(e.message ?? e.problems, e.id).toBeDefined();
      if (e.expect === 'load' && CATALOGUE.data.includes(e)) expect(e.notices, e.id).toBeDefined();
      expect(e.input && e.odd && e.shows, e.id).toBeTruthy();
    }
    // Issue 9 started the catalogue with 65 cases; issue 13 asked for at least 30 more.
    expect(all.length).toBeGreaterThanOrEqual(95);
  });

  it('test/hostile-catalogue.md shows exactly the cases of catalogue.json (node test/hostile/catalogue-md.mjs rewrites it)', () => {
    const md = readFileSync('test/hostile-catalogue.md', 'utf8');
    expect(md).toBe(withTables(md, CATALOGUE));
  });

  it('the committed hostile files are exactly what make-hostile.mjs writes, and every file the catalogue names exists', () => {
    for (const [name, bytes] of Object.entries(makers.hostileFiles())) expect(Buffer.compare(read(`hostile/${name}`), bytes), name).toBe(0);
    for (const e of [...CATALOGUE.data, ...CATALOGUE.recipes]) if (e.file !== undefined) expect(() => read(e.file!), e.file).not.toThrow();
  });
});
