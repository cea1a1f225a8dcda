/**
 * Amounts in the per-trace exports (issue 21): the peak table's named rows
 * get their amount, its interval and marks as extra columns, and the
 * command line's summary an added `amounts` field. Both read the same
 * `CalibrationExport` sample as calibration.json and the report, so every
 * export shows the same numbers.
 */
import type { ExportSample } from '../calibration/export.ts';
import type { Peak } from '../measure/peak-types.ts';
import type { ExtraPeakColumns } from './fit-export.ts';

const pct = (level: number) => `${Number((100 * level).toPrecision(4))} %`;

/**
 * Extra peak table columns for the amounts of one trace: amount, interval
 * low and high, unit and marks, filled on the row of each named peak with a
 * measured amount (empty elsewhere; a named peak without an amount says why).
 * @param names the name of each of `peaks` (index as the result's peaks), null when unnamed
 * @param level confidence level of the intervals (for the header)
 */
export function amountPeakColumns(sample: ExportSample | null, names: readonly (string | null)[], level: number): ExtraPeakColumns | null {
  if (!sample) return null;
  const byName = new Map(sample.amounts.map((a) => [a.name, a]));
  const header = ['amount', `amount interval low (${pct(level)})`, `amount interval high (${pct(level)})`, 'amount unit', 'amount marks'];
  return {
    header,
    cells: (_p: Peak, i: number) => {
      const name = names[i];
      const a = name ? byName.get(name) : undefined;
      if (!a) return ['', '', '', '', ''];
      if (a.status !== 'measured' || a.amount === null) return ['', '', '', a.amountUnit, `no amount: ${a.status.replace(/-/g, ' ')}`];
      return [a.amount, a.interval?.low ?? '', a.interval?.high ?? '', a.amountUnit, a.flags.join('; ')];
    },
  };
}

/** Two sets of extra columns side by side (either may be null). */
export function joinExtraColumns(a: ExtraPeakColumns | null, b: ExtraPeakColumns | null): ExtraPeakColumns | null {
  if (!a) return b;
  if (!b) return a;
  return { header: [...a.header, ...b.header], cells: (p, i) => [...a.cells(p, i), ...b.cells(p, i)] };
}

/** The summary's added `amounts` field: one entry per named peak (every number finite or null). */
export function amountSummary(sample: ExportSample, level: number): Record<string, unknown>[] {
  return sample.amounts.map((a) => ({
    name: a.name, status: a.status, amount: a.amount, low: a.interval?.low ?? null, high: a.interval?.high ?? null, level, unit: a.amountUnit, flags: [...a.flags],
  }));
}
