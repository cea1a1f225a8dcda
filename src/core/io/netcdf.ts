/**
 * Chromatography netCDF reader: the ASTM E1947 interchange laid out in a
 * netCDF classic (or 64-bit offset) file (Unidata, "NetCDF Classic Format
 * Specification"). The general-purpose reader is netcdfjs; this module only
 * checks the bytes it will read and maps the E1947 names to a trace.
 *
 * Layout used (ASTM E1947; names as in the standard's template):
 * * signal: variable `ordinate_values` (one dimension);
 * * time: variable `raw_data_retention` when present (one time per point),
 *   otherwise tᵢ = `actual_delay_time` + i·`actual_sampling_interval`
 *   (scalar variables; a global attribute of the same name is accepted too);
 * * units: global attributes `retention_unit` (x) and `detector_unit` (y);
 *   the time values are taken to be in `retention_unit` (seconds when absent,
 *   with a notice); the y name is `detector_name` when present;
 * * every other global attribute, and every numeric scalar variable, is kept
 *   as metadata.
 */
import { NetCDFReader } from 'netcdfjs';
import { createTrace, TraceError } from '../trace.ts';
import type { LoadProblem, LoadResult } from './types.ts';
import { orderByX } from './order-x.ts';

/** True when the bytes start with the netCDF classic magic: "CDF" then version 1 (classic) or 2 (64-bit offset). */
export function looksLikeNetcdf(bytes: Uint8Array): boolean {
  return (
    bytes instanceof Uint8Array &&
    bytes.length >= 4 &&
    bytes[0] === 0x43 &&
    bytes[1] === 0x44 &&
    bytes[2] === 0x46 &&
    (bytes[3] === 1 || bytes[3] === 2)
  );
}

class NetcdfProblem extends Error {
  constructor(
    readonly problem: string,
    readonly advice: string,
  ) {
    super(problem);
  }
}

interface NcVariable {
  name: string;
  dimensions: number[];
  type: string;
  size: number;
  offset: number;
  record: boolean;
}

const STREAMING = 0xffffffff;

function flatten(values: unknown[]): (number | string)[] {
  const out: (number | string)[] = [];
  for (const v of values) {
    if (Array.isArray(v)) for (const w of v) out.push(w as number);
    else out.push(v as number | string);
  }
  return out;
}

/**
 * netcdfjs turns each char byte into a UTF-16 unit of its sign-extended value
 * (0xC2 → U+FFC2); recover the bytes, then read them as UTF-8 when they are
 * valid UTF-8 and as Latin-1 otherwise (classic netCDF does not say which).
 */
export function netcdfText(s: string): string {
  const bytes: number[] = [];
  for (let i = 0; i < s.length; i++) bytes.push(s.charCodeAt(i) & 0xff);
  const latin1 = () => bytes.map((b) => String.fromCharCode(b)).join('');
  let out = '';
  for (let i = 0; i < bytes.length; ) {
    const b = bytes[i];
    const extra = b < 0x80 ? 0 : b >= 0xc2 && b < 0xe0 ? 1 : b >= 0xe0 && b < 0xf0 ? 2 : b >= 0xf0 && b < 0xf5 ? 3 : -1;
    if (extra < 0 || i + extra >= bytes.length) return latin1();
    let cp = extra === 0 ? b : b & (0x3f >> extra);
    for (let k = 1; k <= extra; k++) {
      const c = bytes[i + k];
      if ((c & 0xc0) !== 0x80) return latin1();
      cp = (cp << 6) | (c & 0x3f);
    }
    if ((extra === 2 && cp < 0x800) || (extra === 3 && (cp < 0x10000 || cp > 0x10ffff)) || (cp >= 0xd800 && cp <= 0xdfff)) {
      return latin1();
    }
    out += String.fromCodePoint(cp);
    i += extra + 1;
  }
  return out;
}

function attributeText(value: unknown): string {
  if (Array.isArray(value)) return value.map((v) => String(v)).join(', ');
  if (typeof value === 'string') return netcdfText(value).replace(/\0+$/, '');
  return String(value);
}

function stringAttribute(reader: NetCDFReader, name: string): string | undefined {
  const a = reader.getAttribute(name);
  return typeof a === 'string' ? attributeText(a).trim() : undefined;
}

function normaliseTimeUnit(unit: string): string {
  const u = unit.trim();
  if (/^s(ec(ond)?s?)?\.?$/i.test(u)) return 's';
  if (/^min(ute)?s?\.?$/i.test(u)) return 'min';
  if (/^(ms|millisec(ond)?s?)$/i.test(u)) return 'ms';
  if (/^h(ours?)?$/i.test(u)) return 'h';
  return u;
}

/** Read one variable's values as numbers, after checking its bytes are all in the file. */
function readNumbers(reader: NetCDFReader, v: NcVariable, byteLength: number): number[] {
  const dims = reader.dimensions;
  const rec = reader.recordDimension;
  if (v.type === 'char' || v.type === 'undefined') {
    throw new NetcdfProblem(
      `The variable ${v.name} holds ${v.type === 'char' ? 'text' : 'values of an unknown type'}, not numbers.`,
      'This file does not follow the chromatography netCDF layout; export it again from the instrument.',
    );
  }
  let count = 1;
  for (const d of v.dimensions) {
    const size = v.record && d === rec.id ? rec.length : dims[d]?.size;
    if (size === undefined) {
      throw new NetcdfProblem(`The variable ${v.name} refers to a dimension that does not exist.`, 'The file is damaged; export it again.');
    }
    count *= size;
  }
  const step = rec.recordStep ?? 0;
  const end = v.record ? v.offset + Math.max(0, rec.length - 1) * step + v.size : v.offset + v.size;
  if (count > 0 && end > byteLength) {
    throw new NetcdfProblem(
      `The file is cut short: the variable ${v.name} needs bytes up to ${end}, but the file has only ${byteLength}.`,
      'Copy or export the file again; it was not transferred completely.',
    );
  }
  let raw: unknown[];
  try {
    raw = reader.getDataVariable(v as Parameters<NetCDFReader['getDataVariable']>[0]);
  } catch (e) {
    throw new NetcdfProblem(
      `The variable ${v.name} could not be read (${e instanceof Error ? e.message : String(e)}).`,
      'The file is damaged or cut short; export it again.',
    );
  }
  // netcdfjs reads the 4-byte-padded size, so a short or byte variable can carry padding values at the end.
  const values = flatten(raw).slice(0, count);
  return values.map((x) => (typeof x === 'number' ? x : NaN));
}

/**
 * Read a chromatography netCDF file (ASTM E1947) into one trace.
 * Never throws for bad input: a problem comes back as `{ ok: false, error }`
 * naming the variable or attribute that is missing or malformed.
 *
 * @param bytes the whole file
 * @param fileName the name shown to the user and kept in the trace's source
 * @param sha256 lower-case hex SHA-256 of the bytes
 * @returns one trace: x = time (put in order and repeated times averaged
 *   by {@link orderByX}, with its notices), y = `ordinate_values`, units from `retention_unit` and
 *   `detector_unit`, global attributes and scalar variables as metadata.
 */
export function parseNetcdf(bytes: Uint8Array, fileName: string, sha256: string): LoadResult {
  const fail = (problem: string, advice: string): LoadResult => {
    const error: LoadProblem = { fileName, problem, advice };
    return { ok: false, error };
  };
  if (!(bytes instanceof Uint8Array)) return fail('The file could not be read as bytes.', 'Choose the file again.');
  if (!looksLikeNetcdf(bytes)) {
    const hdf5 = bytes.length >= 4 && bytes[0] === 0x89 && bytes[1] === 0x48 && bytes[2] === 0x44 && bytes[3] === 0x46;
    return fail(
      hdf5
        ? 'This is a netCDF-4 (HDF5) file; only netCDF classic and 64-bit offset files are read.'
        : 'This file does not start like a netCDF classic file ("CDF" followed by version 1 or 2).',
      hdf5 ? 'Export the chromatogram as netCDF classic (ASTM E1947 / AIA) or as text.' : 'Choose a chromatography netCDF (.cdf) file.',
    );
  }
  try {
    let reader: NetCDFReader;
    try {
      reader = new NetCDFReader(bytes);
    } catch (e) {
      const cut = e instanceof RangeError || (e instanceof Error && /outside the bounds|out of range/i.test(e.message));
      return fail(
        cut
          ? `The netCDF header is cut short: the file (${bytes.length} bytes) ends before the list of dimensions, attributes and variables does.`
          : `The netCDF header is damaged (${e instanceof Error ? e.message : String(e)}).`,
        'Copy or export the file again; it was not transferred completely.',
      );
    }
    if (reader.recordDimension.length === STREAMING) {
      return fail('The file was written while still recording (record count unknown, "streaming").', 'Export the finished run again.');
    }
    const variables = reader.variables as unknown as NcVariable[];
    const find = (name: string) => variables.find((v) => v.name === name);

    const ordinate = find('ordinate_values');
    if (!ordinate) {
      const ms = find('intensity_values') || find('scan_acquisition_time');
      return fail(
        ms
          ? 'The variable ordinate_values is missing; this looks like mass-spectrometry netCDF (scans), not a chromatogram.'
          : 'The variable ordinate_values (the detector signal) is missing, so there is no chromatogram to read.',
        'Export the run as a chromatography netCDF (ASTM E1947 / AIA) file with its signal.',
      );
    }
    if (ordinate.dimensions.length !== 1) {
      return fail(
        `The variable ordinate_values has ${ordinate.dimensions.length} dimensions; a chromatogram has one.`,
        'Export one detector signal per file.',
      );
    }
    const y = readNumbers(reader, ordinate, bytes.length);
    const n = y.length;
    const notices: string[] = [];

    const scalar = (name: string): number | undefined => {
      const v = find(name);
      if (v) {
        const values = readNumbers(reader, v, bytes.length);
        if (values.length === 0 || !Number.isFinite(values[0])) {
          throw new NetcdfProblem(`The variable ${name} holds no finite number.`, `Check ${name} in the file; export it again.`);
        }
        return values[0];
      }
      const a = reader.getAttribute(name);
      return typeof a === 'number' && Number.isFinite(a) ? a : undefined;
    };

    let x: number[];
    const retention = find('raw_data_retention');
    if (retention) {
      x = readNumbers(reader, retention, bytes.length);
      if (x.length !== n) {
        return fail(
          `The variable raw_data_retention holds ${x.length} times but ordinate_values holds ${n} values.`,
          'Each signal value needs one time; the file is damaged or the two variables belong to different runs.',
        );
      }
    } else {
      const interval = scalar('actual_sampling_interval');
      if (interval === undefined) {
        return fail(
          'The variable actual_sampling_interval is missing (and there is no raw_data_retention), so the time of each point is unknown.',
          'Export the run again with its timing, or load it as text with a time column.',
        );
      }
      if (!(interval > 0)) {
        return fail(
          `The variable actual_sampling_interval is ${interval}; it must be a positive time step.`,
          'Check the timing stored in the file; export it again.',
        );
      }
      let delay = scalar('actual_delay_time');
      if (delay === undefined) {
        delay = 0;
        notices.push('The variable actual_delay_time is missing; the first point was placed at time 0.');
      }
      x = new Array<number>(n);
      for (let i = 0; i < n; i++) x[i] = delay + i * interval;
    }

    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(y[i])) {
        return fail(`ordinate_values at point ${i + 1} is not a finite number (${y[i]}).`, 'The file is damaged at this point; export it again.');
      }
      if (!Number.isFinite(x[i])) {
        return fail(`The time of point ${i + 1} is not a finite number (${x[i]}).`, 'Check raw_data_retention in the file; export it again.');
      }
    }
    // Times in order and repeated times averaged, as every loader does (only
    // an explicit raw_data_retention can be out of order or repeat a time).
    const ordered = orderByX(x, [y]);
    notices.push(...ordered.notices);

    const metadata: Record<string, string> = {};
    for (const a of reader.globalAttributes) metadata[a.name] = attributeText(a.value);
    for (const v of variables) {
      if (v === ordinate || v === retention || v.type === 'char' || v.record || v.dimensions.length !== 0) continue;
      const values = readNumbers(reader, v, bytes.length);
      if (values.length === 1) metadata[v.name] = String(values[0]);
    }
    const unitText = stringAttribute(reader, 'retention_unit');
    let xUnit = 's';
    if (unitText) xUnit = normaliseTimeUnit(unitText);
    else notices.push('The attribute retention_unit is missing; times were taken to be in seconds.');
    const detectorUnit = stringAttribute(reader, 'detector_unit') ?? '';
    const yName = stringAttribute(reader, 'detector_name') || 'Detector signal';

    try {
      const trace = createTrace({
        name: `${fileName}: ${yName}`,
        x: ordered.x,
        y: ordered.ys[0],
        xName: 'Time',
        xUnit,
        yName,
        yUnit: detectorUnit,
        source: { fileName, sha256, rowsRead: n, rowsSkipped: 0 },
        metadata,
      });
      return {
        ok: true,
        traces: [trace],
        report: {
          fileName,
          sha256,
          format: `chromatography netCDF (ASTM E1947; ${reader.version})`,
          rowsRead: n,
          skipped: [],
          notices,
          metadata,
        },
      };
    } catch (e) {
      if (e instanceof TraceError) return fail(`The chromatogram cannot be a trace: ${e.message}`, 'Check ordinate_values and the timing in the file.');
      throw e;
    }
  } catch (e) {
    if (e instanceof NetcdfProblem) return fail(e.problem, e.advice);
    // The reader library may fail in ways we did not foresee on damaged bytes; that is still the file's fault.
    return fail(
      `The netCDF file could not be read (${e instanceof Error ? e.message : String(e)}).`,
      'The file is damaged or cut short; export it again.',
    );
  }
}
