/**
 * Blank subtraction: take a measured blank (the same method run without the
 * analyte) away from the sample, point by point.
 */
import type { Signal, StepDefinition } from './types.ts';
import { interpolateLinear, sameGrid } from '../numeric/interpolate.ts';
import { formatNumber, gridCoverageProblem } from './checks.ts';

export interface BlankSubtractionParams extends Record<string, number> {
  /** Factor the blank is multiplied by before subtraction (ratio). */
  scale: number;
}

/**
 * Sample minus scale·blank on the sample's grid. When the grids are equal the
 * blank is used as it is; otherwise it is linearly interpolated onto the
 * sample's x (never extrapolated: call {@link gridCoverageProblem} first).
 * @param sample x ascending; not changed
 * @param blank x ascending; not changed
 * @param scale factor (ratio) applied to the blank, default 1
 * @returns y of the difference (new array) and whether interpolation was used
 * @throws RangeError when the blank does not cover the sample's x range or scale is not finite
 */
export function subtractBlank(sample: Signal, blank: Signal, scale = 1): { y: Float64Array; interpolated: boolean } {
  if (!Number.isFinite(scale)) throw new RangeError(`The blank scale factor must be a finite number, not ${scale}.`);
  const interpolated = !sameGrid(sample.x, blank.x);
  if (interpolated) {
    const problem = gridCoverageProblem(sample.x, blank.x, 'the blank');
    if (problem) throw new RangeError(problem);
  }
  const b = interpolated ? interpolateLinear(blank.x, blank.y, sample.x) : blank.y;
  const y = new Float64Array(sample.y.length);
  for (let i = 0; i < y.length; i++) y[i] = sample.y[i] - scale * b[i];
  return { y, interpolated };
}

export const blankSubtractionStep: StepDefinition<BlankSubtractionParams> = {
  id: 'blank-subtraction',
  linear: true,
  label: 'Subtract blank',
  summary:
    'Subtracts the trace you marked as blank, times a scale factor, from the signal point by point. ' +
    'It removes what the solvent, cell or system adds on its own, such as drift or a fixed band. ' +
    'The blank goes through every step above this one with the same settings, as the signal does, and is subtracted from each repeated scan too. ' +
    'The blank\'s own noise is added to the result, and anything in the blank that is really in the sample too is removed with it.',
  params: [
    {
      key: 'scale', label: 'Blank scale factor', kind: 'number', unit: 'ratio', min: 0, max: 10, step: 0.01,
      help: 'The blank is multiplied by this before subtraction; 1 subtracts it as measured.',
    },
  ],
  defaults: { scale: 1 },
  validate(params, input, ctx) {
    const { scale } = params;
    if (typeof scale !== 'number' || !Number.isFinite(scale)) return 'The blank scale factor is not a number; give a value from 0 to 10 (1 subtracts the blank as measured).';
    if (scale < 0 || scale > 10) return `The blank scale factor must be from 0 to 10, not ${formatNumber(scale)}.`;
    if (!ctx.blank) return 'There is no blank: mark a loaded trace as blank to use this step.';
    if (sameGrid(input.x, ctx.blank.x)) return null;
    return gridCoverageProblem(input.x, ctx.blank.x, 'the blank');
  },
  apply(input, params, ctx) {
    const blank = ctx.blank;
    if (!blank) throw new RangeError('There is no blank: mark a loaded trace as blank to use this step.');
    const { y, interpolated } = subtractBlank(input, blank, params.scale);
    const notes = [`Subtracted ${params.scale === 1 ? 'the blank' : `${formatNumber(params.scale)} × the blank`} "${blank.name}".`];
    if (interpolated) notes.push('The blank was measured on different x values; it was interpolated linearly onto the sample\'s x before subtraction.');
    return { x: input.x, y, notes };
  },
};
