/**
 * Named peaks: a table of the peaks a method expects (name, expected
 * position, window), its validation with messages a user can act on, its
 * versioned JSON form (saved with the processing method as its own
 * sub-object), a CSV / pasted-table reader, and the matcher that gives a
 * trace's peaks their names.
 *
 * The window is a half-width: a peak takes the name when its apex lies
 * within expected position ± window (x-units of the trace).
 *
 * Matching rule (our own, stated in every result):
 * * Candidates of a named peak are the trace's peaks whose apex lies in its
 *   window; dips (height ≤ 0) and peaks the user removed are never named.
 * * "nearest" (default): the candidate closest to the expected position;
 *   "largest": the tallest candidate. Ties go to the other criterion, then
 *   to table order.
 * * Each name is used at most once and each peak takes at most one name:
 *   all (name, peak) pairs are ranked by the rule over the whole table and
 *   taken best first, so when two names want the same peak the better pair
 *   wins and the other name falls back to its next candidate.
 * * A named peak with no candidate left is listed as missing.
 */
import { readTextTable, tableNumber } from './table-text.ts';
import type { TableProblem } from './table-text.ts';
import { parseColumnHeader } from '../io/delimited.ts';
import { checkFormatAndVersion, isPlainObject } from './json-form.ts';

export const NAMED_PEAKS_FORMAT = 'tracewright-named-peaks';
export const NAMED_PEAKS_VERSION = 1;
/** Most named peaks in one table. */
export const NAMED_PEAKS_MAX = 500;
/** Longest name, characters. */
export const NAME_MAX_LENGTH = 80;

/** How a named peak picks among several peaks in its window. */
export type MatchRule = 'nearest' | 'largest';
export const MATCH_RULES: readonly MatchRule[] = ['nearest', 'largest'];

export interface NamedPeak {
  /** The name shown on the peak, e.g. "Orchard Red". */
  readonly name: string;
  /** Expected apex position, x-units. */
  readonly position: number;
  /** Half-width of the window, x-units: the apex must lie within position ± window. */
  readonly window: number;
}

/** The named-peak table as saved with the processing method. */
export interface NamedPeakTable {
  readonly format: typeof NAMED_PEAKS_FORMAT;
  readonly version: number;
  /** Unit of position and window (the trace's x unit), '' when unknown. */
  readonly xUnit: string;
  readonly rule: MatchRule;
  readonly peaks: readonly NamedPeak[];
}

/** An empty table. */
export function emptyNamedPeakTable(xUnit = '', rule: MatchRule = 'nearest'): NamedPeakTable {
  return { format: NAMED_PEAKS_FORMAT, version: NAMED_PEAKS_VERSION, xUnit, rule, peaks: [] };
}

/**
 * A named peak from a peak the user clicked: expected position at its apex;
 * window, unless given, its full width at half height (our choice: a
 * neighbour more than one width away is then not taken).
 */
export function namedPeakFromPeak(name: string, peak: { readonly x: number; readonly fwhm?: number }, window?: number): NamedPeak {
  const w = window ?? peak.fwhm;
  if (w === undefined || !(w > 0) || !Number.isFinite(w)) throw new RangeError('A named peak needs a positive window; the peak has no width to take it from.');
  return { name: name.trim(), position: peak.x, window: w };
}

const unitSuffix = (u: string) => (u ? ` ${u}` : '');

/** Name problems: empty, too long, control characters. Null when fine. */
export function checkPeakName(name: unknown): string | null {
  if (typeof name !== 'string') return 'the name must be text';
  const t = name.trim();
  if (t === '') return 'the name is empty';
  if (t.length > NAME_MAX_LENGTH) return `the name is ${t.length} characters long; at most ${NAME_MAX_LENGTH} are allowed`;
  // eslint-disable-next-line no-control-regex
  if (/[\u0000-\u001f\u007f]/.test(t)) return 'the name holds control characters (line breaks, tabs); use plain text';
  return null;
}

/**
 * Check a named-peak table. Problems make it unusable; warnings are worth
 * reading but do not stop it (overlapping windows).
 */
export function validateNamedPeakTable(table: NamedPeakTable): { problems: string[]; warnings: string[] } {
  const problems: string[] = [];
  const warnings: string[] = [];
  const u = unitSuffix(table.xUnit);
  if (!MATCH_RULES.includes(table.rule)) problems.push(`The matching rule must be one of ${MATCH_RULES.join(', ')}; got "${String(table.rule)}".`);
  if (table.peaks.length > NAMED_PEAKS_MAX) problems.push(`The table has ${table.peaks.length} named peaks; at most ${NAMED_PEAKS_MAX} are allowed.`);
  const seen = new Map<string, number>();
  table.peaks.forEach((p, i) => {
    const where = `Named peak ${i + 1}${typeof p.name === 'string' && p.name.trim() ? ` ("${p.name.trim()}")` : ''}`;
    const bad = checkPeakName(p.name);
    if (bad) problems.push(`${where}: ${bad}.`);
    else {
      const key = p.name.trim().toLowerCase();
      const first = seen.get(key);
      if (first !== undefined) problems.push(`Named peaks ${first + 1} and ${i + 1} are both called "${p.name.trim()}" (names are compared ignoring case); each name must be used once.`);
      else seen.set(key, i);
    }
    if (typeof p.position !== 'number' || !Number.isFinite(p.position)) problems.push(`${where}: the expected position must be a number${u ? ` in${u}` : ''}; got ${String(p.position)}.`);
    if (typeof p.window !== 'number' || !Number.isFinite(p.window) || !(p.window > 0)) {
      problems.push(`${where}: the window must be a positive number${u ? ` of${u}` : ''} (how far either side of the expected position the peak may lie); got ${String(p.window)}.`);
    }
  });
  if (problems.length === 0) {
    const sorted = table.peaks.map((p, i) => ({ p, i })).sort((a, b) => a.p.position - b.p.position || a.i - b.i);
    for (let k = 0; k + 1 < sorted.length; k++) {
      const a = sorted[k].p, b = sorted[k + 1].p;
      if (a.position + a.window > b.position - b.window) {
        warnings.push(
          `The windows of "${a.name}" (${fmtX(a.position - a.window)}–${fmtX(a.position + a.window)}${u}) and "${b.name}" (${fmtX(b.position - b.window)}–${fmtX(b.position + b.window)}${u}) overlap; ` +
          `a peak in both goes to the ${table.rule === 'nearest' ? 'name whose expected position is nearer' : 'name for which it is the tallest candidate'}.`,
        );
      }
    }
  }
  return { problems, warnings };
}

function fmtX(v: number): string {
  return Number(v.toPrecision(6)).toString();
}

/** The JSON form of the table (what the processing method saves). */
export function namedPeaksToJson(table: NamedPeakTable): { format: string; version: number; xUnit: string; rule: MatchRule; peaks: { name: string; position: number; window: number }[] } {
  return {
    format: NAMED_PEAKS_FORMAT,
    version: NAMED_PEAKS_VERSION,
    xUnit: table.xUnit,
    rule: table.rule,
    peaks: table.peaks.map((p) => ({ name: p.name, position: p.position, window: p.window })),
  };
}

/**
 * Read the table's JSON form (already parsed, e.g. the "namedPeaks" member of
 * a saved method). All-or-nothing: any problem refuses the whole table, with
 * every problem listed. A newer version is refused with a sentence saying so.
 */
export function parseNamedPeaks(input: unknown): { ok: true; table: NamedPeakTable; warnings: string[] } | { ok: false; problems: string[] } {
  const head = checkFormatAndVersion(input, NAMED_PEAKS_FORMAT, NAMED_PEAKS_VERSION, 'named-peak table');
  if (!head.ok) return head;
  const { value, problems } = head;
  const xUnit = value.xUnit === undefined ? '' : value.xUnit;
  if (typeof xUnit !== 'string') problems.push('"xUnit" must be text.');
  const rule = value.rule === undefined ? 'nearest' : value.rule;
  if (!MATCH_RULES.includes(rule as MatchRule)) problems.push(`"rule" must be one of ${MATCH_RULES.join(', ')}.`);
  if (!Array.isArray(value.peaks)) {
    problems.push('"peaks" must be a list.');
    return { ok: false, problems };
  }
  if (value.peaks.length > NAMED_PEAKS_MAX) return { ok: false, problems: [`The table has ${value.peaks.length} named peaks; at most ${NAMED_PEAKS_MAX} are allowed.`] };
  const peaks: NamedPeak[] = [];
  value.peaks.forEach((raw: unknown, i: number) => {
    if (!isPlainObject(raw)) { problems.push(`Named peak ${i + 1} is not an object.`); return; }
    for (const k of Object.keys(raw)) if (!['name', 'position', 'window'].includes(k)) problems.push(`Named peak ${i + 1}: unknown field "${k}".`);
    peaks.push({ name: typeof raw.name === 'string' ? raw.name.trim() : (raw.name as string), position: raw.position as number, window: raw.window as number });
  });
  if (problems.length) return { ok: false, problems };
  const table: NamedPeakTable = { format: NAMED_PEAKS_FORMAT, version: NAMED_PEAKS_VERSION, xUnit: xUnit as string, rule: rule as MatchRule, peaks };
  const check = validateNamedPeakTable(table);
  if (check.problems.length) return { ok: false, problems: check.problems };
  return { ok: true, table, warnings: check.warnings };
}

const NAME_HEADERS = ['name', 'peak', 'peak name', 'compound'];
const POSITION_HEADERS = ['position', 'expected position', 'retention time', 'time', 'x'];
const WINDOW_HEADERS = ['window', 'tolerance', 'half window'];

/**
 * Read a named-peak table from CSV text or cells pasted from a spreadsheet.
 * The header names the columns (any order, any case): name (or "peak",
 * "compound"), position (or "expected position", "retention time", "time",
 * "x"), window (or "tolerance"); a unit in brackets, "position (min)", becomes
 * the table's x unit. Other columns are ignored with a notice. Every problem
 * names its line; all-or-nothing.
 */
export function readNamedPeaksCsv(
  text: string,
  fileName: string,
  options: { rule?: MatchRule } = {},
): { ok: true; table: NamedPeakTable; warnings: string[]; notices: string[] } | { ok: false; problems: TableProblem[] } {
  const read = readTextTable(text, fileName, 'named-peak table');
  if (!read.ok) return read;
  const t = read.table;
  const heads = t.header.cells.map((c) => parseColumnHeader(c));
  const find = (names: string[]) => heads.findIndex((h) => names.includes(h.name.toLowerCase()));
  const iName = find(NAME_HEADERS), iPos = find(POSITION_HEADERS), iWin = find(WINDOW_HEADERS);
  const missing = [iName < 0 ? '"name"' : '', iPos < 0 ? '"position"' : '', iWin < 0 ? '"window"' : ''].filter(Boolean);
  if (missing.length) {
    return {
      ok: false,
      problems: [{
        fileName, line: t.header.line,
        problem: `The header has no ${missing.join(' or ')} column. The first line must name the columns name, position and window (any order), e.g. "name,position (min),window (min)"; found: ${t.header.cells.map((c) => `"${c}"`).join(', ')}.`,
      }],
    };
  }
  const posUnit = heads[iPos].unit, winUnit = heads[iWin].unit;
  const problems: TableProblem[] = [];
  if (posUnit && winUnit && posUnit !== winUnit) {
    problems.push({ fileName, line: t.header.line, problem: `The position is in "${posUnit}" but the window in "${winUnit}"; give both in the same unit.` });
  }
  const notices: string[] = [];
  const used = new Set([iName, iPos, iWin]);
  const ignored = t.header.cells.filter((_, i) => !used.has(i) && t.header.cells[i] !== '');
  if (ignored.length) notices.push(`Columns not used: ${ignored.map((c) => `"${c}"`).join(', ')}.`);
  const peaks: NamedPeak[] = [];
  const firstLine = new Map<string, number>();
  for (const r of t.rows) {
    const cell = (i: number) => (i < r.cells.length ? r.cells[i] : '');
    const name = cell(iName);
    const nameProblem = checkPeakName(name);
    const position = tableNumber(cell(iPos), t);
    const window = tableNumber(cell(iWin), t);
    const rowProblems: string[] = [];
    if (nameProblem) rowProblems.push(nameProblem);
    else {
      const key = name.trim().toLowerCase();
      const first = firstLine.get(key);
      if (first !== undefined) rowProblems.push(`"${name.trim()}" is already named on line ${first} (names are compared ignoring case); each name must be used once`);
      else firstLine.set(key, r.line);
    }
    if (Number.isNaN(position)) rowProblems.push(`the position "${cell(iPos)}" is not a number`);
    if (Number.isNaN(window)) rowProblems.push(`the window "${cell(iWin)}" is not a number`);
    else if (!(window > 0)) rowProblems.push(`the window must be above zero (how far either side of the position the peak may lie); got ${cell(iWin)}`);
    if (rowProblems.length) {
      const sentence = rowProblems.join('; ');
      problems.push({ fileName, line: r.line, problem: `${sentence[0].toUpperCase()}${sentence.slice(1)}.` });
      continue;
    }
    peaks.push({ name: name.trim(), position, window });
  }
  if (problems.length) return { ok: false, problems };
  if (peaks.length === 0) return { ok: false, problems: [{ fileName, line: null, problem: 'The named-peak table has a header but no rows.' }] };
  if (peaks.length > NAMED_PEAKS_MAX) return { ok: false, problems: [{ fileName, line: null, problem: `The table has ${peaks.length} named peaks; at most ${NAMED_PEAKS_MAX} are allowed.` }] };
  const table: NamedPeakTable = { format: NAMED_PEAKS_FORMAT, version: NAMED_PEAKS_VERSION, xUnit: posUnit || winUnit, rule: options.rule ?? 'nearest', peaks };
  // Every row passed the checks above, so only warnings can come back here.
  const check = validateNamedPeakTable(table);
  return { ok: true, table, warnings: check.warnings, notices };
}

/** A peak as the matcher sees it (the peak table's rows satisfy this). */
export interface PeakLike {
  /** Apex position, x-units. */
  readonly x: number;
  /** Height above the local baseline (negative for dips). */
  readonly height: number;
  /** Area above the local baseline. */
  readonly area: number;
  readonly removedByUser?: boolean;
}

/** What happened to one named peak in one trace. */
export interface NamedPeakMatch {
  readonly name: string;
  readonly expected: number;
  readonly window: number;
  /** Index of the matched peak in the list given, or null when missing. */
  readonly peakIndex: number | null;
  /** The matched peak's apex, and its offset from the expected position (x-units). */
  readonly x: number | null;
  readonly offset: number | null;
  /** How many eligible peaks lay in the window. */
  readonly candidates: number;
  /** A sentence when there was a choice, a conflict, or nothing found. */
  readonly note: string | null;
}

/** The names given to one trace's peaks. */
export interface PeakNaming {
  readonly rule: MatchRule;
  /** The rule in one sentence (for exports). */
  readonly ruleInWords: string;
  /** One entry per named peak, in table order. */
  readonly matches: readonly NamedPeakMatch[];
  /** For each peak given, its name or null. */
  readonly names: readonly (string | null)[];
  /** Names of the named peaks not found. */
  readonly missing: readonly string[];
}

/** The matching rule in words. */
export function matchRuleInWords(rule: MatchRule): string {
  return rule === 'nearest'
    ? 'Each named peak takes the peak nearest its expected position within its window; each name and each peak is used once, best pairs first.'
    : 'Each named peak takes the tallest peak within its window; each name and each peak is used once, best pairs first.';
}

/**
 * Give a trace's peaks their names by the table (see the module comment for
 * the rule). Pure: neither argument is changed. The table should have passed
 * {@link validateNamedPeakTable}; named peaks with a non-finite position or
 * window find nothing.
 */
export function nameTracePeaks(table: NamedPeakTable, peaks: readonly PeakLike[]): PeakNaming {
  interface Pair { name: number; peak: number; distance: number; height: number }
  const pairs: Pair[] = [];
  const candidates = new Array<number>(table.peaks.length).fill(0);
  table.peaks.forEach((np, i) => {
    if (!Number.isFinite(np.position) || !(np.window > 0)) return;
    peaks.forEach((p, j) => {
      if (p.removedByUser || !(p.height > 0) || !Number.isFinite(p.x)) return;
      const distance = Math.abs(p.x - np.position);
      if (distance <= np.window) { pairs.push({ name: i, peak: j, distance, height: p.height }); candidates[i]++; }
    });
  });
  const byRule = table.rule === 'largest'
    ? (a: Pair, b: Pair) => b.height - a.height || a.distance - b.distance || a.name - b.name || a.peak - b.peak
    : (a: Pair, b: Pair) => a.distance - b.distance || b.height - a.height || a.name - b.name || a.peak - b.peak;
  pairs.sort(byRule);
  const peakOf = new Array<number | null>(table.peaks.length).fill(null);
  const nameOf = new Array<number | null>(peaks.length).fill(null);
  const lostTo = new Array<number | null>(table.peaks.length).fill(null);
  for (const pr of pairs) {
    if (peakOf[pr.name] !== null) continue;
    if (nameOf[pr.peak] !== null) {
      if (lostTo[pr.name] === null) lostTo[pr.name] = nameOf[pr.peak];
      continue;
    }
    peakOf[pr.name] = pr.peak;
    nameOf[pr.peak] = pr.name;
  }
  const u = unitSuffix(table.xUnit);
  const ruleWord = table.rule === 'nearest' ? 'nearest' : 'tallest';
  const matches: NamedPeakMatch[] = table.peaks.map((np, i) => {
    const j = peakOf[i];
    const notes: string[] = [];
    if (j === null) {
      notes.push(candidates[i] === 0
        ? `No peak within ${fmtX(np.position)} ± ${fmtX(np.window)}${u}.`
        : `The only peak${candidates[i] > 1 ? 's' : ''} in its window went to "${table.peaks[lostTo[i] ?? 0].name}".`);
    } else {
      if (candidates[i] > 1) notes.push(`${candidates[i]} peaks lay in the window; the ${ruleWord} was taken.`);
      if (lostTo[i] !== null) notes.push(`A better-placed peak in its window went to "${table.peaks[lostTo[i]!].name}".`);
    }
    return {
      name: np.name,
      expected: np.position,
      window: np.window,
      peakIndex: j,
      x: j === null ? null : peaks[j].x,
      offset: j === null ? null : peaks[j].x - np.position,
      candidates: candidates[i],
      note: notes.length ? notes.join(' ') : null,
    };
  });
  return {
    rule: table.rule,
    ruleInWords: matchRuleInWords(table.rule),
    matches,
    names: nameOf.map((i) => (i === null ? null : table.peaks[i].name)),
    missing: matches.filter((m) => m.peakIndex === null).map((m) => m.name),
  };
}
