/**
 * The cleaned trace as delimited text: x, the raw y, the processed y, the
 * residual (raw − processed) and the fitted baseline when there is one, with
 * a header of comment lines that ties the numbers to the input bytes
 * (file name, SHA-256), the recipe, the tool version and the time.
 */
import type { AnalyseResult } from '../analysis/index.ts';
import { writeCsv, type CsvCellOptions } from '../io/csv-write.ts';
import { interpolateLinear, sameGrid } from '../numeric/interpolate.ts';
import { recipeInWords, recipeToJson, type Recipe, type Registry } from '../method.ts';
import { axisLabel, type Trace } from '../trace.ts';
import { CAUTION, exportTime, TOOL_LABEL, TOOL_NAME } from './version.ts';

export interface CleanedCsvInput {
  /** The sample trace as loaded (the raw y). */
  trace: Trace;
  /** The analysis of that trace with `recipe`. */
  result: AnalyseResult;
  recipe: Recipe;
  registry: Registry;
  /** Delimiter and decimal sign (a decimal comma needs a semicolon or tab delimiter). */
  options: CsvCellOptions;
  now: Date;
  /** Tool name and version; default {@link TOOL_LABEL}. */
  version?: string;
}

/** The recipe as one line of JSON (a comment line cannot hold line breaks). */
export function recipeOneLine(recipe: Recipe): string {
  return JSON.stringify(JSON.parse(recipeToJson(recipe)));
}

/**
 * User text (file and trace names) made fit for one comment line: control
 * characters (tab, CR, LF and the rest) become spaces, so no piece of the
 * line can start with a tab or a line break when a spreadsheet splits it
 * (OWASP CSV injection lists both); writeCsv guards the other characters.
 */
export function commentText(text: string): string {
  // eslint-disable-next-line no-control-regex
  return String(text).replace(/[\u0000-\u001f\u007f]/g, ' ');
}

/** Most metadata entries copied into a CSV header; the report lists them all. */
export const CSV_MAX_METADATA = 60;

/** The file's metadata as comment lines ("File metadata: label = value"), control characters flattened. */
export function metadataLines(trace: Trace): string[] {
  const entries = Object.entries(trace.metadata);
  const lines = entries.slice(0, CSV_MAX_METADATA).map(([k, v]) => commentText(`File metadata: ${k} = ${v}`));
  if (entries.length > CSV_MAX_METADATA) lines.push(`File metadata: ${entries.length - CSV_MAX_METADATA} more entries are in the report.`);
  return lines;
}

/**
 * Comment lines shared by the exports of one trace: what was read, how it
 * was processed, by which tool and when, and the caution.
 */
export function provenanceLines(trace: Trace, recipe: Recipe, registry: Registry, now: Date, version: string = TOOL_LABEL): string[] {
  return [
    `Input file: ${commentText(trace.source.fileName)}`,
    `Input SHA-256: ${commentText(trace.source.sha256)}`,
    `Trace: ${commentText(trace.name)}`,
    `Processing method (JSON): ${recipeOneLine(recipe)}`,
    ...recipeInWords(recipe, registry).map((s) => `Processing method in words: ${s}`),
    `Written by: ${version}`,
    `Written at: ${exportTime(now)}`,
    `Caution: ${CAUTION}`,
  ];
}

/**
 * The cleaned trace as CSV text (RFC 4180 quoting, formula-injection guard
 * and round-trip number text from {@link writeCsv}).
 *
 * Rows follow the processed grid. When a step changed the grid (boxcar
 * binning, resampling) the raw y is interpolated linearly onto the processed
 * x and the column header and a comment line say so. The baseline column is
 * present only when a baseline step fitted one on the final grid. Every
 * number reads back to the same double (ECMAScript shortest round-trip
 * text); a NaN (raw interpolated outside its range) gives an empty cell.
 *
 * @returns the file text, comment lines first ("# "), then a header row, then one row per point.
 * @throws RangeError on a decimal comma with a comma delimiter, or an invalid `now`.
 */
export function cleanedTraceCsv(input: CleanedCsvInput): string {
  const { trace, result, recipe, registry, options, now } = input;
  if (!trace || !result) throw new RangeError('There is no analysed trace to export yet; load a trace and wait for the analysis.');
  const px = result.processed.x;
  const py = result.processed.y;
  const same = sameGrid(trace.x, px);
  const rawY = same ? trace.y : interpolateLinear(trace.x, trace.y, px);
  const residualY = result.residual.y.length === px.length ? result.residual.y : null;
  const baseline = result.baseline && result.baseline.length === px.length ? result.baseline : null;

  const xLabel = axisLabel(trace.xName, trace.xUnit);
  const yUnit = trace.yUnit ? ` (${trace.yUnit})` : '';
  const header: string[] = [
    xLabel,
    same ? `raw ${trace.yName}${yUnit}` : `raw ${trace.yName} interpolated linearly onto the processed x${yUnit}`,
    `processed ${trace.yName}${yUnit}`,
  ];
  if (residualY) header.push(`residual raw minus processed${yUnit}`);
  if (baseline) header.push(`fitted baseline${yUnit}`);

  const comments = [`${TOOL_NAME} cleaned trace`, ...provenanceLines(trace, recipe, registry, now, input.version)];
  comments.push(...metadataLines(trace));
  comments.push(`Points: ${px.length} processed (the input had ${trace.x.length}).`);
  if (!same) comments.push('The processing changed the x grid, so the raw column holds the raw trace interpolated linearly onto the processed x values.');
  if (result.residualNote) comments.push(`Residual: ${result.residualNote}`);
  if (!baseline && result.baseline) comments.push('A baseline was fitted, but a later step changed the grid, so it is not written.');
  const failed = result.runs.filter((r) => r.status === 'error');
  for (const r of failed) comments.push(`Step not applied (${r.step}): ${r.message ?? 'it could not run.'}`);

  const rows: (string | number)[][] = [header];
  for (let i = 0; i < px.length; i++) {
    const row: (string | number)[] = [px[i], rawY[i], py[i]];
    if (residualY) row.push(residualY[i]);
    if (baseline) row.push(baseline[i]);
    rows.push(row);
  }
  return writeCsv(rows, { ...options, comments });
}
