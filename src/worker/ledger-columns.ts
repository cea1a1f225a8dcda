/**
 * The loss check's ledger as columns (issue 16): the rows' own numbers and
 * the cells (every row's cell in every column, row after row) as typed-array
 * columns (transfer.ts), the sentences as one list of strings with where each
 * row's end, so the ledger crosses from the worker with a transfer list
 * instead of a structured clone of an object per row and per cell. Exact:
 * the page gets back the same rows, cells and sentences.
 */
import type { Ledger, LedgerCell, LedgerRow } from '../core/measure/loss-matching.ts';
import { columnBuffers, fromColumns, toColumns, type Columns } from './transfer.ts';

export interface LedgerColumns {
  readonly alternatives: Ledger['alternatives'];
  readonly rule: string;
  /** position, tolerance, firstFoundIn, crossed of each row. */
  readonly rows: Columns;
  /** Each row's cells, one per column of the ledger, row after row. */
  readonly cells: Columns;
  /** Cells per row (the ledger's columns). */
  readonly width: number;
  /** Every row's sentences in row order; row k's are those from sentenceEnds[k − 1] (0 for the first) to sentenceEnds[k]. */
  readonly rowSentences: string[];
  readonly sentenceEnds: Uint32Array;
  /** The ledger's own list of sentences when it is not the rows' in row order (null when it is). */
  readonly sentences: string[] | null;
}

export function ledgerToColumns(ledger: Ledger): LedgerColumns {
  const width = ledger.alternatives.length;
  const rows = ledger.rows;
  const cells: LedgerCell[] = [];
  const rowSentences: string[] = [];
  const sentenceEnds = new Uint32Array(rows.length);
  rows.forEach((r, k) => {
    if (r.cells.length !== width) throw new RangeError(`ledger row ${k} has ${r.cells.length} cells for ${width} columns`);
    for (const c of r.cells) cells.push(c);
    for (const s of r.sentences) rowSentences.push(s);
    sentenceEnds[k] = rowSentences.length;
  });
  const same = ledger.sentences.length === rowSentences.length && ledger.sentences.every((s, i) => s === rowSentences[i]);
  return {
    alternatives: ledger.alternatives,
    rule: ledger.rule,
    rows: toColumns(rows.map((r) => ({ position: r.position, tolerance: r.tolerance, firstFoundIn: r.firstFoundIn, crossed: r.crossed }))),
    cells: toColumns(cells as unknown as Record<string, unknown>[]),
    width,
    rowSentences,
    sentenceEnds,
    sentences: same ? null : ledger.sentences.slice(),
  };
}

export function ledgerFromColumns(c: LedgerColumns): Ledger {
  const heads = fromColumns<Pick<LedgerRow, 'position' | 'tolerance' | 'firstFoundIn' | 'crossed'>>(c.rows);
  const cells = fromColumns<LedgerCell>(c.cells);
  const rows: LedgerRow[] = heads.map((h, k) => ({
    position: h.position,
    tolerance: h.tolerance,
    firstFoundIn: h.firstFoundIn,
    cells: cells.slice(k * c.width, (k + 1) * c.width),
    crossed: h.crossed,
    sentences: c.rowSentences.slice(k === 0 ? 0 : c.sentenceEnds[k - 1], c.sentenceEnds[k]),
  }));
  return { alternatives: c.alternatives, rows, sentences: c.sentences ?? c.rowSentences, rule: c.rule };
}

/** The typed-array buffers of a ledger's columns, for the transfer list. */
export function ledgerBuffers(c: LedgerColumns): ArrayBuffer[] {
  return [...columnBuffers(c.rows), ...columnBuffers(c.cells), c.sentenceEnds.buffer as ArrayBuffer];
}
