/**
 * Command-line arguments, read by hand rather than with node:util's
 * parseArgs, because "--quiet-range -0.5:2" must take "-0.5:2" as the
 * value (parseArgs refuses a value that starts with a dash).
 */
import type { LoadOptions } from '../core/io/types.ts';
import { fitChoicesFromArgs, type CliFitOptions } from './fits.ts';

export interface AnalyseOptions {
  inputs: string[];
  method: string | null;
  blank: string | null;
  scans: string[];
  traceName: string | null;
  traceIndex: number | null;
  /** x-units, from < to. */
  quietRange: [number, number] | null;
  dialect: NonNullable<LoadOptions['dialect']>;
  out: string;
  jobs: number;
  json: boolean;
  /** Issue 21: standard traces (--standard, repeatable), their amounts (--amounts CSV) and a named-peak table (--named-peaks CSV). */
  standards: string[];
  amounts: string | null;
  namedPeaks: string | null;
  /** Issue 18: regions to fit (--fit-region, repeatable) with --fit-shape, --fit-baseline, --fit-peaks, --fit-on; null without regions. */
  fit: CliFitOptions | null;
  /** Issue 18: figure columns (--figures) with the dead time (--dead-time, x-units) when given; null without --figures. */
  figures: { deadTime: number | null } | null;
  /** Issue 18: the combined table across the run's traces (--combine, --match-window in x-units); null without it. */
  combine: { window: number | null } | null;
}

export type Parsed =
  | { kind: 'help'; topic: 'main' | 'analyse' }
  | { kind: 'version' }
  | { kind: 'analyse'; options: AnalyseOptions }
  | { kind: 'usage-error'; message: string; topic: 'main' | 'analyse' };

/** Options of `analyse` that take a value, and whether they may be given more than once. */
const VALUE_OPTIONS: Record<string, { repeat: boolean }> = {
  method: { repeat: false }, blank: { repeat: false }, scan: { repeat: true }, trace: { repeat: false },
  'trace-index': { repeat: false }, 'quiet-range': { repeat: false }, delimiter: { repeat: false },
  decimal: { repeat: false }, out: { repeat: false }, jobs: { repeat: false },
  standard: { repeat: true }, amounts: { repeat: false }, 'named-peaks': { repeat: false },
  'fit-region': { repeat: true }, 'fit-shape': { repeat: false }, 'fit-baseline': { repeat: false }, 'fit-peaks': { repeat: false },
  'fit-on': { repeat: false }, 'dead-time': { repeat: false }, 'match-window': { repeat: false },
};
const FLAG_OPTIONS = new Set(['json', 'help', 'figures', 'combine']);

const NUMBER = /^[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?$/;

/** "FROM:TO" in x-units with a decimal point, negative values allowed; from < to. `option` names the option in the sentence. */
export function parseQuietRange(text: string, option = '--quiet-range'): [number, number] | string {
  const parts = text.split(':');
  if (parts.length !== 2) return `${option} takes FROM:TO in x-units (e.g. 0.5:1.25); got "${text}".`;
  const [a, b] = parts.map((p) => p.trim());
  if (!NUMBER.test(a) || !NUMBER.test(b)) return `${option} takes numbers with a decimal point (e.g. -0.5:1.25); got "${text}".`;
  const from = Number(a), to = Number(b);
  if (!Number.isFinite(from) || !Number.isFinite(to)) return `${option} values must be finite; got "${text}".`;
  if (!(from < to)) return `${option} needs FROM smaller than TO; got "${text}".`;
  return [from, to];
}

/** A positive number of x-units, or the sentence of a usage error. */
function positiveX(text: string, option: string): number | string {
  const t = text.trim();
  if (!NUMBER.test(t) || !(Number(t) > 0) || !Number.isFinite(Number(t))) return `${option} takes a positive number of x-units (e.g. 0.8); got "${text}".`;
  return Number(t);
}

const DELIMITERS: Record<string, ',' | ';' | '\t' | 'whitespace'> = {
  ',': ',', comma: ',', ';': ';', semicolon: ';', tab: '\t', '\t': '\t', '\\t': '\t', space: 'whitespace', ' ': 'whitespace', whitespace: 'whitespace',
};

/** Read the arguments after the program name. Never throws. */
export function parseArgs(argv: readonly string[]): Parsed {
  if (argv.length === 0) return { kind: 'usage-error', message: 'No command given.', topic: 'main' };
  const first = argv[0];
  if (first === '-h' || first === '--help' || first === 'help') {
    return { kind: 'help', topic: argv[1] === 'analyse' || argv[1] === 'analyze' ? 'analyse' : 'main' };
  }
  if (first === '--version' || first === '-v') return { kind: 'version' };
  if (first !== 'analyse' && first !== 'analyze') {
    return { kind: 'usage-error', message: `Unknown command "${first}". The command is "analyse".`, topic: 'main' };
  }
  const values: Record<string, string[]> = {};
  const flags = new Set<string>();
  const inputs: string[] = [];
  let optionsEnded = false;
  const fail = (message: string): Parsed => ({ kind: 'usage-error', message, topic: 'analyse' });
  for (let i = 1; i < argv.length; i++) {
    const arg = argv[i];
    if (optionsEnded || !arg.startsWith('-') || arg === '-') { inputs.push(arg); continue; }
    if (arg === '--') { optionsEnded = true; continue; }
    if (arg === '-h') { flags.add('help'); continue; }
    if (!arg.startsWith('--')) return fail(`Unknown option "${arg}".`);
    const eq = arg.indexOf('=');
    const name = eq >= 0 ? arg.slice(2, eq) : arg.slice(2);
    if (FLAG_OPTIONS.has(name)) {
      if (eq >= 0) return fail(`--${name} takes no value.`);
      flags.add(name);
      continue;
    }
    const spec = Object.hasOwn(VALUE_OPTIONS, name) ? VALUE_OPTIONS[name] : undefined;
    if (!spec) return fail(`Unknown option "--${name}".`);
    let value: string;
    if (eq >= 0) value = arg.slice(eq + 1);
    else {
      if (i + 1 >= argv.length) return fail(`--${name} needs a value.`);
      value = argv[++i];
    }
    if (!spec.repeat && values[name]) return fail(`--${name} is given twice.`);
    (values[name] ??= []).push(value);
  }
  if (flags.has('help')) return { kind: 'help', topic: 'analyse' };
  if (inputs.length === 0) return fail('No input files or folders given.');
  const one = (k: string): string | null => values[k]?.[0] ?? null;

  let traceIndex: number | null = null;
  const ti = one('trace-index');
  if (ti !== null) {
    if (!/^\d+$/.test(ti.trim())) return fail(`--trace-index takes a whole number from 0; got "${ti}".`);
    traceIndex = Number(ti.trim());
  }
  if (ti !== null && one('trace') !== null) return fail('Give --trace or --trace-index, not both.');
  let quietRange: [number, number] | null = null;
  const qr = one('quiet-range');
  if (qr !== null) {
    const r = parseQuietRange(qr);
    if (typeof r === 'string') return fail(r);
    quietRange = r;
  }
  const dialect: AnalyseOptions['dialect'] = {};
  const dl = one('delimiter');
  if (dl !== null) {
    const d = Object.hasOwn(DELIMITERS, dl) ? DELIMITERS[dl] : Object.hasOwn(DELIMITERS, dl.trim().toLowerCase()) ? DELIMITERS[dl.trim().toLowerCase()] : undefined;
    if (!d) return fail(`--delimiter takes , ; tab or space; got "${dl}".`);
    dialect.delimiter = d;
  }
  const dc = one('decimal');
  if (dc !== null) {
    const v = dc.trim().toLowerCase();
    if (v === 'point' || v === '.') dialect.decimal = '.';
    else if (v === 'comma' || v === ',') dialect.decimal = ',';
    else return fail(`--decimal takes point or comma; got "${dc}".`);
  }
  let jobs = 1;
  const jb = one('jobs');
  if (jb !== null) {
    if (!/^\d+$/.test(jb.trim()) || Number(jb) < 1 || Number(jb) > 256) return fail(`--jobs takes a whole number from 1 to 256; got "${jb}".`);
    jobs = Number(jb);
  }
  const standards = values.standard ?? [];
  if (standards.length > 0 && one('amounts') === null) return fail('--standard needs --amounts FILE: the known amount of each named peak in each standard.');
  if (standards.length === 0 && one('amounts') !== null) return fail('--amounts needs at least one --standard FILE.');
  const out = one('out');
  if (out !== null && out.trim() === '') return fail('--out needs a folder name.');
  // Issue 18: regions to fit, the figure columns and the combined table.
  let fit: CliFitOptions | null = null;
  const regions: [number, number][] = [];
  for (const r of values['fit-region'] ?? []) {
    const range = parseQuietRange(r, '--fit-region');
    if (typeof range === 'string') return fail(range);
    regions.push(range);
  }
  const fitValues = { shape: one('fit-shape'), baseline: one('fit-baseline'), peaks: one('fit-peaks'), on: one('fit-on') };
  if (regions.length) {
    const choices = fitChoicesFromArgs(fitValues);
    if (typeof choices === 'string') return fail(choices);
    fit = { regions, ...choices };
  } else {
    const stray = Object.entries(fitValues).find(([, v]) => v !== null);
    if (stray) return fail(`--fit-${stray[0]} needs at least one --fit-region FROM:TO.`);
  }
  let figures: AnalyseOptions['figures'] = null;
  const dt = one('dead-time');
  if (dt !== null && !flags.has('figures')) return fail('--dead-time needs --figures (it adds the retention factor and selectivity columns).');
  if (flags.has('figures')) {
    const deadTime = dt === null ? null : positiveX(dt, '--dead-time');
    if (typeof deadTime === 'string') return fail(deadTime);
    figures = { deadTime };
  }
  let combine: AnalyseOptions['combine'] = null;
  const mw = one('match-window');
  if (mw !== null && !flags.has('combine')) return fail('--match-window needs --combine.');
  if (flags.has('combine')) {
    const window = mw === null ? null : positiveX(mw, '--match-window');
    if (typeof window === 'string') return fail(window);
    combine = { window };
  }
  return {
    kind: 'analyse',
    options: {
      inputs, method: one('method'), blank: one('blank'), scans: values.scan ?? [], traceName: one('trace'), traceIndex,
      quietRange, dialect, out: out ?? '.', jobs, json: flags.has('json'),
      standards, amounts: one('amounts'), namedPeaks: one('named-peaks'), fit, figures, combine,
    },
  };
}
