/**
 * The recipe: the ordered processing steps with their parameters, as a
 * versioned JSON document. It is what the page saves, loads, and writes
 * into reports, so a reviewer can redo exactly what was done.
 *
 * Validation is all-or-nothing: a recipe with any problem is refused with
 * every problem listed, and nothing is half-applied.
 */
import type { ParamSpec, ParamValue, StepDefinition, StepParams } from './steps/types.ts';

export const RECIPE_FORMAT = 'tracewright-recipe';
export const RECIPE_VERSION = 1;
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

export interface Recipe {
  format: typeof RECIPE_FORMAT;
  version: number;
  steps: RecipeStep[];
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
  if (!isPlainObject(value)) return { ok: false, problems: ['The file is not a recipe: expected a JSON object.'] };
  if (value.format !== RECIPE_FORMAT) problems.push(`"format" must be "${RECIPE_FORMAT}".`);
  const version = value.version;
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1) {
    problems.push('"version" must be a whole number.');
  } else if (version > RECIPE_VERSION) {
    return { ok: false, problems: [`This recipe was written by a newer version of Tracewright (recipe version ${version}; this page reads up to ${RECIPE_VERSION}). Open it with a newer version.`] };
  }
  if (!Array.isArray(value.steps)) {
    problems.push('"steps" must be a list.');
    return { ok: false, problems };
  }
  if (value.steps.length > RECIPE_MAX_STEPS) {
    return { ok: false, problems: [`The recipe has ${value.steps.length} steps; at most ${RECIPE_MAX_STEPS} are allowed.`] };
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
    let uid = typeof raw.uid === 'string' && /^[\w-]{1,40}$/.test(raw.uid) ? raw.uid : newStepUid();
    if (seen.has(uid)) uid = newStepUid();
    seen.add(uid);
    steps.push({ uid, step: def.id, enabled: enabled === true, params });
  });
  if (problems.length) return { ok: false, problems };
  return { ok: true, recipe: { format: RECIPE_FORMAT, version: RECIPE_VERSION, steps } };
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
  if (text.length > RECIPE_MAX_BYTES) return { ok: false, problems: [`The recipe file is ${text.length} characters; recipes are at most ${RECIPE_MAX_BYTES}.`] };
  if (jsonDepth(text) > RECIPE_MAX_DEPTH) return { ok: false, problems: [`The recipe file is nested more than ${RECIPE_MAX_DEPTH} levels deep; it is not a recipe.`] };
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (e) {
    return { ok: false, problems: [`The recipe file is not valid JSON: ${(e as Error).message}`] };
  }
  return validateRecipe(value, registry);
}

/** The recipe as pretty JSON text (what is saved and put in reports). */
export function recipeToJson(recipe: Recipe): string {
  return JSON.stringify({ format: recipe.format, version: recipe.version, steps: recipe.steps.map((s) => ({ uid: s.uid, step: s.step, enabled: s.enabled, params: s.params })) }, null, 2);
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
