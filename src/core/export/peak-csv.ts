/**
 * The peak table as delimited text: the columns of the page's table with
 * units in the header, and comment lines that state how S/N was defined,
 * how and where the noise was measured, the detection and quantitation
 * limits, and which peaks were added or removed by hand.
 */
import { ghostCell, ghostColumnHeader } from '../measure/ghost-peaks.ts'; // issue 20
import { excludedRangesSentence } from '../measure/excluded-ranges.ts';
import type { AnalyseResult } from '../analysis/index.ts';
import { writeCsv, type CsvCellOptions } from '../io/csv-write.ts';
import type { NoiseEstimate } from '../measure/noise-estimators.ts';
import type { BoundKind, Peak, PeakMark, SplitRule } from '../measure/peak-types.ts';
import { FLAG_TEXT, SNR_DEFINITION_WORDS, SNR_SHORT } from '../measure/snr-words.ts';
import { SIGMA_FLOOR_OF_SPAN } from '../measure/peak-types.ts';
import { WIDTH_LIMIT } from '../measure/peak-bounds.ts';
import { noiseBumpSentence } from '../measure/noise-bumps.ts';
import type { Recipe, Registry } from '../method.ts';
import type { Trace } from '../trace.ts';
import { noiseSummaryLines } from '../measure/noise-report.ts';
import { commentText, metadataLines, provenanceLines } from './cleaned-csv.ts';
import { CAUTION, exportTime, TOOL_LABEL, TOOL_NAME } from './version.ts';
import { namedPeakLines, peakNamingOf, withNameColumn } from './peak-names.ts';
import type { ExtraPeakColumns } from './fit-export.ts';
import { reasonFor, type HandReason } from './report-fields.ts';

/** What each mark means, in a few words (the table, the plot and the exports). */
export const MARK_TEXT: Record<PeakMark, string> = {
  'appears-only-after-processing': 'appears only after processing',
  'possibly-saturated': 'flat top at the largest value: possibly saturated',
  'thinly-sampled': 'thinly sampled (under 5 points across half height)',
  'also-in-blank': 'also in the blank at this position (carry-over or a ghost peak)',
};

/** Why a bound lies where it does, in words. */
export const BOUND_TEXT: Record<BoundKind, string> = {
  returned: 'back at the baseline',
  valley: 'valley before a rise',
  'shared-valley': 'valley shared with a neighbour',
  'width-limit': `width limit (${WIDTH_LIMIT} half-widths)`,
  'trace-end': 'end of the trace',
  'set-by-hand': 'set by hand',
};

/** How a shared valley splits the area, in words. */
export const SPLIT_TEXT: Record<SplitRule | 'none', string> = {
  none: '',
  'perpendicular-drop': 'perpendicular drop',
  'valley-to-valley': 'valley to valley',
};

/** The marks of a row in words, joined by "; ". */
export function peakMarksText(p: Peak): string {
  return p.marks.map((m) => MARK_TEXT[m]).join('; ');
}

/** The hand decision on a peak, in words; empty for a detected peak left alone. */
export function peakDecisionText(p: Peak): string {
  if (p.removedByUser) return 'removed by hand';
  if (p.origin === 'added-by-user') return 'added by hand';
  if (p.boundsByUser) return 'start and end set by hand';
  return '';
}

function unitSuffix(unit: string): string {
  return unit ? ` (${unit})` : '';
}

/** Each row's area as % of the summed area of every peak not removed by hand (null for removed rows, or no total). */
export function areaPercents(peaks: readonly Peak[]): (number | null)[] {
  let total = 0;
  for (const p of peaks) if (!p.removedByUser && Number.isFinite(p.area)) total += p.area;
  return peaks.map((p) => (p.removedByUser || total === 0 || !Number.isFinite(p.area) ? null : (100 * p.area) / total));
}

/**
 * Header and rows of the peak table (no comments); numbers stay numbers, a
 * missing value is an empty cell. With `unitsInHeader` false the header
 * says "(x unit)" and "(y unit)" instead of the trace's units. `reasons`
 * (issue 17) fill the "reason for the hand change" column.
 */
export function peakTableRows(trace: Trace, result: AnalyseResult, unitsInHeader = true, extra?: ExtraPeakColumns | null, reasons?: readonly HandReason[] | null): (string | number)[][] {
  // A table that mixes files (batch) names the units in columns of their own instead.
  const xu = unitsInHeader ? unitSuffix(trace.xUnit) : ' (x unit)';
  const yu = unitsInHeader ? unitSuffix(trace.yUnit) : ' (y unit)';
  const areaUnit = !unitsInHeader ? ' (y unit × x unit)'
    : trace.xUnit || trace.yUnit ? ` (${trace.yUnit || 'y-units'} × ${trace.xUnit || 'x-units'})` : '';
  const def = result.peakOptions?.snrDefinition ?? 'rms';
  const header = [
    'peak #', `apex${xu}`, `height${yu}`, `prominence${yu}`, `FWHM${xu}`, `FWHM (points)`, `area${areaUnit}`, 'area % of all peaks kept',
    `start${xu}`, `end${xu}`, 'start: why there', 'end: why there', `baseline at start${yu}`, `baseline at end${yu}`, 'shared valley split',
    `noise σ at the peak${yu}`, `S/N (${SNR_SHORT[def]}, definition in use)`, 'S/N H/σ', 'S/N 2H/h',
    `noise range h for 2H/h${yu}`, 'h measured on', 'S/N mean/SD of region', 'status', 'marks', 'decision', 'reason for the hand change', 'origin', 'note',
    ghostColumnHeader(yu), // issue 20
    ...(extra?.header ?? []), // issue 18: fitted areas and figures (export/fit-export.ts)
  ];
  const rows: (string | number)[][] = [header];
  const opt = (v: number | null | undefined): string | number => (v === null || v === undefined ? '' : v);
  const shares = areaPercents(result.peaks);
  const oneStep = trace.x.length > 1 ? Math.abs(trace.x[trace.x.length - 1] - trace.x[0]) / (trace.x.length - 1) : 0;
  result.peaks.forEach((p, i) => {
    rows.push([
      i + 1, p.x, p.height, p.prominence, p.fwhm, p.fwhmPoints, p.area, opt(shares[i]), p.start, p.end,
      BOUND_TEXT[p.startKind], BOUND_TEXT[p.endKind], p.baselineStart, p.baselineEnd, SPLIT_TEXT[p.split],
      p.noiseSigma, opt(p.snr), opt(p.snrRms), opt(p.snrPharma), opt(p.pharmaNoise?.h),
      p.pharmaNoise ? `${p.pharmaNoise.source}, ${p.pharmaNoise.points} points${p.pharmaNoise.clipped ? ', window cut by the trace end' : ''}` : '',
      opt(p.snrRegion), FLAG_TEXT[p.flag], peakMarksText(p), peakDecisionText(p), reasonFor(p, reasons, oneStep), p.origin, p.note ?? '',
      ghostCell(p), // issue 20
      ...(extra ? extra.cells(p, i) : []),
    ]);
  });
  return rows;
}

/** A number for a sentence: never "NaN" or "Infinity" (issue 13). */
function num(v: number): string {
  return Number.isFinite(v) ? String(v) : 'not a finite number';
}

/** One sentence about a noise estimate: what, over how many points, where. */
export function noiseSentence(e: NoiseEstimate): string {
  const where = e.from !== undefined && e.to !== undefined ? ` over x ${e.from} to ${e.to}${e.clipped ? ' (cut by the trace end)' : ''}` : '';
  const held = e.assumptionsHeld === undefined ? '' : e.assumptionsHeld ? '; assumptions held' : '; an assumption did not hold or a fallback was used';
  const value = Number.isFinite(e.sigma) ? String(e.sigma) : `${num(e.sigma)} (the computation overflowed or had no data)`;
  return `${e.description} Method ${e.method}; ${e.measure === 'sd' ? 'standard deviation' : 'range'} ${value}; ${e.points} points${where}${held}.`;
}

/** How height, width, bounds and area are measured, in words (the table's hint says the same, shorter). */
export const PEAK_MEASURE_LINES: readonly string[] = [
  'Height: the apex level (a parabola over the peak\'s own top, ±FWHM/6) above the peak\'s local baseline, a straight line between the levels of the trace at its start and end (the mean of at least 5 samples beyond each, or the averaged trace at a valley).',
  `Start and end: where the trace, averaged over about half the peak's half-height width, is back at the baseline (within 3 standard deviations of that average above the lower of the baseline and the lower hull of the trace) plus two half-widths, or at the valley before a rise (3 standard deviations; 6 once back at the baseline); never beyond ${WIDTH_LIMIT} of the peak's own half-height half-widths. Peaks sharing a valley are split there: perpendicular drop (one baseline under the group) unless valley to valley was chosen. Narrow peaks on a broad neighbour's top keep their own baseline; two maxima whose valley is shallower than the detection limit count as one peak.`,
  'FWHM: the peak\'s own width at half its height above the local baseline (crossings linearly interpolated). Area: above the local baseline between start and end (trapezoid rule). Perpendicular drop is biased by construction where peaks overlap (about −21 % for the smaller of a 5:1 pair at resolution 0.8).',
];

/** Comment lines on how S/N and the flags were obtained. */
export function peakMethodLines(result: AnalyseResult): string[] {
  const lines: string[] = [];
  const o = result.peakOptions;
  const def = o?.snrDefinition ?? 'rms';
  lines.push(`S/N definition in use: ${SNR_DEFINITION_WORDS[def]}`);
  if (result.noise) {
    lines.push(`Noise σ on the measured trace: ${noiseSentence(result.noise.sigma)}`);
    if (result.noise.rawSigma && result.noise.rawSigma !== result.noise.sigma) lines.push(`Noise on the raw trace (for comparison): ${noiseSentence(result.noise.rawSigma)}`);
    if (result.noise.peakToPeak) lines.push(`Peak-to-peak noise in the quiet range: ${noiseSentence(result.noise.peakToPeak)}`);
    lines.push(...noiseSummaryLines(result.noise));
    for (const n of result.noise.notes) lines.push(`Noise note: ${n}`);
  } else {
    lines.push('Noise: not measured.');
  }
  if (o) {
    lines.push(`Limits: detection S/N ${o.limits.detection}, quantitation S/N ${o.limits.quantitation}.`);
    lines.push(`Flags: "${FLAG_TEXT['below-detection']}" when S/N < ${o.limits.detection}; "${FLAG_TEXT.detectable}" when ${o.limits.detection} ≤ S/N < ${o.limits.quantitation}; "${FLAG_TEXT.quantifiable}" when S/N ≥ ${o.limits.quantitation}; "${FLAG_TEXT['not-measured']}" when S/N could not be computed.`);
    lines.push(`Thresholds: prominence at least ${num(o.minProminence)} (y-units), S/N at least ${num(o.minSnr)}, FWHM at least ${num(o.minWidth)} (x-units), apex separation at least ${num(o.minSeparation)} (x-units, 0 = off)${o.negative ? '; troughs detected (heights and areas negative)' : ''}.`);
    const excludedLine = excludedRangesSentence(o.excluded); // issue 17
    if (excludedLine) lines.push(excludedLine);
    if (def === 'pharmacopoeial') lines.push(`2H/h noise window: ${o.pharmacopoeialMultiplier} half-height widths${o.pharmacopoeialNoise?.fromBlank ? '; h from the blank, processed by the same steps as the trace measured' : ''}.`);
  }
  lines.push(...PEAK_MEASURE_LINES);
  if (o && o.noiseSigma === 0) lines.push(`Noise σ is 0: S/N is not measured, and the rules that need σ use ${SIGMA_FLOOR_OF_SPAN} × the trace's span instead.`);
  if (result.noiseBumps) lines.push(`Noise-only peaks: ${noiseBumpSentence(result.noiseBumps)} ${result.noiseBumps.method}`);
  const marked = result.peaks.filter((p) => p.marks.length && !p.removedByUser);
  for (const m of Object.keys(MARK_TEXT) as PeakMark[]) {
    const n = marked.filter((p) => p.marks.includes(m)).length;
    if (n) lines.push(`Marked "${MARK_TEXT[m]}": ${n} row${n === 1 ? '' : 's'}.`);
  }
  if (result.peakProblem) lines.push(`Peaks could not be measured: ${result.peakProblem}`);
  const added = result.peaks.map((p, i) => ({ p, i })).filter(({ p }) => p.origin === 'added-by-user' && !p.removedByUser);
  const removed = result.peaks.map((p, i) => ({ p, i })).filter(({ p }) => p.removedByUser);
  lines.push(added.length ? `Added by hand: ${added.map(({ p, i }) => `peak ${i + 1} at ${p.x}`).join('; ')}.` : 'Added by hand: none.');
  lines.push(removed.length
    ? `Removed by hand (kept in the table, marked, and not counted): ${removed.map(({ p, i }) => `peak ${i + 1} at ${p.x}`).join('; ')}.`
    : 'Removed by hand: none.');
  return lines;
}

export interface PeakCsvInput {
  trace: Trace;
  result: AnalyseResult;
  options: CsvCellOptions;
  now: Date;
  /** When given, the recipe (JSON and words) is written into the header too. */
  recipe?: Recipe;
  registry?: Registry;
  version?: string;
  /** Issue 18: extra columns (fitted areas, figures) and the comment lines that explain them. */
  extra?: ExtraPeakColumns | null;
  extraComments?: readonly string[];
  /** Issue 17: the reasons given for hand changes (the "reason for the hand change" column). */
  reasons?: readonly HandReason[] | null;
}

/**
 * The peak table as CSV text: comment lines (input file and SHA-256, tool
 * version, time, caution, S/N definition, noise method with its points and
 * window, limits, flags, hand decisions), a header row with units, one row
 * per peak (peaks removed by hand stay, marked in the "decision" column).
 * Formula-injection guard and round-trip numbers from {@link writeCsv}.
 * @throws RangeError on a decimal comma with a comma delimiter, or an invalid `now`.
 */
export function peakTableCsv(input: PeakCsvInput): string {
  const { trace, result, options, now } = input;
  if (!trace || !result) throw new RangeError('There is no analysed trace to export yet; load a trace and wait for the analysis.');
  const version = input.version ?? TOOL_LABEL;
  const head = input.recipe && input.registry
    ? provenanceLines(trace, input.recipe, input.registry, now, version)
    : [
      `Input file: ${commentText(trace.source.fileName)}`,
      `Input SHA-256: ${commentText(trace.source.sha256)}`,
      `Trace: ${commentText(trace.name)}`,
      `Written by: ${version}`,
      `Written at: ${exportTime(now)}`,
      `Caution: ${CAUTION}`,
    ];
  // Issue 21: a "name" column and the named peaks found or missing, when the method names peaks.
  const naming = peakNamingOf(input.recipe, result.peaks);
  const comments = [`${TOOL_NAME} peak table`, ...head, ...metadataLines(trace), `Peaks: ${result.peaks.length} rows.`, ...peakMethodLines(result), ...namedPeakLines(naming, trace.xUnit), ...(input.extraComments ?? [])];
  return writeCsv(withNameColumn(peakTableRows(trace, result, true, input.extra, input.reasons), naming), { ...options, comments });
}

/**
 * The peak table as tab-separated text without comment lines, for pasting
 * into a spreadsheet (same guard and numbers as the CSV; decimal sign and significant digits as given).
 */
export function peakTableTsv(trace: Trace, result: AnalyseResult, decimal: CsvCellOptions['decimal'] = '.', digits?: number): string {
  return writeCsv(peakTableRows(trace, result), { delimiter: '\t', decimal, digits, newline: '\n' });
}
