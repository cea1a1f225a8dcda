/**
 * Start and end set by hand (issue 17). The peak keeps its apex, width and
 * noise; its area and height are measured again against the straight line
 * between the trace's values at the new start and end (the nearest
 * samples), with the trapezoid rule as elsewhere. Pure: returns new rows.
 */
import { snrFlag } from './peak-snr.ts';
import type { HandBounds, Peak, PeakOptions } from './peak-types.ts';

function nearest(x: Float64Array, v: number): number {
  let lo = 0, hi = x.length;
  while (lo < hi) { const mid = (lo + hi) >>> 1; if (x[mid] < v) lo = mid + 1; else hi = mid; }
  if (lo >= x.length) return x.length - 1;
  if (lo > 0 && v - x[lo - 1] <= x[lo] - v) return lo - 1;
  return lo;
}

const fmt = (v: number) => String(Number(v.toPrecision(6)));

/** Which hand bounds belong to peak p: the last one set within max(½ FWHM, one sample) of its apex. */
export function boundsFor(p: Peak, bounds: readonly HandBounds[], x: Float64Array): HandBounds | undefined {
  const step = x[Math.min(p.index + 1, x.length - 1)] - x[Math.max(p.index - 1, 0)];
  const tol = Math.max(p.fwhm / 2, step / 2);
  for (let k = bounds.length - 1; k >= 0; k--) if (Math.abs(bounds[k].x - p.x) <= tol) return bounds[k];
  return undefined;
}

/** The peak measured between hand-set bounds; a start or end on the wrong side of the apex is refused with a note. */
export function withHandBounds(p: Peak, b: HandBounds, x: Float64Array, y: Float64Array, options: PeakOptions): Peak {
  const i0 = nearest(x, Math.min(b.start, b.end)), i1 = nearest(x, Math.max(b.start, b.end));
  if (!(i0 < p.index && p.index < i1)) {
    return { ...p, note: [p.note, `Start and end set by hand (${fmt(b.start)} to ${fmt(b.end)}) were not used: the apex must lie between them.`].filter(Boolean).join(' ') };
  }
  const b0 = y[i0], b1 = y[i1];
  const line = (v: number) => b0 + ((b1 - b0) * (v - x[i0])) / (x[i1] - x[i0]);
  let area = 0;
  for (let i = i0; i < i1; i++) area += 0.5 * ((y[i] - line(x[i])) + (y[i + 1] - line(x[i + 1]))) * (x[i + 1] - x[i]);
  // Apex level on the old baseline, then above the new one.
  const oldBase = p.end === p.start ? p.baselineStart : p.baselineStart + ((p.baselineEnd - p.baselineStart) * (p.x - p.start)) / (p.end - p.start);
  const height = oldBase + p.height - line(p.x);
  const snrRms = p.noiseSigma > 0 ? Math.abs(height) / p.noiseSigma : null;
  const snrPharma = p.pharmaNoise && p.pharmaNoise.h > 0 ? (2 * Math.abs(height)) / p.pharmaNoise.h : null;
  const snr = p.snrDefinition === 'rms' ? snrRms : p.snrDefinition === 'pharmacopoeial' ? snrPharma : p.snrRegion;
  return {
    ...p,
    startIndex: i0, endIndex: i1, start: x[i0], end: x[i1], startKind: 'set-by-hand', endKind: 'set-by-hand',
    baselineStart: b0, baselineEnd: b1, split: 'none', area, height, snrRms, snrPharma, snr, flag: snrFlag(snr, options.limits),
    boundsByUser: true,
    note: [p.note, `Start and end set by hand (${fmt(x[i0])} to ${fmt(x[i1])}): area and height measured against the straight line between the trace there; apex and FWHM as found.`].filter(Boolean).join(' '),
  };
}

/** Apply every hand-set start and end to the rows they belong to (removed rows left alone). */
export function applyHandBounds(peaks: readonly Peak[], bounds: readonly HandBounds[] | undefined, x: Float64Array, y: Float64Array, options: PeakOptions): Peak[] {
  if (!bounds || bounds.length === 0) return peaks.slice();
  return peaks.map((p) => {
    if (p.removedByUser) return p;
    const b = boundsFor(p, bounds, x);
    return b ? withHandBounds(p, b, x, y, options) : p;
  });
}
