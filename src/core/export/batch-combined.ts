/**
 * The batch's combined table (issue 18): peaks matched across files by
 * retention time within a stated window (measure/batch-figures.ts), with the
 * mean and %RSD of retention time and area per matched peak. Peaks below
 * the detection limit and peaks removed by hand are left out (noise would
 * otherwise start groups of its own).
 */
import type { Peak } from '../measure/peak-types.ts';
import { combineBatchPeaks } from '../measure/batch-figures.ts';
import { writeCsv, type CsvCellOptions } from '../io/csv-write.ts';

export interface CombinedRun {
  name: string;
  peaks: readonly Peak[];
}

const kept = (p: Peak) => !p.removedByUser && p.flag !== 'below-detection';

/**
 * The matching window when none is given: half the median half-height width
 * of the kept peaks of every file (our choice: peaks closer than that are
 * not resolved anyway). Null when no file has a kept peak.
 */
export function defaultMatchWindow(runs: readonly CombinedRun[]): number | null {
  const w = runs.flatMap((r) => r.peaks.filter(kept).map((p) => p.fwhm)).filter((v) => Number.isFinite(v) && v > 0).sort((a, b) => a - b);
  if (!w.length) return null;
  const mid = w.length >> 1;
  return (w.length % 2 ? w[mid] : (w[mid - 1] + w[mid]) / 2) / 2;
}

/**
 * The combined table as CSV text (comments: the window and how it was set,
 * the matching rule, files missing a peak, doubtful matches).
 * @param window matching window in x-units; default {@link defaultMatchWindow}
 */
export function batchCombinedCsv(runs: readonly CombinedRun[], options: CsvCellOptions, head: readonly string[], window?: number): string {
  const chosen = window ?? defaultMatchWindow(runs);
  const header = ['matched peak #', 'files with this peak', 'files without it', 'mean retention time (x unit)', 'retention time SD', 'retention time %RSD', 'mean area (y unit × x unit)', 'area SD', 'area %RSD', 'members (file: retention time, area)'];
  if (chosen === null) return writeCsv([header], { ...options, comments: [...head, 'No file has a peak at or above the detection limit: nothing to combine.'] });
  const out = combineBatchPeaks(runs.map((r) => ({ name: r.name, peaks: r.peaks.filter(kept).map((p) => ({ retentionTime: p.x, area: p.area })) })), chosen);
  if (!out.ok) return writeCsv([header], { ...options, comments: [...head, out.message] });
  const c = out.combination;
  const opt = (v: number | null) => (v === null ? '' : v);
  const rows = c.groups.map((g, i) => [
    i + 1, g.members.length, g.missing.join('; '), g.retentionTime.mean, opt(g.retentionTime.sd), opt(g.retentionTime.rsdPercent),
    g.area.mean, opt(g.area.sd), opt(g.area.rsdPercent), g.members.map((m) => `${m.file}: ${m.retentionTime}, ${m.area}`).join('; '),
  ]);
  const how = window === undefined ? 'half the median half-height width of the kept peaks (our default)' : 'as given';
  const comments = [
    ...head,
    `Matching window: ±${chosen} x-units, ${how}. Peaks at or above the detection limit only; peaks removed by hand left out.`,
    ...c.notes,
    'SD: sample standard deviation (n − 1); %RSD = 100 · SD / |mean|; empty with fewer than two files.',
  ];
  return writeCsv([header, ...rows], { ...options, comments });
}
