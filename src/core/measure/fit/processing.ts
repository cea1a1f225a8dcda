/**
 * Does each alternative processing still support the same number of peaks?
 * Given one region and several versions of the trace (the raw trace first,
 * then processed ones on the same x grid), choose the peak count on each by
 * the forward BIC comparison of ./count.ts and compare it with the first.
 *
 * Smoothing correlates the noise; the count comparison judges each version
 * on its effective number of independent points (./count.ts), and each row
 * says whether its residuals looked independent. A smaller count after
 * processing is the loss this helper is for: "supported by the fit on raw,
 * not after 7-point average".
 */
import { supportedPeakCount } from './count.ts';
import { SHAPES } from './shapes.ts';
import type { SupportedCount } from './count.ts';
import type { PeakStart, RegionFitOptions } from './region.ts';

export interface ProcessedVersion {
  /** Plain label, e.g. "raw" or "7-point average". */
  label: string;
  /** The signal on the common x grid. */
  y: Float64Array;
  /**
   * The noise correlation time this processing gives white noise, in points, when known
   * (τ = (Σc)²/Σc² for filter weights c; 1 for the raw trace). Without it τ is estimated from
   * the residuals, which understates it after heavy smoothing.
   */
  noiseCorrelationTime?: number;
}

export interface CountSupportRow {
  label: string;
  /** Peaks supported on this version, or null when the fit could not run (see message). */
  count: number | null;
  /** true / false against the first version; null when either count is missing. */
  sameAsReference: boolean | null;
  /** Residual lag-1 test of the chosen fit: true independent, false correlated, null unknown. */
  independentResiduals: boolean | null;
  result: SupportedCount | null;
  /** One sentence for the ledger. */
  statement: string;
}

export interface CountSupportAcrossProcessing {
  reference: string;
  referenceCount: number | null;
  rows: CountSupportRow[];
  /** Labels of versions that support fewer peaks than the reference. */
  fewer: string[];
  /** E.g. "2 peaks supported by the fit on raw, not after 7-point average (1)." */
  summary: string;
}

const peaksWord = (k: number) => `${k} peak${k === 1 ? '' : 's'}`;

/**
 * Choose the peak count in one region of each version of a trace.
 * The first version is the reference; the counts it supports seed the
 * starting peaks of the others (`options.starts` seeds the reference).
 * @param x common x grid (x-units), strictly increasing
 * @param versions at least one; each y as long as x
 * @param options region, shapes, baseline, minimum width, largest count (default 4)
 */
export function peakCountAcrossProcessing(
  x: Float64Array,
  versions: readonly ProcessedVersion[],
  options: RegionFitOptions & { maxPeaks?: number },
): CountSupportAcrossProcessing {
  if (versions.length === 0) throw new RangeError('Give at least one version of the trace (the raw trace first).');
  const rows: CountSupportRow[] = [];
  let seeds: PeakStart[] | undefined = options.starts ? options.starts.slice() : undefined;
  let referenceCount: number | null = null;
  versions.forEach((v, index) => {
    if (v.y.length !== x.length) {
      rows.push({ label: v.label, count: null, sameAsReference: null, independentResiduals: null, result: null, statement: `${v.label}: not on the same x grid as the other versions (${v.y.length} points, not ${x.length}); not fitted.` });
      return;
    }
    const out = supportedPeakCount(x, v.y, { ...options, starts: seeds, noiseCorrelationTime: v.noiseCorrelationTime });
    if (!out.ok) {
      rows.push({ label: v.label, count: null, sameAsReference: null, independentResiduals: null, result: null, statement: `${v.label}: ${out.message}` });
      return;
    }
    const r = out.result;
    if (index === 0) {
      referenceCount = r.count;
      seeds = r.fit.peaks.map((q) => ({ position: q.position.value, height: q.height.value, fwhm: q.fwhm.value }));
    }
    const independent = r.fit.assumptions.find((a) => a.name === 'independent residuals')?.held ?? null;
    const same = referenceCount === null ? null : r.count === referenceCount;
    let statement: string;
    if (index === 0) statement = `${v.label}: the fit supports ${peaksWord(r.count)}.`;
    else if (same) statement = `${v.label}: still supports ${peaksWord(r.count)}, as on ${versions[0].label}.`;
    else if (referenceCount !== null && r.count < referenceCount) statement = `${peaksWord(referenceCount)} supported by the fit on ${versions[0].label}, not after ${v.label} (${r.count}).`;
    else {
      statement =
        `${v.label}: ${r.count} components fitted where ${versions[0].label} supports ${referenceCount}. Not evidence of more peaks: ` +
        `processing can reshape peaks so that a sum of ${SHAPES[r.fit.shapes[0]].label} shapes no longer describes them, and correlates the noise.`;
    }
    if (independent === false && index > 0) {
      const tau = r.comparisons[r.comparisons.length - 1]?.correlationTime ?? r.fit.correlationTime;
      statement += ` Residuals correlated: the count was judged on n/τ effective points (τ = ${tau.toFixed(1)}), an approximation.`;
    }
    rows.push({ label: v.label, count: r.count, sameAsReference: index === 0 ? true : same, independentResiduals: independent, result: r, statement });
  });
  const fewer = rows.filter((r, i) => i > 0 && r.count !== null && referenceCount !== null && r.count < referenceCount).map((r) => r.label);
  const reference = versions[0].label;
  let summary: string;
  if (referenceCount === null) summary = `The fit on ${reference} could not run, so there is nothing to compare against.`;
  else if (fewer.length === 0) summary = `Every version that could be fitted supports at least the ${peaksWord(referenceCount)} found on ${reference}.`;
  else summary = `${peaksWord(referenceCount)} supported by the fit on ${reference}, not after ${fewer.map((l) => `${l} (${rows.find((r) => r.label === l)?.count})`).join(', ')}.`;
  return { reference, referenceCount, rows, fewer, summary };
}
