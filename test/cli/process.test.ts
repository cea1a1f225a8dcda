/**
 * The built command line run as a user runs it: `node bin/tracewright.js`
 * in a separate process, plain JavaScript built by the prepare script's
 * configuration. Checks: the hostile catalogue (every data file that must be
 * refused gives status 1 and a message naming it, no stack trace, while the
 * others of the same run are written; the ones that must load give 0),
 * --jobs 2 writes the same files as --jobs 1, standard output stays empty
 * without --json, and the bin script explains itself when nothing is built.
 */
import { execFile } from 'node:child_process';
import { copyFileSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { buildCli, type BuiltCli } from './build-cli.ts';
import { dataRows } from './catalogue.ts';

const EPOCH = '1735689600';
let built: BuiltCli;
const work = mkdtempSync(join(tmpdir(), 'tracewright-cli-proc-'));

beforeAll(async () => { built = await buildCli(); }, 180_000);
afterAll(() => {
  rmSync(work, { recursive: true, force: true });
  if (built) rmSync(built.root, { recursive: true, force: true });
});

function run(args: string[], env: Record<string, string> = {}): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((done) => {
    execFile(process.execPath, [built.bin, ...args], { env: { ...process.env, SOURCE_DATE_EPOCH: EPOCH, ...env }, maxBuffer: 64 << 20 }, (err, stdout, stderr) => {
      done({ code: err ? (typeof err.code === 'number' ? err.code : -1) : 0, stdout, stderr });
    });
  });
}

/** Every file of a folder and its bytes. */
function tree(dir: string): Map<string, Buffer> {
  return new Map(readdirSync(dir).sort().map((f) => [f, readFileSync(join(dir, f))]));
}

/** A stack trace line as Node prints one ("    at fn (file:1:2)"). */
const STACK = /^\s+at .+:\d+:\d+\)?$/m;

describe('the built command line', () => {
  test('hostile catalogue: refused files give status 1 and name themselves, no stack trace; the rest of the run is written', { timeout: 180_000 }, async () => {
    const rows = dataRows();
    expect(rows.filter((r) => r.refuse).length).toBeGreaterThanOrEqual(20);
    expect(rows.filter((r) => !r.refuse).length).toBeGreaterThanOrEqual(20);
    const out = join(work, 'hostile-all');
    const r = await run(['analyse', ...rows.map((row) => row.path), '--out', out, '--json']);
    expect(r.code).toBe(1);
    expect(r.stderr).not.toMatch(STACK);
    expect(r.stderr).not.toMatch(/\b(TypeError|RangeError|ReferenceError)\b/);
    const analysed = new Set(r.stdout.trim().split('\n').map((l) => JSON.parse(l).input.file as string));
    const lines = r.stderr.split('\n');
    for (const row of rows) {
      if (row.refuse) {
        // "tracewright: <file>[, line n]: <reason>", then the progress line saying nothing was written.
        const named = lines.find((l) => l.startsWith(`tracewright: ${row.path}: `) || l.startsWith(`tracewright: ${row.path}, line `));
        expect(named, `${row.id} is named on standard error`).toBeDefined();
        expect(named!.length, row.id).toBeGreaterThan(`tracewright: ${row.path}: `.length + 20);
        expect(lines).toContain(`tracewright: [${rows.indexOf(row) + 1}/${rows.length}] ${row.path}: problem, nothing written`);
        expect(analysed.has(row.path), row.id).toBe(false);
      } else {
        expect(analysed.has(row.path), `${row.id} was analysed and written`).toBe(true);
      }
    }
    // Four files per analysed trace, and a summary file for every line of standard output.
    const files = readdirSync(out);
    expect(files.filter((f) => f.endsWith('-summary.json'))).toHaveLength(r.stdout.trim().split('\n').length);
    expect(files.length).toBe(4 * r.stdout.trim().split('\n').length);
  });

  test('hostile catalogue: the files that must load, on their own, give status 0', { timeout: 180_000 }, async () => {
    const rows = dataRows().filter((row) => !row.refuse);
    const r = await run(['analyse', ...rows.map((row) => row.path), '--out', join(work, 'hostile-load')]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toBe('');
    expect(r.stderr).not.toMatch(STACK);
  });

  test('--jobs 2 writes the same files, byte for byte, as --jobs 1, and the same standard output', { timeout: 180_000 }, async () => {
    const inputs = ['public/demo', 'test/fixtures/hostile', 'test/fixtures/jcamp/dif.jdx', 'test/fixtures/netcdf/chromatogram.cdf'];
    const method = join(work, 'method.json');
    mkdirSync(work, { recursive: true });
    copyFileSync('test/fixtures/hostile/recipe-window-larger-than-trace.json', method);
    const one = await run(['analyse', ...inputs, '--method', method, '--out', join(work, 'jobs-1'), '--jobs', '1', '--json']);
    const two = await run(['analyse', ...inputs, '--method', method, '--out', join(work, 'jobs-2'), '--jobs', '2', '--json']);
    expect(one.code).toBe(1); // the catalogue's refused files are in these folders
    expect(two.code).toBe(1);
    const a = tree(join(work, 'jobs-1')), b = tree(join(work, 'jobs-2'));
    expect([...b.keys()]).toEqual([...a.keys()]);
    expect(a.size).toBeGreaterThan(100);
    for (const [name, bytes] of a) expect(Buffer.compare(bytes, b.get(name)!), name).toBe(0);
    expect(two.stdout).toBe(one.stdout);
    expect(two.stderr.replace(/jobs-2/g, 'jobs-1')).toBe(one.stderr);
  });

  test('standard output is empty without --json; the files carry SOURCE_DATE_EPOCH as their time', { timeout: 60_000 }, async () => {
    const out = join(work, 'quiet');
    const r = await run(['analyse', 'public/demo/demo-sample.csv', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toBe('');
    expect(readFileSync(join(out, 'demo-sample-cleaned.csv'), 'utf8')).toContain('# Written at: 2025-01-01T00:00:00.000Z\r\n');
    expect(statSync(join(out, 'demo-sample-report.html')).size).toBeGreaterThan(1000);
  });

  test('the bin script runs without TypeScript, and says what to do when the command line is not built', { timeout: 60_000 }, async () => {
    const v = await run(['--version']);
    expect(v).toEqual({ code: 0, stdout: `tracewright ${JSON.parse(readFileSync('package.json', 'utf8')).version}\n`, stderr: '' });
    expect(statSync('bin/tracewright.js').mode & 0o111).not.toBe(0);
    const lonely = mkdtempSync(join(work, 'unbuilt-'));
    mkdirSync(join(lonely, 'bin'));
    copyFileSync('bin/tracewright.js', join(lonely, 'bin', 'tracewright.js'));
    const r = await new Promise<{ code: number; stderr: string }>((done) => execFile(process.execPath, [join(lonely, 'bin', 'tracewright.js'), '--help'], (err, _o, stderr) => done({ code: err ? Number(err.code) : 0, stderr })));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/not built yet\. Run "npm install"/);
  });
});
