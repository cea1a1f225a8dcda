/**
 * src/cli/run.ts: the command line run in this process (runCli with
 * stand-in streams): the exports equal the page's for the demo, the naming
 * rules, folders, refusals that name the option settling them, exit
 * statuses 0/1/2, help and version, every summary file written conforms to
 * the published summary.schema.json, and standard output empty unless
 * --json. What one input gives (trace choice and its sentences, loading
 * refusals, the texts per trace) is in job.test.ts; worker threads (--jobs)
 * and the built program are checked in process.test.ts.
 */
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { analyse, DEFAULT_PEAK_SETTINGS } from '../../src/core/analysis/index.ts';
import { cleanedTraceCsv } from '../../src/core/export/cleaned-csv.ts';
import { peakTableCsv } from '../../src/core/export/peak-csv.ts';
import { reportHtml } from '../../src/core/export/report-html.ts';
import { loadFile } from '../../src/core/io/load.ts';
import { emptyRecipe, makeRecipeStep, recipeToJson, recipeWithAnalysis } from '../../src/core/method.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import type { Trace } from '../../src/core/trace.ts';
import { ANALYSE_HELP, MAIN_HELP } from '../../src/cli/help.ts';
import { runCli } from '../../src/cli/run.ts';
import { schemaProblems } from '../core/export/json-schema.ts';
import { recipeRows } from './catalogue.ts';

const EPOCH = '1735689600'; // 2025-01-01T00:00:00Z
const NOW = new Date(Number(EPOCH) * 1000);
const DEMO = resolve('public/demo');
const FIX = resolve('test/fixtures');
const work = mkdtempSync(join(tmpdir(), 'tracewright-cli-test-'));
let dirCount = 0;
const fresh = (name = 'out') => join(work, `${name}-${++dirCount}`);
afterAll(() => rmSync(work, { recursive: true, force: true }));

async function cli(argv: string[], opts: { cwd?: string; tty?: boolean; env?: Record<string, string> } = {}) {
  const out: string[] = [], err: string[] = [];
  const code = await runCli(argv, {
    stdout: (t) => out.push(t), stderr: (t) => err.push(t), stderrIsTTY: opts.tty ?? false, columns: 100,
    cwd: opts.cwd ?? process.cwd(), env: { SOURCE_DATE_EPOCH: EPOCH, ...(opts.env ?? {}) },
  });
  return { code, stdout: out.join(''), stderr: err.join('') };
}

const demoScans = Array.from({ length: 8 }, (_, i) => join(DEMO, `demo-scan-${i + 1}.csv`));

/** A method as the page would save it: blank subtraction, Savitzky–Golay, 2H/h S/N on the blank, a quiet range. */
function pageMethod() {
  const steps = emptyRecipe();
  steps.steps.push(makeRecipeStep(STEP_REGISTRY.find((d) => d.id === 'blank-subtraction')!));
  steps.steps.push(makeRecipeStep(STEP_REGISTRY.find((d) => d.id === 'savitzky-golay')!, { window: 9 }));
  return recipeWithAnalysis(steps, { method: 'rms', quietRange: [8.5, 10.5] }, { ...DEFAULT_PEAK_SETTINGS, snrDefinition: 'pharmacopoeial', minSnr: 3 });
}

function loaded(file: string): Trace {
  const r = loadFile(new Uint8Array(readFileSync(join(DEMO, file))), file);
  if (!r.ok) throw new Error(r.error.problem);
  return r.traces[0];
}

describe('the demo: the command line writes the page\'s exports', () => {
  test('cleaned CSV, peak CSV and report are what the page\'s export code writes for the same traces, method and time', async () => {
    const method = pageMethod();
    const methodFile = join(work, 'page-method.json');
    writeFileSync(methodFile, `${recipeToJson(method)}\n`);
    const out = fresh();
    const r = await cli(['analyse', join(DEMO, 'demo-sample.csv'), '--blank', join(DEMO, 'demo-blank.csv'), ...demoScans.flatMap((s) => ['--scan', s]), '--method', methodFile, '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toBe('');
    expect(readdirSync(out).sort()).toEqual(['demo-sample-cleaned.csv', 'demo-sample-peaks.csv', 'demo-sample-report.html', 'demo-sample-summary.json']);

    // The page's path: the demo loaded under its file names, roles sample / blank / scans (controller.ts
    // buildRequest), then the calls ExportPanel makes with the default CSV options.
    const sample = loaded('demo-sample.csv'), blank = loaded('demo-blank.csv');
    const scans = Array.from({ length: 8 }, (_, i) => loaded(`demo-scan-${i + 1}.csv`));
    const all = new Map([sample, blank, ...scans].map((t) => [t.id, t]));
    const result = analyse({
      sampleId: sample.id, blankId: blank.id, scanIds: scans.map((s) => s.id), recipe: method, showUid: null,
      noise: method.analysis!.noise, peaks: method.analysis!.peaks, decisions: { added: [], removed: [] }, alternatives: [],
    }, all, STEP_REGISTRY);
    const options = { delimiter: ',' as const, decimal: '.' as const };
    expect(readFileSync(join(out, 'demo-sample-cleaned.csv'), 'utf8')).toBe(cleanedTraceCsv({ trace: sample, result, recipe: method, registry: STEP_REGISTRY, options, now: NOW }));
    expect(readFileSync(join(out, 'demo-sample-peaks.csv'), 'utf8')).toBe(peakTableCsv({ trace: sample, result, recipe: method, registry: STEP_REGISTRY, options, now: NOW }));
    expect(readFileSync(join(out, 'demo-sample-report.html'), 'utf8')).toBe(reportHtml({ trace: sample, result, recipe: method, registry: STEP_REGISTRY, ledger: result.loss?.ledger ?? null, confirmation: null, now: NOW }));
    // The method the page saved is the one written into the exports, analysis settings included.
    const summary = JSON.parse(readFileSync(join(out, 'demo-sample-summary.json'), 'utf8'));
    expect(summary.method).toEqual(JSON.parse(recipeToJson(method)));
    expect(summary.noise.method).toMatch(/^rms-about-line\b/);
    expect(summary.snr.definition).toBe('2H/h');
    expect(readFileSync(join(out, 'demo-sample-peaks.csv'), 'utf8')).toContain('h measured on');
    expect(readFileSync(join(out, 'demo-sample-peaks.csv'), 'utf8')).toContain(',"blank, ');
  });

  test('--quiet-range replaces the method\'s noise setting as the page\'s "use the marked range" does; negative values allowed', async () => {
    const out = fresh();
    const r = await cli(['analyse', join(DEMO, 'demo-sample.csv'), '--quiet-range', '-0.5:0.9', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const s = JSON.parse(readFileSync(join(out, 'demo-sample-summary.json'), 'utf8'));
    expect(s.method.analysis.noise).toEqual({ method: 'rms', quietRange: [-0.5, 0.9] });
    expect(s.noise.method).toMatch(/^rms-about-line\b/);
    expect(s.noise.points).toBe(91); // x 0.00 … 0.90 min in steps of 0.01 (the demo's grid)
  });
});

describe('standard output and exit status', () => {
  test('--json: one summary per line on standard output, equal to the summary files; without it nothing', async () => {
    const out = fresh();
    const r = await cli(['analyse', join(FIX, 'hostile/ragged.csv'), join(DEMO, 'demo-blank.csv'), '--out', out, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const lines = r.stdout.split('\n');
    expect(lines.pop()).toBe('');
    expect(lines).toHaveLength(3);
    const files = ['ragged_A-summary.json', 'ragged_B-summary.json', 'demo-blank-summary.json'];
    lines.forEach((l, i) => expect(JSON.parse(l)).toEqual(JSON.parse(readFileSync(join(out, files[i]), 'utf8'))));
    expect(lines.map((l) => JSON.parse(l).input.trace)).toEqual(['A', 'B', 'Absorbance 520 nm']);
  });

  test('status 1 when an input cannot be read; the others are still written; each problem named with file and line', async () => {
    const out = fresh();
    const r = await cli(['analyse', join(FIX, 'hostile/one-row.csv'), join(DEMO, 'demo-blank.csv'), join(work, 'no-such.csv'), '--out', out]);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(existsSync(join(out, 'demo-blank-summary.json'))).toBe(true);
    expect(r.stderr).toContain(`tracewright: ${join(FIX, 'hostile/one-row.csv')}, line 1: Only 1 row of numbers could be read`);
    expect(r.stderr).toContain(`tracewright: ${join(work, 'no-such.csv')}: cannot be read (no such file).`);
  });

  test('status 2, nothing written: usage errors, no inputs, a method that fails validation, a blank or scan that cannot be used', async () => {
    const sample = join(DEMO, 'demo-sample.csv');
    const cases: [string[], RegExp][] = [
      [['analyse'], /No input files or folders given/],
      [[], /No command given/],
      [['analyse', sample, '--bogus'], /Unknown option "--bogus"/],
      [['analyse', sample, '--quiet-range', '2:1'], /--quiet-range needs FROM smaller than TO/],
      [['analyse', sample, '--quiet-range', '1,5:2'], /decimal point/],
      [['analyse', sample, '--decimal', 'dot'], /--decimal takes point or comma/],
      [['analyse', sample, '--trace', 'A', '--trace-index', '0'], /not both/],
      [['analyse', sample, '--jobs', 'many'], /--jobs takes a whole number/],
      [['analyse', sample, '--blank', join(work, 'missing-blank.csv')], /The blank .* cannot be read \(no such file\)/],
      [['analyse', sample, '--scan', join(FIX, 'hostile/report.pdf')], /The scan cannot be used\. .*report\.pdf: This is a PDF document/],
      [['analyse', sample, '--blank', join(FIX, 'hostile/ragged.csv')], /a blank must be one trace/],
      [['analyse', sample, '--method', join(work, 'missing-method.json')], /method file .* cannot be read/],
      [['analyse', mkdtempSync(join(work, 'empty-'))], /No input files: the folders given hold no files/],
    ];
    for (const [argv, message] of cases) {
      const out = fresh();
      const r = await cli(argv.length ? [...argv, '--out', out] : []);
      expect(r.code, `${argv.join(' ')}\n${r.stderr}`).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stdout).toBe('');
      expect(existsSync(out), argv.join(' ')).toBe(false);
    }
  });

  test('every recipe of the hostile catalogue that must be refused stops the run with status 2 and its problem; the one that parses runs', async () => {
    const rows = recipeRows();
    expect(rows.length).toBeGreaterThanOrEqual(14);
    for (const row of rows) {
      const out = fresh();
      const r = await cli(['analyse', join(DEMO, 'demo-sample.csv'), '--method', resolve(row.path), '--out', out]);
      if (row.refuse) {
        expect(r.code, row.id).toBe(2);
        expect(r.stderr, row.id).toContain(`The method file ${resolve(row.path)}`);
        expect(existsSync(out), row.id).toBe(false);
      } else {
        // Steps that cannot run on this trace are warnings; the files are written.
        expect(r.code, `${row.id}\n${r.stderr}`).toBe(0);
        expect(r.stderr).toMatch(/was not applied/);
        expect(existsSync(join(out, 'demo-sample-summary.json'))).toBe(true);
      }
      expect(r.stderr).not.toMatch(/\n\s+at /);
    }
  });

  test('help and version go to standard output with status 0', async () => {
    const version = `tracewright ${JSON.parse(readFileSync('package.json', 'utf8')).version}\n`;
    for (const [argv, text] of [[['--help'], MAIN_HELP], [['analyse', '--help'], ANALYSE_HELP], [['help', 'analyse'], ANALYSE_HELP], [['--version'], version]] as const) {
      const r = await cli([...argv]);
      expect(r.code).toBe(0);
      expect(r.stderr).toBe('');
      expect(r.stdout).toBe(text);
    }
  });

  test('a usage error names the help to read: the main help for the command, the analyse help for its options', async () => {
    expect((await cli(['frobnicate'])).stderr).toBe('tracewright: Unknown command "frobnicate". The command is "analyse".\nSee "tracewright --help".\n');
    expect((await cli(['analyse', 'x.csv', '--bogus'])).stderr).toBe('tracewright: Unknown option "--bogus".\nSee "tracewright analyse --help".\n');
  });

  test('every summary file a run writes conforms to the published schema (strict), for one and for several traces per file', async () => {
    const schema = JSON.parse(readFileSync('src/core/export/summary.schema.json', 'utf8'));
    const out = fresh();
    const r = await cli(['analyse', join(DEMO, 'demo-sample.csv'), join(FIX, 'hostile/ragged.csv'), '--blank', join(DEMO, 'demo-blank.csv'), '--out', out, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const files = readdirSync(out).filter((f) => f.endsWith('-summary.json')).sort();
    expect(files).toEqual(['demo-sample-summary.json', 'ragged_A-summary.json', 'ragged_B-summary.json']);
    for (const f of files) expect(schemaProblems(schema, JSON.parse(readFileSync(join(out, f), 'utf8')), true), f).toEqual([]);
  });
});

describe('names, folders and traces', () => {
  test('several traces: <stem>_<trace>; a name used twice gets -2, -3 in input order (case ignored)', async () => {
    const dir = fresh('in');
    mkdirSync(join(dir, 'b'), { recursive: true });
    const demo = readFileSync(join(DEMO, 'demo-blank.csv'));
    writeFileSync(join(dir, 'Run 1.csv'), demo);
    writeFileSync(join(dir, 'b', 'run 1.txt'), demo);
    writeFileSync(join(dir, 'run 1_A.csv'), demo);
    const out = fresh();
    const r = await cli(['analyse', join(dir, 'Run 1.csv'), join(dir, 'b', 'run 1.txt'), join(FIX, 'hostile/ragged.csv'), join(dir, 'Run 1.csv'), join(dir, 'run 1_A.csv'), '--out', out, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const stems = [...new Set(readdirSync(out).map((f) => f.replace(/-(cleaned\.csv|peaks\.csv|report\.html|summary\.json)$/, '')))];
    expect(stems.sort()).toEqual(['Run 1', 'Run 1-3', 'ragged_A', 'ragged_B', 'run 1-2', 'run 1_A'].sort());
    // Input order decides who gets -2: the second input, then the fourth.
    expect(JSON.parse(readFileSync(join(out, 'run 1-2-summary.json'), 'utf8')).input.file).toBe(join(dir, 'b', 'run 1.txt'));
  });

  test('a folder means its files in name order (sub-folders left out)', async () => {
    const dir = fresh('in');
    mkdirSync(join(dir, 'z-sub'), { recursive: true });
    for (const n of ['c.csv', 'a.csv', 'B.csv']) writeFileSync(join(dir, n), readFileSync(join(DEMO, 'demo-blank.csv')));
    writeFileSync(join(dir, 'z-sub', 'd.csv'), readFileSync(join(DEMO, 'demo-blank.csv')));
    const r = await cli(['analyse', dir, '--out', fresh(), '--json']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout.trim().split('\n').map((l) => JSON.parse(l).input.file)).toEqual(['B.csv', 'a.csv', 'c.csv'].map((n) => join(dir, n)));
  });

  test('--trace and --trace-index pick one trace; the output names keep the trace part; a wrong choice is status 1', async () => {
    const ragged = join(FIX, 'hostile/ragged.csv');
    let out = fresh();
    let r = await cli(['analyse', ragged, '--trace', 'B', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    expect(readdirSync(out).sort()).toEqual(['ragged_B-cleaned.csv', 'ragged_B-peaks.csv', 'ragged_B-report.html', 'ragged_B-summary.json']);
    out = fresh();
    r = await cli(['analyse', ragged, '--trace-index', '0', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    expect(readdirSync(out)).toContain('ragged_A-summary.json');
    // The sentences themselves: job.test.ts (chooseTraces).
    r = await cli(['analyse', ragged, '--trace', 'C', '--out', fresh()]);
    expect(r.code).toBe(1);
    expect(r.stderr).toContain(`tracewright: ${ragged}: no trace is named "C"`);
  });

  test('numbers that read two ways: status 1 (the sentence: job.test.ts, loadForRun); --decimal settles it', async () => {
    const file = join(work, 'squares.csv');
    writeFileSync(file, '0,1\n1,4\n2,9\n3,16\n4,25\n5,36\n');
    let r = await cli(['analyse', file, '--out', fresh()]);
    expect(r.code).toBe(1);
    expect(r.stderr).toContain(`tracewright: ${file}, line 1: Line 1 reads as comma, decimal point`);
    r = await cli(['analyse', file, '--decimal', 'comma', '--out', fresh(), '--json']);
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).points.in).toBe(6);
  });

  test('an output never replaces an input of the run', async () => {
    const dir = fresh('in');
    mkdirSync(dir);
    const demo = readFileSync(join(DEMO, 'demo-blank.csv'));
    writeFileSync(join(dir, 'a.csv'), demo);
    writeFileSync(join(dir, 'a-cleaned.csv'), demo);
    const r = await cli(['analyse', dir, '--out', dir]);
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('its output a-cleaned.csv would replace an input of this run');
    expect(readFileSync(join(dir, 'a-cleaned.csv'))).toEqual(demo);
    expect(existsSync(join(dir, 'a-cleaned-cleaned.csv'))).toBe(true);
  });
});

describe('progress on standard error', () => {
  test('plain lines when not a terminal, a bar redrawn in place on a terminal', async () => {
    const args = ['analyse', join(DEMO, 'demo-blank.csv'), join(DEMO, 'demo-scan-1.csv')];
    const plain = await cli([...args, '--out', fresh()]);
    expect(plain.stderr).toMatch(/\[1\/2\] .*demo-blank\.csv: 1 trace written\n/);
    expect(plain.stderr).not.toContain('\r');
    const tty = await cli([...args, '--out', fresh()], { tty: true });
    // A carriage return and "erase line" (ESC [ K, ECMA-48) before each redraw of the bar.
    expect(tty.stderr).toContain(`\r${String.fromCharCode(27)}[K[`);
    expect(tty.stderr).toMatch(/\[#+\.*\] 2\/2 /);
    expect(tty.stderr.endsWith('\n')).toBe(true);
    expect(tty.stdout).toBe('');
  });
});
