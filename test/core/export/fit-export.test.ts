/**
 * Issue 18 in the exports: fitted areas beside the drop-line areas in the
 * peak CSV, the figures of chromatography as optional columns with their
 * formulas, the report's fit section with the core's SVG plots, and the
 * summary's added `fits` field (the schema still holds, strictly).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { analysisSummary, summaryJson } from '../../../src/core/export/summary.ts';
import { peakFigures, extraPeakColumns, figureFormulaLines, fitCommentLines, type FitForExport } from '../../../src/core/export/fit-export.ts';
import { peakTableCsv } from '../../../src/core/export/peak-csv.ts';
import { reportHtml } from '../../../src/core/export/report-html.ts';
import { runFitJob } from '../../../src/core/measure/fit/job.ts';
import { emptyRecipe } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { analysed, HOSTILE_NAME, inventedTrace, readCsv } from './helpers.ts';
import { schemaProblems } from './json-schema.ts';

const SCHEMA = JSON.parse(readFileSync('src/core/export/summary.schema.json', 'utf8')) as Record<string, unknown>;
const NOW = new Date(Date.UTC(2024, 6, 1, 12, 0, 0));

// inventedTrace: Gaussians at 2 (height 1, σ 0.05) and 4 (height 0.3, σ 0.08) on a slope 0.02 x, noise σ 0.01.
function fitted(fileName = 'run.csv') {
  const trace = inventedTrace({ fileName });
  const result = analysed(trace, emptyRecipe());
  const out = runFitJob({ settings: { from: 1.6, to: 2.4, on: 'raw', shape: 'gaussian', baseline: 'line', maxPeaks: 2 }, raw: { label: 'raw', x: trace.x, y: trace.y } });
  expect(out.ok).toBe(true);
  if (!out.ok) throw new Error(out.message);
  const fits: FitForExport[] = [{ madeAt: '2024-07-01T12:00:00Z', result: out.result }];
  return { trace, result, fits };
}

describe('fits and figures in the exports', () => {
  test('peak CSV: the fitted area beside the drop-line area, with its method; rows outside the region say so', () => {
    const { trace, result, fits } = fitted();
    const extra = extraPeakColumns({ result, measured: trace, fits, figures: { deadTime: 0.5 }, xUnitSuffix: ' (min)', areaUnitSuffix: ' (mAU × min)' });
    const csv = peakTableCsv({ trace, result, options: { delimiter: ',', decimal: '.' }, now: NOW, extra, extraComments: [...fitCommentLines(fits), ...figureFormulaLines(0.5)] });
    const { header, body, comments } = readCsv(csv, ',', '.');
    const col = (name: string) => header.indexOf(name);
    expect(col('fitted area (mAU × min)')).toBeGreaterThan(0);
    expect(col('table area: method')).toBeGreaterThan(0);
    const rowAt = (x: number) => body.find((r) => Math.abs(Number(r[1]) - x) < 0.02)!;
    const first = rowAt(2), second = rowAt(4);
    // One fitted Gaussian: area = H σ √(2π) = 0.12533 (analytic); within 3 reported SE of the truth.
    const area = Number(first[col('fitted area (mAU × min)')]);
    const se = Number(first[col('fitted area standard error (mAU × min)')]);
    expect(Math.abs(area - 0.05 * Math.sqrt(2 * Math.PI))).toBeLessThan(3 * se);
    expect(area).toBe(fits[0].result.fit.peaks[0].area.value);
    expect(first[col('table area: method')]).toBe('drop line (perpendicular drop)');
    expect(second[col('fitted area: which fit')]).toBe('not in a fitted region');
    expect(comments.some((c) => c.includes('Fit 1: raw trace, 1.6 to 2.4; 1 peak(s).'))).toBe(true);
    // Figures of a Gaussian (REFERENCES.md, USP <621> / Ph. Eur. 2.2.46): T = As = 1, N = (t_R/σ)² = 1600 at t_R 2, σ 0.05.
    // Noise σ 0.01 on height 1 moves each 5 % crossing by about σ_noise / slope = 0.01 / 2.45 min⁻¹ ≈ 0.004 min,
    // 3 % of the 0.122-min half-width: T and As scatter by about 5 % (one SD) on one seeded trace; allow 2 SD.
    expect(Math.abs(Number(first[col('tailing factor T (5 %)')]) - 1)).toBeLessThan(0.1);
    expect(Math.abs(Number(first[col('asymmetry factor As (10 %)')]) - 1)).toBeLessThan(0.1);
    // The columns are the core's figures for this row (the page and the CSV map rows the same way).
    const p0 = result.peaks.findIndex((p) => Math.abs(p.x - 2) < 0.02);
    const direct = peakFigures(trace, result.peaks, 0.5).get(p0)!;
    expect(Number(first[col('tailing factor T (5 %)')])).toBe(direct.tailing.value);
    expect(Math.abs(Number(first[col('plate number N (half height)')]) / 1600 - 1)).toBeLessThan(0.03);
    // k = (t_R − t_M)/t_M with t_M 0.5: 3 for the peak at 2 (t_R from the data's apex, so within 0.01).
    expect(Number(first[col('retention factor k')])).toBeCloseTo(3, 1);
    expect(comments.some((c) => c.includes('N = 8 ln 2'))).toBe(true);
    expect(comments.some((c) => c.includes('Dead time t_M = 0.5'))).toBe(true);
  });

  test('without a dead time there are no retention factor or selectivity columns, and the comment says why', () => {
    const { trace, result } = fitted();
    const extra = extraPeakColumns({ result, measured: trace, figures: { deadTime: null } })!;
    expect(extra.header).not.toContain('retention factor k');
    expect(extra.header).toContain('resolution R_s to the previous peak');
    expect(figureFormulaLines(null).join(' ')).toContain('none was entered');
    expect(extraPeakColumns({ result, measured: trace })).toBeNull();
  });

  test('report: a fit section with the decision, the fit and residual plots as SVG, the peaks with standard errors; text escaped', () => {
    const { trace, result, fits } = fitted(HOSTILE_NAME);
    const html = reportHtml({ trace, result, recipe: emptyRecipe(), registry: STEP_REGISTRY, now: NOW, fits });
    const section = html.slice(html.indexOf('<h2>Region fits</h2>'), html.indexOf('<h2>What the processing may have lost</h2>'));
    expect(section).toContain(fits[0].result.lead);
    expect(section).toContain('extra peak not supported');
    expect((section.match(/<svg/g) ?? []).length).toBe(2);
    expect(section).toContain('± ');
    expect(section).toContain('F (figure only)');
    expect(html).not.toContain('<img src=x');
    const none = reportHtml({ trace, result, recipe: emptyRecipe(), registry: STEP_REGISTRY, now: NOW, fits: [] });
    // Without fits the report is as before (the command line's report has no fits and must match the page's).
    expect(none).not.toContain('Region fits');
    expect(none).toBe(reportHtml({ trace, result, recipe: emptyRecipe(), registry: STEP_REGISTRY, now: NOW }));
  });

  test('summary JSON: fits added as a field, the schema still holds strictly, every number finite or null', () => {
    const { trace, result, fits } = fitted();
    const summary = analysisSummary({ trace, result, method: emptyRecipe(), registry: STEP_REGISTRY, inputFile: 'run.csv', fits });
    const json = JSON.parse(summaryJson(summary)) as Record<string, unknown>;
    expect(schemaProblems(SCHEMA, json, true)).toEqual([]);
    const f = (json.fits as Record<string, unknown>[])[0];
    expect(f.count).toBe(1);
    expect((f.peaks as { area: number }[])[0].area).toBe(fits[0].result.fit.peaks[0].area.value);
    // Without fits the summary is as before (no `fits` key at all).
    expect('fits' in analysisSummary({ trace, result, method: emptyRecipe(), registry: STEP_REGISTRY, inputFile: 'run.csv' })).toBe(false);
  });
});
