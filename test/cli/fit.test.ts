/**
 * Issue 18 on the command line (runCli in this process): --fit-region on the
 * invented demo's shoulder (scripts/make-demo.mjs; truth in
 * public/demo/demo-truth.json: main peak at 6.0 min, σ 0.1, height 3 mAU;
 * shoulder at 6.35 min, σ 0.05, height 0.22 mAU) writes the fits into the
 * summary's `fits` (schema still holds), the peak CSV's fitted-area columns
 * and the report's fit section, with the same numbers the core's fit job
 * gives; --figures adds the figure columns; --combine writes the combined
 * table across the run's traces, checked against arithmetic on the
 * per-trace peak CSVs.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { runCli } from '../../src/cli/run.ts';
import { runFitJob } from '../../src/core/measure/fit/job.ts';
import { FWHM_PER_SIGMA, GAUSS_AREA } from '../../src/core/measure/fit/shapes.ts';
import { readCsv } from '../core/export/helpers.ts';
import { schemaProblems } from '../core/export/json-schema.ts';

const DEMO = resolve('public/demo');
const work = mkdtempSync(join(tmpdir(), 'tracewright-fit-cli-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));
const truth = JSON.parse(readFileSync(join(DEMO, 'demo-truth.json'), 'utf8')) as { peaks: { label: string; centre: number; height: number; sigma: number }[] };

async function cli(argv: string[]) {
  const err: string[] = [];
  const code = await runCli(argv, { stdout: () => {}, stderr: (t) => err.push(t), stderrIsTTY: false, cwd: process.cwd(), env: { SOURCE_DATE_EPOCH: '1735689600' } });
  return { code, stderr: err.join('') };
}

function demoXy(name: string) {
  const xs: number[] = [], ys: number[] = [];
  for (const line of readFileSync(join(DEMO, name), 'utf8').split(/\r?\n/)) {
    const m = /^\s*(-?[\d.]+)\s*,\s*(-?[\d.]+)\s*$/.exec(line);
    if (m) { xs.push(Number(m[1])); ys.push(Number(m[2])); }
  }
  return { x: Float64Array.from(xs), y: Float64Array.from(ys) };
}

describe('region fits from the command line', () => {
  const out = join(work, 'fit');
  const run = cli(['analyse', join(DEMO, 'demo-sample.csv'), '--fit-region', '5.4:6.9', '--fit-baseline', 'quadratic', '--fit-peaks', '3', '--figures', '--dead-time', '0.8', '--out', out]);

  test('the summary’s fits: two peaks supported on the raw trace, each within 3 SE of the truth; the schema still holds', async () => {
    const r = await run;
    expect(r.code, r.stderr).toBe(0);
    const summary = JSON.parse(readFileSync(join(out, 'demo-sample-summary.json'), 'utf8'));
    const schema = JSON.parse(readFileSync('src/core/export/summary.schema.json', 'utf8'));
    expect(schemaProblems(schema, summary, true)).toEqual([]);
    expect(summary.fits).toHaveLength(1);
    const f = summary.fits[0];
    expect(f).toMatchObject({ trace: 'raw', from: 5.4, to: 6.9, shape: 'gaussian', baseline: 'quadratic', count: 2 });
    expect(f.criterion).toMatch(/BIC/);
    const main = truth.peaks.find((p) => p.centre === 6.0)!, shoulder = truth.peaks.find((p) => p.label === 'shoulder')!;
    for (const [q, t] of [[f.peaks[0], main], [f.peaks[1], shoulder]] as const) {
      expect(Math.abs(q.position - t.centre)).toBeLessThan(3 * q.positionSe);
      expect(Math.abs(q.area - t.height * t.sigma * FWHM_PER_SIGMA * GAUSS_AREA)).toBeLessThan(3 * q.areaSe);
    }
    // The same numbers as the core's fit job on the same data (no processing: no processing check).
    const { x, y } = demoXy('demo-sample.csv');
    const direct = runFitJob({ settings: { from: 5.4, to: 6.9, on: 'raw', shape: 'gaussian', baseline: 'quadratic', maxPeaks: 3 }, raw: { label: 'raw', x, y }, starts: undefined });
    expect(direct.ok).toBe(true);
    if (direct.ok) expect(direct.result.count).toBe(2);
    expect(f.processing).toBe(null);
  });

  test('the peak CSV has the fitted areas beside the drop-line areas and the figure columns; the report a fit section with both plots', async () => {
    await run;
    const { header, body, comments } = readCsv(readFileSync(join(out, 'demo-sample-peaks.csv'), 'utf8'), ',', '.');
    const summary = JSON.parse(readFileSync(join(out, 'demo-sample-summary.json'), 'utf8'));
    const fa = header.indexOf('fitted area (mAU × min)');
    expect(fa).toBeGreaterThan(0);
    const areas = body.map((r) => r[fa]).filter((v) => v !== '').map(Number);
    expect(areas).toContain(summary.fits[0].peaks[0].area);
    expect(header).toContain('tailing factor T (5 %)');
    expect(header).toContain('retention factor k');
    expect(comments.some((c) => c.startsWith('# Fit 1: raw trace, 5.4 to 6.9; 2 peak(s).'))).toBe(true);
    const report = readFileSync(join(out, 'demo-sample-report.html'), 'utf8');
    expect(report).toContain('<h2>Region fits</h2>');
    expect(report).toContain('Fit 1: residuals (data − fit)');
  });

  test('on a processed trace the other version is fitted too (the processing check), and a region outside the trace is a warning, not a failure', async () => {
    const out2 = join(work, 'fit2');
    const method = join(work, 'ma7.json');
    const { writeFileSync } = await import('node:fs');
    writeFileSync(method, JSON.stringify({ format: 'tracewright-recipe', version: 1, steps: [{ step: 'moving-average', params: { window: 7 } }] }));
    const r = await cli(['analyse', join(DEMO, 'demo-sample.csv'), '--method', method, '--fit-region', '5.4:6.9', '--fit-region', '500:600', '--fit-baseline', 'quadratic', '--out', out2]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/Region 500:600 was not fitted/);
    const summary = JSON.parse(readFileSync(join(out2, 'demo-sample-summary.json'), 'utf8'));
    expect(summary.fits).toHaveLength(1);
    expect(summary.fits[0].processing.map((p: { label: string }) => p.label)).toEqual(['raw', 'the method’s steps']);
    expect(summary.fits[0].processingSummary).toMatch(/found on raw|supported by the fit on raw/);
    const schema = JSON.parse(readFileSync('src/core/export/summary.schema.json', 'utf8'));
    expect(schemaProblems(schema, summary, true)).toEqual([]);
    expect(readFileSync(join(out2, 'demo-sample-peaks.csv'), 'utf8')).toContain(`Processing check: ${summary.fits[0].processingSummary}`);
    expect(summary.warnings.join(' ')).toMatch(/Region 500:600 was not fitted/);
  });
});

describe('the combined table from the command line (--combine)', () => {
  test('peaks matched across the run’s traces: mean and %RSD as computed by hand from the per-trace peak CSVs', async () => {
    const out = join(work, 'combine');
    const inputs = ['demo-scan-1.csv', 'demo-scan-2.csv', 'demo-scan-3.csv'].map((f) => join(DEMO, f));
    const r = await cli(['analyse', ...inputs, '--combine', '--match-window', '0.05', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const combined = readCsv(readFileSync(join(out, 'peaks-combined.csv'), 'utf8'), ',', '.');
    expect(combined.comments.some((c) => c.includes('Matching window: ±0.05 x-units, as given'))).toBe(true);
    const per = ['demo-scan-1', 'demo-scan-2', 'demo-scan-3'].map((s) => readCsv(readFileSync(join(out, `${s}-peaks.csv`), 'utf8'), ',', '.'));
    // The tallest peak of each scan, matched in all three: independent arithmetic (sample SD, n − 1; %RSD = 100 SD / mean).
    const rows = per.map((t) => {
      const h = t.header.findIndex((c) => c.startsWith('height')), a = t.header.findIndex((c) => c.startsWith('area (')), x = t.header.findIndex((c) => c.startsWith('apex'));
      const top = [...t.body].sort((p, q) => Number(q[h]) - Number(p[h]))[0];
      return { x: Number(top[x]), area: Number(top[a]) };
    });
    const group = combined.body.find((g) => Math.abs(Number(g[3]) - rows[0].x) < 0.05)!;
    expect(Number(group[1])).toBe(3);
    const mean = rows.reduce((s, v) => s + v.area, 0) / 3;
    const sd = Math.sqrt(rows.reduce((s, v) => s + (v.area - mean) ** 2, 0) / 2);
    expect(Number(group[6])).toBeCloseTo(mean, 10);
    expect(Number(group[8])).toBeCloseTo((100 * sd) / mean, 8);
  });
});
