/**
 * Tests on the residual (raw minus processed): does what a step removed look
 * like noise, or did it take part of the signal with it?
 */
import type { Signal } from '../steps/types.ts';
import { interpolateLinear } from '../numeric/interpolate.ts';
import { medianOf, PASS_CHUNK } from '../numeric/median.ts';

/** Wald–Wolfowitz runs test about the median. */
export interface RunsTest {
  /** Observed runs (maximal stretches on one side of the median). */
  runs: number;
  /** Expected runs for a random order: 2·n₁n₂/(n₁ + n₂) + 1. */
  expected: number;
  /** (runs − expected)/SD; negative means fewer runs (longer stretches) than chance. */
  z: number;
  /** Two-sided p-value from the normal approximation. */
  p: number;
}

export interface ResidualDiagnostics {
  /** Points used. */
  n: number;
  /** Root mean square of the residual (y-units). */
  rms: number;
  /** Lag-1 autocorrelation about the mean. */
  lag1: number;
  /** 2/√n: approximate 95 % bound of lag-1 autocorrelation for white noise. */
  lag1Threshold: number;
  runs: RunsTest;
  /** False when there is evidence of signal in the residual or, after {@link combineVerdict}, of signal lost (see {@link residualDiagnostics}). */
  looksLikeNoise: boolean;
  /**
   * 'nothing-removed': the residual is zero or at round-off level; 'clean': it looks like noise and
   * nothing says otherwise; 'caution': it is not plain noise (runs test at p < 0.001 by alternation),
   * but shows no slow structure; 'structure': slow structure in the residual, or the loss check
   * reports a quantifiable feature weakened beyond {@link HEIGHT_LOSS_TOLERANCE}.
   */
  level: 'nothing-removed' | 'clean' | 'caution' | 'structure';
  /** One plain sentence for the page. */
  verdict: string;
}

/** Significance level of the runs test (two-sided). Common practice. */
export const RUNS_ALPHA = 0.05;

/** Below this p the runs test alone keeps the verdict from reading clean, in either direction (issue 14; our choice). */
export const RUNS_STRICT_ALPHA = 0.001;

/** Share of its raw height a quantifiable feature may lose before the verdict cannot read clean (the loss check's own warning level; our choice). */
export const HEIGHT_LOSS_TOLERANCE = 0.2;

/**
 * A residual whose RMS is below this multiple of the raw trace's largest
 * |y| is round-off (double precision carries about 16 digits; sums over
 * long windows lose a few), and reads "nothing removed".
 */
export const ROUND_OFF_RELATIVE = 1e-12;

/**
 * Complementary error function, fractional error below 1.2e-7 everywhere
 * (Press, Teukolsky, Vetterling & Flannery, Numerical Recipes, 2nd ed., §6.2, erfcc).
 */
export function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r = t * Math.exp(-z * z - 1.26551223 + t * (1.00002368 + t * (0.37409196 + t * (0.09678418 +
    t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 +
    t * (-0.82215223 + t * 0.17087277)))))))));
  return x >= 0 ? r : 2 - r;
}

/** Two-sided p-value of a standard normal z: P(|Z| ≥ |z|) = erfc(|z|/√2). */
export function twoSidedP(z: number): number {
  return erfc(Math.abs(z) / Math.SQRT2);
}

/**
 * Wald–Wolfowitz runs test about the median (Wald & Wolfowitz 1940, Ann.
 * Math. Statist. 11:147), normal approximation: mean 2n₁n₂/N + 1, variance
 * 2n₁n₂(2n₁n₂ − N)/(N²(N − 1)), N = n₁ + n₂. Points equal to the median are
 * left out (common practice). With fewer than 2 points on either side the
 * test cannot be made: z = 0, p = 1. The median is found by selection
 * ({@link medianOf}), not by sorting the residual.
 */
export function runsTest(e: Float64Array): RunsTest {
  const med = medianOf(e);
  // [above, below, flips, last side off the median], carried from chunk to chunk (PASS_CHUNK, median.ts).
  const state = new Float64Array(4);
  for (let from = 0; from < e.length; from += PASS_CHUNK) runsChunk(e, from, Math.min(e.length, from + PASS_CHUNK), med, state);
  const n1 = state[0], n2 = state[1], flips = state[2];
  const N = n1 + n2;
  const runs = N > 0 ? flips + 1 : 0;
  const expected = N > 0 ? (2 * n1 * n2) / N + 1 : 0;
  if (n1 < 2 || n2 < 2) return { runs, expected, z: 0, p: 1 };
  const variance = (2 * n1 * n2 * (2 * n1 * n2 - N)) / (N * N * (N - 1));
  const z = (runs - expected) / Math.sqrt(variance);
  return { runs, expected, z, p: twoSidedP(z) };
}

/**
 * The runs test's count over e[from, to) (state: above, below, flips, last side). Written without branches
 * (issue 16: on noise the side is a coin toss, and a mispredicted branch per point was most of this loop at 10⁶
 * points, 7.7 → 2.7 ms): side is +1 above the median, −1 below, 0 on it; a run starts at the first point off the
 * median and wherever the side flips (side × last < 0); last keeps the latest side off the median.
 */
function runsChunk(e: Float64Array, from: number, to: number, med: number, state: Float64Array): void {
  let n1 = state[0], n2 = state[1], flips = state[2], last = state[3];
  for (let i = from; i < to; i++) {
    const v = e[i];
    const up = +(v > med), down = +(v < med);
    n1 += up; n2 += down;
    const side = up - down;
    flips += +(side * last < 0);
    last = side + (1 - side * side) * last;
  }
  state[0] = n1; state[1] = n2; state[2] = flips; state[3] = last;
}

/** Lag-1 autocorrelation about the mean, Σ(eₜ − ē)(eₜ₊₁ − ē)/Σ(eₜ − ē)²; 0 for a constant. */
export function lag1Autocorrelation(e: Float64Array): number {
  const n = e.length;
  // Sums carried from chunk to chunk in the order one loop would add them (PASS_CHUNK, median.ts).
  let mean = 0;
  for (let from = 0; from < n; from += PASS_CHUNK) mean = sumChunk(e, from, Math.min(n, from + PASS_CHUNK), mean);
  mean /= n;
  const sums = new Float64Array(2); // [Σ products with the next point, Σ squares]
  for (let from = 0; from < n; from += PASS_CHUNK) lagChunk(e, from, Math.min(n, from + PASS_CHUNK), mean, sums);
  const num = sums[0], den = sums[1];
  return den > 0 ? num / den : 0;
}

/** acc + e[from] + … + e[to − 1], added in that order. */
function sumChunk(e: Float64Array, from: number, to: number, acc: number): number {
  for (let i = from; i < to; i++) acc += e[i];
  return acc;
}

/** The lag-1 sums over e[from, to) about `mean`, added to sums[0] (products) and sums[1] (squares). */
function lagChunk(e: Float64Array, from: number, to: number, mean: number, sums: Float64Array): void {
  const n = e.length;
  let num = sums[0], den = sums[1];
  for (let i = from; i < to; i++) {
    const a = e[i] - mean;
    den += a * a;
    if (i + 1 < n) num += a * (e[i + 1] - mean);
  }
  sums[0] = num;
  sums[1] = den;
}

/** acc plus the squares of e[from, to), in order; throws at the first value that is not finite. */
function squaresChunk(e: Float64Array, from: number, to: number, acc: number): number {
  for (let i = from; i < to; i++) {
    if (!Number.isFinite(e[i])) throw new RangeError(`The residual is not a finite number at point ${i + 1} (${e[i]}).`);
    acc += e[i] * e[i];
  }
  return acc;
}

/**
 * Check whether a residual looks like noise.
 *
 * Two tests: lag-1 autocorrelation against ±2/√n (the approximate 95 % bound
 * for white noise; common practice after Box & Jenkins, Time Series Analysis,
 * 1970) and the Wald–Wolfowitz runs test about the median at 5 % (two-sided).
 *
 * The verdict is one-sided on purpose. Signal taken out by smoothing is slow,
 * so it shows as positive lag-1 correlation and too few runs. The residual of
 * any smoother is high-pass filtered noise, whose neighbours alternate
 * (negative lag-1, too many runs); that is expected and does not count as
 * structure, though the verdict says so — and when the runs test rejects at
 * p < 0.001 the verdict reads 'caution', never clean. On white noise the
 * structure verdict is a false alarm about 4–5 % of the time (each one-sided
 * half is ≈ 2.5 %). A residual whose RMS is at round-off level against
 * `rawScale` (the raw trace's largest |y|) reads "nothing removed".
 * @param residual y-units; at least 3 finite values; not changed
 * @param rawScale the raw trace's largest |y|, for the round-off test (0: only an exact zero counts)
 * @throws RangeError on fewer than 3 points or non-finite values
 */
export function residualDiagnostics(residual: Float64Array, rawScale = 0): ResidualDiagnostics {
  const n = residual.length;
  if (n < 3) throw new RangeError(`Residual tests need at least 3 points; there are ${n}.`);
  let ss = 0;
  for (let from = 0; from < n; from += PASS_CHUNK) ss = squaresChunk(residual, from, Math.min(n, from + PASS_CHUNK), ss);
  const rms = Math.sqrt(ss / n);
  const lag1 = lag1Autocorrelation(residual);
  const lag1Threshold = 2 / Math.sqrt(n);
  const runs = runsTest(residual);
  const slowStructure = lag1 > lag1Threshold || (runs.z < 0 && runs.p < RUNS_ALPHA);
  const alternating = lag1 < -lag1Threshold || (runs.z > 0 && runs.p < RUNS_ALPHA);
  const roundOff = rms === 0 || (rawScale > 0 && rms <= ROUND_OFF_RELATIVE * rawScale);
  let verdict: string;
  let level: ResidualDiagnostics['level'];
  if (rms === 0) { level = 'nothing-removed'; verdict = 'The residual is zero: the processing changed nothing.'; }
  else if (roundOff) { level = 'nothing-removed'; verdict = `Nothing removed: the residual (RMS ${rms.toPrecision(2)}) is at the level of rounding in the arithmetic, ${(rms / rawScale).toPrecision(2)} of the trace's largest value.`; }
  else if (slowStructure) { level = 'structure'; verdict = 'The residual has structure: the smoothing removed part of the signal.'; }
  else if (runs.p < RUNS_STRICT_ALPHA) {
    level = 'caution';
    verdict = `The residual is not plain noise: the runs test rejects a random order (z = ${runs.z.toFixed(1)}, p below ${RUNS_STRICT_ALPHA}); neighbouring points alternate more than noise would, as after smoothing, with no slow structure. Check the loss ledger before trusting heights.`;
  } else if (alternating) { level = 'clean'; verdict = 'The residual looks like noise with its slow part left in the trace (neighbouring points alternate, as expected after smoothing); no sign of removed signal.'; }
  else { level = 'clean'; verdict = 'The residual looks like noise.'; }
  return { n, rms, lag1, lag1Threshold, runs, looksLikeNoise: level === 'clean' || level === 'nothing-removed', level, verdict };
}

/**
 * One verdict for the page: the residual's own tests combined with the loss
 * check. The verdict cannot read clean while `weakened` (sentences about
 * quantifiable features lost or weakened beyond {@link HEIGHT_LOSS_TOLERANCE})
 * is not empty; a round-off residual stays "nothing removed".
 */
export function combineVerdict(d: ResidualDiagnostics, weakened: readonly string[]): ResidualDiagnostics {
  if (weakened.length === 0 || d.level === 'nothing-removed') return d;
  const lead = d.level === 'structure' ? d.verdict : 'The residual alone looks like noise, but the processing took signal with it:';
  return {
    ...d, level: 'structure', looksLikeNoise: false,
    verdict: `${lead} ${weakened.length === 1 ? weakened[0] : `${weakened.length} quantifiable features were lost or weakened by more than ${HEIGHT_LOSS_TOLERANCE * 100} % of their raw height (${weakened[0]} …)`}`,
  };
}

/** Raw minus processed, on the processed grid. */
export interface ResidualResult {
  x: Float64Array;
  y: Float64Array;
  /** Set when raw had to be interpolated onto the processed grid. */
  note: string | null;
}

/**
 * Residual raw − processed, on the processed trace's own x array (shared,
 * not copied: 8 MB at 10⁶ points; issue 16). When both have the same x values it is the exact
 * point-by-point difference; when the processed grid differs (e.g. after
 * binning) raw is interpolated linearly onto the processed x first, and the
 * returned note says so.
 * @throws RangeError when the processed x reach outside the raw x range
 */
export function residual(raw: Signal, processed: Signal): ResidualResult {
  const px = processed.x;
  let sameGrid = raw.x.length === px.length;
  for (let i = 0; sameGrid && i < px.length; i++) if (raw.x[i] !== px[i]) sameGrid = false;
  const y = new Float64Array(px.length);
  if (sameGrid) {
    for (let i = 0; i < y.length; i++) y[i] = raw.y[i] - processed.y[i];
    return { x: px, y, note: null };
  }
  const r = interpolateLinear(raw.x, raw.y, px);
  for (let i = 0; i < y.length; i++) {
    if (Number.isNaN(r[i])) throw new RangeError(`The processed trace has x = ${px[i]} outside the raw trace's range; the residual cannot be formed there.`);
    y[i] = r[i] - processed.y[i];
  }
  return {
    x: px,
    y,
    note: 'The processed trace has different x values from the raw one; the raw trace was interpolated linearly onto them to form the residual.',
  };
}
