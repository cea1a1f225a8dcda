/**
 * src/cli/job.ts: one input of a command-line run, without writing
 * anything. Checks: which traces a run takes (--trace, --trace-index) and
 * the sentences when the choice fails; files the page would have to ask
 * about are refused naming the option that settles it; a blank or scan must
 * be one trace; a method that fails validation stops the run; runJob makes
 * the four texts per trace, and the summary conforms to the published
 * src/core/export/summary.schema.json (strict: no field it does not name)
 * with the input's SHA-256 as Node's crypto (FIPS 180-4) gives it and the
 * invented demo's point count (public/demo/demo-truth.json). The run around
 * it (names, folders, exit statuses, standard output) is test/cli/run.test.ts.
 */
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { chooseTraces, jobContext, loadForRun, loadSupport, runJob, type JobContext, type JobSetup } from '../../src/cli/job.ts';
import { emptyRecipe, recipeToJson } from '../../src/core/method.ts';
import { schemaProblems } from '../core/export/json-schema.ts';

const DEMO = resolve('public/demo');
const FIX = resolve('test/fixtures');
const work = mkdtempSync(join(tmpdir(), 'tracewright-job-test-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));
const bytes = (p: string) => new Uint8Array(readFileSync(p));
const schema = JSON.parse(readFileSync('src/core/export/summary.schema.json', 'utf8'));
const truth = JSON.parse(readFileSync(join(DEMO, 'demo-truth.json'), 'utf8')) as { x: { points: number } };

function setup(over: Partial<JobSetup> = {}): JobSetup {
  return {
    methodJson: recipeToJson(emptyRecipe()), blank: null, scans: [], dialect: {}, traceName: null, traceIndex: null,
    nowMs: Date.UTC(2025, 0, 1), standards: [], amounts: null, ...over,
  };
}

function context(over: Partial<JobSetup> = {}): JobContext {
  const c = jobContext(setup(over));
  if (typeof c === 'string') throw new Error(c);
  return c;
}

describe('chooseTraces', () => {
  const ragged = join(FIX, 'hostile/ragged.csv');
  const loaded = loadForRun(ragged, bytes(ragged), setup({ traceIndex: 0 }));
  if (!loaded.ok) throw new Error(loaded.message);
  const traces = loaded.traces;

  test('all traces without a choice; by its own name or its full name; by position from 0', () => {
    expect(traces.length).toBe(2);
    expect(chooseTraces(ragged, traces, null, null)).toEqual({ ok: true, traces });
    expect(chooseTraces(ragged, traces, 'B', null)).toEqual({ ok: true, traces: [traces[1]] });
    expect(chooseTraces(ragged, traces, traces[1].name, null)).toEqual({ ok: true, traces: [traces[1]] });
    expect(chooseTraces(ragged, traces, null, 0)).toEqual({ ok: true, traces: [traces[0]] });
  });

  test('a wrong choice names the file, what it holds and the option that settles it', () => {
    expect(chooseTraces(ragged, traces, 'C', null)).toEqual({
      ok: false, message: `${ragged}: no trace is named "C"; the file holds "A", "B". Name one of them with --trace, or pick one by position with --trace-index (0 = first).`,
    });
    const past = chooseTraces(ragged, traces, null, 2);
    expect(past.ok).toBe(false);
    if (!past.ok) expect(past.message).toBe(`${ragged}: --trace-index 2 is past the end; the file holds 2 traces ("A", "B"), numbered from 0.`);
    const twice = chooseTraces(ragged, [traces[0], traces[0]], 'A', null);
    expect(twice.ok).toBe(false);
    if (!twice.ok) expect(twice.message).toMatch(/2 traces are named "A"\. Pick one by position with --trace-index/);
  });
});

describe('loadForRun', () => {
  test('numbers that read two ways: refused naming --delimiter and --decimal; either option settles it', () => {
    const file = join(work, 'squares.csv');
    const text = new TextEncoder().encode('0,1\n1,4\n2,9\n3,16\n4,25\n5,36\n');
    const r = loadForRun(file, text, setup());
    expect(r).toEqual({ ok: false, message: `${file}, line 1: Line 1 reads as comma, decimal point (2 columns: 0 | 1) or as semicolon, decimal comma (1 column: 0.1), and nothing in the file tells which. Say which with --delimiter (, ; tab or space) or --decimal (point or comma).` });
    const comma = loadForRun(file, text, setup({ dialect: { decimal: ',' } }));
    expect(comma.ok && comma.traces[0].y.length).toBe(6);
    const delim = loadForRun(file, text, setup({ dialect: { delimiter: ',' } }));
    expect(delim.ok && Array.from(delim.traces[0].y)).toEqual([1, 4, 9, 16, 25, 36]);
  });

  test('a file the loader refuses: path, line and the loader’s problem and advice in one sentence', () => {
    const p = join(FIX, 'hostile/one-row.csv');
    const r = loadForRun(p, bytes(p), setup());
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(new RegExp(`^${p.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}, line 1: Only 1 row of numbers could be read`));
  });
});

describe('loadSupport and jobContext', () => {
  const ragged = { path: join(FIX, 'hostile/ragged.csv'), bytes: bytes(join(FIX, 'hostile/ragged.csv')) };

  test('a blank must be one trace, or the one --trace names', () => {
    expect(loadSupport('blank', ragged, setup())).toBe(`The blank cannot be used. ${ragged.path} holds 2 traces; a blank must be one trace, or --trace / --trace-index must name one that it holds.`);
    const t = loadSupport('blank', ragged, setup({ traceName: 'B' }));
    expect(typeof t !== 'string' && t.name).toMatch(/B$/);
    const pdf = { path: join(FIX, 'hostile/report.pdf'), bytes: bytes(join(FIX, 'hostile/report.pdf')) };
    expect(loadSupport('scan', pdf, setup())).toMatch(/^The scan cannot be used\. .*report\.pdf: This is a PDF document/);
  });

  test('a method that fails validation, or a blank that cannot be used, stops the run with a sentence', () => {
    expect(jobContext(setup({ methodJson: '{"format":"nothing"}' }))).toMatch(/^The method does not validate: /);
    expect(jobContext(setup({ blank: ragged }))).toMatch(/^The blank cannot be used\./);
    expect(jobContext(setup({ standards: [ragged], amounts: null }))).toMatch(/^Calibration needs named peaks/);
  });

  test('a usable blank and scans are loaded once into the context', () => {
    const blank = { path: join(DEMO, 'demo-blank.csv'), bytes: bytes(join(DEMO, 'demo-blank.csv')) };
    const scan = { path: join(DEMO, 'demo-scan-1.csv'), bytes: bytes(join(DEMO, 'demo-scan-1.csv')) };
    const c = context({ blank, scans: [scan, scan] });
    expect(c.blank!.y.length).toBe(truth.x.points);
    expect(c.scans).toHaveLength(2);
    expect(c.calibration).toBeNull();
    expect(c.method.steps).toEqual([]);
  });
});

describe('runJob', () => {
  test('the demo sample: one output whose summary conforms to the published schema, with the file’s SHA-256 and point count', () => {
    const path = join(DEMO, 'demo-sample.csv');
    const out = runJob(context(), 3, path);
    expect(out).toMatchObject({ index: 3, file: path, multi: false, errors: [] });
    expect(out.outputs).toHaveLength(1);
    const o = out.outputs[0];
    const summary = JSON.parse(o.summary);
    expect(schemaProblems(schema, summary, true)).toEqual([]);
    expect(JSON.parse(o.summaryLine)).toEqual(summary);
    expect(o.summaryLine).not.toContain('\n');
    expect(summary.input).toEqual({ file: path, sha256: createHash('sha256').update(readFileSync(path)).digest('hex'), trace: o.trace });
    expect(summary.points.in).toBe(truth.x.points);
    expect(summary.peaks).toHaveLength(o.peakRows.length);
    expect(o.warnings).toEqual(summary.warnings);
    expect(o.amounts).toBeNull();
    // The three page exports, each carrying the run's time (SOURCE_DATE_EPOCH or now, given as nowMs).
    expect(o.cleaned).toContain('# Written at: 2025-01-01T00:00:00.000Z');
    expect(o.peaks).toContain('# Written at: 2025-01-01T00:00:00.000Z');
    expect(o.report).toMatch(/^<!DOCTYPE html>/i);
  });

  test('a file of several traces gives one output per trace and says so; --trace-index takes one', () => {
    const ragged = join(FIX, 'hostile/ragged.csv');
    const all = runJob(context(), 0, ragged);
    expect(all.multi).toBe(true);
    expect(all.outputs.map((o) => o.trace)).toEqual(['A', 'B']);
    for (const o of all.outputs) expect(schemaProblems(schema, JSON.parse(o.summary), true)).toEqual([]);
    const one = runJob(context({ traceIndex: 1 }), 0, ragged);
    expect(one.outputs.map((o) => o.trace)).toEqual(['B']);
  });

  test('an input that cannot be read is named with the reason, with no outputs', () => {
    const missing = join(work, 'no-such.csv');
    expect(runJob(context(), 0, missing)).toEqual({ index: 0, file: missing, multi: false, outputs: [], errors: [`${missing}: cannot be read (no such file).`] });
    expect(runJob(context(), 1, work).errors).toEqual([`${work}: cannot be read (a folder inside a folder is not read).`]);
    const file = join(work, 'two-ways.csv');
    writeFileSync(file, '0,1\n1,4\n2,9\n3,16\n4,25\n5,36\n');
    expect(runJob(context(), 2, file).errors[0]).toMatch(/Say which with --delimiter/);
  });
});
