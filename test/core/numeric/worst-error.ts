// Shared by the fast-kernel tests (numeric/savgol.test.ts, steps/moving-average-kernel.test.ts): the largest
// error of a fast kernel against a direct sum, relative to the sum of |terms| at each point (the size of the
// rounding a direct sum can make there), so a 1e-12 bound means "equal up to rounding" at every point.

/** Largest |fast − direct| / Σ|terms| over the points; NaN when any output is NaN (so a bound check fails). */
export function worst(fast: Float64Array, ref: { out: Float64Array; scale: Float64Array }): number {
  let e = 0;
  for (let i = 0; i < fast.length; i++) {
    const d = Math.abs(fast[i] - ref.out[i]) / Math.max(ref.scale[i], Number.MIN_VALUE);
    if (!(d <= e)) e = d; // a NaN in the output makes e NaN, which fails below
  }
  return e;
}
