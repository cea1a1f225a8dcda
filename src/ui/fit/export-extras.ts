/**
 * What the page's exports add for issue 18: the kept fits of the sample
 * (marked out of date when the stack changed since a fit of the processed
 * trace), the extra peak table columns and their explaining lines
 * (core/export/fit-extras.ts, as the command line).
 */
import type { AnalyseResult } from '../../core/analysis/index.ts';
import type { ExtraPeakColumns, FitForExport } from '../../core/export/fit-export.ts';
import { fitExportExtras } from '../../core/export/fit-extras.ts';
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
  const { extra, lines } = fitExportExtras({ trace, result, fits, figures: s.showFigures ? { deadTime: s.deadTime } : null, measureOn: s.peakSettings.measureOn });
  return { fits, extra, lines };
}
