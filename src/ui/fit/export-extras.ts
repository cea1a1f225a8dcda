/**
 * What the page's exports add for issue 18: the kept fits of the sample
 * (marked out of date when the stack changed since a fit of the processed
 * trace), the extra peak table columns and their explaining lines.
 */
import type { AnalyseResult } from '../../core/analysis/index.ts';
import { extraPeakColumns, figureFormulaLines, fitCommentLines, type ExtraPeakColumns, type FitForExport } from '../../core/export/fit-export.ts';
import type { Trace } from '../../core/trace.ts';
import { useApp } from '../../state/store.ts';

export interface ExportExtras {
  fits: FitForExport[];
  extra: ExtraPeakColumns | null;
  lines: string[];
}

/** The fits and extra columns the exports of `trace` carry now. */
export function exportExtras(trace: Trace, result: AnalyseResult): ExportExtras {
  const s = useApp.getState();
  const stackKey = JSON.stringify(s.recipe.steps);
  const fits: FitForExport[] = s.fits
    .filter((f) => f.sampleId === trace.id)
    .map((f) => ({ madeAt: f.madeAt, result: f.result, outOfDate: f.result.settings.on === 'processed' && f.stackKey !== stackKey }));
  const measured = s.peakSettings.measureOn === 'raw' ? { x: trace.x, y: trace.y } : result.processed;
  const xu = trace.xUnit ? ` (${trace.xUnit})` : '';
  const au = trace.xUnit || trace.yUnit ? ` (${trace.yUnit || 'y-units'} × ${trace.xUnit || 'x-units'})` : '';
  const extra = extraPeakColumns({ result, measured, fits, figures: s.showFigures ? { deadTime: s.deadTime } : null, xUnitSuffix: xu, areaUnitSuffix: au });
  const lines = [...fitCommentLines(fits), ...(s.showFigures ? figureFormulaLines(s.deadTime) : [])];
  return { fits, extra, lines };
}
