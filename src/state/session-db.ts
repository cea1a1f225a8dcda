/**
 * The session kept in the browser so a reload or a crash loses nothing: the
 * loaded traces (their x and y in chunks), roles, the sample, load reports,
 * the recipe with the last {@link SESSION_UNDO_STEPS} undo and redo steps,
 * noise settings (with the quiet range), peak settings, the hand decisions
 * on peaks and the alternatives, and the work of issues 18 and 21 (region
 * fits, named peaks, standards' amounts, calibration settings; see
 * ./session-work.ts).
 *
 * Two stores, because an edit made just before a reload must survive it:
 * * IndexedDB holds everything (below). Its writes are asynchronous, and a
 *   transaction still open when the page goes away is not guaranteed to
 *   finish, so it alone would lose the last edit.
 * * A journal in localStorage holds the small parts (everything but the
 *   traces and load reports). It is written at most
 *   {@link JOURNAL_DELAY_MS} after each edit and synchronously on
 *   `pagehide` and on `visibilitychange` to hidden, so the last edit is
 *   on disk before the page is gone. On restore the journal wins over the
 *   IndexedDB generation when it is at least as new.
 *
 * Safety of what is already saved: a save writes a new generation (its
 * description plus any trace chunks not stored yet) in one transaction,
 * and only after that transaction has completed is the pointer switched to
 * it and the previous generation removed. A failed save (quota reached)
 * aborts its own transaction and leaves the pointer, and so the last good
 * session, as it was. Traces never change once made, so their chunks are
 * keyed by trace id and shared between generations.
 *
 * The record shapes and the conversion to and from them are pure functions
 * (tested without IndexedDB); only the functions at the bottom touch the
 * database.
 */
import { cleanHandReasons, cleanReportFields, type HandReason, type ReportFields } from '../core/export/report-fields.ts';
import { deleteDB, openDB, type IDBPDatabase } from 'idb';
import type { AlternativeRequest, NoiseSettings, PeakSettings } from '../core/analysis/index.ts';
import type { LoadReport } from '../core/io/types.ts';
import type { PeakDecisions } from '../core/measure/peak-types.ts';
import { emptyRecipe, validateRecipe, type Recipe, type Registry } from '../core/method.ts';
import { STEP_REGISTRY } from '../core/steps/registry.ts';
import { createTrace, type Trace, type TraceRole, type TraceSource } from '../core/trace.ts';
import { STACK_HISTORY_KEYS, stackHistoryOf } from './recipe-slice.ts';
import type { AppState } from './store.ts';
import { JOURNAL_FITS_MAX_CHARS, mergeWorkJson, sessionWorkFromJson, sessionWorkJson, WORK_KEYS, type SessionWork } from './session-work.ts';

export const SESSION_FORMAT = 'tracewright-session';
export const SESSION_VERSION = 1;
/**
 * Values per stored chunk (1 MB of doubles). Storing a record copies it on
 * the page's thread: 8 MB records took 0.2-0.4 s each on a busy machine
 * with a 50 MB file, 1 MB records take a few tens of milliseconds, so the
 * page stays responsive while a big trace is kept. Sessions stored with
 * another chunk size are read by the size their heads state.
 */
export const SESSION_CHUNK = 2 ** 17;
/** Skipped-row entries kept per load report (the full list was shown when the file was loaded). */
export const SESSION_MAX_SKIPPED = 1000;
/** Undo steps (and redo steps) kept with the session; the page itself keeps more while open. */
export const SESSION_UNDO_STEPS = 50;
/** Longest wait between an edit and the journal write (the journal is also written at once when the page is hidden). */
export const JOURNAL_DELAY_MS = 150;
/** localStorage key of the journal. */
export const JOURNAL_KEY = 'tracewright-session-journal';

const DB_NAME = 'tracewright-session';
const DB_VERSION = 1;

/** The parts of the page state a session keeps. */
export interface SessionSnapshot {
  traces: Trace[];
  roles: Record<string, TraceRole>;
  sampleId: string | null;
  reports: Record<string, LoadReport>;
  recipe: Recipe;
  noiseSettings: NoiseSettings;
  peakSettings: PeakSettings;
  decisions: PeakDecisions;
  /** Alternative stacks kept for the loss check. */
  alternatives: AlternativeRequest[];
  /** Undo history (oldest first) and redo steps (next first). */
  past: Recipe[];
  future: Recipe[];
  /** Issues 18 and 21: fits and calibration inputs; an absent member was not saved (older sessions) and is left as it is. */
  fits?: SessionWork['fits'];
  fitChoices?: SessionWork['fitChoices'];
  showFigures?: SessionWork['showFigures'];
  deadTime?: SessionWork['deadTime'];
  namedPeaks?: SessionWork['namedPeaks'];
  standardsTable?: SessionWork['standardsTable'];
  calibrationSettings?: SessionWork['calibrationSettings'];
  /** Issue 17: the report's fields and the reasons for hand changes (absent in sessions saved before). */
  reportFields?: ReportFields;
  handReasons?: HandReason[];
}

/** A trace without its numbers. */
export interface TraceHead {
  id: string;
  name: string;
  xName: string;
  xUnit: string;
  yName: string;
  yUnit: string;
  source: TraceSource;
  metadata: Record<string, string>;
  /** Points. */
  length: number;
  chunkSize: number;
  /** Chunks per axis. */
  chunks: number;
}

export type ChunkKey = [traceId: string, axis: 'x' | 'y', index: number];

export interface ChunkRecord {
  key: ChunkKey;
  data: Float64Array;
}

/** One saved generation: everything but the trace numbers. */
export interface SessionMeta {
  format: typeof SESSION_FORMAT;
  version: number;
  generation: number;
  savedAt: string;
  heads: TraceHead[];
  roles: Record<string, TraceRole>;
  sampleId: string | null;
  reports: Record<string, LoadReport>;
  recipe: unknown;
  noiseSettings: NoiseSettings;
  peakSettings: PeakSettings;
  decisions: PeakDecisions;
  /** Absent in sessions saved before alternatives were kept. */
  alternatives?: { id: string; label: string; recipe: unknown }[];
  /** Undo and redo steps (at most {@link SESSION_UNDO_STEPS} each); absent in older sessions. */
  past?: unknown[];
  future?: unknown[];
  /** When the page state was taken (ms since 1970); absent in older sessions. */
  takenAt?: number;
  /** Fits and calibration inputs in their JSON form (./session-work.ts); absent in older sessions. */
  work?: unknown;
  /** Issue 17; absent in older sessions. */
  reportFields?: ReportFields;
  handReasons?: HandReason[];
}

/** The small parts of a session, written to localStorage on every edit. */
export interface SessionJournal {
  format: 'tracewright-session-journal';
  version: number;
  /** When the page state was taken (ms since 1970). */
  takenAt: number;
  /** Ids of the traces the state refers to (their numbers are in IndexedDB). */
  traceIds: string[];
  traceNames: string[];
  roles: Record<string, TraceRole>;
  sampleId: string | null;
  recipe: unknown;
  past: unknown[];
  future: unknown[];
  noiseSettings: NoiseSettings;
  peakSettings: PeakSettings;
  decisions: PeakDecisions;
  alternatives: { id: string; label: string; recipe: unknown }[];
  /** Fits (when not too large for the journal) and calibration inputs (./session-work.ts); absent in older journals. */
  work?: unknown;
  /** Issue 17; absent in older journals. */
  reportFields?: ReportFields;
  handReasons?: HandReason[];
}

export type SessionProblem = { ok: false; problem: string };
export type SaveOutcome = { ok: true; generation: number } | SessionProblem;
export type LoadOutcome = { ok: true; snapshot: SessionSnapshot; notes: string[] } | SessionProblem | null;

/** The session parts of the page state (same objects, nothing copied). */
export function snapshotOf(state: Pick<AppState, Exclude<keyof SessionSnapshot, 'reportFields' | 'handReasons'>> & Partial<Pick<AppState, 'reportFields' | 'handReasons'>>): SessionSnapshot {
  return {
    traces: state.traces, roles: state.roles, sampleId: state.sampleId, reports: state.reports,
    noiseSettings: state.noiseSettings, peakSettings: state.peakSettings, decisions: state.decisions,
    alternatives: state.alternatives, ...stackHistoryOf(state),
    fits: state.fits, fitChoices: state.fitChoices, showFigures: state.showFigures, deadTime: state.deadTime,
    namedPeaks: state.namedPeaks, standardsTable: state.standardsTable, calibrationSettings: state.calibrationSettings,
    reportFields: state.reportFields, handReasons: state.handReasons,
  };
}

/** The work members of a snapshot. */
function workOf(s: SessionSnapshot): SessionWork {
  const w: SessionWork = {};
  for (const k of WORK_KEYS) if (s[k] !== undefined) (w as Record<string, unknown>)[k] = s[k];
  return w;
}

/** The decisions as kept: plain copies, hand-set start and end included when there are any (issue 17). */
function keptDecisions(d: PeakDecisions): PeakDecisions {
  return { added: [...d.added], removed: [...d.removed], ...(d.bounds?.length ? { bounds: d.bounds.map((b) => ({ ...b })) } : {}) };
}

/** Issue 17: the report's fields and hand-change reasons as kept (plain copies; cleaned when read back). */
function keptNotes(s: { reportFields?: unknown; handReasons?: unknown }): { reportFields: ReportFields; handReasons: HandReason[] } {
  return { reportFields: cleanReportFields(s.reportFields), handReasons: cleanHandReasons(s.handReasons) };
}

function plainRecipe(r: Recipe): unknown {
  return JSON.parse(JSON.stringify(r)) as unknown;
}

/** The undo and redo steps as kept: the newest {@link SESSION_UNDO_STEPS} of each. */
function keptHistory(snapshot: Pick<SessionSnapshot, 'past' | 'future'>): { past: unknown[]; future: unknown[] } {
  return {
    past: (snapshot.past ?? []).slice(-SESSION_UNDO_STEPS).map(plainRecipe),
    future: (snapshot.future ?? []).slice(0, SESSION_UNDO_STEPS).map(plainRecipe),
  };
}

/** The journal of a snapshot (no trace numbers, no load reports). */
export function sessionJournal(snapshot: SessionSnapshot, takenAt: number): SessionJournal {
  return {
    format: 'tracewright-session-journal', version: SESSION_VERSION, takenAt,
    traceIds: snapshot.traces.map((t) => t.id), traceNames: snapshot.traces.map((t) => t.name),
    roles: { ...snapshot.roles }, sampleId: snapshot.sampleId, recipe: plainRecipe(snapshot.recipe), ...keptHistory(snapshot),
    noiseSettings: { ...snapshot.noiseSettings }, peakSettings: { ...snapshot.peakSettings },
    decisions: keptDecisions(snapshot.decisions),
    alternatives: snapshot.alternatives.map((a) => ({ id: a.id, label: a.label, recipe: plainRecipe(a.recipe) })),
    // Large fits wait for the database save rather than fill the small store.
    work: sessionWorkJson(workOf(snapshot), { maxFitChars: JOURNAL_FITS_MAX_CHARS }),
    ...keptNotes(snapshot),
  };
}

/**
 * The meta record to restore: the IndexedDB generation with the journal's
 * small parts laid over it when the journal is at least as new. Traces the
 * journal names but the generation does not hold (loaded just before the
 * page closed, before their numbers were stored) are named in a note.
 */
export function mergeJournal(meta: SessionMeta, journal: SessionJournal | null): { meta: SessionMeta; notes: string[] } {
  if (!journal || journal.format !== 'tracewright-session-journal' || journal.version > SESSION_VERSION) return { meta, notes: [] };
  if (typeof journal.takenAt !== 'number' || journal.takenAt < (meta.takenAt ?? 0)) return { meta, notes: [] };
  const held = new Set(meta.heads.map((h) => h.id));
  const notes: string[] = [];
  const missing = (journal.traceNames ?? []).filter((_, i) => !held.has(journal.traceIds[i]));
  if (missing.length) notes.push(`Not stored before the page closed, so load again: ${missing.join(', ')}.`);
  // The journal's sample was never stored: the stored generation's sample and roles stay, so a trace is still processed.
  const sampleStored = journal.sampleId === null || held.has(journal.sampleId);
  if (!sampleStored && meta.sampleId) notes.push('The sample from the stored session is processed instead, until the missing file is loaded again.');
  return {
    notes,
    meta: {
      ...meta,
      takenAt: journal.takenAt,
      roles: sampleStored ? journal.roles : meta.roles, sampleId: sampleStored ? journal.sampleId : meta.sampleId,
      recipe: journal.recipe, past: journal.past, future: journal.future,
      noiseSettings: journal.noiseSettings, peakSettings: journal.peakSettings, decisions: journal.decisions, alternatives: journal.alternatives,
      work: mergeWorkJson(meta.work, journal.work),
      ...(journal.reportFields || journal.handReasons ? keptNotes(journal) : {}),
    },
  };
}

/** Key of the last chunk of an axis: present only when the whole trace was stored (same transaction). */
export function lastChunkKey(head: Pick<TraceHead, 'id' | 'chunks'>): ChunkKey {
  return [head.id, 'y', Math.max(0, head.chunks - 1)];
}

/** The head of a trace: everything but its numbers, and how they are chunked. */
export function traceHead(trace: Trace, chunkSize: number = SESSION_CHUNK): TraceHead {
  if (!Number.isInteger(chunkSize) || chunkSize < 1) throw new RangeError('The chunk size must be a whole number of values, at least 1.');
  const n = trace.x.length;
  return {
    id: trace.id, name: trace.name, xName: trace.xName, xUnit: trace.xUnit, yName: trace.yName, yUnit: trace.yUnit,
    source: { ...trace.source }, metadata: { ...trace.metadata }, length: n, chunkSize, chunks: Math.max(1, Math.ceil(n / chunkSize)),
  };
}

/**
 * Split a trace into its head and chunks of at most `chunkSize` values per
 * axis. Each chunk is a copy (a view would make IndexedDB store the whole
 * underlying buffer with every chunk). The trace is only read.
 */
export function traceToRecords(trace: Trace, chunkSize: number = SESSION_CHUNK): { head: TraceHead; chunks: ChunkRecord[] } {
  return { head: traceHead(trace, chunkSize), chunks: [...traceChunks(trace, chunkSize)] };
}

/**
 * The chunks of a trace one at a time, each copied only when asked for, so
 * saving a 50 MB trace does not copy it all in one task of the page.
 */
export function* traceChunks(trace: Trace, chunkSize: number = SESSION_CHUNK): Generator<ChunkRecord> {
  const head = traceHead(trace, chunkSize);
  const n = head.length, count = head.chunks;
  for (const axis of ['x', 'y'] as const) {
    const a = trace[axis];
    for (let k = 0; k < count; k++) yield { key: [trace.id, axis, k], data: a.slice(k * chunkSize, Math.min(n, (k + 1) * chunkSize)) };
  }
}

/**
 * Join a head and its chunks back into a trace (invariants checked again by
 * createTrace). `getChunk` returns undefined for a missing chunk.
 * @throws RangeError when a chunk is missing or has the wrong length.
 */
export function traceFromRecords(head: TraceHead, getChunk: (key: ChunkKey) => Float64Array | undefined): Trace {
  const x = new Float64Array(head.length), y = new Float64Array(head.length);
  for (const [axis, out] of [['x', x], ['y', y]] as const) {
    let at = 0;
    for (let k = 0; k < head.chunks; k++) {
      const data = getChunk([head.id, axis, k]);
      const want = Math.min(head.chunkSize, head.length - k * head.chunkSize);
      if (!data || data.length !== Math.max(0, want)) throw new RangeError(`The saved trace ${head.name} is incomplete (part ${k + 1} of its ${axis} values is missing or cut).`);
      out.set(data, at);
      at += data.length;
    }
  }
  return createTrace({
    id: head.id, name: head.name, x, y, xName: head.xName, xUnit: head.xUnit, yName: head.yName, yUnit: head.yUnit,
    source: head.source, metadata: head.metadata,
  });
}

function trimReport(r: LoadReport): LoadReport {
  return r.skipped.length > SESSION_MAX_SKIPPED ? { ...r, skipped: r.skipped.slice(0, SESSION_MAX_SKIPPED) } : r;
}

/** The meta record of a snapshot (trace heads, no numbers). */
export function sessionMeta(snapshot: SessionSnapshot, generation: number, savedAt: Date, chunkSize: number = SESSION_CHUNK, takenAt: number = savedAt.getTime()): SessionMeta {
  const heads = snapshot.traces.map((t) => traceHead(t, chunkSize));
  const reports: Record<string, LoadReport> = {};
  for (const [id, r] of Object.entries(snapshot.reports)) if (heads.some((h) => h.id === id)) reports[id] = trimReport(r);
  return {
    format: SESSION_FORMAT, version: SESSION_VERSION, generation, savedAt: savedAt.toISOString(), heads,
    roles: { ...snapshot.roles }, sampleId: snapshot.sampleId, reports,
    recipe: plainRecipe(snapshot.recipe),
    noiseSettings: { ...snapshot.noiseSettings }, peakSettings: { ...snapshot.peakSettings },
    decisions: keptDecisions(snapshot.decisions),
    alternatives: snapshot.alternatives.map((a) => ({ id: a.id, label: a.label, recipe: plainRecipe(a.recipe) })),
    ...keptHistory(snapshot),
    takenAt,
    work: sessionWorkJson(workOf(snapshot)),
    ...keptNotes(snapshot),
  };
}

/**
 * A snapshot from a meta record and a chunk lookup. A trace that cannot be
 * rebuilt is left out with a note; a recipe that no longer validates (a
 * step removed since) is replaced by an empty one with a note.
 */
export function sessionFromRecords(meta: SessionMeta, getChunk: (key: ChunkKey) => Float64Array | undefined, registry: Registry = STEP_REGISTRY): LoadOutcome {
  if (!meta || meta.format !== SESSION_FORMAT) return { ok: false, problem: 'The saved session is not in a form this page knows.' };
  if (meta.version > SESSION_VERSION) return { ok: false, problem: 'The saved session was written by a newer version of the page; it was left alone.' };
  const notes: string[] = [];
  const traces: Trace[] = [];
  for (const h of meta.heads) {
    try { traces.push(traceFromRecords(h, getChunk)); } catch (e) { notes.push((e as Error).message); }
  }
  const ids = new Set(traces.map((t) => t.id));
  const roles: Record<string, TraceRole> = {};
  for (const [id, role] of Object.entries(meta.roles ?? {})) if (ids.has(id)) roles[id] = role;
  const reports: Record<string, LoadReport> = {};
  for (const [id, r] of Object.entries(meta.reports ?? {})) if (ids.has(id)) reports[id] = r;
  const check = validateRecipe(meta.recipe, registry);
  let recipe = emptyRecipe();
  if (check.ok) recipe = check.recipe;
  else notes.push(`The saved processing method could not be restored: ${check.problems.join(' ')} The stack starts empty.`);
  const alternatives: AlternativeRequest[] = [];
  for (const a of meta.alternatives ?? []) {
    const c = validateRecipe(a.recipe, registry);
    if (c.ok && typeof a.id === 'string' && typeof a.label === 'string') alternatives.push({ id: a.id, label: a.label, recipe: c.recipe });
    else notes.push(`The saved alternative “${String(a.label)}” could not be restored and was left out.`);
  }
  const history = (list: unknown[] | undefined): Recipe[] => {
    const out: Recipe[] = [];
    for (const r of Array.isArray(list) ? list : []) {
      const c = validateRecipe(r, registry);
      if (c.ok) out.push(c.recipe);
    }
    if (Array.isArray(list) && out.length < list.length) notes.push(`${list.length - out.length} undo step(s) no longer fit this version of the page and were dropped.`);
    return out;
  };
  const past = history(meta.past);
  const future = history(meta.future);
  const work = sessionWorkFromJson(meta.work, ids);
  notes.push(...work.notes);
  return {
    ok: true,
    notes,
    snapshot: {
      ...work.work,
      alternatives, past, future,
      traces, roles, reports, recipe,
      sampleId: meta.sampleId && ids.has(meta.sampleId) ? meta.sampleId : null,
      noiseSettings: meta.noiseSettings, peakSettings: meta.peakSettings,
      decisions: meta.decisions ?? { added: [], removed: [] },
      ...keptNotes(meta),
    },
  };
}

/** A sentence for a failed save or load; quota errors get their own advice. */
export function storageProblem(e: unknown, doing: 'save' | 'load'): SessionProblem {
  const err = e as { name?: string; message?: string; inner?: { name?: string } } | null;
  const text = `${err?.name ?? ''} ${err?.message ?? String(e)}`;
  if (/quota/i.test(text)) {
    return { ok: false, problem: 'The browser has no room left to keep this session (its storage quota is reached). The session saved before is kept unchanged; remove large traces you no longer need, or export your results now.' };
  }
  return { ok: false, problem: `The session could not be ${doing === 'save' ? 'saved' : 'read back'} (${err?.message ?? String(e)}). The session saved before is kept unchanged.` };
}

// ---------------------------------------------------------------------------
// IndexedDB

let dbPromise: Promise<IDBPDatabase> | null = null;
/** Set by {@link clearSession}: no save may run afterwards (the page is about to reload). */
let stopped = false;

function db(): Promise<IDBPDatabase> {
  if (!dbPromise) {
    dbPromise = openDB(DB_NAME, DB_VERSION, {
      upgrade(d) {
        if (!d.objectStoreNames.contains('meta')) d.createObjectStore('meta');
        if (!d.objectStoreNames.contains('chunks')) d.createObjectStore('chunks');
      },
      terminated() { dbPromise = null; },
    });
    dbPromise.catch(() => { dbPromise = null; });
  }
  return dbPromise;
}

function hasIndexedDb(): boolean {
  try {
    return typeof indexedDB !== 'undefined' && indexedDB !== null;
  } catch {
    return false;
  }
}

/**
 * Save the session as a new generation, then switch the pointer to it and
 * remove what only older generations used. Never throws: problems come back
 * as a value.
 * @param takenAt when the state was taken from the page (ms); compared with the journal's on restore.
 */
export async function saveSession(state: SessionSnapshot, takenAt: number = Date.now()): Promise<SaveOutcome> {
  if (stopped) return { ok: false, problem: 'The session was cleared; nothing is saved until the page reloads.' };
  if (!hasIndexedDb()) return { ok: false, problem: 'This browser keeps no local database here (a private window, or storage switched off), so the session cannot be kept for the next visit.' };
  try {
    const d = await db();
    const pointer = (await d.get('meta', 'pointer')) as { generation: number } | undefined;
    const generation = (pointer?.generation ?? 0) + 1;
    const meta = sessionMeta(state, generation, new Date(), SESSION_CHUNK, takenAt);
    const tx = d.transaction(['meta', 'chunks'], 'readwrite');
    const store = tx.objectStore('chunks');
    for (let i = 0; i < meta.heads.length; i++) {
      // Traces never change, so a trace whose last chunk is stored is stored whole.
      if (await store.getKey(lastChunkKey(meta.heads[i]))) continue;
      for (const c of traceChunks(state.traces[i])) await store.put(c.data, c.key);
    }
    await tx.objectStore('meta').put(meta, `gen-${generation}`);
    await tx.done;
    if (stopped) return { ok: false, problem: 'The session was cleared while saving.' };

    const keep = new Set(meta.heads.map((h) => h.id));
    const tx2 = d.transaction(['meta', 'chunks'], 'readwrite');
    await tx2.objectStore('meta').put({ generation }, 'pointer');
    const metaKeys = await tx2.objectStore('meta').getAllKeys();
    for (const k of metaKeys) if (typeof k === 'string' && k.startsWith('gen-') && k !== `gen-${generation}`) await tx2.objectStore('meta').delete(k);
    const chunkKeys = await tx2.objectStore('chunks').getAllKeys();
    for (const k of chunkKeys) if (Array.isArray(k) && !keep.has(String(k[0]))) await tx2.objectStore('chunks').delete(k);
    await tx2.done;
    return { ok: true, generation };
  } catch (e) {
    return storageProblem(e, 'save');
  }
}

/** True when IndexedDB holds a saved session (without reading it). Never throws. */
export async function hasSavedSession(): Promise<boolean> {
  if (!hasIndexedDb()) return false;
  try {
    const d = await db();
    return (await d.get('meta', 'pointer')) !== undefined;
  } catch {
    return false;
  }
}

/** The saved session (the journal laid over the last generation), null when there is none, or a problem. Never throws. */
export async function loadSession(): Promise<LoadOutcome> {
  if (!hasIndexedDb()) return null;
  try {
    const d = await db();
    const pointer = (await d.get('meta', 'pointer')) as { generation: number } | undefined;
    if (!pointer) return null;
    const stored = (await d.get('meta', `gen-${pointer.generation}`)) as SessionMeta | undefined;
    if (!stored) return { ok: false, problem: 'The saved session is incomplete and was not restored.' };
    const tx = d.transaction('chunks', 'readonly');
    const found = new Map<string, Float64Array>();
    for (const h of stored.heads) {
      for (const axis of ['x', 'y'] as const) {
        for (let k = 0; k < h.chunks; k++) {
          const data = (await tx.store.get([h.id, axis, k])) as Float64Array | undefined;
          if (data) found.set(`${h.id}\u0000${axis}\u0000${k}`, data);
        }
      }
    }
    await tx.done;
    const merged = mergeJournal(stored, readJournal());
    const out = sessionFromRecords(merged.meta, (key) => found.get(key.join('\u0000')));
    if (out && out.ok) out.notes.push(...merged.notes);
    return out;
  } catch (e) {
    return storageProblem(e, 'load');
  }
}

// ---------------------------------------------------------------------------
// The journal (localStorage)

function localStore(): Storage | null {
  try {
    return typeof localStorage === 'undefined' ? null : localStorage;
  } catch {
    return null;
  }
}

/** Write the journal synchronously. Never throws. */
export function writeJournal(journal: SessionJournal): { ok: true } | SessionProblem {
  if (stopped) return { ok: true };
  const s = localStore();
  if (!s) return { ok: false, problem: 'This browser refuses the page its small local store (a private window, or storage switched off), so edits made just before closing the page may be lost.' };
  try {
    s.setItem(JOURNAL_KEY, JSON.stringify(journal));
    return { ok: true };
  } catch (e) {
    return storageProblem(e, 'save');
  }
}

/** The journal, or null when there is none or it cannot be read. */
export function readJournal(): SessionJournal | null {
  try {
    const raw = localStore()?.getItem(JOURNAL_KEY);
    return raw ? (JSON.parse(raw) as SessionJournal) : null;
  } catch {
    return null;
  }
}

function clearJournal(): void {
  try { localStore()?.removeItem(JOURNAL_KEY); } catch { /* nothing to clear */ }
}

/** Empty the saved session (database and journal) and stop any further saving (call before reloading the page). */
export async function clearSession(): Promise<{ ok: true } | SessionProblem> {
  stopped = true;
  clearJournal();
  try {
    if (dbPromise) (await dbPromise).close();
    dbPromise = null;
    if (hasIndexedDb()) await deleteDB(DB_NAME);
    return { ok: true };
  } catch (e) {
    return { ok: false, problem: `The saved session could not be emptied (${(e as Error).message}).` };
  }
}

/** The store as the session functions need it (the app's `useApp` fits). */
export interface SessionStore {
  getState(): AppState;
  setState(partial: Partial<AppState>): void;
  subscribe(listener: (state: AppState, prev: AppState) => void): () => void;
}

const SESSION_KEYS: readonly (keyof SessionSnapshot)[] = [
  'traces', 'roles', 'sampleId', 'reports', ...STACK_HISTORY_KEYS, 'noiseSettings', 'peakSettings', 'decisions', 'alternatives', ...WORK_KEYS,
  'reportFields', 'handReasons',
];

/** Where the page listens for being hidden or closed (the window in the page; absent in Node tests). */
export interface PageEvents {
  addEventListener(type: string, listener: () => void): void;
  removeEventListener(type: string, listener: () => void): void;
}

export interface AutosaveOptions {
  /** Wait after the last edit before the IndexedDB save; 0 when the traces changed. Default 1000 ms. */
  delayMs?: number;
  /** Default {@link JOURNAL_DELAY_MS}. */
  journalDelayMs?: number;
  /** Default: `window` and `document` when they exist. */
  page?: { window?: PageEvents; document?: PageEvents & { visibilityState?: string } };
  /** Default {@link saveSession} (tests give a stand-in). */
  save?: (state: SessionSnapshot, takenAt: number) => Promise<SaveOutcome>;
}

/**
 * Keep the session as the user works. Each edit to a kept part writes the
 * journal within `journalDelayMs` and the whole session to IndexedDB
 * `delayMs` after the last edit (at once when traces were loaded or
 * removed); one IndexedDB save at a time, and an edit during a save leads
 * to one more. Traces not yet in the database are never kept waiting by
 * later small edits: while some are, every save is due at once (the
 * journal holds only their names, so a reload loses them until they are
 * stored; a stream of edits, each restarting the wait, kept six standards
 * loaded during a save out of the database for as long as the user kept
 * working). When the page is hidden or closed (`pagehide`,
 * `visibilitychange` to hidden) the journal is written at once,
 * synchronously, and a pending IndexedDB save is started.
 *
 * A storage problem (no database, quota reached, storage refused) is put in
 * the store once (`sessionProblem`) and cleared when saving works again;
 * the page keeps working in memory. Each complete save sets
 * `sessionSavedAt`; `sessionPending` is true while an edit is not yet in
 * the database (the journal already holds its small parts).
 * @returns a function that stops the autosave.
 */
export function startSessionAutosave(store: SessionStore, options: AutosaveOptions = {}): () => void {
  const delayMs = options.delayMs ?? 1000;
  const save = options.save ?? saveSession;
  /** Traces loaded or removed since the last save began: the next save is due at once. */
  let tracesDirty = false;
  const journalDelayMs = options.journalDelayMs ?? JOURNAL_DELAY_MS;
  const win = options.page?.window ?? (typeof window !== 'undefined' ? window : undefined);
  const doc = options.page?.document ?? (typeof document !== 'undefined' ? document : undefined);
  let saveTimer: ReturnType<typeof setTimeout> | null = null;
  let journalTimer: ReturnType<typeof setTimeout> | null = null;
  let journalDirty = false;
  let saving = false;
  let again = false;
  let dbProblem: string | null = null;
  let journalProblem: string | null = null;
  const publish = () => {
    if (stopped) return;
    const problem = dbProblem ?? journalProblem;
    if (store.getState().sessionProblem !== problem) store.getState().setSessionProblem(problem);
  };
  const writeJournalNow = () => {
    if (journalTimer !== null) { clearTimeout(journalTimer); journalTimer = null; }
    if (!journalDirty || stopped) return;
    journalDirty = false;
    const out = writeJournal(sessionJournal(snapshotOf(store.getState()), Date.now()));
    journalProblem = out.ok ? null : out.problem;
    publish();
  };
  const run = async () => {
    saveTimer = null;
    if (saving) { again = true; return; }
    saving = true;
    const taken = store.getState();
    const hadTraces = tracesDirty;
    tracesDirty = false;
    const out = await save(snapshotOf(taken), Date.now());
    saving = false;
    if (!out.ok && hadTraces) tracesDirty = true;
    if (stopped) return;
    if (out.ok) {
      dbProblem = null;
      store.getState().setSessionSavedAt(new Date().toISOString());
      // Up to date only when nothing kept changed while saving.
      const now = store.getState();
      if (saveTimer === null && !again && SESSION_KEYS.every((k) => now[k] === taken[k])) store.getState().setSessionPending(false);
    } else {
      dbProblem = out.problem;
    }
    publish();
    if (again) { again = false; schedule(delayMs); }
  };
  const schedule = (wait: number) => {
    if (saveTimer !== null) clearTimeout(saveTimer);
    if (!store.getState().sessionPending) store.getState().setSessionPending(true);
    saveTimer = setTimeout(() => { void run(); }, tracesDirty ? 0 : wait);
  };
  const unsub = store.subscribe((s, prev) => {
    if (stopped) return;
    if (!SESSION_KEYS.some((k) => s[k] !== prev[k])) return;
    journalDirty = true;
    if (journalTimer === null) journalTimer = setTimeout(writeJournalNow, journalDelayMs);
    if (s.traces !== prev.traces) tracesDirty = true;
    schedule(delayMs);
  });
  const flush = () => {
    if (stopped) return;
    writeJournalNow();
    if (saveTimer !== null) { clearTimeout(saveTimer); void run(); }
  };
  const onVisibility = () => { if (doc?.visibilityState === 'hidden') flush(); };
  win?.addEventListener('pagehide', flush);
  doc?.addEventListener('visibilitychange', onVisibility);
  // Whatever was loaded before the autosave started is kept too.
  if (store.getState().traces.length > 0) {
    journalDirty = true;
    tracesDirty = true;
    writeJournalNow();
    schedule(0);
  }
  return () => {
    unsub();
    win?.removeEventListener('pagehide', flush);
    doc?.removeEventListener('visibilitychange', onVisibility);
    if (saveTimer !== null) clearTimeout(saveTimer);
    if (journalTimer !== null) clearTimeout(journalTimer);
  };
}

/** Put a restored snapshot into the store (the undo history with it). */
export function applySnapshot(store: SessionStore, s: SessionSnapshot): void {
  store.setState({
    traces: s.traces, roles: s.roles, sampleId: s.sampleId, reports: s.reports,
    ...stackHistoryOf(s),
    noiseSettings: s.noiseSettings, peakSettings: s.peakSettings, decisions: s.decisions, alternatives: s.alternatives,
    // Fits belong to the traces they were made on: a session without them (saved before they were kept) has none.
    fits: s.fits ?? [], shownFitId: null,
    ...workOf({ ...s, fits: undefined }),
    ...keptNotes(s), lastHandChange: null,
  });
}

/** ", 3 region fit(s), the named peaks (4) and the standards' amounts" for the restore notice. */
export function workWords(s: SessionSnapshot): string {
  const parts: string[] = [];
  if (s.fits?.length) parts.push(`${s.fits.length} region fit(s)`);
  if (s.namedPeaks?.peaks.length) parts.push(`the named peaks (${s.namedPeaks.peaks.length})`);
  if (s.standardsTable) parts.push('the standards’ amounts');
  if (s.calibrationSettings) parts.push('the calibration settings');
  return parts.map((p) => `, ${p}`).join('');
}

/**
 * Put a saved session back into the store. Returns true when it restored
 * at least one trace (the page then skips the demo); problems and notes go
 * to the notices.
 */
export async function restoreSession(store: SessionStore): Promise<boolean> {
  const out = await loadSession();
  if (out === null) return false;
  if (!out.ok) {
    store.getState().notify('warning', 'The saved session was not restored', [out.problem]);
    return false;
  }
  const s = out.snapshot;
  if (s.traces.length === 0) {
    if (out.notes.length) store.getState().notify('warning', 'The saved session was not restored', out.notes);
    return false;
  }
  applySnapshot(store, s);
  store.getState().notify(out.notes.length ? 'warning' : 'info', 'Your previous session was restored',
    [`${s.traces.length} trace(s), the step stack with its last ${s.past.length} undo step(s), the quiet range, your peak decisions with their reasons, the report fields, the alternatives${workWords(s)} are as you left them. Use “Start over” to empty it.`, ...out.notes]);
  return true;
}
