/**
 * Ghost peaks (issue 20): a peak of the sample that also stands in the blank
 * at the same position, such as carry-over from an earlier injection or a
 * peak the solvent or system brings. The row is marked 'also-in-blank' and
 * carries the blank's height there, whether or not the blank was
 * subtracted: the blank used is the one the stack processed as it processed
 * the sample (it is never subtracted from itself), so its peaks stand as
 * they would in the sample.
 *
 * Rule (our own, stated): the blank's peaks are detected with the sample's
 * own peak options (thresholds in y-units, the sample's σ; a σ profile along
 * the sample's grid is not used on the blank's grid); a blank peak marks a
 * sample peak when it reaches the detection limit (S/N against the same σ),
 * its apex lies within half the sample peak's half-height width of the
 * sample peak's apex (and at least one sample spacing), and its own
 * half-height width is within a factor 2 of the sample peak's (a noise bump
 * of the blank is narrower than a real peak after any smoothing). The
 * blank's height is that peak's height against its own local baseline.
 * Below the detection limit nothing is marked: the blank then holds nothing
 * there that a reader could call a peak.
 */
import type { Signal } from '../steps/types.ts';
import type { Peak, PeakOptions } from './peak-types.ts';
import { detectPeaks } from './peak-table.ts';

/** The mark's name in the peak rows. */
export const GHOST_MARK = 'also-in-blank' as const;

/** Header of the export column that holds the blank's height. */
export function ghostColumnHeader(yUnitSuffix: string): string {
  return `height in the blank at this position${yUnitSuffix}`;
}

/** The export cell: the blank's height, or empty. */
export function ghostCell(p: Peak): number | string {
  return p.blankHeight ?? '';
}

/**
 * Mark the sample's peaks that also stand in the blank (see the file
 * comment). Returns new rows; rows without a match are returned as they are.
 * @param peaks the sample's rows
 * @param blank the blank on its own grid, processed as the sample was
 * @param options the options the sample's peaks were measured with
 * @param dx the sample's mean spacing, x-units
 */
export function markGhostPeaks(peaks: readonly Peak[], blank: Signal, options: PeakOptions, dx: number): Peak[] {
  if (peaks.length === 0 || blank.x.length < 5) return peaks.slice();
  let inBlank: Peak[];
  try {
    inBlank = detectPeaks(blank.x, blank.y, { ...options, noiseProfile: undefined, pharmacopoeialNoise: undefined });
  } catch {
    return peaks.slice();
  }
  inBlank = inBlank.filter((b) => b.snr !== null && b.snr >= options.limits.detection);
  if (inBlank.length === 0) return peaks.slice();
  const xs = inBlank.map((b) => b.x);
  return peaks.map((p) => {
    if (p.removedByUser) return p;
    const tol = Math.max(Math.abs(dx), 0.5 * p.fwhm);
    let best: Peak | null = null;
    for (let k = 0; k < xs.length; k++) {
      const d = Math.abs(xs[k] - p.x);
      const ratio = inBlank[k].fwhm / p.fwhm;
      if (!(ratio >= 0.5 && ratio <= 2)) continue;
      if (d <= tol && (!best || d < Math.abs(best.x - p.x))) best = inBlank[k];
    }
    if (!best) return p;
    return { ...p, marks: p.marks.includes(GHOST_MARK) ? p.marks : [...p.marks, GHOST_MARK], blankHeight: best.height };
  });
}
