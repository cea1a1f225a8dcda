/**
 * The loss confirmation in short (issue 17): what the current processing
 * lost, weakened and made appear, each kind with its strongest few
 * features and then a count, so one confirmation before exporting can be
 * read at a glance. The full sentences stay in the report's detail.
 */
import type { LossItem } from '../analysis/result.ts';

/** Features named per kind; the rest are counted. */
export const LOSS_SUMMARY_TOP = 3;

const KIND_WORDS: Record<LossItem['kind'], { title: string; snr: string }> = {
  lost: { title: 'Lost', snr: 'raw' },
  weakened: { title: 'Weakened', snr: 'raw' },
  appeared: { title: 'Appear only after processing', snr: 'processed' },
};

/** Counts per kind. */
export function lossCounts(items: readonly LossItem[]): Record<LossItem['kind'], number> {
  const out = { lost: 0, weakened: 0, appeared: 0 };
  for (const it of items) out[it.kind]++;
  return out;
}

/**
 * One line per kind that has features ("Lost: 2 features, at 4.10 min (S/N
 * 12.3 raw), at 5.20 min (S/N 4.0 raw)."), strongest first by S/N, at most
 * {@link LOSS_SUMMARY_TOP} named and the rest counted; then the warnings
 * that name no single feature (the sum of noise-range changes).
 *
 * @param items the structured features (LossReport.currentItems)
 * @param warnings every warning sentence (LossReport.currentWarnings); those not among the items are added as they are
 * @param xUnit the x unit, for positions
 */
export function lossSummaryLines(items: readonly LossItem[], warnings: readonly string[], xUnit = '', top = LOSS_SUMMARY_TOP): string[] {
  const lines: string[] = [];
  const unit = xUnit ? ` ${xUnit}` : '';
  for (const kind of ['lost', 'weakened', 'appeared'] as const) {
    const these = items.filter((it) => it.kind === kind).sort((a, b) => (b.snr ?? -Infinity) - (a.snr ?? -Infinity));
    if (!these.length) continue;
    const named = these.slice(0, top).map((it) => `at ${it.x.toPrecision(5)}${unit}${it.snr !== null && Number.isFinite(it.snr) ? ` (S/N ${it.snr.toFixed(1)} ${KIND_WORDS[kind].snr})` : ''}`);
    const more = these.length > top ? `, and ${these.length - top} more` : '';
    const lead = these.length > top ? `the ${top} strongest ` : '';
    lines.push(`${KIND_WORDS[kind].title}: ${these.length} feature${these.length === 1 ? '' : 's'}, ${lead}${named.join(', ')}${more}.`);
  }
  const itemised = new Set(items.map((it) => it.sentence));
  for (const w of warnings) if (!itemised.has(w)) lines.push(w);
  return lines;
}
