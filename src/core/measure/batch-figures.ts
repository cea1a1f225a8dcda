/**
 * Combine the peaks of a batch of runs: match peaks across files by
 * retention time within a stated window, then give per matched peak the
 * mean and relative standard deviation (%RSD = 100 · s / mean, s the sample
 * standard deviation with n − 1) of retention time and area.
 *
 * Matching (our own rule, stated in every result): files are taken in the
 * order given; each peak joins the group whose current mean retention time
 * is nearest and within the window, at most one peak per file per group,
 * nearest pairs first; a peak with no group in reach starts a new one.
 */

export interface BatchPeak {
  retentionTime: number;
  area: number;
}

export interface BatchRun {
  /** File name or label, shown in the combined table. */
  name: string;
  peaks: readonly BatchPeak[];
}

export interface Spread {
  mean: number;
  /** Sample standard deviation (n − 1); null with fewer than two values. */
  sd: number | null;
  /** 100 · sd / |mean|; null with fewer than two values or a zero mean. */
  rsdPercent: number | null;
}

export interface BatchGroup {
  retentionTime: Spread;
  area: Spread;
  /** Which peak of which file joined, in file order. */
  members: { file: string; peakIndex: number; retentionTime: number; area: number }[];
  /** Files with no peak in this group. */
  missing: string[];
}

export type BatchOutcome = { ok: true; combination: BatchCombination } | { ok: false; message: string };

export interface BatchCombination {
  /** Matching window, x-units (± around the group's mean retention time). */
  window: number;
  groups: BatchGroup[];
  /** How the peaks were matched and anything doubtful about it. */
  notes: string[];
}

function spread(values: number[]): Spread {
  const n = values.length;
  const mean = values.reduce((s, v) => s + v, 0) / n;
  if (n < 2) return { mean, sd: null, rsdPercent: null };
  const sd = Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (n - 1));
  return { mean, sd, rsdPercent: mean !== 0 ? (100 * sd) / Math.abs(mean) : null };
}

/**
 * Match peaks across runs and summarise each matched peak.
 * @param runs the files of the batch, in order
 * @param window largest distance (x-units) between a peak and its group's mean retention time
 * @returns `{ ok: false, message }` when the window is not a positive number
 */
export function combineBatchPeaks(runs: readonly BatchRun[], window: number): BatchOutcome {
  if (!(Number.isFinite(window) && window > 0)) return { ok: false, message: `The matching window must be a positive number of x-units (got ${window}).` };
  const groups: { sum: number; members: BatchGroup['members'] }[] = [];
  const notes: string[] = [
    `Peaks matched by retention time within ±${window} of each group's mean, nearest first, at most one peak per file in a group.`,
  ];
  for (const run of runs) {
    const peaks = run.peaks
      .map((p, i) => ({ ...p, i }))
      .filter((p) => Number.isFinite(p.retentionTime) && Number.isFinite(p.area));
    if (peaks.length < run.peaks.length) notes.push(`${run.name}: ${run.peaks.length - peaks.length} peak(s) without a finite retention time or area left out.`);
    const pairs: { d: number; p: number; g: number }[] = [];
    peaks.forEach((p, pi) =>
      groups.forEach((g, gi) => {
        const d = Math.abs(p.retentionTime - g.sum / g.members.length);
        if (d <= window) pairs.push({ d, p: pi, g: gi });
      }),
    );
    pairs.sort((a, b) => a.d - b.d);
    const usedPeak = new Set<number>();
    const usedGroup = new Set<number>();
    const joins: { p: number; g: number }[] = [];
    for (const pair of pairs) {
      if (usedPeak.has(pair.p) || usedGroup.has(pair.g)) continue;
      usedPeak.add(pair.p);
      usedGroup.add(pair.g);
      joins.push(pair);
    }
    // Means move only after the whole file is placed, so the order of peaks in a file does not matter.
    for (const { p, g } of joins) {
      const q = peaks[p];
      groups[g].members.push({ file: run.name, peakIndex: q.i, retentionTime: q.retentionTime, area: q.area });
      groups[g].sum += q.retentionTime;
    }
    peaks.forEach((q, pi) => {
      if (!usedPeak.has(pi)) groups.push({ sum: q.retentionTime, members: [{ file: run.name, peakIndex: q.i, retentionTime: q.retentionTime, area: q.area }] });
    });
  }
  const out: BatchGroup[] = groups
    .map((g) => ({
      retentionTime: spread(g.members.map((m) => m.retentionTime)),
      area: spread(g.members.map((m) => m.area)),
      members: g.members,
      missing: runs.map((r) => r.name).filter((name) => !g.members.some((m) => m.file === name)),
    }))
    .sort((a, b) => a.retentionTime.mean - b.retentionTime.mean);
  for (let i = 1; i < out.length; i++) {
    const a = out[i - 1].retentionTime.mean;
    const b = out[i].retentionTime.mean;
    if (b - a <= window) notes.push(`Groups at ${a.toPrecision(6)} and ${b.toPrecision(6)} lie within one window of each other: their matching is ambiguous; narrow the window or check these peaks by hand.`);
  }
  return { ok: true, combination: { window, groups: out, notes } };
}
