import { describe, expect, it } from 'vitest';
import { readFileSync, readdirSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { loadFile } from '../../../src/core/io/load.ts';
import { parseDelimited } from '../../../src/core/io/delimited.ts';
import { parseJcamp } from '../../../src/core/io/jcamp.ts';
import { parseNetcdf } from '../../../src/core/io/netcdf.ts';
import { MAX_FILE_BYTES } from '../../../src/core/io/types.ts';
import type { LoadResult } from '../../../src/core/io/types.ts';

const TEXT = new URL('../../fixtures/text/', import.meta.url);
const read = (url: URL) => new Uint8Array(readFileSync(url));
const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

function comparable(r: LoadResult): unknown {
  if (!r.ok) return r;
  return { report: r.report, traces: r.traces.map(({ id: _id, ...rest }) => ({ ...rest, x: Array.from(rest.x), y: Array.from(rest.y) })) };
}

function problemOf(r: LoadResult): string {
  if (r.ok) throw new Error('expected a problem');
  return `${r.error.problem} ${r.error.advice}`;
}

describe('loadFile', () => {
  it('refuses binary files, naming the format and what the page reads', () => {
    expect(problemOf(loadFile(read(new URL('picture.csv', TEXT)), 'picture.csv'))).toMatch(/This is a PNG image.*JCAMP-DX.*netCDF/);
    expect(problemOf(loadFile(read(new URL('workbook.xlsx', TEXT)), 'workbook.xlsx'))).toMatch(/ZIP archive.*save the sheet as CSV/);
    expect(problemOf(loadFile(read(new URL('binary.dat', TEXT)), 'binary.dat'))).toMatch(/binary.*NUL bytes/);
    const gz = Uint8Array.from([0x1f, 0x8b, 0x08, 0x00, 0x31, 0x2c, 0x32]);
    expect(problemOf(loadFile(gz, 'run.csv.gz'))).toMatch(/gzip.*Decompress/);
    const pdf = new TextEncoder().encode('%PDF-1.7\n1 0 obj\n');
    expect(problemOf(loadFile(pdf, 'report.pdf'))).toMatch(/PDF document/);
  });

  it('refuses a file over the size limit without reading it', () => {
    // A Uint8Array that claims to be one byte too long, so the test does not need 400 MB of memory.
    class Oversized extends Uint8Array {
      override get length(): number { return MAX_FILE_BYTES + 1; }
    }
    const r = loadFile(new Oversized(10), 'huge.csv');
    expect(problemOf(r)).toMatch(/more than the 400 MB the page can hold/);
  });

  it('refuses empty files', () => {
    expect(problemOf(loadFile(new Uint8Array(0), 'none.csv'))).toMatch(/empty \(0 bytes\)/);
  });

  it('gives the same result as the delimited reader for every text fixture that is not binary', () => {
    let count = 0;
    for (const name of readdirSync(TEXT).filter((f) => f !== 'README.md')) {
      if (['binary.dat', 'picture.csv', 'workbook.xlsx'].includes(name)) continue;
      const bytes = read(new URL(name, TEXT));
      expect(comparable(loadFile(bytes, name)), name).toEqual(comparable(parseDelimited(bytes, name)));
      count++;
    }
    expect(count).toBeGreaterThanOrEqual(20);
  });

  it('chooses the reader by content, not by file name', () => {
    // JCAMP-DX text saved as .csv goes to the JCAMP-DX reader.
    const jdx = read(new URL('../../fixtures/jcamp/xypoints.jdx', import.meta.url));
    const asCsv = loadFile(jdx, 'spectrum.csv');
    expect(asCsv.ok).toBe(true);
    if (asCsv.ok) expect(asCsv.report.format).toMatch(/^JCAMP-DX/);
    expect(comparable(asCsv)).toEqual(comparable(parseJcamp(new TextDecoder().decode(jdx), 'spectrum.csv', sha(jdx))));
    // A CSV saved as .jdx goes to the delimited reader.
    const csv = read(new URL('comma.csv', TEXT));
    const asJdx = loadFile(csv, 'comma.jdx');
    expect(asJdx.ok && asJdx.report.format).toMatch(/^delimited text/);
  });

  const cdf = new URL('../../fixtures/netcdf/chromatogram.cdf', import.meta.url);
  it('sends netCDF classic bytes to the netCDF reader whatever the name', () => {
    const bytes = read(cdf);
    const r = loadFile(bytes, 'run.txt');
    expect(comparable(r)).toEqual(comparable(parseNetcdf(bytes, 'run.txt', sha(bytes))));
    expect(r.ok && r.report.format).toMatch(/netCDF/);
  });

  it('never throws on odd arguments', () => {
    expect(problemOf(loadFile(undefined as unknown as Uint8Array, 'x.csv'))).toMatch(/No file content/);
    expect(problemOf(loadFile([1, 2, 3] as unknown as Uint8Array, 'x.csv'))).toMatch(/No file content/);
  });

  it('leaves the bytes unchanged', () => {
    const bytes = read(new URL('latin1-degree.csv', TEXT));
    const copy = bytes.slice();
    loadFile(bytes, 'latin1-degree.csv');
    expect(bytes).toEqual(copy);
  });
});
