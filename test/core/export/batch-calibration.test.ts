/**
 * Issue 21, the batch ZIP's calibration section: with the calibration from
 * the invented demo standards (scripts/make-demo.mjs, truth in
 * public/demo/demo-standards-truth.json), the ZIP holds calibration.json,
 * calibration-table.csv and amounts.csv, the same calibration the command
 * line writes for the same standards (compared member by member with the
 * command line's own calibration.json), every file's named peaks as amounts
 * with intervals that hold the truth, and each file's report a calibration
 * section. Without a calibration the ZIP is as before.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join, resolve } from 'node:path';
import { strFromU8, unzipSync } from 'fflate';
import { afterAll, describe, expect, test } from 'vitest';
import { jobContext } from '../../../src/cli/job.ts';
import { runCli } from '../../../src/cli/run.ts';
import { runBatch } from '../../../src/core/export/batch.ts';
import { readNamedPeaksCsv } from '../../../src/core/calibration/named-peaks.ts';
import { analysisOf, parseRecipeText, recipeToJson, recipeWithAnalysis } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { readCsv } from './helpers.ts';

const DEMO = resolve('public/demo');
const METHOD = resolve('test/fixtures/calibration/demo-method.json');
const NOW = new Date(Date.UTC(2025, 0, 1));
const truth = JSON.parse(readFileSync(join(DEMO, 'demo-standards-truth.json'), 'utf8')) as { dyes: { name: string; sampleAmount: number }[]; files: { file: string }[] };
const work = mkdtempSync(join(tmpdir(), 'tracewright-batch-cal-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const bytes = (p: string) => new Uint8Array(readFileSync(p));

/** The method with the demo's named peaks, and the calibration the command line builds from the demo standards. */
function demoCalibration() {
  const check = parseRecipeText(readFileSync(METHOD, 'utf8'), STEP_REGISTRY);
  if (!check.ok) throw new Error(check.problems.join(' '));
  const names = readNamedPeaksCsv(readFileSync(join(DEMO, 'demo-named-peaks.csv'), 'utf8'), 'demo-named-peaks.csv');
  if (!names.ok) throw new Error('named peaks');
  const a = analysisOf(check.recipe);
  const method = recipeWithAnalysis(check.recipe, a.noise, a.peaks, { namedPeaks: names.table, calibration: a.calibration ?? null });
  const ctx = jobContext({
    methodJson: recipeToJson(method), blank: null, scans: [], dialect: {}, traceName: null, traceIndex: null, nowMs: NOW.getTime(),
    standards: truth.files.map((f) => ({ path: join(DEMO, f.file), bytes: bytes(join(DEMO, f.file)) })),
    amounts: { path: join(DEMO, 'demo-standards.csv'), bytes: bytes(join(DEMO, 'demo-standards.csv')) },
  });
  if (typeof ctx === 'string') throw new Error(ctx);
  return { method, set: ctx.calibration!, analysis: a };
}

describe('the batch ZIP carries the calibration (issue 21)', () => {
  const { method, set, analysis } = demoCalibration();
  const files = [{ name: 'demo-sample.csv', bytes: bytes(join(DEMO, 'demo-sample.csv')) }];
  const batch = runBatch(files, method, STEP_REGISTRY, { now: NOW, noise: analysis.noise, peaks: analysis.peaks, calibration: set });
  const cliOut = join(work, 'cli');
  const cli = runCli(['analyse', join(DEMO, 'demo-sample.csv'), '--method', METHOD, '--named-peaks', join(DEMO, 'demo-named-peaks.csv'),
    ...truth.files.flatMap((f) => ['--standard', join(DEMO, f.file)]), '--amounts', join(DEMO, 'demo-standards.csv'), '--out', cliOut],
  { stdout: () => {}, stderr: () => {}, stderrIsTTY: false, cwd: process.cwd(), env: { SOURCE_DATE_EPOCH: String(NOW.getTime() / 1000) } });

  test('calibration.json, calibration-table.csv and amounts.csv are in the ZIP; the calibration is the command line’s, member by member', async () => {
    const out = await batch;
    expect(await cli).toBe(0);
    const zip = unzipSync(out.zip);
    for (const n of ['calibration.json', 'calibration-table.csv', 'amounts.csv']) expect(Object.keys(zip)).toContain(n);
    const ours = JSON.parse(strFromU8(zip['calibration.json']));
    const theirs = JSON.parse(readFileSync(join(cliOut, 'calibration.json'), 'utf8'));
    expect(ours.format).toBe('tracewright-calibration');
    expect(ours.caution).toMatch(/not a validated system/i);
    // Model, weights, coefficients with SEs, residual SD, standards with back-calculated deviations, limits: identical.
    expect(ours.calibrations).toEqual(theirs.calibrations);
    expect(ours.calibrations.every((c: { standards: { deviationPercent?: unknown }[] }) => c.standards.length === 6)).toBe(true);
    // The sample's amounts: the same numbers; the batch names the sample by its file name, the command line by the path given.
    expect(ours.samples).toHaveLength(1);
    expect(ours.samples[0].trace).toBe('demo-sample.csv');
    expect(basename(theirs.samples[0].trace)).toBe('demo-sample.csv');
    expect(ours.samples[0].amounts).toEqual(theirs.samples[0].amounts);
    expect(strFromU8(zip['calibration-table.csv'])).toBe(readFileSync(join(cliOut, 'calibration-table.csv'), 'utf8'));
  });

  test('every dye of the demo sample lies within its interval of the truth (demo-standards-truth.json)', async () => {
    const zip = unzipSync((await batch).zip);
    const { header, body } = readCsv(strFromU8(zip['amounts.csv']), ',', '.');
    const col = (re: RegExp) => header.findIndex((h) => re.test(h));
    const name = col(/^named peak$/), low = col(/interval low/i), high = col(/interval high/i), status = col(/^status$/);
    expect(Math.min(name, low, high, status), header.join(' | ')).toBeGreaterThanOrEqual(0);
    for (const d of truth.dyes) {
      const row = body.find((r) => r[name] === d.name)!;
      expect(row[status], d.name).toBe('measured');
      expect(Number(row[low])).toBeLessThanOrEqual(d.sampleAmount);
      expect(Number(row[high])).toBeGreaterThanOrEqual(d.sampleAmount);
    }
    const report = strFromU8(zip['demo-sample-report.html']);
    expect(report).toContain('<h2>Calibration and amounts</h2>');
    expect(report).toContain('data-role="amounts"');
  });

  test('without a calibration the ZIP has no calibration files', async () => {
    const out = await runBatch(files, method, STEP_REGISTRY, { now: NOW, noise: analysis.noise, peaks: analysis.peaks });
    expect(Object.keys(unzipSync(out.zip)).filter((n) => n.startsWith('calibration') || n === 'amounts.csv')).toEqual([]);
  });
});
