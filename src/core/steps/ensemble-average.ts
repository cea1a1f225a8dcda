/**
 * Ensemble averaging: the mean of repeated scans of the same sample, point by point.
 */
import type { StepDefinition, StepOutput } from './types.ts';
import { interpolateLinear } from '../numeric/interpolate.ts';
import { formatNumber, gridCoverageProblem, sameGrid } from './blank-subtraction.ts';
import { MAD_TO_SD } from '../numeric/sliding-median.ts';

export type EnsembleAverageParams = Record<string, never>;

function median(values: Float64Array): number {
  const s = Float64Array.from(values).sort();
  const h = s.length >> 1;
  return s.length & 1 ? s[h] : 0.5 * (s[h - 1] + s[h]);
}

/**
 * Robust white-noise SD from point-to-point differences:
 * 1.4826·MAD(Δy)/√2. Differencing removes slow signal; the √2 undoes the
 * doubling of variance that differencing causes for white noise; 1.4826·MAD
 * is the Gaussian-consistent SD (Hampel 1974). Common practice.
 * @param y signal with at least 3 points; not changed
 */
export function noiseFromDifferences(y: Float64Array): number {
  if (y.length < 3) throw new RangeError(`A noise estimate needs at least 3 points; there are ${y.length}.`);
  const d = new Float64Array(y.length - 1);
  for (let i = 0; i < d.length; i++) d[i] = y[i + 1] - y[i];
  const m = median(d);
  for (let i = 0; i < d.length; i++) d[i] = Math.abs(d[i] - m);
  return (MAD_TO_SD * median(d)) / Math.SQRT2;
}

function sameValues(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

export const ensembleAverageStep: StepDefinition<EnsembleAverageParams> = {
  id: 'ensemble-average',
  linear: true,
  label: 'Average repeated scans',
  summary:
    'Replaces the signal by the point-by-point mean of itself and every trace you marked as a repeated scan, on the signal\'s x values. ' +
    'Random noise drops by about √n for n scans while anything that repeats in every scan is kept. ' +
    'The scans go through every step above this one with the same settings, as the signal does. Anything that changes between scans (drift, a shifted peak) is blurred unless the scans are aligned first.',
  params: [],
  defaults: {},
  validate(_params, input, ctx) {
    const scans = ctx.scans ?? [];
    if (scans.length === 0) return 'There are no repeated scans: mark the other loaded scans of this sample as scans to average them.';
    for (const scan of scans) {
      if (sameGrid(input.x, scan.x)) continue;
      const problem = gridCoverageProblem(input.x, scan.x, `the scan "${scan.name}"`);
      if (problem) return problem;
    }
    return null;
  },
  apply(input, _params, ctx): StepOutput {
    const scans = ctx.scans ?? [];
    const n = input.y.length;
    const sum = Float64Array.from(input.y);
    let count = 1;
    let interpolatedCount = 0;
    const notes: string[] = [];
    for (const scan of scans) {
      const equalGrid = sameGrid(input.x, scan.x);
      // A scan that is the signal itself (the sample also marked as a scan) would be counted twice.
      if (equalGrid && sameValues(input.y, scan.y)) {
        notes.push(`The scan "${scan.name}" is identical to the signal; it was counted once.`);
        continue;
      }
      let ys = scan.y;
      if (!equalGrid) {
        const problem = gridCoverageProblem(input.x, scan.x, `the scan "${scan.name}"`);
        if (problem) throw new RangeError(problem);
        ys = interpolateLinear(scan.x, scan.y, input.x);
        interpolatedCount++;
      }
      for (let i = 0; i < n; i++) sum[i] += ys[i];
      count++;
    }
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) y[i] = sum[i] / count;
    const noiseBefore = noiseFromDifferences(input.y);
    const noiseAfter = noiseFromDifferences(y);
    const expectedGain = Math.sqrt(count);
    const measuredGain = noiseAfter > 0 ? noiseBefore / noiseAfter : Infinity;
    notes.unshift(
      `Averaged ${count} scans (the signal and ${count - 1} marked scan${count === 2 ? '' : 's'}): for independent random noise the noise should fall by √${count} = ${formatNumber(expectedGain)}; measured from point-to-point differences it fell by ${formatNumber(measuredGain)}.`,
    );
    if (interpolatedCount > 0) notes.push(`${interpolatedCount} scan(s) had different x values and were interpolated linearly onto the signal's x.`);
    return {
      x: input.x,
      y,
      notes,
      figures: { n: count, expectedGain, noiseBefore, noiseAfter, measuredGain },
    };
  },
};
