/**
 * Property tests of the loader (fast-check, fixed seeds, 200 cases each).
 *
 * 1. Format then parse is identity: random finite doubles written by the
 *    project's own writer (writeCsv: shortest round-trip text, ECMA-262
 *    Number::toString) and read back by loadFile come back as the very same
 *    doubles, for every delimiter / decimal-sign pair the writer offers.
 * 2. "Chunked equals whole". The loader has no chunked API, so three things
 *    that stand for it are checked:
 *    a. parsing with onProgress (the path the page uses for big files, which
 *       reports between blocks of lines) gives the same traces as without,
 *       and the progress fractions rise from 0 to exactly 1;
 *    b. the same bytes split at a random line boundary into two files (each
 *       with the header) load into two traces whose concatenation is the
 *       whole file's trace: rows are read independently of each other;
 *    c. the fast splitter and PapaParse give the same result on plain files,
 *       and LF, CRLF and lone-CR line ends give the same result.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { writeCsv } from '../../../src/core/io/csv-write.ts';
import type { CsvDecimal, CsvDelimiter } from '../../../src/core/io/csv-write.ts';
import { loadFile } from '../../../src/core/io/load.ts';
import { parseDelimited } from '../../../src/core/io/delimited.ts';
import type { LoadResult } from '../../../src/core/io/types.ts';

const RUNS = { numRuns: 200 } as const;
const enc = (s: string) => new TextEncoder().encode(s);

/** Any finite double, subnormals and −0 included. */
const finite = fc.double({ noNaN: true, noDefaultInfinity: true });

/** A strictly ascending x column of 5 … 60 distinct finite doubles. */
const ascendingX = fc
  .uniqueArray(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e300, max: 1e300 }), { minLength: 5, maxLength: 60, comparator: (a, b) => a === b })
  .map((xs) => xs.sort((a, b) => a - b))
  // 0 and −0 compare equal: keep one of them only.
  .filter((xs) => xs.every((v, i) => i === 0 || v > xs[i - 1]));

const table = ascendingX.chain((x) => fc.tuple(fc.constant(x), fc.array(finite, { minLength: x.length, maxLength: x.length })));

const DIALECTS: { delimiter: CsvDelimiter; decimal: CsvDecimal }[] = [
  { delimiter: ',', decimal: '.' },
  { delimiter: ';', decimal: '.' },
  { delimiter: ';', decimal: ',' },
  { delimiter: '\t', decimal: '.' },
  { delimiter: '\t', decimal: ',' },
];

function written(x: number[], y: number[], d: (typeof DIALECTS)[number], newline: '\n' | '\r\n' = '\r\n'): string {
  const rows: (string | number)[][] = [['Time (s)', 'Signal (mV)'], ...x.map((v, i) => [v, y[i]])];
  return writeCsv(rows, { ...d, newline });
}

function traces(r: LoadResult): { x: number[]; y: number[]; name: string }[] {
  if (!r.ok) throw new Error(`${r.error.problem} (line ${r.error.line})`);
  return r.traces.map((t) => ({ x: Array.from(t.x), y: Array.from(t.y), name: t.name }));
}

describe('format then parse is identity', () => {
  for (const d of DIALECTS) {
    it(`delimiter ${JSON.stringify(d.delimiter)}, decimal ${JSON.stringify(d.decimal)}`, () => {
      fc.assert(
        fc.property(table, ([x, y]) => {
          const r = loadFile(enc(written(x, y, d)), 'round-trip.csv');
          const [t] = traces(r);
          // toEqual compares numbers with Object.is: −0 must stay −0, every bit must match.
          expect(t.x).toEqual(x);
          expect(t.y).toEqual(y);
          expect(r.ok && r.report.skipped.length).toBe(0);
        }),
        { ...RUNS, seed: 0x7ab1e + d.delimiter.charCodeAt(0) + d.decimal.charCodeAt(0) },
      );
    });
  }
});

describe('chunked equals whole', () => {
  it('parsing with progress reports gives the same traces, progress rising to 1', () => {
    fc.assert(
      fc.property(table, fc.constantFrom(...DIALECTS), ([x, y], d) => {
        const bytes = enc(written(x, y, d));
        const plain = traces(loadFile(bytes, 'p.csv'));
        const seen: number[] = [];
        const withProgress = traces(loadFile(bytes, 'p.csv', { onProgress: (f) => seen.push(f) }));
        expect(withProgress).toEqual(plain);
        expect(seen.length).toBeGreaterThan(0);
        expect(seen[seen.length - 1]).toBe(1);
        for (let i = 0; i < seen.length; i++) {
          expect(seen[i]).toBeGreaterThanOrEqual(i === 0 ? 0 : seen[i - 1]);
          expect(seen[i]).toBeLessThanOrEqual(1);
        }
      }),
      { ...RUNS, seed: 4242 },
    );
  });

  it('the file split at a random line boundary into two files loads as the two halves of the whole', () => {
    const longTable = fc
      .integer({ min: 10, max: 80 })
      .chain((n) => fc.tuple(
        fc.uniqueArray(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 }), { minLength: n, maxLength: n, comparator: (a, b) => a === b }),
        fc.array(finite, { minLength: n, maxLength: n }),
      ))
      .map(([xs, ys]) => [xs.sort((a, b) => a - b), ys] as const)
      .filter(([xs]) => xs.every((v, i) => i === 0 || v > xs[i - 1]));
    fc.assert(
      fc.property(longTable, fc.constantFrom(...DIALECTS), fc.nat(), ([x, y], d, cutSeed) => {
        const text = written(x, y, d, '\n');
        const lines = text.split('\n').slice(0, -1);
        const header = lines[0];
        const rows = lines.slice(1);
        // Each part keeps at least 5 rows (a trace's minimum).
        const cut = 5 + (cutSeed % (rows.length - 9));
        const whole = traces(loadFile(enc(text), 'w.csv'))[0];
        const a = traces(loadFile(enc([header, ...rows.slice(0, cut)].join('\n') + '\n'), 'a.csv'))[0];
        const b = traces(loadFile(enc([header, ...rows.slice(cut)].join('\n') + '\n'), 'b.csv'))[0];
        expect([...a.x, ...b.x]).toEqual(whole.x);
        expect([...a.y, ...b.y]).toEqual(whole.y);
      }),
      { ...RUNS, seed: 777 },
    );
  });

  it('fast splitter = PapaParse, and LF = CRLF = lone CR', () => {
    fc.assert(
      fc.property(table, fc.constantFrom(...DIALECTS), ([x, y], d) => {
        const lf = written(x, y, d, '\n');
        const fast = traces(parseDelimited(enc(lf), 'f.csv', {}, 'fast'));
        expect(traces(parseDelimited(enc(lf), 'f.csv', {}, 'papa'))).toEqual(fast);
        expect(traces(loadFile(enc(lf.replace(/\n/g, '\r\n')), 'f.csv'))).toEqual(fast);
        expect(traces(loadFile(enc(lf.replace(/\n/g, '\r')), 'f.csv'))).toEqual(fast);
      }),
      { ...RUNS, seed: 99 },
    );
  });
});
