/**
 * Region fits and figure columns on the command line (issue 18): the
 * options' values as the run uses them, and the fits of one analysed trace
 * made as the page makes them (core/measure/fit/job.ts, starting peaks from
 * the peak table inside the region), so the peak CSV, the report and the
 * summary carry them exactly as the page's exports do.
 */
import type { AnalyseResult } from '../core/analysis/index.ts';
import type { FitForExport } from '../core/export/fit-export.ts';
import { runFitJob, type FitSettings, type FitVersion } from '../core/measure/fit/job.ts';
import { MAX_PEAKS, type BaselineKind } from '../core/measure/fit/region.ts';
import { SHAPE_KINDS, type ShapeKind } from '../core/measure/fit/shapes.ts';
import { startsInRegion } from '../core/measure/fit/starts.ts';
import type { Trace } from '../core/trace.ts';

/** The fit options of a run: regions (x-units) and one set of choices for all of them. */
export interface CliFitOptions {
  regions: [number, number][];
  on: 'raw' | 'processed';
  shape: ShapeKind;
  baseline: BaselineKind;
  maxPeaks: number;
}

/** Label of the method's processed trace in the fit's sentences. */
export const CLI_PROCESSED_LABEL = 'the method’s steps';

/** Defaults, as the page's fit panel. */
export const CLI_FIT_DEFAULTS: Omit<CliFitOptions, 'regions'> = { on: 'raw', shape: 'gaussian', baseline: 'line', maxPeaks: 3 };

/** The fit choices from the option values, or the sentence of a usage error. */
export function fitChoicesFromArgs(v: { shape: string | null; baseline: string | null; peaks: string | null; on: string | null }): Omit<CliFitOptions, 'regions'> | string {
  const out = { ...CLI_FIT_DEFAULTS };
  if (v.shape !== null) {
    if (!SHAPE_KINDS.includes(v.shape as ShapeKind)) return `--fit-shape takes ${SHAPE_KINDS.join(', ')}; got "${v.shape}".`;
    out.shape = v.shape as ShapeKind;
  }
  if (v.baseline !== null) {
    if (v.baseline !== 'line' && v.baseline !== 'quadratic') return `--fit-baseline takes line or quadratic; got "${v.baseline}".`;
    out.baseline = v.baseline;
  }
  if (v.peaks !== null) {
    if (!/^\d+$/.test(v.peaks.trim()) || Number(v.peaks) < 1 || Number(v.peaks) > MAX_PEAKS) return `--fit-peaks takes a whole number from 1 to ${MAX_PEAKS}; got "${v.peaks}".`;
    out.maxPeaks = Number(v.peaks);
  }
  if (v.on !== null) {
    if (v.on !== 'raw' && v.on !== 'processed') return `--fit-on takes raw or processed; got "${v.on}".`;
    out.on = v.on;
  }
  return out;
}

/**
 * Fit every region of the run on one analysed trace. The processing check
 * compares the raw trace with the method's processed trace (when a step
 * ran). A region that cannot be fitted gives a sentence naming it, and the
 * other regions still come out.
 */
export function fitsForTrace(trace: Trace, result: AnalyseResult, options: CliFitOptions, madeAt: string): { fits: FitForExport[]; problems: string[] } {
  const fits: FitForExport[] = [];
  const problems: string[] = [];
  const ran = result.runs.some((r) => r.status === 'ok');
  const processed: FitVersion | undefined = ran ? { label: CLI_PROCESSED_LABEL, x: result.processed.x, y: result.processed.y } : undefined;
  for (const [from, to] of options.regions) {
    const settings: FitSettings = { from, to, on: options.on, shape: options.shape, baseline: options.baseline, maxPeaks: options.maxPeaks };
    if (settings.on === 'processed' && !processed) { problems.push(`Region ${from}:${to} was not fitted: no step of the method ran, so there is no processed trace (use --fit-on raw).`); continue; }
    const out = runFitJob({ settings, raw: { label: 'raw', x: trace.x, y: trace.y }, processed, starts: startsInRegion(result.peaks, from, to) });
    if (out.ok) fits.push({ madeAt, result: out.result });
    else problems.push(`Region ${from}:${to} was not fitted: ${out.message}`);
  }
  return { fits, problems };
}
