/**
 * Small dense polynomials, coefficients in ascending powers:
 * [a0, a1, a2] is a0 + a1·x + a2·x². Used by the calibration for inverse
 * prediction, where every quantity is a polynomial of degree at most 4.
 */

/** Value at x by Horner's rule. */
export function polynomialValue(coefficients: readonly number[], x: number): number {
  let v = 0;
  for (let i = coefficients.length - 1; i >= 0; i--) v = v * x + coefficients[i];
  return v;
}

/** Sum of two polynomials. */
export function polynomialAdd(a: readonly number[], b: readonly number[]): number[] {
  const out = new Array<number>(Math.max(a.length, b.length)).fill(0);
  for (let i = 0; i < a.length; i++) out[i] += a[i];
  for (let i = 0; i < b.length; i++) out[i] += b[i];
  return out;
}

/** Product of two polynomials. */
export function polynomialMultiply(a: readonly number[], b: readonly number[]): number[] {
  if (a.length === 0 || b.length === 0) return [];
  const out = new Array<number>(a.length + b.length - 1).fill(0);
  for (let i = 0; i < a.length; i++) for (let j = 0; j < b.length; j++) out[i + j] += a[i] * b[j];
  return out;
}

/** The polynomial times a number. */
export function polynomialScale(a: readonly number[], k: number): number[] {
  return a.map((v) => v * k);
}

/** First derivative. */
export function polynomialDerivative(a: readonly number[]): number[] {
  const out: number[] = [];
  for (let i = 1; i < a.length; i++) out.push(i * a[i]);
  return out;
}

/** (c + h·u)^k expanded in powers of u (binomial theorem). */
export function polynomialShiftedPower(c: number, h: number, k: number): number[] {
  let out = [1];
  for (let i = 0; i < k; i++) out = polynomialMultiply(out, [c, h]);
  return out;
}

/** Drop exact-zero leading coefficients. */
function trimmed(a: readonly number[]): number[] {
  let n = a.length;
  while (n > 0 && a[n - 1] === 0) n--;
  return a.slice(0, n);
}

/** Bisection to the last representable bit, given p(lo) and p(hi) of opposite signs. */
function bisectRoot(p: readonly number[], lo: number, hi: number): number {
  let flo = polynomialValue(p, lo);
  for (let k = 0; k < 2200; k++) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    const fm = polynomialValue(p, mid);
    if (fm === 0) return mid;
    if ((fm < 0) === (flo < 0)) { lo = mid; flo = fm; } else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * The real roots where the polynomial changes sign (roots of odd
 * multiplicity), ascending. A root of even multiplicity, where the curve
 * only touches zero, is not reported: callers use these roots as the ends
 * of the regions where the polynomial is negative, and a touching root ends
 * no such region.
 *
 * Method: the roots of the derivative (found the same way, recursively)
 * split the line into pieces on which the polynomial is monotone; each
 * piece with a sign change holds exactly one root, found by bisection to
 * the last bit. All real roots lie within Cauchy's bound 1 + max|aᵢ/aₙ|
 * (Cauchy 1829; any algebra text, e.g. Householder, The Numerical Treatment
 * of a Single Nonlinear Equation, 1970).
 */
export function polynomialSignChangeRoots(coefficients: readonly number[]): number[] {
  const p = trimmed(coefficients);
  const degree = p.length - 1;
  if (degree < 1) return [];
  if (p.some((v) => !Number.isFinite(v))) throw new RangeError('Polynomial coefficients must be finite numbers.');
  if (degree === 1) return [-p[0] / p[1]];
  if (degree === 2) {
    const [c, b, a] = p;
    const disc = b * b - 4 * a * c;
    if (!(disc > 0)) return [];
    // Citardauq form avoids cancellation in the smaller root (Press et al., Numerical Recipes §5.6).
    const q = -0.5 * (b + Math.sign(b || 1) * Math.sqrt(disc));
    const r1 = q / a;
    const r2 = q !== 0 ? c / q : -r1;
    return r1 < r2 ? [r1, r2] : [r2, r1];
  }
  const lead = p[degree];
  let bound = 0;
  for (let i = 0; i < degree; i++) bound = Math.max(bound, Math.abs(p[i] / lead));
  bound += 1;
  const cuts = [-bound];
  for (const c of polynomialSignChangeRoots(polynomialDerivative(p))) if (c > -bound && c < bound) cuts.push(c);
  cuts.push(bound);
  const roots: number[] = [];
  for (let i = 0; i + 1 < cuts.length; i++) {
    const a = cuts[i], b = cuts[i + 1];
    const fa = polynomialValue(p, a), fb = polynomialValue(p, b);
    if (fa === 0 && i > 0) continue; // counted as the right end of the previous piece
    if (fb === 0) {
      // A zero exactly at a critical point is a sign change only when the two sides differ
      // (b is never the last cut: p(±bound) is not zero).
      const left = polynomialValue(p, 0.5 * (a + b));
      const right = polynomialValue(p, 0.5 * (b + cuts[i + 2]));
      if ((left < 0) !== (right < 0)) roots.push(b);
      continue;
    }
    if ((fa < 0) !== (fb < 0)) roots.push(bisectRoot(p, a, b));
  }
  return roots;
}
