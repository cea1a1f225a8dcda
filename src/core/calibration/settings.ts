/**
 * Calibration settings: how responses become amounts. A versioned JSON
 * sub-object, saved with the processing method beside the named-peak table.
 * One set of defaults for every named peak, with optional changes per peak.
 */
import { checkFormatAndVersion, isPlainObject } from './json-form.ts';
import { WEIGHTINGS } from './regression.ts';
import type { CurveKind, Weighting } from './regression.ts';

export const CALIBRATION_SETTINGS_FORMAT = 'tracewright-calibration-settings';
export const CALIBRATION_SETTINGS_VERSION = 1;

/** Which peak measure is the response. */
export type ResponseMeasure = 'area' | 'height';
/** 'auto': line or quadratic chosen by test (see chooseCurve); otherwise fixed. */
export type ModelSetting = 'auto' | CurveKind;
/** σ for the limits in amount: residual SD of the fit, or SD of its intercept (ICH Q2). */
export type LimitSigma = 'residual' | 'intercept';

/** Settings that may differ from peak to peak. */
export interface PeakCalibrationSettings {
  readonly response: ResponseMeasure;
  /** Name of the named peak whose response divides every other's, or null for none. */
  readonly internalStandard: string | null;
  readonly model: ModelSetting;
  readonly throughOrigin: boolean;
  readonly weighting: Weighting;
  readonly limitSigma: LimitSigma;
}

export interface CalibrationSettings extends PeakCalibrationSettings {
  readonly format: typeof CALIBRATION_SETTINGS_FORMAT;
  readonly version: number;
  /** Confidence level of the amounts' intervals (default 0.95). */
  readonly confidence: number;
  /** Significance level of the tests choosing line or quadratic (default 0.05, common practice). */
  readonly alpha: number;
  /** Changes for single named peaks. */
  readonly perPeak: readonly { readonly name: string; readonly settings: Partial<PeakCalibrationSettings> }[];
}

export const RESPONSE_MEASURES: readonly ResponseMeasure[] = ['area', 'height'];
export const MODEL_SETTINGS: readonly ModelSetting[] = ['auto', 'line', 'quadratic'];
export const LIMIT_SIGMAS: readonly LimitSigma[] = ['residual', 'intercept'];
const CONFIDENCE_RANGE = [0.5, 0.999] as const;
const ALPHA_RANGE = [0.001, 0.2] as const;

/** Defaults: area, no internal standard, line or quadratic by test, with intercept, unweighted, σ from the residual SD, 95 %, α = 0.05. */
export function defaultCalibrationSettings(): CalibrationSettings {
  return {
    format: CALIBRATION_SETTINGS_FORMAT,
    version: CALIBRATION_SETTINGS_VERSION,
    response: 'area',
    internalStandard: null,
    model: 'auto',
    throughOrigin: false,
    weighting: 'none',
    limitSigma: 'residual',
    confidence: 0.95,
    alpha: 0.05,
    perPeak: [],
  };
}

/** The settings that apply to one named peak (its changes over the defaults). */
export function settingsForPeak(settings: CalibrationSettings, name: string): PeakCalibrationSettings {
  const own = settings.perPeak.find((p) => p.name === name)?.settings ?? {};
  return {
    response: own.response ?? settings.response,
    internalStandard: own.internalStandard !== undefined ? own.internalStandard : settings.internalStandard,
    model: own.model ?? settings.model,
    throughOrigin: own.throughOrigin ?? settings.throughOrigin,
    weighting: own.weighting ?? settings.weighting,
    limitSigma: own.limitSigma ?? settings.limitSigma,
  };
}

const PEAK_KEYS = ['response', 'internalStandard', 'model', 'throughOrigin', 'weighting', 'limitSigma'] as const;

function checkPeakSetting(key: string, v: unknown, where: string, problems: string[]): void {
  const oneOf = (list: readonly string[]) => { if (!list.includes(v as string)) problems.push(`${where}"${key}" must be one of ${list.join(', ')}.`); };
  switch (key) {
    case 'response': oneOf(RESPONSE_MEASURES); break;
    case 'model': oneOf(MODEL_SETTINGS); break;
    case 'weighting': oneOf(WEIGHTINGS); break;
    case 'limitSigma': oneOf(LIMIT_SIGMAS); break;
    case 'throughOrigin': if (typeof v !== 'boolean') problems.push(`${where}"throughOrigin" must be true or false.`); break;
    case 'internalStandard': if (!(v === null || (typeof v === 'string' && v.trim() !== ''))) problems.push(`${where}"internalStandard" must be a named peak's name or null.`); break;
    default: problems.push(`${where}unknown setting "${key}".`);
  }
}

/**
 * Check the settings, alone or against a list of named-peak names: every
 * value in range, the internal standard and the per-peak names known.
 */
export function validateCalibrationSettings(s: CalibrationSettings, names?: readonly string[]): string[] {
  const problems: string[] = [];
  for (const k of PEAK_KEYS) checkPeakSetting(k, s[k], '', problems);
  if (!(typeof s.confidence === 'number' && s.confidence >= CONFIDENCE_RANGE[0] && s.confidence <= CONFIDENCE_RANGE[1])) {
    problems.push(`"confidence" must be a level between ${CONFIDENCE_RANGE[0]} and ${CONFIDENCE_RANGE[1]} (0.95 for 95 %); got ${String(s.confidence)}.`);
  }
  if (!(typeof s.alpha === 'number' && s.alpha >= ALPHA_RANGE[0] && s.alpha <= ALPHA_RANGE[1])) {
    problems.push(`"alpha" (significance of the curve tests) must lie between ${ALPHA_RANGE[0]} and ${ALPHA_RANGE[1]}; got ${String(s.alpha)}.`);
  }
  const seen = new Set<string>();
  s.perPeak.forEach((p, i) => {
    const where = `Settings for "${p.name}" (${i + 1}): `;
    if (seen.has(p.name)) problems.push(`${where}the peak has two entries; merge them.`);
    seen.add(p.name);
    for (const [k, v] of Object.entries(p.settings)) checkPeakSetting(k, v, where, problems);
    if (names && !names.includes(p.name)) problems.push(`${where}"${p.name}" is not a named peak.`);
  });
  if (names) {
    const all = [s.internalStandard, ...s.perPeak.map((p) => p.settings.internalStandard ?? null)];
    for (const is of all) if (is !== null && !names.includes(is)) problems.push(`The internal standard "${is}" is not a named peak.`);
  }
  return problems;
}

/** The JSON form (what the processing method saves). */
export function calibrationSettingsToJson(s: CalibrationSettings): Record<string, unknown> {
  return {
    format: CALIBRATION_SETTINGS_FORMAT,
    version: CALIBRATION_SETTINGS_VERSION,
    response: s.response,
    internalStandard: s.internalStandard,
    model: s.model,
    throughOrigin: s.throughOrigin,
    weighting: s.weighting,
    limitSigma: s.limitSigma,
    confidence: s.confidence,
    alpha: s.alpha,
    perPeak: s.perPeak.map((p) => ({ name: p.name, settings: { ...p.settings } })),
  };
}

/**
 * Read the JSON form; missing members take their defaults. All-or-nothing,
 * every problem listed; a newer version is refused with a sentence.
 */
export function parseCalibrationSettings(input: unknown): { ok: true; settings: CalibrationSettings } | { ok: false; problems: string[] } {
  const head = checkFormatAndVersion(input, CALIBRATION_SETTINGS_FORMAT, CALIBRATION_SETTINGS_VERSION, 'calibration-settings object');
  if (!head.ok) return head;
  const { value, problems } = head;
  const d = defaultCalibrationSettings();
  for (const k of Object.keys(value)) {
    if (!['format', 'version', 'confidence', 'alpha', 'perPeak', ...PEAK_KEYS].includes(k)) problems.push(`Unknown setting "${k}".`);
  }
  const pick = <K extends keyof CalibrationSettings>(k: K): CalibrationSettings[K] => (value[k] === undefined ? d[k] : (value[k] as CalibrationSettings[K]));
  const perPeakIn = value.perPeak === undefined ? [] : value.perPeak;
  const perPeak: { name: string; settings: Partial<PeakCalibrationSettings> }[] = [];
  if (!Array.isArray(perPeakIn)) problems.push('"perPeak" must be a list.');
  else {
    perPeakIn.forEach((p: unknown, i: number) => {
      if (!isPlainObject(p) || typeof p.name !== 'string' || !isPlainObject(p.settings)) {
        problems.push(`"perPeak" entry ${i + 1} must be { "name": …, "settings": { … } }.`);
        return;
      }
      perPeak.push({ name: p.name, settings: { ...(p.settings as Partial<PeakCalibrationSettings>) } });
    });
  }
  if (problems.length) return { ok: false, problems };
  const settings: CalibrationSettings = {
    format: CALIBRATION_SETTINGS_FORMAT,
    version: CALIBRATION_SETTINGS_VERSION,
    response: pick('response'),
    internalStandard: pick('internalStandard'),
    model: pick('model'),
    throughOrigin: pick('throughOrigin'),
    weighting: pick('weighting'),
    limitSigma: pick('limitSigma'),
    confidence: pick('confidence'),
    alpha: pick('alpha'),
    perPeak,
  };
  const check = validateCalibrationSettings(settings);
  if (check.length) return { ok: false, problems: check };
  return { ok: true, settings };
}
