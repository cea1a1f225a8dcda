/**
 * What crosses between the worker and the page, and how: every typed array
 * is transferred (moved, not copied), cached arrays are copied first so the
 * worker's own stay usable, and rows of plain objects (the peak table) cross
 * as columns of typed arrays instead of one cloned object per row.
 */

/** Every typed array buffer in a result, for zero-copy transfer. */
export function transferablesOf(value: unknown, out: Set<ArrayBuffer> = new Set(), depth = 0): ArrayBuffer[] {
  if (depth > 6 || value === null || typeof value !== 'object') return [...out];
  if (ArrayBuffer.isView(value)) {
    if (value.buffer instanceof ArrayBuffer) out.add(value.buffer);
    return [...out];
  }
  for (const v of Object.values(value as Record<string, unknown>)) transferablesOf(v, out, depth + 1);
  return [...out];
}

/** Deep copy of the typed arrays in a result (all kinds: σ profiles hold Int32Array) so the originals can stay cached in the worker. */
export function cloneResultForTransfer<T>(value: T, depth = 0): T {
  if (value === null || typeof value !== 'object' || depth > 8) return value;
  // Every typed array is copied: whatever is transferred afterwards must not be an array the worker keeps.
  if (ArrayBuffer.isView(value)) return (value instanceof DataView ? value : (value as unknown as Float64Array).slice()) as unknown as T;
  if (Array.isArray(value)) return value.map((v) => cloneResultForTransfer(v, depth + 1)) as unknown as T;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(value as Record<string, unknown>)) out[k] = cloneResultForTransfer(v, depth + 1);
  return out as T;
}

/**
 * Rows of plain objects (the peak table) as columns of typed arrays, so they
 * cross from the worker with a transfer list instead of a structured clone
 * of one object per row. Exact: every number keeps its bits, and a missing
 * field stays missing, null stays null.
 *
 * A field whose values are all numbers (or null / absent) becomes a
 * Float64Array, with a Uint8Array of kinds only when some value is not a
 * number; all strings (or absent), a dictionary of the distinct strings and
 * a Uint32Array of codes; all booleans (or absent), a Uint8Array; all lists
 * of strings (or null / absent: a peak's marks), one dictionary, the codes
 * of every list end to end and where each list starts; all plain objects
 * (or null / absent: a peak's pharmacopoeial noise window) with the same
 * keys in the same order, columns of their own, made the same way, and which
 * of them each row has (each object comes back with its keys in its own
 * order; the top rows' fields come back in the order first seen). Anything
 * else stays a plain list. (Issue 16: the marks and the noise windows crossed as one
 * array and one object per peak, 10–40 ms of the worker's structured clone
 * for 6,000–13,000 peaks at 10⁶ points, and as long again to read back on
 * the page's thread.)
 */
type Row = Record<string, unknown>;

const ABSENT = 0, NULL = 1, VALUE = 2;

export type Column =
  | { kind: 'number'; values: Float64Array; kinds?: Uint8Array }
  | { kind: 'string'; dictionary: string[]; codes: Uint32Array }
  | { kind: 'boolean'; values: Uint8Array }
  /** Lists of strings: list i is `codes[starts[i]…starts[i + 1])` in the dictionary; kinds only when some row has no list (null or absent). */
  | { kind: 'words'; dictionary: string[]; starts: Uint32Array; codes: Uint32Array; kinds?: Uint8Array }
  /** Plain objects: row i's is row `at[i]` of `rows`; at[i] is {@link AT_ABSENT} or {@link AT_NULL} when it has none. */
  | { kind: 'records'; at: Int32Array; rows: Columns }
  | { kind: 'plain'; values: unknown[] };

const AT_ABSENT = -1, AT_NULL = -2;
/** How deep objects inside objects become columns (deeper ones stay plain). */
const RECORD_DEPTH = 4;

/** An object made by an object literal (or a structured clone of one): not an array, a typed array, a class instance. */
function isPlainObject(v: unknown): v is Row {
  return v !== null && typeof v === 'object' && Object.getPrototypeOf(v) === Object.prototype;
}

/** Is v an array of strings only (none missing)? */
function isWordList(v: unknown): v is string[] {
  if (!Array.isArray(v)) return false;
  for (let i = 0; i < v.length; i++) if (typeof v[i] !== 'string') return false;
  return true;
}

export interface Columns {
  readonly columnar: true;
  length: number;
  /** Field names in the order the first row had them (then any later ones). */
  fields: string[];
  columns: Record<string, Column>;
}

export function toColumns(rows: readonly Row[]): Columns {
  return columnsOf(rows, 0)!;
}

/**
 * {@link toColumns} at a depth: below the top (objects inside rows) null unless every object has the same keys in
 * the same order, so each comes back with its keys in its own order (a plain list keeps them as they were).
 */
function columnsOf(rows: readonly Row[], depth: number): Columns | null {
  const n = rows.length;
  const fields: string[] = [];
  const where = new Map<string, number>();
  const table: unknown[][] = [];
  // Transposed once, row by row (issue 16): each row's own keys and values, in the same order, and the column of
  // each key looked up once per run of rows of one shape. Reading r[f] for every field of every row, twice, took
  // 30-95 ms for 13,000 peaks (a keyed read per field, the object's shape not known in advance).
  let shapeKeys: string[] = [];
  let shapeCols: number[] = [];
  for (let i = 0; i < n; i++) {
    const r = rows[i];
    const keys = Object.keys(r);
    let same = keys.length === shapeKeys.length;
    for (let j = 0; same && j < keys.length; j++) same = keys[j] === shapeKeys[j];
    if (!same) {
      if (depth > 0 && i > 0) return null;
      shapeKeys = keys;
      shapeCols = keys.map((k) => {
        let c = where.get(k);
        if (c === undefined) { c = fields.length; fields.push(k); where.set(k, c); table.push(new Array<unknown>(n).fill(undefined)); }
        return c;
      });
    }
    const values = Object.values(r);
    for (let j = 0; j < values.length; j++) table[shapeCols[j]][i] = values[j];
  }
  const columns: Record<string, Column> = {};
  fields.forEach((f, c) => {
    const col = table[c];
    let numbers = true, strings = true, booleans = true, someNotNumber = false;
    let lists = true, records = depth < RECORD_DEPTH, someNotList = false;
    for (let i = 0; i < n; i++) {
      const v = col[i];
      const t = typeof v;
      if (v === undefined) { someNotNumber = true; someNotList = true; continue; }
      if (t !== 'number') { numbers = numbers && v === null; someNotNumber = true; }
      if (t !== 'string') strings = false;
      if (t !== 'boolean') booleans = false;
      if (v === null) { someNotList = true; continue; }
      if (lists && !isWordList(v)) lists = false;
      if (records && !isPlainObject(v)) records = false;
    }
    if (numbers) {
      const values = new Float64Array(n);
      const kinds = someNotNumber ? new Uint8Array(n) : undefined;
      for (let i = 0; i < n; i++) {
        const v = col[i];
        if (typeof v === 'number') { values[i] = v; if (kinds) kinds[i] = VALUE; } else if (kinds) kinds[i] = v === null ? NULL : ABSENT;
      }
      columns[f] = kinds ? { kind: 'number', values, kinds } : { kind: 'number', values };
    } else if (strings) {
      const dictionary: string[] = [];
      const index = new Map<string, number>();
      const codes = new Uint32Array(n);
      for (let i = 0; i < n; i++) {
        const v = col[i] as string | undefined;
        if (v === undefined) { codes[i] = 0xffffffff; continue; }
        let k = index.get(v);
        if (k === undefined) { k = dictionary.length; dictionary.push(v); index.set(v, k); }
        codes[i] = k;
      }
      columns[f] = { kind: 'string', dictionary, codes };
    } else if (booleans) {
      const values = new Uint8Array(n);
      for (let i = 0; i < n; i++) { const v = col[i]; values[i] = v === undefined ? 2 : v ? 1 : 0; }
      columns[f] = { kind: 'boolean', values };
    } else if (lists) {
      columns[f] = wordsColumn(col, someNotList);
    } else if (records) {
      const at = new Int32Array(n);
      const present: Row[] = [];
      for (let i = 0; i < n; i++) {
        const v = col[i];
        if (v === undefined) at[i] = AT_ABSENT;
        else if (v === null) at[i] = AT_NULL;
        else { at[i] = present.length; present.push(v as Row); }
      }
      const inner = columnsOf(present, depth + 1);
      columns[f] = inner ? { kind: 'records', at, rows: inner } : { kind: 'plain', values: col };
    } else {
      columns[f] = { kind: 'plain', values: col };
    }
  });
  return { columnar: true, length: n, fields, columns };
}

/** A column of lists of strings (or null / absent: then with kinds). */
function wordsColumn(col: readonly unknown[], someNotList: boolean): Column {
  const n = col.length;
  const dictionary: string[] = [];
  const index = new Map<string, number>();
  const starts = new Uint32Array(n + 1);
  const kinds = someNotList ? new Uint8Array(n) : undefined;
  let total = 0;
  for (let i = 0; i < n; i++) { const v = col[i]; if (Array.isArray(v)) total += v.length; }
  const codes = new Uint32Array(total);
  let k = 0;
  for (let i = 0; i < n; i++) {
    starts[i] = k;
    const v = col[i];
    if (!Array.isArray(v)) { if (kinds) kinds[i] = v === null ? NULL : ABSENT; continue; }
    if (kinds) kinds[i] = VALUE;
    for (let j = 0; j < v.length; j++) {
      const w = v[j] as string;
      let c = index.get(w);
      if (c === undefined) { c = dictionary.length; dictionary.push(w); index.set(w, c); }
      codes[k++] = c;
    }
  }
  starts[n] = k;
  return kinds ? { kind: 'words', dictionary, starts, codes, kinds } : { kind: 'words', dictionary, starts, codes };
}

/** List i of a words column (a new array). */
function wordsAt(col: Extract<Column, { kind: 'words' }>, i: number): string[] {
  const a = col.starts[i], b = col.starts[i + 1];
  const out: string[] = new Array(b - a);
  for (let j = a; j < b; j++) out[j - a] = col.dictionary[col.codes[j]];
  return out;
}

export function fromColumns<T>(c: Columns): T[] {
  const out: Row[] = new Array(c.length);
  const read = rowReader(c);
  for (let i = 0; i < c.length; i++) out[i] = read(i);
  return out as T[];
}

/**
 * How to make row i of some columns ({@link rowAt}'s row). When no row leaves a field out, every row has every
 * field in the same order, so each is copied from a template with all of them and its values set in place: one
 * shape for every row, no field added one at a time (issue 16: the loss ledger's cells, 14 fields in about
 * 12,000 cells at 10⁶ points, took about 37 ms of the page's message task built field by field).
 */
function rowReader(c: Columns): (i: number) => Row {
  const fields = c.fields;
  const cols = fields.map((f) => c.columns[f]);
  if (fields.includes('__proto__') || cols.some((col) => leavesOut(col, c.length))) return (i) => rowAt(c, i);
  const template: Row = {};
  for (const f of fields) template[f] = null;
  return (i) => {
    const row: Row = { ...template };
    for (let j = 0; j < cols.length; j++) row[fields[j]] = valueAt(cols[j], i);
    return row;
  };
}

/** Does some row leave this field out? */
function leavesOut(col: Column, n: number): boolean {
  if (col.kind === 'number' || col.kind === 'words') return col.kinds !== undefined && col.kinds.includes(ABSENT);
  if (col.kind === 'string') return col.codes.includes(0xffffffff);
  if (col.kind === 'boolean') return col.values.includes(2);
  if (col.kind === 'records') return col.at.includes(AT_ABSENT);
  for (let i = 0; i < n; i++) if (col.values[i] === undefined) return true;
  return false;
}

/** Each nested table's row maker, made once. */
const readers = new WeakMap<Columns, (i: number) => Row>();
function readerOf(c: Columns): (i: number) => Row {
  let r = readers.get(c);
  if (!r) { r = rowReader(c); readers.set(c, r); }
  return r;
}

/** The value of row i in a column that leaves no row out. */
function valueAt(col: Column, i: number): unknown {
  if (col.kind === 'number') return col.kinds === undefined || col.kinds[i] === VALUE ? col.values[i] : null;
  if (col.kind === 'string') return col.dictionary[col.codes[i]];
  if (col.kind === 'boolean') return col.values[i] === 1;
  if (col.kind === 'words') return col.kinds === undefined || col.kinds[i] === VALUE ? wordsAt(col, i) : null;
  if (col.kind === 'records') return col.at[i] === AT_NULL ? null : readerOf(col.rows)(col.at[i]);
  return col.values[i];
}

/** Row `i` of some columns: a field left out of a row stays left out, a null stays null. */
function rowAt(c: Columns, i: number): Row {
  const row: Row = {};
  for (const f of c.fields) {
    const col = c.columns[f];
    if (col.kind === 'number') {
      const k = col.kinds ? col.kinds[i] : VALUE;
      if (k === VALUE) row[f] = col.values[i]; else if (k === NULL) row[f] = null;
    } else if (col.kind === 'string') {
      if (col.codes[i] !== 0xffffffff) row[f] = col.dictionary[col.codes[i]];
    } else if (col.kind === 'boolean') {
      if (col.values[i] !== 2) row[f] = col.values[i] === 1;
    } else if (col.kind === 'words') {
      const k = col.kinds ? col.kinds[i] : VALUE;
      if (k === VALUE) row[f] = wordsAt(col, i); else if (k === NULL) row[f] = null;
    } else if (col.kind === 'records') {
      const a = col.at[i];
      if (a >= 0) row[f] = readerOf(col.rows)(a); else if (a === AT_NULL) row[f] = null;
    } else if (col.values[i] !== undefined) row[f] = col.values[i];
  }
  return row;
}

/** A row index named by a property key, or -1. */
function indexOfKey(key: string | symbol, n: number): number {
  if (typeof key !== 'string' || key.length === 0 || key.length > 10) return -1;
  const c0 = key.charCodeAt(0);
  if (c0 < 48 || c0 > 57 || (c0 === 48 && key.length > 1)) return -1;
  const i = Number(key);
  return Number.isInteger(i) && i < n ? i : -1;
}

/**
 * The same rows as {@link fromColumns}, as an array that makes each row only when it is first read (and
 * then keeps it: the same row object every time). A long peak table (tens of thousands of rows) then costs
 * the page only the rows something reads: the table's shown rows and the plot's markers (issue 16); an
 * export or a search reads them all, as before. It behaves as an array for reading (length, indexing,
 * iteration, the array methods, JSON); the browser cannot post it to a worker (nothing does).
 */
export function lazyRows<T>(c: Columns): T[] {
  const n = c.length;
  const target: Row[] = new Array(n);
  const make = rowReader(c);
  return new Proxy(target, {
    get(t, key, receiver) {
      const i = indexOfKey(key, n);
      if (i < 0) return Reflect.get(t, key, receiver);
      return t[i] ?? (t[i] = make(i));
    },
    has(t, key) {
      return indexOfKey(key, n) >= 0 || Reflect.has(t, key);
    },
    getOwnPropertyDescriptor(t, key) {
      const i = indexOfKey(key, n);
      if (i >= 0 && t[i] === undefined) t[i] = make(i);
      return Reflect.getOwnPropertyDescriptor(t, key);
    },
    ownKeys(t) {
      for (let i = 0; i < n; i++) if (t[i] === undefined) t[i] = make(i);
      return Reflect.ownKeys(t);
    },
  }) as unknown as T[];
}

/** The typed-array buffers of some columns, for the transfer list. */
export function columnBuffers(c: Columns): ArrayBuffer[] {
  const out: ArrayBuffer[] = [];
  for (const col of Object.values(c.columns)) {
    if (col.kind === 'number') { out.push(col.values.buffer as ArrayBuffer); if (col.kinds) out.push(col.kinds.buffer as ArrayBuffer); }
    else if (col.kind === 'string') out.push(col.codes.buffer as ArrayBuffer);
    else if (col.kind === 'boolean') out.push(col.values.buffer as ArrayBuffer);
    else if (col.kind === 'words') { out.push(col.starts.buffer as ArrayBuffer, col.codes.buffer as ArrayBuffer); if (col.kinds) out.push(col.kinds.buffer as ArrayBuffer); }
    else if (col.kind === 'records') out.push(col.at.buffer as ArrayBuffer, ...columnBuffers(col.rows));
  }
  return out;
}
