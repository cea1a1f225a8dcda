/**
 * The recipe (the saved processing method): the ordered processing steps
 * with their parameters and, since version 2, the analysis settings (noise
 * method and quiet range, S/N definition, limits, detection thresholds), as
 * a versioned JSON document. It is what the page saves, loads, and writes
 * into reports, and what the command line runs, so one file reproduces the
 * page's numbers.
 *
 * Validation is all-or-nothing: a recipe with any problem is refused with
 * every problem listed, and nothing is half-applied. Version 1 files (steps
 * only) still load; their analysis settings are the defaults.
 */
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, type NoiseMethod, type NoiseSettings, type PeakSettings } from './analysis/request.ts';
import type { ParamSpec, ParamValue, StepDefinition, StepParams } from './steps/types.ts';
import { namedPeaksToJson, parseNamedPeaks, type NamedPeakTable } from './calibration/named-peaks.ts';
import { calibrationSettingsToJson, parseCalibrationSettings, type CalibrationSettings } from './calibration/settings.ts';
import { SNR_SHORT } from './measure/snr-words.ts';

export const RECIPE_FORMAT = 'tracewright-recipe';
/** 2: the analysis settings were added ("analysis"); 1: steps only. */
export const RECIPE_VERSION = 2;
/** Limits that keep a hostile file from tying up the page. */
export const RECIPE_MAX_BYTES = 1_000_000;
export const RECIPE_MAX_DEPTH = 16;
export const RECIPE_MAX_STEPS = 50;
const MAX_RANGES = 200;

export interface RecipeStep {
  /** Stable id of this entry in the stack (survives reordering). */
  uid: string;
  /** Step id from the registry, e.g. "savitzky-golay". */
  step: string;
  enabled: boolean;
  params: StepParams;
}

/** How noise and peaks are measured: everything besides the steps that changes the numbers. */
export interface AnalysisSettings {
  noise: NoiseSettings;
  peaks: PeakSettings;
  /** Issue 21: the named-peak table (name, expected position, window); absent when the method names no peaks. */
  namedPeaks?: NamedPeakTable;
  /** Issue 21: how responses become amounts (model, weights, limits); absent means the defaults. */
  calibration?: CalibrationSettings;
}

export interface Recipe {
  format: typeof RECIPE_FORMAT;
  version: number;
  steps: RecipeStep[];
  /**
   * The analysis settings saved with the steps; absent in files saved
   * before version 2 ({@link analysisOf} then gives the defaults). The page
   * keeps its own copy in the store and writes it back with
   * {@link recipeWithAnalysis}.
   */
  analysis?: AnalysisSettings;
}

export type Registry = readonly StepDefinition[];

export type RecipeCheck = { ok: true; recipe: Recipe } | { ok: false; problems: string[] };

let uidCounter = 0;
/** A fresh uid for a step entry. */
export function newStepUid(): string {
  uidCounter += 1;
  return `s${uidCounter}-${Math.floor(Math.random() * 1e9).toString(36)}`;
}

/** An empty recipe. */
export function emptyRecipe(): Recipe {
  return { format: RECIPE_FORMAT, version: RECIPE_VERSION, steps: [] };
}

/** A new stack entry for a registered step with its default parameters. */
export function makeRecipeStep(def: StepDefinition, params?: Partial<StepParams>): RecipeStep {
  return { uid: newStepUid(), step: def.id, enabled: true, params: { ...cloneParams(def.defaults), ...(params ?? {}) } as StepParams };
}

/** Deep copy of parameters (ranges are nested arrays). */
export function cloneParams(p: StepParams): StepParams {
  const out: StepParams = {};
  for (const [k, v] of Object.entries(p)) out[k] = Array.isArray(v) ? v.map((r) => [r[0], r[1]] as [number, number]) : v;
  return out;
}

/** Check one parameter value against its spec; return a sentence or null. */
export function checkParam(spec: ParamSpec, value: unknown): string | null {
  switch (spec.kind) {
    case 'int': {
      if (typeof value !== 'number' || !Number.isFinite(value)) return `${spec.label} must be a number.`;
      if (!Number.isInteger(value)) return `${spec.label} must be a whole number of ${spec.unit}.`;
      if (value < spec.min || value > spec.max) return `${spec.label} must be between ${spec.min} and ${spec.max} ${spec.unit}; got ${value}.`;
      if (spec.odd && value % 2 === 0) return `${spec.label} must be odd (3, 5, 7, …) so the window has a centre; got ${value}.`;
      return null;
    }
    case 'number': {
      if (typeof value !== 'number' || !Number.isFinite(value)) return `${spec.label} must be a finite number.`;
      if (value < spec.min || value > spec.max) return `${spec.label} must be between ${spec.min} and ${spec.max}; got ${value}.`;
      return null;
    }
    case 'choice':
      if (typeof value !== 'string' || !spec.choices.some((c) => c.value === value)) {
        return `${spec.label} must be one of ${spec.choices.map((c) => c.value).join(', ')}.`;
      }
      return null;
    case 'boolean':
      return typeof value === 'boolean' ? null : `${spec.label} must be true or false.`;
    case 'ranges': {
      if (!Array.isArray(value)) return `${spec.label} must be a list of [from, to] pairs.`;
      if (value.length > MAX_RANGES) return `${spec.label} has ${value.length} ranges; at most ${MAX_RANGES} are allowed.`;
      for (const r of value) {
        if (!Array.isArray(r) || r.length !== 2 || !r.every((v) => typeof v === 'number' && Number.isFinite(v))) {
          return `${spec.label} must be a list of [from, to] pairs of finite numbers.`;
        }
      }
      return null;
    }
  }
}

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/**
 * Validate an already-parsed JSON value as a recipe against the registry.
 * Missing parameters take their defaults; unknown steps, unknown
 * parameters, wrong types, out-of-range values and newer versions are refused.
 */
export function validateRecipe(value: unknown, registry: Registry): RecipeCheck {
  const problems: string[] = [];
  if (!isPlainObject(value)) return { ok: false, problems: ['The file is not a processing method: expected a JSON object.'] };
  if (value.format !== RECIPE_FORMAT) problems.push(`"format" must be "${RECIPE_FORMAT}".`);
  const version = value.version;
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1) {
    problems.push('"version" must be a whole number.');
  } else if (version > RECIPE_VERSION) {
    return { ok: false, problems: [`This processing method was written by a newer version of Tracewright (method file version ${version}; this page reads up to ${RECIPE_VERSION}). Open it with a newer version.`] };
  }
  if (!Array.isArray(value.steps)) {
    problems.push('"steps" must be a list.');
    return { ok: false, problems };
  }
  if (value.steps.length > RECIPE_MAX_STEPS) {
    return { ok: false, problems: [`The processing method has ${value.steps.length} steps; at most ${RECIPE_MAX_STEPS} are allowed.`] };
  }
  const steps: RecipeStep[] = [];
  const seen = new Set<string>();
  value.steps.forEach((raw: unknown, i: number) => {
    const where = `Step ${i + 1}`;
    if (!isPlainObject(raw)) { problems.push(`${where} is not an object.`); return; }
    const def = registry.find((d) => d.id === raw.step);
    if (!def) { problems.push(`${where}: unknown step "${String(raw.step)}". Known steps: ${registry.map((d) => d.id).join(', ')}.`); return; }
    const enabled = raw.enabled === undefined ? true : raw.enabled;
    if (typeof enabled !== 'boolean') problems.push(`${where} (${def.label}): "enabled" must be true or false.`);
    const paramsIn = raw.params === undefined ? {} : raw.params;
    if (!isPlainObject(paramsIn)) { problems.push(`${where} (${def.label}): "params" must be an object.`); return; }
    const params = cloneParams(def.defaults);
    for (const [k, v] of Object.entries(paramsIn)) {
      const spec = def.params.find((p) => p.key === k);
      if (!spec) { problems.push(`${where} (${def.label}): unknown parameter "${k}".`); continue; }
      const bad = checkParam(spec, v);
      if (bad) problems.push(`${where} (${def.label}): ${bad}`);
      else params[k] = (Array.isArray(v) ? (v as [number, number][]).map((r) => [r[0], r[1]]) : v) as ParamValue;
    }
    // A file without uids gets the same ones on every load, so exports of one method are reproducible.
    let uid = typeof raw.uid === 'string' && /^[\w-]{1,40}$/.test(raw.uid) ? raw.uid : `step-${i + 1}`;
    if (seen.has(uid)) uid = newStepUid();
    seen.add(uid);
    steps.push({ uid, step: def.id, enabled: enabled === true, params });
  });
  const analysis = value.analysis === undefined ? undefined : validateAnalysis(value.analysis, problems);
  if (problems.length) return { ok: false, problems };
  const recipe: Recipe = { format: RECIPE_FORMAT, version: RECIPE_VERSION, steps };
  if (analysis) recipe.analysis = analysis;
  return { ok: true, recipe };
}

/** Each noise method by its saved name (a Record, so a new method must be listed here to compile). */
const NOISE_METHODS: Record<NoiseMethod, string> = {
  auto: 'automatic: finest-scale spread of the raw trace with features masked, corrected for noise correlation',
  rms: 'RMS about a straight line over the quiet range',
  blank: 'the blank trace, measured like the automatic estimate',
};

/** Names earlier files used for what is now the automatic estimate ('robust', point-to-point differences, is gone). */
const OLD_NOISE_METHODS: Record<string, NoiseMethod> = { windows: 'auto', robust: 'auto' };

/** The peak settings as parameters, with the same limits as the page's fields. */
const PEAK_SETTING_SPECS: Record<keyof PeakSettings, ParamSpec> = {
  measureOn: { key: 'measureOn', label: 'Measure peaks and noise on', kind: 'choice', unit: 'none', choices: [{ value: 'processed', label: 'the processed trace' }, { value: 'raw', label: 'the raw trace' }] },
  minProminenceSigma: { key: 'minProminenceSigma', label: 'Smallest prominence (× σ)', kind: 'number', unit: 'ratio', min: 0, max: 1000 },
  minSnr: { key: 'minSnr', label: 'Smallest S/N kept', kind: 'number', unit: 'ratio', min: 0, max: 1000 },
  minWidth: { key: 'minWidth', label: 'Smallest half-height width (x-units, 0 = 2.5 sample spacings)', kind: 'number', unit: 'x-units', min: 0, max: 1e9 },
  minSeparation: { key: 'minSeparation', label: 'Smallest separation (x-units, 0 = off)', kind: 'number', unit: 'x-units', min: 0, max: 1e9 },
  snrDefinition: { key: 'snrDefinition', label: 'S/N definition', kind: 'choice', unit: 'none', choices: (['rms', 'pharmacopoeial', 'region'] as const).map((value) => ({ value, label: SNR_SHORT[value] })) },
  pharmacopoeialMultiplier: { key: 'pharmacopoeialMultiplier', label: 'Pharmacopoeial window (× half-height width)', kind: 'number', unit: 'ratio', min: 1, max: 100 },
  negative: { key: 'negative', label: 'Look for dips', kind: 'boolean', unit: 'none' },
  detectionLimit: { key: 'detectionLimit', label: 'Detection limit S/N', kind: 'number', unit: 'ratio', min: 1, max: 100 },
  quantitationLimit: { key: 'quantitationLimit', label: 'Quantitation limit S/N', kind: 'number', unit: 'ratio', min: 1, max: 1000 },
  split: { key: 'split', label: 'Peaks sharing a valley', kind: 'choice', unit: 'none', choices: [{ value: 'perpendicular-drop', label: 'perpendicular drop' }, { value: 'valley-to-valley', label: 'valley to valley' }] },
  excluded: { key: 'excluded', label: 'Ranges excluded from peak finding', kind: 'ranges', unit: 'x-units' },
};

/** Fresh copies of the default analysis settings. */
export function defaultAnalysis(): AnalysisSettings {
  return { noise: { ...DEFAULT_NOISE_SETTINGS, quietRange: DEFAULT_NOISE_SETTINGS.quietRange ? [...DEFAULT_NOISE_SETTINGS.quietRange] : null }, peaks: { ...DEFAULT_PEAK_SETTINGS } };
}

/** The recipe's analysis settings, or the defaults when it has none (a file saved before version 2). */
export function analysisOf(recipe: Recipe): AnalysisSettings {
  return recipe.analysis ?? defaultAnalysis();
}

/**
 * Check the "analysis" member of a recipe file; a missing setting takes the
 * default. Problems are added to `problems`.
 */
function validateAnalysis(value: unknown, problems: string[]): AnalysisSettings {
  const out = defaultAnalysis();
  if (!isPlainObject(value)) { problems.push('"analysis" must be an object with "noise" and "peaks".'); return out; }
  for (const k of Object.keys(value)) if (!['noise', 'peaks', 'namedPeaks', 'calibration'].includes(k)) problems.push(`Analysis settings: unknown member "${k}" (expected "noise", "peaks", "namedPeaks" and "calibration").`);
  if (value.namedPeaks !== undefined) {
    const named = parseNamedPeaks(value.namedPeaks);
    if (named.ok) out.namedPeaks = named.table;
    else problems.push(...named.problems.map((p) => `Named peaks: ${p}`));
  }
  if (value.calibration !== undefined) {
    const cal = parseCalibrationSettings(value.calibration);
    if (cal.ok) out.calibration = cal.settings;
    else problems.push(...cal.problems.map((p) => `Calibration settings: ${p}`));
  }
  const noise = value.noise === undefined ? {} : value.noise;
  if (!isPlainObject(noise)) problems.push('Analysis settings: "noise" must be an object.');
  else {
    for (const [k, v] of Object.entries(noise)) {
      if (k === 'method') {
        if (typeof v === 'string' && Object.hasOwn(NOISE_METHODS, v)) out.noise.method = v as NoiseMethod;
        else if (typeof v === 'string' && Object.hasOwn(OLD_NOISE_METHODS, v)) out.noise.method = OLD_NOISE_METHODS[v];
        else problems.push(`Noise method must be one of ${Object.keys(NOISE_METHODS).join(', ')}.`);
      } else if (k === 'quietRange') {
        if (v === null) out.noise.quietRange = null;
        else if (Array.isArray(v) && v.length === 2 && v.every((e) => typeof e === 'number' && Number.isFinite(e)) && v[0] < v[1]) out.noise.quietRange = [v[0], v[1]];
        else problems.push('Quiet range must be null or [from, to] in x-units with from < to.');
      } else {
        problems.push(`Analysis settings (noise): unknown setting "${k}".`);
      }
    }
  }
  const peaks = value.peaks === undefined ? {} : value.peaks;
  if (!isPlainObject(peaks)) problems.push('Analysis settings: "peaks" must be an object.');
  else {
    const target = out.peaks as unknown as Record<string, ParamValue>;
    for (const [k, v] of Object.entries(peaks)) {
      const spec = Object.hasOwn(PEAK_SETTING_SPECS, k) ? PEAK_SETTING_SPECS[k as keyof PeakSettings] : undefined;
      if (!spec) { problems.push(`Analysis settings (peaks): unknown setting "${k}".`); continue; }
      const bad = checkParam(spec, v);
      if (bad) problems.push(`Analysis settings (peaks): ${bad}`);
      else target[k] = v as ParamValue;
    }
  }
  return out;
}

/**
 * The recipe with the given analysis settings (copied), as it is saved and written into exports.
 * `named` (issue 21): the named-peak table and calibration settings, written only when given.
 */
export function recipeWithAnalysis(recipe: Recipe, noise: NoiseSettings, peaks: PeakSettings, named?: { namedPeaks?: NamedPeakTable | null; calibration?: CalibrationSettings | null }): Recipe {
  const analysis: AnalysisSettings = { noise: { method: noise.method, quietRange: noise.quietRange ? [noise.quietRange[0], noise.quietRange[1]] : null }, peaks: { ...peaks } };
  if (named?.namedPeaks) analysis.namedPeaks = named.namedPeaks;
  if (named?.calibration) analysis.calibration = named.calibration;
  return { format: recipe.format, version: RECIPE_VERSION, steps: recipe.steps, analysis };
}

/** The recipe without its analysis settings (what the page's step stack holds). */
export function recipeStepsOnly(recipe: Recipe): Recipe {
  return { format: recipe.format, version: recipe.version, steps: recipe.steps };
}

/** Deepest nesting of brackets outside strings; stops counting past `limit`. */
export function jsonDepth(text: string, limit = RECIPE_MAX_DEPTH + 1): number {
  let depth = 0, max = 0, inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 92) i++; // backslash escapes the next character
      else if (c === 34) inString = false;
      continue;
    }
    if (c === 34) inString = true;
    else if (c === 91 || c === 123) { depth++; if (depth > max) { max = depth; if (max >= limit) return max; } }
    else if (c === 93 || c === 125) depth--;
  }
  return max;
}

/**
 * Parse recipe text (a saved .json file) and validate it. Refuses files that
 * are too large or nested too deeply before handing them to JSON.parse.
 */
export function parseRecipeText(text: string, registry: Registry): RecipeCheck {
  if (text.length > RECIPE_MAX_BYTES) return { ok: false, problems: [`The processing method file is ${text.length} characters; method files are at most ${RECIPE_MAX_BYTES}.`] };
  if (jsonDepth(text) > RECIPE_MAX_DEPTH) return { ok: false, problems: [`The processing method file is nested more than ${RECIPE_MAX_DEPTH} levels deep; it is not a processing method.`] };
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (e) {
    return { ok: false, problems: [`The processing method file is not valid JSON: ${(e as Error).message}`] };
  }
  return validateRecipe(value, registry);
}

/** The recipe as pretty JSON text (what is saved and put in reports). */
export function recipeToJson(recipe: Recipe): string {
  const doc: Record<string, unknown> = {
    format: recipe.format, version: recipe.version,
    steps: recipe.steps.map((s) => ({ uid: s.uid, step: s.step, enabled: s.enabled, params: s.params })),
  };
  if (recipe.analysis) {
    // Settings in one fixed order, so the same method always gives the same text.
    const { noise, peaks } = recipe.analysis;
    const orderedPeaks: Record<string, unknown> = {};
    for (const k of Object.keys(PEAK_SETTING_SPECS) as (keyof PeakSettings)[]) orderedPeaks[k] = peaks[k];
    const analysis: Record<string, unknown> = { noise: { method: noise.method, quietRange: noise.quietRange }, peaks: orderedPeaks };
    if (recipe.analysis.namedPeaks) analysis.namedPeaks = namedPeaksToJson(recipe.analysis.namedPeaks);
    if (recipe.analysis.calibration) analysis.calibration = calibrationSettingsToJson(recipe.analysis.calibration);
    doc.analysis = analysis;
  }
  return JSON.stringify(doc, null, 2);
}

/** The recipe in words, one sentence per step, for reports. */
export function recipeInWords(recipe: Recipe, registry: Registry): string[] {
  if (recipe.steps.length === 0) return ['No processing: the raw trace is used as loaded.'];
  return recipe.steps.map((s, i) => {
    const def = registry.find((d) => d.id === s.step);
    const label = def?.label ?? s.step;
    const parts = Object.entries(s.params).map(([k, v]) => {
      const spec = def?.params.find((p) => p.key === k);
      const unit = spec && spec.unit !== 'none' ? ` ${spec.unit}` : '';
      const shown = Array.isArray(v) ? v.map((r) => `${r[0]}–${r[1]}`).join(', ') || 'none' : String(v);
      return `${spec?.label ?? k} ${shown}${unit}`;
    });
    return `${i + 1}. ${label}${s.enabled ? '' : ' (switched off)'}: ${parts.join('; ')}.`;
  });
}
