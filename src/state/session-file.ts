/**
 * The session as a file the user keeps: for a browser that keeps nothing
 * (private windows, storage full or switched off) and for moving a session
 * to another computer. Loading the file puts the session back exactly.
 *
 * Format (JSON, UTF-8): `{ format: "tracewright-session-file", version,
 * savedAt, caution, meta, numbers }` where `meta` is the same record the
 * browser's database keeps ({@link SessionMeta}: trace heads without their
 * numbers, roles, load reports, recipe with its undo steps, settings,
 * decisions, alternatives) and `numbers[traceId]` holds x and y as base64
 * of IEEE 754 doubles in little-endian byte order (RFC 4648 base64), so
 * every value comes back bit for bit. Reading checks everything again (the
 * trace invariants, every recipe) exactly as a restore from the database.
 *
 * Pure: no DOM, so it is tested in Node.
 */
import { CAUTION, TOOL_LABEL } from '../core/export/version.ts';
import type { Registry } from '../core/method.ts';
import { STEP_REGISTRY } from '../core/steps/registry.ts';
import { base64ToFloat64, float64ToBase64 } from './base64-doubles.ts';
import { sessionFromRecords, sessionMeta, type ChunkKey, type LoadOutcome, type SessionMeta, type SessionSnapshot } from './session-db.ts';

export const SESSION_FILE_FORMAT = 'tracewright-session-file';
export const SESSION_FILE_VERSION = 1;
/** Largest session file read back (text characters). */
export const SESSION_FILE_MAX_CHARS = 512 * 1024 * 1024;

export { base64ToFloat64, float64ToBase64 };

/** The session as the text of a session file. The snapshot is only read. */
export function sessionFileText(snapshot: SessionSnapshot, now: Date, version: string = TOOL_LABEL): string {
  // One chunk per axis: the file holds each axis whole.
  const meta = sessionMeta(snapshot, 0, now, Number.MAX_SAFE_INTEGER);
  const numbers: Record<string, { x: string; y: string }> = {};
  for (const t of snapshot.traces) numbers[t.id] = { x: float64ToBase64(t.x), y: float64ToBase64(t.y) };
  return JSON.stringify({
    format: SESSION_FILE_FORMAT, version: SESSION_FILE_VERSION, savedAt: now.toISOString(), writtenBy: version, caution: CAUTION, meta, numbers,
  });
}

/**
 * A session from the text of a session file, checked as a restore from the
 * database is (a trace that fails its checks is left out with a note, a
 * recipe that no longer validates starts empty with a note). Never throws.
 */
export function sessionFromFileText(text: string, fileName: string, registry: Registry = STEP_REGISTRY): Exclude<LoadOutcome, null> {
  const refuse = (problem: string) => ({ ok: false as const, problem: `${fileName}: ${problem}` });
  if (typeof text !== 'string' || text.length === 0) return refuse('the file is empty.');
  if (text.length > SESSION_FILE_MAX_CHARS) return refuse(`the file is larger than ${SESSION_FILE_MAX_CHARS / 1048576} MB and was not read.`);
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch (e) {
    return refuse(`this is not a session file (it is not valid JSON: ${(e as Error).message}).`);
  }
  const f = parsed as { format?: unknown; version?: unknown; meta?: SessionMeta; numbers?: Record<string, { x?: unknown; y?: unknown }> } | null;
  if (!f || typeof f !== 'object' || f.format !== SESSION_FILE_FORMAT) {
    return refuse('this is not a session file saved by this page. Trace files go through “Open file…”, processing methods through “Load processing method…”.');
  }
  if (typeof f.version !== 'number' || f.version > SESSION_FILE_VERSION) return refuse('the session file was written by a newer version of the page.');
  if (!f.meta || typeof f.meta !== 'object' || !Array.isArray(f.meta.heads) || !f.numbers || typeof f.numbers !== 'object') {
    return refuse('the session file is incomplete (its description or its numbers are missing).');
  }
  const numbers = f.numbers;
  const decoded = new Map<string, Float64Array>();
  const bad: string[] = [];
  const get = (key: ChunkKey): Float64Array | undefined => {
    const [id, axis, k] = key;
    if (k !== 0) return undefined;
    const name = `${id}\u0000${axis}`;
    if (decoded.has(name)) return decoded.get(name);
    const entry = Object.prototype.hasOwnProperty.call(numbers, id) ? numbers[id] : undefined;
    const raw = entry?.[axis];
    if (typeof raw !== 'string') return undefined;
    try {
      const values = base64ToFloat64(raw);
      decoded.set(name, values);
      return values;
    } catch (e) {
      bad.push(`${id} ${axis}: ${(e as Error).message}`);
      return undefined;
    }
  };
  // The file keeps each axis in one piece, whatever chunk size its description states.
  const heads = f.meta.heads.map((h) => ({ ...h, chunkSize: Math.max(1, h.length), chunks: 1 }));
  const out = sessionFromRecords({ ...f.meta, heads }, get, registry);
  if (!out) return refuse('the session file holds no session.');
  if (out.ok && bad.length) out.notes.push(...bad.map((b) => `Numbers that could not be read: ${b}.`));
  return out;
}
