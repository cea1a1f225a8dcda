/**
 * What a trace's exports add for its fits (src/core/export/fit-extras.ts): the
 * same extra columns and lines as fit-export's own functions, in x and y units
 * of the trace, for the page and the command line alike (one home).
 */
import { describe, expect, test } from 'vitest';
import { fitExportExtras } from '../../../src/core/export/fit-extras.ts';
import { extraPeakColumns, figureFormulaLines, fitCommentLines, type FitForExport } from '../../../src/core/export/fit-export.ts';
import { runFitJob } from '../../../src/core/measure/fit/job.ts';
import { emptyRecipe } from '../../../src/core/method.ts';
import { analysed, inventedTrace } from './helpers.ts';

// inventedTrace: Gaussians at 2 (height 1, σ 0.05) and 4 (height 0.3, σ 0.08) on a slope, noise σ 0.01.
const trace = inventedTrace({ fileName: 'run.csv' });
const result = analysed(trace, emptyRecipe());
const job = runFitJob({ settings: { from: 1.6, to: 2.4, on: 'raw', shape: 'gaussian', baseline: 'line', maxPeaks: 1 }, raw: { label: 'raw', x: trace.x, y: trace.y } });
if (!job.ok) throw new Error(job.message);
const fits: FitForExport[] = [{ madeAt: '2024-07-01T12:00:00Z', result: job.result }];

describe('fitExportExtras', () => {
  test('columns and lines equal fit-export\'s, with the units of the trace; the inputs are only read', () => {
    const before = Float64Array.from(trace.y);
    const got = fitExportExtras({ trace, result, fits, figures: { deadTime: 0.5 }, measureOn: 'raw' });
    const xu = trace.xUnit ? ` (${trace.xUnit})` : '';
    const au = trace.xUnit || trace.yUnit ? ` (${trace.yUnit || 'y-units'} × ${trace.xUnit || 'x-units'})` : '';
    const want = extraPeakColumns({ result, measured: { x: trace.x, y: trace.y }, fits, figures: { deadTime: 0.5 }, xUnitSuffix: xu, areaUnitSuffix: au });
    expect(got.extra!.header).toEqual(want!.header);
    result.peaks.forEach((p, i) => expect(got.extra!.cells(p, i)).toEqual(want!.cells(p, i)));
    expect(got.lines).toEqual([...fitCommentLines(fits), ...figureFormulaLines(0.5)]);
    expect(trace.y).toEqual(before);
  });

  test('without figures asked for, only the fit lines; the fitted peak\'s row carries its fitted area (σ√(2π)h ≈ 0.1253)', () => {
    const got = fitExportExtras({ trace, result, fits, figures: null, measureOn: 'processed' });
    expect(got.lines).toEqual(fitCommentLines(fits));
    const k = result.peaks.findIndex((p) => Math.abs(p.x - 2) < 0.02);
    const areaCol = got.extra!.header.findIndex((h) => /fitted area/i.test(h));
    expect(areaCol).toBeGreaterThanOrEqual(0);
    // Gaussian area σ√(2π)·h = 0.05·2.5066·1 = 0.12533 (handbook formula); noise σ 0.01 allows 2 %.
    expect(Math.abs(Number(got.extra!.cells(result.peaks[k], k)[areaCol]) / 0.12533 - 1)).toBeLessThan(0.02);
  });
});
