/**
 * What the exports of one trace add for issue 18, given its fits and the
 * figure-column choice: the extra peak table columns and the comment lines
 * that explain them. The page (ui/fit/export-extras.ts, from the store) and
 * the command line (cli/fits.ts, from its options) both call this.
 */
import type { AnalyseResult } from '../analysis/index.ts';
import type { Trace } from '../trace.ts';
import { extraPeakColumns, figureFormulaLines, fitCommentLines, type ExtraPeakColumns, type FitForExport } from './fit-export.ts';

export interface FitExtrasInput {
  trace: Trace;
  result: AnalyseResult;
  fits: readonly FitForExport[];
  /** Figure columns (with the dead time t_M, x-units, or null) when asked for; null for none. */
  figures: { deadTime: number | null } | null;
  /** The trace the peak table was measured on. */
  measureOn: 'raw' | 'processed';
}

export interface FitExtras {
  extra: ExtraPeakColumns | null;
  lines: string[];
}

/** The extra peak columns (fitted areas, figures) and their explaining lines for one trace. Inputs are only read. */
export function fitExportExtras(o: FitExtrasInput): FitExtras {
  const { trace, result } = o;
  const measured = o.measureOn === 'raw' ? { x: trace.x, y: trace.y } : result.processed;
  const xu = trace.xUnit ? ` (${trace.xUnit})` : '';
  const au = trace.xUnit || trace.yUnit ? ` (${trace.yUnit || 'y-units'} × ${trace.xUnit || 'x-units'})` : '';
  const extra = extraPeakColumns({ result, measured, fits: o.fits, figures: o.figures, xUnitSuffix: xu, areaUnitSuffix: au });
  const lines = [...fitCommentLines(o.fits), ...(o.figures ? figureFormulaLines(o.figures.deadTime) : [])];
  return { extra, lines };
}
