import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { looksLikeNetcdf, netcdfText, parseNetcdf } from '../../../src/core/io/netcdf.ts';
import type { LoadResult } from '../../../src/core/io/types.ts';
import { buildNetcdfClassic, chromatogramFixture, inventedSignal } from '../../fixtures/netcdf/netcdf-classic.mjs';
import type { NcAttr, NcVar } from '../../fixtures/netcdf/netcdf-classic.mjs';

// Files are assembled by our own test writer following Unidata's "NetCDF Classic
// Format Specification" (magic "CDF\x01", numrecs, dim_list, gatt_list, var_list,
// big-endian). Names and layout follow ASTM E1947 (chromatography netCDF):
// signal in ordinate_values, tᵢ = actual_delay_time + i·actual_sampling_interval
// (REFERENCES.md: delay 0.5 s, interval 0.2 s, i = 10 → 2.5 s), optional raw_data_retention.

const SHA = 'a'.repeat(64);
const fixturePath = fileURLToPath(new URL('../../fixtures/netcdf/chromatogram.cdf', import.meta.url));

function ok(r: LoadResult) {
  if (!r.ok) throw new Error(`expected ok, got: ${r.error.problem}`);
  expect(r.traces).toHaveLength(1);
  return { trace: r.traces[0], report: r.report };
}
function problem(r: LoadResult) {
  if (r.ok) throw new Error('expected a problem, got a trace');
  return r.error;
}

const ATTRS: NcAttr[] = [
  { name: 'detector_name', value: 'RI' },
  { name: 'detector_unit', value: 'µRIU' },
  { name: 'retention_unit', value: 'Minutes' },
  { name: 'injection_date_time_stamp', value: '20260101120000+0000' },
  { name: 'run_count', value: [3, 4], type: 'int' },
];

function build(vars: NcVar[], attrs: NcAttr[] = ATTRS, n = 12): Uint8Array {
  return buildNetcdfClassic({ dims: [{ name: 'point_number', size: n }], attrs, vars });
}

describe('looksLikeNetcdf', () => {
  it('accepts "CDF" + 1 or 2, refuses anything else (netCDF classic magic)', () => {
    expect(looksLikeNetcdf(new Uint8Array([0x43, 0x44, 0x46, 1, 0]))).toBe(true);
    expect(looksLikeNetcdf(new Uint8Array([0x43, 0x44, 0x46, 2]))).toBe(true);
    expect(looksLikeNetcdf(new Uint8Array([0x43, 0x44, 0x46, 5]))).toBe(false);
    expect(looksLikeNetcdf(new Uint8Array([0x89, 0x48, 0x44, 0x46]))).toBe(false);
    expect(looksLikeNetcdf(new TextEncoder().encode('CD'))).toBe(false);
  });
});

describe('netcdfText', () => {
  it('reads char bytes as UTF-8 when valid, else Latin-1 (RFC 3629 byte patterns)', () => {
    // netcdfjs hands bytes ≥ 0x80 over sign-extended (0xC2 → U+FFC2).
    const wide = (bytes: number[]) => bytes.map((b) => String.fromCharCode(b >= 0x80 ? 0xff00 | b : b)).join('');
    expect(netcdfText(wide([0xc2, 0xb5, 0x52]))).toBe('µR'); // U+00B5 in UTF-8 is C2 B5
    expect(netcdfText(wide([0xe2, 0x82, 0xac]))).toBe('€'); // U+20AC is E2 82 AC
    expect(netcdfText(wide([0xb5, 0x41]))).toBe('µA'); // lone B5: not UTF-8, Latin-1 µ
    expect(netcdfText(wide([0xe2, 0x82]))).toBe('â\u0082'); // cut sequence → Latin-1
    expect(netcdfText('plain')).toBe('plain');
  });
});

describe('parseNetcdf (ASTM E1947 layout)', () => {
  it('the committed fixture is what the generator script writes', () => {
    expect(Array.from(new Uint8Array(readFileSync(fixturePath)))).toEqual(Array.from(chromatogramFixture()));
  });

  it('fixture: delay 0.5 s, interval 0.2 s → t₁₀ = 2.5 s, and the stored signal', () => {
    const bytes = new Uint8Array(readFileSync(fixturePath));
    const copy = bytes.slice();
    const { trace, report } = ok(parseNetcdf(bytes, 'chromatogram.cdf', SHA));
    expect(trace.x.length).toBe(21);
    // 0.5 + 10·0.2 in doubles is 2.5 exactly (0.2·10 rounds to 2).
    expect(trace.x[10]).toBe(2.5);
    expect(trace.x[0]).toBe(0.5);
    for (let i = 0; i < 21; i++) expect(Math.abs(trace.x[i] - (0.5 + 0.2 * i))).toBeLessThan(1e-12);
    // Integer signal values are exact in float32.
    expect(Array.from(trace.y)).toEqual(Array.from({ length: 21 }, (_, i) => inventedSignal(i)));
    expect(trace.xName).toBe('Time');
    expect(trace.xUnit).toBe('s');
    expect(trace.yName).toBe('UV 254 nm');
    expect(trace.yUnit).toBe('mAU');
    expect(trace.name).toBe('chromatogram.cdf: UV 254 nm');
    expect(trace.metadata['sample_name']).toBe('invented mix');
    expect(trace.metadata['dataset_completeness']).toBe('C1+C2');
    expect(trace.metadata['actual_run_time_length']).toBe('4');
    expect(trace.source).toMatchObject({ fileName: 'chromatogram.cdf', sha256: SHA, rowsRead: 21, rowsSkipped: 0 });
    expect(report.format).toMatch(/E1947/);
    expect(report.notices).toEqual([]);
    // The caller's bytes are unchanged.
    expect(Array.from(bytes)).toEqual(Array.from(copy));
  });

  it('a view that does not start at byte 0 of its buffer reads the same', () => {
    const bytes = new Uint8Array(readFileSync(fixturePath));
    const big = new Uint8Array(bytes.length + 13).fill(0x55);
    big.set(bytes, 7);
    const { trace } = ok(parseNetcdf(big.subarray(7, 7 + bytes.length), 'offset.cdf', SHA));
    expect(trace.x[10]).toBe(2.5);
    expect(trace.y[10]).toBe(inventedSignal(10));
  });

  it('float timing: t₁₀ within float32 rounding of 2.5 (relative 2⁻²⁴ per stored value)', () => {
    const n = 12;
    const y = Array.from({ length: n }, (_, i) => i * i - 7);
    const bytes = build([
      { name: 'actual_sampling_interval', dims: [], type: 'float', values: [0.2] },
      { name: 'actual_delay_time', dims: [], type: 'float', values: [0.5] },
      { name: 'ordinate_values', dims: [0], type: 'double', values: y },
    ]);
    const { trace } = ok(parseNetcdf(bytes, 'f.cdf', SHA));
    expect(Math.abs(trace.x[10] - 2.5)).toBeLessThan(10 * 0.2 * 2 ** -24 + 1e-15);
    expect(Array.from(trace.y)).toEqual(y);
    expect(trace.xUnit).toBe('min');
    expect(trace.yUnit).toBe('µRIU');
    expect(trace.metadata['run_count']).toBe('3, 4');
    expect(trace.metadata['injection_date_time_stamp']).toBe('20260101120000+0000');
  });

  it('raw_data_retention, when present, gives the times (uneven)', () => {
    const t = [0.5, 0.7, 0.95, 1.2, 1.6, 2.0, 2.1, 2.5, 3.0, 3.25, 4.0, 5.5];
    const bytes = build([
      { name: 'actual_sampling_interval', dims: [], type: 'double', values: [0.2] },
      { name: 'actual_delay_time', dims: [], type: 'double', values: [0.5] },
      { name: 'raw_data_retention', dims: [0], type: 'double', values: t },
      { name: 'ordinate_values', dims: [0], type: 'float', values: t.map((_, i) => 10 * i) },
    ]);
    const { trace } = ok(parseNetcdf(bytes, 'r.cdf', SHA));
    expect(Array.from(trace.x)).toEqual(t);
    expect(Array.from(trace.y)).toEqual(t.map((_, i) => 10 * i));
  });

  it('short signal with an odd count: the 4-byte padding value is not read as a point', () => {
    const n = 11;
    const y = Array.from({ length: n }, (_, i) => -300 + 61 * i);
    const bytes = build(
      [
        { name: 'actual_sampling_interval', dims: [], type: 'double', values: [1] },
        { name: 'actual_delay_time', dims: [], type: 'double', values: [0] },
        { name: 'ordinate_values', dims: [0], type: 'short', values: y },
      ],
      ATTRS,
      n,
    );
    const { trace } = ok(parseNetcdf(bytes, 's.cdf', SHA));
    expect(Array.from(trace.y)).toEqual(y);
  });

  it('missing actual_delay_time → start at 0 with a notice; missing retention_unit → seconds with a notice', () => {
    const bytes = build(
      [
        { name: 'actual_sampling_interval', dims: [], type: 'double', values: [0.25] },
        { name: 'ordinate_values', dims: [0], type: 'float', values: Array.from({ length: 12 }, (_, i) => i) },
      ],
      [{ name: 'detector_unit', value: 'mV' }],
    );
    const { trace, report } = ok(parseNetcdf(bytes, 'd.cdf', SHA));
    expect(trace.x[4]).toBe(1);
    expect(trace.xUnit).toBe('s');
    expect(trace.yName).toBe('Detector signal');
    expect(report.notices.join(' ')).toMatch(/actual_delay_time/);
    expect(report.notices.join(' ')).toMatch(/retention_unit/);
  });

  it('missing ordinate_values → a message naming it', () => {
    const bytes = build([{ name: 'actual_sampling_interval', dims: [], type: 'double', values: [0.2] }]);
    const e = problem(parseNetcdf(bytes, 'm.cdf', SHA));
    expect(e.problem).toMatch(/ordinate_values/);
    expect(e.fileName).toBe('m.cdf');
  });

  it('missing timing → a message naming actual_sampling_interval', () => {
    const bytes = build([{ name: 'ordinate_values', dims: [0], type: 'float', values: Array.from({ length: 12 }, () => 1) }]);
    expect(problem(parseNetcdf(bytes, 't.cdf', SHA)).problem).toMatch(/actual_sampling_interval/);
  });

  it('raw_data_retention of the wrong length, zero interval, non-finite signal → named problems', () => {
    const y = Array.from({ length: 12 }, (_, i) => i);
    const withDims = buildNetcdfClassic({
      dims: [{ name: 'point_number', size: 12 }, { name: 'other', size: 3 }],
      attrs: ATTRS,
      vars: [
        { name: 'raw_data_retention', dims: [1], type: 'double', values: [1, 2, 3] },
        { name: 'ordinate_values', dims: [0], type: 'float', values: y },
      ],
    });
    expect(problem(parseNetcdf(withDims, 'w.cdf', SHA)).problem).toMatch(/raw_data_retention holds 3/);
    const zero = build([
      { name: 'actual_sampling_interval', dims: [], type: 'double', values: [0] },
      { name: 'ordinate_values', dims: [0], type: 'float', values: y },
    ]);
    expect(problem(parseNetcdf(zero, 'z.cdf', SHA)).problem).toMatch(/actual_sampling_interval is 0/);
    const nan = build([
      { name: 'actual_sampling_interval', dims: [], type: 'double', values: [1] },
      { name: 'ordinate_values', dims: [0], type: 'float', values: y.map((v) => (v === 5 ? NaN : v)) },
    ]);
    expect(problem(parseNetcdf(nan, 'n.cdf', SHA)).problem).toMatch(/point 6/);
  });

  it('every truncation of the fixture gives a clear problem, never an exception', () => {
    const bytes = new Uint8Array(readFileSync(fixturePath));
    const kinds = new Set<string>();
    for (let len = 0; len < bytes.length; len++) {
      const r = parseNetcdf(bytes.subarray(0, len), 'cut.cdf', SHA);
      const e = problem(r);
      expect(e.problem.length).toBeGreaterThan(20);
      expect(e.advice.length).toBeGreaterThan(10);
      kinds.add(e.problem.replace(/\d+/g, '#'));
    }
    // Cuts in the header and cuts in the data are told apart.
    expect([...kinds].some((k) => /header is cut short/.test(k))).toBe(true);
    expect([...kinds].some((k) => /variable ordinate_values needs bytes up to/.test(k))).toBe(true);
  });

  it('not netCDF, or netCDF-4/HDF5 → says which formats are read', () => {
    expect(problem(parseNetcdf(new TextEncoder().encode('time,signal\n'), 'x.cdf', SHA)).problem).toMatch(/netCDF classic/);
    expect(problem(parseNetcdf(new Uint8Array([0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a]), 'h.nc', SHA)).problem).toMatch(/HDF5/);
  });
});
