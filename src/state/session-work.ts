/**
 * The user's work beyond the traces and the step stack that a session keeps
 * (issues 18 and 21): the region fits made (with their curves, so the plots
 * and exports come back as they were), the fit panel's choices, the figure
 * columns and dead time, the named-peak table, the standards' known amounts
 * and the calibration settings. Amounts and curves of the calibration are not
 * stored: they are computed again from these inputs and the standards' peaks.
 *
 * JSON form (`work` in the session's description, the journal and the
 * session file): `{ fits?, fitChoices?, showFigures?, deadTime?,
 * namedPeaks?, standards?, calibration? }`. Fits are plain JSON in which each
 * Float64Array is `{ "$f64": base64 }` (RFC 4648 of little-endian doubles)
 * and each number that JSON cannot hold (NaN, ±Infinity) is `{ "$num": "NaN" }`,
 * so every value comes back bit for bit. The three calibration inputs use
 * their own versioned JSON forms (named-peaks.ts, standards.ts,
 * settings.ts). Every member is optional: sessions saved before these were
 * kept load as before.
 *
 * Reading checks everything; a part that does not read is left out with a
 * note, never silently. Pure: no DOM, tested in Node.
 */
import { namedPeaksToJson, parseNamedPeaks, validateNamedPeakTable, NAMED_PEAKS_FORMAT, NAMED_PEAKS_VERSION, MATCH_RULES, type MatchRule, type NamedPeakTable } from '../core/calibration/named-peaks.ts';
import { calibrationSettingsToJson, parseCalibrationSettings, type CalibrationSettings } from '../core/calibration/settings.ts';
import { parseStandards, standardsToJson, type StandardsTable } from '../core/calibration/standards.ts';
import { fitSettingsProblem } from '../core/measure/fit/job.ts';
import { MAX_KEPT_FITS, type FitChoices, type KeptFit } from './fit-slice.ts';
import { base64ToFloat64, float64ToBase64 } from './base64-doubles.ts';

/** What a session keeps of the fits and the calibration inputs; an absent member was not saved. */
export interface SessionWork {
  fits?: KeptFit[];
  fitChoices?: FitChoices;
  showFigures?: boolean;
  deadTime?: number | null;
  namedPeaks?: NamedPeakTable;
  standardsTable?: StandardsTable | null;
  calibrationSettings?: CalibrationSettings;
}

/** The store members a session keeps for {@link SessionWork}. */
export const WORK_KEYS = ['fits', 'fitChoices', 'showFigures', 'deadTime', 'namedPeaks', 'standardsTable', 'calibrationSettings'] as const;

/** Largest JSON form of the fits written to the journal (characters); larger fits wait for the database save. */
export const JOURNAL_FITS_MAX_CHARS = 1_000_000;

/** A value with typed arrays and non-finite numbers made JSON-safe (see the file comment). */
export function encodeTyped(value: unknown): unknown {
  if (value instanceof Float64Array) return { $f64: float64ToBase64(value) };
  if (typeof value === 'number') return Number.isFinite(value) ? value : { $num: String(value) };
  if (Array.isArray(value)) return value.map(encodeTyped);
  if (value && typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) if (v !== undefined && typeof v !== 'function') out[k] = encodeTyped(v);
    return out;
  }
  return value;
}

/**
 * The value written by {@link encodeTyped}.
 * @throws RangeError when a `$f64` member is not base64 of whole doubles.
 */
export function decodeTyped(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(decodeTyped);
  if (value && typeof value === 'object') {
    const o = value as Record<string, unknown>;
    const keys = Object.keys(o);
    if (keys.length === 1 && typeof o.$f64 === 'string') return base64ToFloat64(o.$f64);
    if (keys.length === 1 && typeof o.$num === 'string' && ['NaN', 'Infinity', '-Infinity'].includes(o.$num)) return Number(o.$num);
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(o)) out[k] = decodeTyped(v);
    return out;
  }
  return value;
}

const isObj = (v: unknown): v is Record<string, unknown> => !!v && typeof v === 'object' && !Array.isArray(v);
const isF64 = (v: unknown): v is Float64Array => v instanceof Float64Array;

/** Why a decoded fit cannot be used, or null when its parts are all there and consistent. */
export function keptFitProblem(f: unknown): string | null {
  if (!isObj(f)) return 'it is not an object';
  if (!Number.isInteger(f.id) || typeof f.sampleId !== 'string' || typeof f.madeAt !== 'string' || typeof f.stackKey !== 'string') return 'its id, trace, time or step stack is missing';
  const r = f.result;
  if (!isObj(r) || !isObj(r.settings) || !isObj(r.fit)) return 'its result is missing';
  const settingsProblem = fitSettingsProblem(r.settings as never);
  if (settingsProblem) return settingsProblem;
  if (typeof r.fittedLabel !== 'string' || !Number.isInteger(r.count) || typeof r.statement !== 'string' || typeof r.lead !== 'string' || !Array.isArray(r.steps)) return 'its decision is incomplete';
  const fit = r.fit;
  const c = fit.curves;
  if (!isObj(c) || !Array.isArray(fit.peaks) || !isF64(fit.areaCorrelation) || !isF64(fit.parameters) || !Array.isArray(fit.assumptions) || typeof fit.method !== 'string') return 'its fitted peaks are incomplete';
  const n = isF64(c.x) ? c.x.length : -1;
  if (n < 1 || ![c.y, c.fitted, c.baseline, c.residual].every((a) => isF64(a) && a.length === n)) return 'its curves are missing or of unequal length';
  if (!Array.isArray(c.components) || !c.components.every((a) => isF64(a) && a.length === n)) return 'its fitted peaks’ curves are missing';
  if (c.components.length !== fit.peaks.length || fit.peaks.length !== r.count) return 'its peak count does not match its curves';
  return null;
}

function fitChoicesOf(v: unknown): FitChoices | null {
  if (!isObj(v)) return null;
  const c = { on: v.on, shape: v.shape, baseline: v.baseline, maxPeaks: v.maxPeaks } as FitChoices;
  if (c.on !== 'raw' && c.on !== 'processed') return null;
  return fitSettingsProblem({ ...c, from: 0, to: 1 }) ? null : c;
}

// The journal is written on every edit; the fits list changes rarely, so its encoding is kept per list.
const encodedFits = new WeakMap<readonly KeptFit[], { json: unknown; chars: number }>();

/** The JSON form of the work (see the file comment). */
export function sessionWorkJson(w: SessionWork, options: { maxFitChars?: number } = {}): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  if (w.fits) {
    let enc = encodedFits.get(w.fits);
    if (!enc) {
      const json = encodeTyped(w.fits);
      enc = { json, chars: JSON.stringify(json).length };
      encodedFits.set(w.fits, enc);
    }
    if (options.maxFitChars === undefined || enc.chars <= options.maxFitChars) out.fits = enc.json;
  }
  if (w.fitChoices) out.fitChoices = { ...w.fitChoices };
  if (w.showFigures !== undefined) out.showFigures = w.showFigures;
  if (w.deadTime !== undefined) out.deadTime = w.deadTime;
  if (w.namedPeaks) out.namedPeaks = namedPeaksToJson(w.namedPeaks);
  if (w.standardsTable !== undefined) out.standards = w.standardsTable ? standardsToJson(w.standardsTable) : null;
  if (w.calibrationSettings) out.calibration = calibrationSettingsToJson(w.calibrationSettings);
  return out;
}

/**
 * A named-peak table read back. A table saved while being edited may not
 * validate (a name not typed yet); it is kept as it was, with a note, so the
 * user can finish it. Null when it cannot be read at all.
 */
function namedPeaksBack(v: unknown, notes: string[]): NamedPeakTable | null {
  const p = parseNamedPeaks(v);
  if (p.ok) return p.table;
  if (isObj(v) && v.format === NAMED_PEAKS_FORMAT && Array.isArray(v.peaks)
    && v.peaks.every((q) => isObj(q) && typeof q.name === 'string' && (typeof q.position === 'number' || q.position === null) && (typeof q.window === 'number' || q.window === null))) {
    const rule: MatchRule = MATCH_RULES.includes(v.rule as MatchRule) ? (v.rule as MatchRule) : 'nearest';
    const table: NamedPeakTable = {
      format: NAMED_PEAKS_FORMAT, version: NAMED_PEAKS_VERSION, xUnit: typeof v.xUnit === 'string' ? v.xUnit : '', rule,
      peaks: (v.peaks as { name: string; position: number | null; window: number | null }[]).map((q) => ({ name: q.name, position: q.position ?? NaN, window: q.window ?? NaN })),
    };
    notes.push(`The named-peak table was saved while unfinished and is restored as it was: ${validateNamedPeakTable(table).problems.join(' ')}`);
    return table;
  }
  notes.push(`The saved named-peak table could not be restored and was left out: ${p.problems.join(' ')}`);
  return null;
}

/**
 * The work from its JSON form. Fits whose trace is not in `traceIds` are left
 * out (their trace was not restored); a fit that fails its checks is left out
 * with a note; so is any calibration input that does not read.
 */
export function sessionWorkFromJson(v: unknown, traceIds: ReadonlySet<string>): { work: SessionWork; notes: string[] } {
  const notes: string[] = [];
  const work: SessionWork = {};
  if (v === undefined || v === null) return { work, notes };
  if (!isObj(v)) return { work, notes: ['The saved fits and calibration inputs could not be read and were left out.'] };
  if (v.fits !== undefined) {
    const fits: KeptFit[] = [];
    let decoded: unknown;
    try { decoded = decodeTyped(v.fits); } catch (e) { decoded = null; notes.push(`The saved region fits could not be read (${(e as Error).message}) and were left out.`); }
    if (Array.isArray(decoded)) {
      decoded.forEach((f, i) => {
        const problem = keptFitProblem(f);
        if (problem) { notes.push(`Saved fit ${i + 1} was left out: ${problem}.`); return; }
        if (traceIds.has((f as KeptFit).sampleId)) fits.push(f as KeptFit);
      });
    } else if (decoded !== null) notes.push('The saved region fits are not a list and were left out.');
    work.fits = fits.slice(-MAX_KEPT_FITS);
  }
  if (v.fitChoices !== undefined) {
    const c = fitChoicesOf(v.fitChoices);
    if (c) work.fitChoices = c; else notes.push('The saved fit choices could not be read; the defaults are used.');
  }
  if (typeof v.showFigures === 'boolean') work.showFigures = v.showFigures;
  else if (v.showFigures !== undefined) notes.push('The saved choice of figure columns could not be read; they are off.');
  if (v.deadTime === null || (typeof v.deadTime === 'number' && Number.isFinite(v.deadTime) && v.deadTime > 0)) work.deadTime = v.deadTime as number | null;
  else if (v.deadTime !== undefined) notes.push(`The saved dead time (${JSON.stringify(v.deadTime)}) is not a positive number and was left out.`);
  if (v.namedPeaks !== undefined) {
    const t = namedPeaksBack(v.namedPeaks, notes);
    if (t) work.namedPeaks = t;
  }
  if (v.standards === null) work.standardsTable = null;
  else if (v.standards !== undefined) {
    const s = parseStandards(v.standards);
    if (s.ok) work.standardsTable = s.table; else notes.push(`The saved amounts of the standards could not be restored and were left out: ${s.problems.join(' ')}`);
  }
  if (v.calibration !== undefined) {
    const c = parseCalibrationSettings(v.calibration);
    if (c.ok) work.calibrationSettings = c.settings; else notes.push(`The saved calibration settings could not be restored; the defaults are used: ${c.problems.join(' ')}`);
  }
  return { work, notes };
}

/** The work's members laid over older ones, member by member (the journal over the database's generation). */
export function mergeWorkJson(older: unknown, newer: unknown): unknown {
  if (!isObj(newer)) return older;
  if (!isObj(older)) return newer;
  return { ...older, ...newer };
}
