/**
 * Issue 21 on the command line (runCli in this process): --standard (once
 * per standard) with --amounts and --named-peaks on the invented demo
 * standards (scripts/make-demo.mjs; truth in public/demo/demo-standards-truth.json).
 * The sample's named peaks get their names in the summary, the peak CSV and
 * the report, calibration.json is written beside the summaries, and each
 * dye's true amount lies within its 95 % interval. Refusals stop with
 * status 2 before anything is written.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { runCli } from '../../src/cli/run.ts';
import { parseArgs } from '../../src/cli/args.ts';
import { schemaProblems } from '../core/export/json-schema.ts';

const DEMO = resolve('public/demo');
const METHOD = resolve('test/fixtures/calibration/demo-method.json');
const work = mkdtempSync(join(tmpdir(), 'tracewright-cal-test-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));
const truth = JSON.parse(readFileSync(join(DEMO, 'demo-standards-truth.json'), 'utf8')) as { dyes: { name: string; sampleAmount: number }[]; files: { file: string }[] };

async function cli(argv: string[]) {
  const err: string[] = [];
  const code = await runCli(argv, { stdout: () => {}, stderr: (t) => err.push(t), stderrIsTTY: false, cwd: process.cwd(), env: { SOURCE_DATE_EPOCH: '1735689600' } });
  return { code, stderr: err.join('') };
}
const standards = truth.files.flatMap((f) => ['--standard', join(DEMO, f.file)]);

describe('the command line calibrates from standards', () => {
  const out = join(work, 'demo');
  const run = cli(['analyse', join(DEMO, 'demo-sample.csv'), '--method', METHOD, '--named-peaks', join(DEMO, 'demo-named-peaks.csv'), ...standards, '--amounts', join(DEMO, 'demo-standards.csv'), '--out', out]);

  test('writes calibration.json, the calibration table and the amounts beside the summaries; every dye\'s truth in its interval', async () => {
    const r = await run;
    expect(r.code, r.stderr).toBe(0);
    const cal = JSON.parse(readFileSync(join(out, 'calibration.json'), 'utf8'));
    expect(cal.format).toBe('tracewright-calibration');
    expect(cal.problems).toEqual([]);
    expect(cal.calibrations.map((c: { name: string; status: string }) => [c.name, c.status])).toEqual(truth.dyes.map((d) => [d.name, 'calibrated']));
    // Six standards per dye (three levels in duplicate), all in the fit.
    for (const c of cal.calibrations) expect(c.standards.filter((p: { used: boolean }) => p.used)).toHaveLength(6);
    expect(cal.samples).toHaveLength(1);
    for (const d of truth.dyes) {
      const a = cal.samples[0].amounts.find((v: { name: string }) => v.name === d.name);
      expect(a.status, d.name).toBe('measured');
      expect(a.interval.low, d.name).toBeLessThanOrEqual(d.sampleAmount);
      expect(a.interval.high, d.name).toBeGreaterThanOrEqual(d.sampleAmount);
    }
    expect(readFileSync(join(out, 'amounts.csv'), 'utf8')).toContain('Orchard Red,measured');
    expect(readFileSync(join(out, 'calibration-table.csv'), 'utf8')).toContain('demo-standard-L3-b.csv');
  });

  test('the summary names the peaks (null when unnamed) and still validates against its schema', async () => {
    await run;
    const summary = JSON.parse(readFileSync(join(out, 'demo-sample-summary.json'), 'utf8'));
    const schema = JSON.parse(readFileSync('src/core/export/summary.schema.json', 'utf8'));
    expect(schemaProblems(schema, summary, true)).toEqual([]);
    const named = summary.peaks.filter((p: { name: string | null }) => p.name !== null);
    expect(named.map((p: { name: string }) => p.name).sort()).toEqual(truth.dyes.map((d) => d.name).sort());
    expect(summary.peaks.every((p: object) => 'name' in p)).toBe(true);
    expect(summary.method.analysis.namedPeaks.peaks).toHaveLength(3);
  });

  test('the peak CSV has a name column and the report a calibration section with the amounts', async () => {
    await run;
    const csv = readFileSync(join(out, 'demo-sample-peaks.csv'), 'utf8');
    expect(csv).toMatch(/^peak #,name,apex/m);
    expect(csv).toContain('# Missing named peaks: none.');
    const report = readFileSync(join(out, 'demo-sample-report.html'), 'utf8');
    expect(report).toContain('<h2>Calibration and amounts</h2>');
    expect(report).toContain('data-role="amounts"');
    expect(report).toContain('R² (figure only)');
  });
});

describe('amounts in the per-trace exports', () => {
  test('the summary’s added amounts and the peak CSV’s amount columns: the same numbers as calibration.json, each dye’s truth inside its interval', async () => {
    const out = join(work, 'demo-amounts');
    const r = await cli(['analyse', join(DEMO, 'demo-sample.csv'), '--method', METHOD, '--named-peaks', join(DEMO, 'demo-named-peaks.csv'), ...standards, '--amounts', join(DEMO, 'demo-standards.csv'), '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const cal = JSON.parse(readFileSync(join(out, 'calibration.json'), 'utf8'));
    const summary = JSON.parse(readFileSync(join(out, 'demo-sample-summary.json'), 'utf8'));
    expect(schemaProblems(JSON.parse(readFileSync('src/core/export/summary.schema.json', 'utf8')), summary, true)).toEqual([]);
    const csv = readFileSync(join(out, 'demo-sample-peaks.csv'), 'utf8').split('\n').filter((l) => l && !l.startsWith('#')).map((l) => l.split(','));
    const head = csv[0];
    const [nameCol, amountCol, lowCol, highCol] = ['name', 'amount', 'amount interval low (95 %)', 'amount interval high (95 %)'].map((h) => head.indexOf(h));
    expect(Math.min(nameCol, amountCol, lowCol, highCol), head.join(' | ')).toBeGreaterThanOrEqual(0);
    for (const d of truth.dyes) {
      const ref = cal.samples[0].amounts.find((v: { name: string }) => v.name === d.name);
      const s = summary.amounts.find((v: { name: string }) => v.name === d.name);
      expect(s).toMatchObject({ status: 'measured', amount: ref.amount, low: ref.interval.low, high: ref.interval.high, level: 0.95 });
      expect(s.low).toBeLessThanOrEqual(d.sampleAmount);
      expect(s.high).toBeGreaterThanOrEqual(d.sampleAmount);
      const row = csv.find((c) => c[nameCol] === d.name)!;
      expect(Number(row[amountCol])).toBe(ref.amount);
      expect(Number(row[lowCol])).toBe(ref.interval.low);
      expect(Number(row[highCol])).toBe(ref.interval.high);
    }
    // Unnamed rows carry no amount.
    expect(csv.slice(1).filter((c) => c[nameCol] === '').every((c) => c[amountCol] === '')).toBe(true);
  });
});

describe('refusals', () => {
  test('--standard without --amounts, and --amounts without --standard, are usage errors', () => {
    expect(parseArgs(['analyse', 'a.csv', '--standard', 's.csv'])).toMatchObject({ kind: 'usage-error' });
    expect(parseArgs(['analyse', 'a.csv', '--amounts', 'a.csv'])).toMatchObject({ kind: 'usage-error' });
    expect(parseArgs(['analyse', 'a.csv', '--standard', 's1.csv', '--standard', 's2.csv', '--amounts', 'm.csv'])).toMatchObject({ kind: 'analyse', options: { standards: ['s1.csv', 's2.csv'], amounts: 'm.csv' } });
  });

  test('standards without named peaks stop the run with status 2 and nothing written', async () => {
    const out = join(work, 'no-names');
    const r = await cli(['analyse', join(DEMO, 'demo-sample.csv'), ...standards, '--amounts', join(DEMO, 'demo-standards.csv'), '--out', out]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/named peaks/);
    expect(existsSync(out)).toBe(false);
  });

  test('an amounts file with a bad cell stops the run naming file and line', async () => {
    const bad = join(work, 'bad-amounts.csv');
    writeFileSync(bad, 'standard,Orchard Red (mg/L)\ndemo-standard-L1-a.csv,two\n');
    const out = join(work, 'bad');
    const r = await cli(['analyse', join(DEMO, 'demo-sample.csv'), '--named-peaks', join(DEMO, 'demo-named-peaks.csv'), '--standard', join(DEMO, 'demo-standard-L1-a.csv'), '--amounts', bad, '--out', out]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/bad-amounts\.csv, line 2/);
    expect(existsSync(out)).toBe(false);
  });
});
