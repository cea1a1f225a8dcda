/**
 * Batch: one recipe applied to many files. Each file is loaded, analysed
 * and exported (cleaned trace CSV and report); the peaks of all files go
 * into one combined table; everything is packed into one ZIP. A file that
 * cannot be read or analysed is listed with the reason and the rest go on.
 */
import { strToU8, zipSync, type Zippable } from 'fflate';
import { analyse, DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, type NoiseSettings, type PeakSettings } from '../analysis/index.ts';
import { writeCsv, type CsvCellOptions } from '../io/csv-write.ts';
import { loadFile } from '../io/load.ts';
import { recipeToJson, type Recipe, type Registry } from '../method.ts';
import type { Trace } from '../trace.ts';
import { cleanedTraceCsv, commentText, recipeOneLine } from './cleaned-csv.ts';
import { peakMethodLines, peakTableRows } from './peak-csv.ts';
import { uniqueNamer, zipBaseName } from './names.ts';
import { reportHtml } from './report-html.ts';
import { batchCombinedCsv, type CombinedRun } from './batch-combined.ts';
import { quantifySamples, type CalibrationSet, type SampleAmounts } from '../calibration/calibrate.ts';
import { calibrationExport, calibrationExportJson } from '../calibration/export.ts';
import { amountsCsv, calibrationTableCsv } from './calibration-csv.ts';

export { zipBaseName } from './names.ts';
import { CAUTION, exportTime, TOOL_LABEL, TOOL_NAME } from './version.ts';

export interface BatchFile {
  name: string;
  bytes: Uint8Array;
}

export interface BatchSettings {
  noise?: NoiseSettings;
  peaks?: PeakSettings;
  /** Delimiter and decimal sign of every CSV in the batch; default comma and decimal point. */
  csv?: CsvCellOptions;
  /** Time written into every file and the ZIP entries. */
  now: Date;
  version?: string;
  /** Issue 18: matching window (x-units) of the combined table; default half the median half-height width. */
  matchWindow?: number;
  /**
   * Issue 21: the calibration from the standards (the page's), or none. With it every file's
   * named peaks get amounts, each report its calibration section, and the ZIP the calibration
   * files the command line writes: calibration.json, calibration-table.csv, amounts.csv.
   */
  calibration?: CalibrationSet | null;
}

/** The calibration files of a batch with a calibration, as the command line names them. */
export const BATCH_CALIBRATION_FILES = ['calibration.json', 'calibration-table.csv', 'amounts.csv'] as const;

export interface BatchProgress {
  /** Files finished so far (0 … total). */
  done: number;
  total: number;
  /** The file just finished, or '' before the first. */
  file: string;
}

/** Called after each file; when it returns a promise the batch waits for it (the page uses this to repaint). */
export type BatchProgressFn = (p: BatchProgress) => void | Promise<void>;

export interface BatchError {
  file: string;
  message: string;
}

export interface BatchResult {
  zip: Uint8Array<ArrayBuffer>;
  errors: BatchError[];
  combinedCsv: string;
  /** Names of the entries in the ZIP, in order. */
  entries: string[];
}

/**
 * Run one recipe over many files and pack the results.
 *
 * For each file, in order: {@link loadFile} (the first trace of a file with
 * several columns is used), {@link analyse} with the recipe and settings
 * (no blank or scans: each file stands alone), then `<name>-cleaned.csv`
 * and `<name>-report.html`. The ZIP also holds `peaks-all-files.csv` (one
 * row per peak with the file name and SHA-256), `peaks-combined.csv`,
 * with a calibration `calibration.json`, `calibration-table.csv` and
 * `amounts.csv` (as the command line writes them), `recipe.json`, and
 * `problems.txt` when any file had a problem. A file that cannot be read or
 * analysed is listed in `errors` and skipped; a recipe step that could not
 * run on a file is listed too, but that file's outputs are still written.
 * Inputs are only read.
 *
 * @param onProgress called after each file (awaited when it returns a promise)
 * @throws RangeError on bad CSV options or an invalid `settings.now`
 */
export async function runBatch(
  files: readonly BatchFile[], recipe: Recipe, registry: Registry, settings: BatchSettings, onProgress?: BatchProgressFn,
): Promise<BatchResult> {
  if (!Array.isArray(files)) throw new RangeError('The batch needs a list of files.');
  const now = settings.now;
  const when = exportTime(now);
  const csv: CsvCellOptions = settings.csv ?? { delimiter: ',', decimal: '.' };
  const version = settings.version ?? TOOL_LABEL;
  const ps = settings.peaks ?? DEFAULT_PEAK_SETTINGS;
  const errors: BatchError[] = [];
  const zipFiles: Zippable = {};
  const entries: string[] = [];
  const combined: (string | number)[][] = [];
  let combinedHeader: (string | number)[] | null = null;
  const methodLines = new Set<string>();
  const combinedRuns: CombinedRun[] = []; // issue 18: peaks-combined.csv
  const amounts: SampleAmounts[] = []; // issue 21: each file's amounts
  const calibration = settings.calibration ?? null;
  let analysed = 0;

  const put = (name: string, text: string) => {
    zipFiles[name] = strToU8(text);
    entries.push(name);
  };
  const unique = uniqueNamer();
  const uniqueBase = (fileName: string) => unique(zipBaseName(fileName));

  await onProgress?.({ done: 0, total: files.length, file: '' });
  for (let f = 0; f < files.length; f++) {
    const file = files[f];
    const fileName = String(file?.name ?? `file ${f + 1}`);
    try {
      const loaded = loadFile(file.bytes, fileName);
      if (!loaded.ok) {
        const e = loaded.error;
        errors.push({ file: fileName, message: `${e.line ? `Line ${e.line}: ` : ''}${e.problem} ${e.advice}` });
      } else {
        const trace: Trace = loaded.traces[0];
        const result = analyse(
          { sampleId: trace.id, scanIds: [], recipe, noise: settings.noise ?? DEFAULT_NOISE_SETTINGS, peaks: ps },
          new Map([[trace.id, trace]]), registry,
        );
        for (const r of result.runs) {
          if (r.status === 'error') errors.push({ file: fileName, message: `Step "${r.step}" was not applied: ${r.message ?? 'it could not run.'} The file's outputs were written without it.` });
        }
        analysed += 1;
        const base = uniqueBase(fileName);
        put(`${base}-cleaned.csv`, cleanedTraceCsv({ trace, result, recipe, registry, options: csv, now, version }));
        // Issue 21: the file's named peaks as amounts (named by the file, as the command line names its inputs).
        const own = calibration ? quantifySamples(calibration, [{ trace: fileName, peaks: result.peaks }])[0] : null;
        if (own) amounts.push(own);
        const calibrationPart = calibration && own ? calibrationExport(calibration, [own], when) : null;
        put(`${base}-report.html`, reportHtml({ trace, result, recipe, registry, now, version, calibration: calibrationPart }));
        const rows = peakTableRows(trace, result, false);
        combinedRuns.push({ name: fileName, peaks: result.peaks });
        if (!combinedHeader) combinedHeader = ['file', 'input SHA-256', 'x unit', 'y unit', ...rows[0]];
        for (const row of rows.slice(1)) combined.push([fileName, trace.source.sha256, trace.xUnit, trace.yUnit, ...row]);
        if (result.peaks.length === 0) combined.push([fileName, trace.source.sha256, trace.xUnit, trace.yUnit, 'no peaks']);
        for (const line of peakMethodLines(result)) if (!/^(Noise|Added|Removed|Peak-to-peak|Thresholds|Peaks could not)/.test(line)) methodLines.add(line);
      }
    } catch (e) {
      errors.push({ file: fileName, message: `The file could not be analysed: ${e instanceof Error ? e.message : String(e)}` });
    }
    await onProgress?.({ done: f + 1, total: files.length, file: fileName });
  }

  const comments = [
    `${TOOL_NAME} peak table of a batch`,
    `Written by: ${version}`,
    `Written at: ${when}`,
    `Caution: ${CAUTION}`,
    `Processing method (JSON): ${recipeOneLine(recipe)}`,
    `Files: ${files.length} given, ${analysed} analysed. Noise and S/N are measured on each file by itself; each file's report states its noise figure.`,
    `Thresholds: prominence at least ${ps.minProminenceSigma} σ of each file's noise, S/N at least ${ps.minSnr}, FWHM at least ${ps.minWidth > 0 ? `${ps.minWidth} x-units` : '2.5 sample spacings'}, apex separation at least ${ps.minSeparation} x-units (0 = off); measured on the ${ps.measureOn} trace.`,
    ...methodLines,
    ...errors.map((e) => commentText(`Problem with ${e.file}: ${e.message}`)),
  ];
  const header = combinedHeader ?? ['file', 'input SHA-256', 'x unit', 'y unit', 'peak #'];
  const combinedCsv = writeCsv([header, ...combined], { ...csv, comments });
  put('peaks-all-files.csv', combinedCsv);
  put('peaks-combined.csv', batchCombinedCsv(combinedRuns, csv, [`${TOOL_NAME} peaks matched across the files of a batch: mean and %RSD of retention time and area`, `Written by: ${version}`, `Written at: ${when}`, `Caution: ${CAUTION}`], settings.matchWindow));
  if (calibration) {
    // One calibration for the whole batch, with every analysed file's amounts (the same object as calibration.json).
    const exp = calibrationExport(calibration, amounts, when);
    put(BATCH_CALIBRATION_FILES[0], calibrationExportJson(exp));
    put(BATCH_CALIBRATION_FILES[1], calibrationTableCsv(exp, csv));
    put(BATCH_CALIBRATION_FILES[2], amountsCsv(exp, csv));
  }
  put('recipe.json', `${recipeToJson(recipe)}\n`);
  if (errors.length) put('problems.txt', `${errors.map((e) => `${e.file}: ${e.message}`).join('\n')}\n`);
  // ZIP times are local DOS times from 1980 on; the export time keeps the archive reproducible.
  const zip = zipSync(zipFiles, { mtime: now.getTime() < Date.UTC(1980, 1, 1) ? Date.UTC(1980, 1, 1) : now });
  return { zip, errors, combinedCsv, entries };
}
