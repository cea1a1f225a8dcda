/**
 * What the page's exports add for issue 18: the kept fits of the sample
 * (marked out of date when the stack changed since a fit of the processed
 * trace), the extra peak table columns and their explaining lines
 * (core/export/fit-extras.ts, as the command line).
 */
import type { AnalyseResult } from '../../core/analysis/index.ts';
import type { ExtraPeakColumns, FitForExport } from '../../core/export/fit-export.ts';
import { fitExportExtras } from '../../core/export/fit-extras.ts';
import { amountPeakColumns, joinExtraColumns } from '../../core/export/amount-columns.ts';
import { nameTracePeaks } from '../../core/calibration/named-peaks.ts';
import type { CalibrationExport } from '../../core/calibration/export.ts';
import type { Trace } from '../../core/trace.ts';
import { useApp } from '../../state/store.ts';

export interface ExportExtras {
  fits: FitForExport[];
  extra: ExtraPeakColumns | null;
  lines: string[];
}

/**
 * The fits and extra columns the exports of `trace` carry now; with the
 * page's calibration (issue 21) the named rows also get their amounts.
 */
export function exportExtras(trace: Trace, result: AnalyseResult, calibration: CalibrationExport | null = null): ExportExtras {
  const s = useApp.getState();
  const stackKey = JSON.stringify(s.recipe.steps);
  const fits: FitForExport[] = s.fits
    .filter((f) => f.sampleId === trace.id)
    .map((f) => ({ madeAt: f.madeAt, result: f.result, outOfDate: f.result.settings.on === 'processed' && f.stackKey !== stackKey }));
  const { extra, lines } = fitExportExtras({ trace, result, fits, figures: s.showFigures ? { deadTime: s.deadTime } : null, measureOn: s.peakSettings.measureOn });
  const names = calibration && s.namedPeaks.peaks.length ? nameTracePeaks(s.namedPeaks, result.peaks).names : [];
  const amounts = calibration ? amountPeakColumns(calibration.samples[0] ?? null, names, calibration.confidenceLevel) : null;
  return { fits, extra: joinExtraColumns(extra, amounts), lines };
}
