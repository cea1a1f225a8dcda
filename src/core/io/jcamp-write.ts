/**
 * JCAMP-DX writer (McDonald & Wilks 1988, Appl. Spectrosc. 42:151; labels of
 * the IUPAC 5.01 revision). Plain numbers only (AFFN, no compression), so any
 * reader and any person can check the values.
 */
import { isEvenlySpaced } from '../numeric/interpolate.ts';

/** What the writer needs of a trace (a Trace satisfies it). */
export interface JcampTraceLike {
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  xName: string;
  xUnit: string;
  yName: string;
  yUnit: string;
  name: string;
}

const MAX_LINE = 80;

// Our unit spellings → the words JCAMP-DX files use (the reader maps them back).
const X_UNIT_WORDS: Record<string, string> = {
  'cm⁻¹': '1/CM',
  'cm^-1': '1/CM',
  'cm-1': '1/CM',
  nm: 'NANOMETERS',
  'µm': 'MICROMETERS',
  s: 'SECONDS',
  min: 'MINUTES',
  Hz: 'HZ',
  ppm: 'PPM',
};

const Y_NAME_WORDS: Record<string, string> = {
  absorbance: 'ABSORBANCE',
  transmittance: 'TRANSMITTANCE',
  reflectance: 'REFLECTANCE',
};

/** Labels the writer sets itself; the same labels in `meta` are ignored (compared as the standard compares labels). */
const OWN_KEYS = new Set([
  'TITLE', 'JCAMPDX', 'DATATYPE', 'DATACLASS', 'ORIGIN', 'OWNER', 'XUNITS', 'YUNITS', 'XFACTOR', 'YFACTOR',
  'FIRSTX', 'LASTX', 'DELTAX', 'NPOINTS', 'FIRSTY', 'XYDATA', 'XYPOINTS', 'PEAKTABLE', 'NTUPLES', 'END',
  '$XNAME', '$YNAME', 'BLOCKS', 'BLOCKID',
]);

function labelKey(label: string): string {
  return label.replace(/[\s\-/_]/g, '').toUpperCase();
}

/** Shortest text that reads back to exactly the same double (ECMAScript Number::toString), exponent as "E". */
function affn(n: number): string {
  if (Object.is(n, -0)) return '-0';
  return String(n).replace('e', 'E');
}

/**
 * One line per text line of a value. So that no value can forge a label or
 * hide text as a comment, "$$" becomes "$ $" and a continuation line starting
 * with "##" starts with "# #" instead.
 */
function labelledLine(label: string, value: string): string {
  const lines = value.replace(/\$\$/g, '$ $').split(/\r\n|\r|\n/);
  const rest = lines.slice(1).map((l) => l.replace(/^(\s*)##/, '$1# #'));
  return [`##${label}=${lines[0]}`, ...rest].join('\n');
}

/**
 * Write one trace as a JCAMP-DX 5.01 text block.
 *
 * When x is evenly spaced ({@link isEvenlySpaced}, 0.1 % of a step) the data
 * are written as `##XYDATA=(X++(Y..Y))` with FIRSTX/LASTX/DELTAX/NPOINTS (a
 * reader rebuilds x from FIRSTX, LASTX and NPOINTS, so x jitter below that
 * tolerance is not kept); otherwise as `##XYPOINTS=(XY..XY)`, one pair per
 * line. Factors are 1, numbers are written in the shortest form that reads
 * back to the same double, and no line is longer than 80 characters.
 *
 * @param trace x strictly ascending or not, finite values, at least 1 point
 * @param meta extra labels, e.g. `{ 'DATA TYPE': 'UV/VIS SPECTRUM', OWNER: 'Lab 3' }`;
 *   DATA TYPE defaults to CHROMATOGRAM for a time axis and SPECTRUM otherwise,
 *   OWNER to "not stated". Labels the writer sets itself are not repeated.
 * @returns the file text, lines joined by "\n", ending with "##END=\n"
 * @throws RangeError when x and y differ in length, are empty, or hold a non-finite value
 */
export function jcampFromTrace(trace: JcampTraceLike, meta: Record<string, string> = {}): string {
  const { x, y } = trace;
  if (x.length !== y.length) throw new RangeError(`x has ${x.length} values but y has ${y.length}; a JCAMP-DX file needs one y per x.`);
  if (x.length === 0) throw new RangeError('The trace has no points; there is nothing to write.');
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) {
      throw new RangeError(`Point ${i + 1} is not a finite number (x ${x[i]}, y ${y[i]}); JCAMP-DX holds finite numbers only.`);
    }
  }
  const n = x.length;
  const xs = Float64Array.from(x);
  const metaByKey = new Map<string, string>();
  for (const [k, v] of Object.entries(meta)) metaByKey.set(labelKey(k), v);
  const isTime = /^(s|min|h|ms)$/.test(trace.xUnit) || /time/i.test(trace.xName);
  const dataType = metaByKey.get('DATATYPE') ?? (isTime ? 'CHROMATOGRAM' : 'SPECTRUM');
  const even = n >= 2 && isEvenlySpaced(xs);

  const out: string[] = [];
  out.push(labelledLine('TITLE', trace.name));
  out.push('##JCAMP-DX=5.01');
  out.push(labelledLine('DATA TYPE', dataType));
  out.push(`##DATA CLASS=${even ? 'XYDATA' : 'XYPOINTS'}`);
  out.push('##ORIGIN=Tracewright');
  out.push(labelledLine('OWNER', metaByKey.get('OWNER') ?? 'not stated'));
  for (const [k, v] of Object.entries(meta)) {
    const key = labelKey(k);
    if (OWN_KEYS.has(key) || key === '') continue;
    out.push(labelledLine(k.replace(/[=\r\n]/g, ' ').trim(), v));
  }
  out.push(labelledLine('XUNITS', X_UNIT_WORDS[trace.xUnit] ?? (trace.xUnit || 'ARBITRARY UNITS')));
  out.push(labelledLine('YUNITS', trace.yUnit || Y_NAME_WORDS[trace.yName.toLowerCase()] || 'ARBITRARY UNITS'));
  out.push(labelledLine('$X NAME', trace.xName));
  out.push(labelledLine('$Y NAME', trace.yName));
  out.push('##XFACTOR=1');
  out.push('##YFACTOR=1');

  if (even) {
    out.push(`##FIRSTX=${affn(xs[0])}`);
    out.push(`##LASTX=${affn(xs[n - 1])}`);
    out.push(`##DELTAX=${affn((xs[n - 1] - xs[0]) / (n - 1))}`);
    out.push(`##NPOINTS=${n}`);
    out.push(`##FIRSTY=${affn(y[0])}`);
    out.push('##XYDATA=(X++(Y..Y))');
    let i = 0;
    while (i < n) {
      let line = affn(xs[i]);
      // At least one y per line; a number is at most 24 characters, so x + y always fits in 80.
      line += ` ${affn(y[i])}`;
      i++;
      while (i < n) {
        const next = ` ${affn(y[i])}`;
        if (line.length + next.length > MAX_LINE) break;
        line += next;
        i++;
      }
      out.push(line);
    }
  } else {
    out.push(`##NPOINTS=${n}`);
    out.push('##XYPOINTS=(XY..XY)');
    for (let i = 0; i < n; i++) out.push(`${affn(xs[i])}, ${affn(y[i])}`);
  }
  out.push('##END=');
  return `${out.join('\n')}\n`;
}
