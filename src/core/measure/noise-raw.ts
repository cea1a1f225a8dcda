/**
 * The noise of a RAW trace: its σ, its autocorrelation over a stated number
 * of lags, and whether the assumptions behind both held.
 *
 * Method (chosen by test over seeded families of 10⁴–10⁶ points — flat,
 * drifting baseline, broad bands over the whole range, narrow peaks one every
 * 40 points, AR(1) noise — and the real spectra in test/fixtures/real; see
 * test/core/measure/noise-raw.test.ts):
 *
 * 1. Features are masked: points where the second difference of the trace at
 *    scale s (means of s points, s apart; s = 1, 2, 4, 8, 16) stands more
 *    than 4 robust SDs from its median (the robust SD taken locally, in
 *    blocks), each with s + 1 points on each side. For the correlation
 *    (step 3) each masked run is widened by its own length on each side, to
 *    keep the flanks out too.
 * 2. The finest-scale σ: 1.4826 × the median absolute deviation of the second
 *    differences yᵢ₋₁ − 2yᵢ + yᵢ₊₁ outside the mask, / √6. This is the
 *    Donoho & Johnstone (1994, Biometrika 81:425) recipe — MAD of the
 *    finest-scale detail coefficients / 0.6745 — with the second difference
 *    as the high-pass filter: it removes constants and straight lines (so
 *    wander and band flanks), and the median ignores what features remain.
 *    First differences were rejected by test (band slopes leak in: 3 × too
 *    large on the NIR spectra); third and fourth differences give the same
 *    mean with more scatter.
 * 3. The finest scale sees only the high-frequency part of correlated noise
 *    (for AR(1) noise with φ = 0.5 it reads 0.645 σ). So the autocorrelation
 *    ρ(0..L) is measured in stretches between features: residuals about a
 *    least-squares quadratic in pieces of 16–48 points (L = 8; 32–96 for
 *    L = 16, 64–192 for L = 32), pooled lag products solved for γ(0..L) by
 *    the method of moments with the exact expectation of residual products
 *    about a fitted polynomial, E[e eᵀ] = (I − H) Γ (I − H) (standard
 *    regression algebra), assuming γ = 0 beyond L. L grows from 8 to 16
 *    (32 on request) while ρ(L) is still above max(0.05, 3/√N). Measured
 *    block by block (at least 2,048 free points each); blocks where the
 *    trace's shape leaks in (a cubic and a quadratic disagree, or the factor
 *    below passes 3) are left out, and the medians over the rest are used.
 * 4. σ = finest-scale σ / √r, r = (6 − 8ρ₁ + 2ρ₂)/6 the share of the noise
 *    variance the second difference sees.
 *
 * Known bias (measured, 200 seeded realisations per family, in
 * test/core/measure/noise-raw.test.ts): white-noise families within 2 % on average; AR(1) φ = 0.5
 * about −1 % after the correction (−35 % without it); a random-walk
 * baseline with steps of 0.1 σ adds +2 % (it is correlated noise at the
 * scale of the pieces, and indistinguishable from it there).
 *
 * Checks reported with every estimate: the finest scale holds noise only
 * (second and third differences agree); the correlation can be told from the
 * trace's shape (a cubic in the same pieces gives the same σ; when not, σ
 * falls back to the finest-scale figure, white noise assumed, and says so);
 * the correlation dies out within L ≤ 32 points; enough points outside
 * features; noise does not grow with the signal (spread compared between
 * the lowest and highest thirds of the signal level). When the noise does
 * grow with the signal, σ is given as a profile along the trace, in blocks.
 */
import type { NoiseCheck } from './noise-estimators.ts';
import { MAD_TO_SIGMA, medianInPlace, medianMadInPlace } from '../numeric/median.ts';

export type { NoiseCheck };
import { constantProfile, profileMedian, sigmaAt, type SigmaProfile } from './noise-profile.ts';
import { fmtNoiseNumber } from './noise-profile.ts';

/** The raw trace's noise: σ, correlation, profile and checks. */
export interface RawNoiseModel {
  /** σ of the noise, y-units (the median of `profile`). */
  readonly sigma: number;
  /** σ along the raw grid (constant unless the noise varies with the signal). */
  readonly profile: SigmaProfile;
  /** The finest-scale σ (second differences, white noise assumed). */
  readonly sigmaFinest: number;
  /** Autocorrelation ρ(0..L) of the noise, ρ(0) = 1; what carries σ through linear steps. */
  readonly rho: Float64Array;
  /** Points outside features used for the finest-scale σ. */
  readonly points: number;
  /** Points in the pieces used for the correlation (0 when not measured). */
  readonly correlationPoints: number;
  /** Share of the trace masked as features (0..1). */
  readonly maskedFraction: number;
  /** Stable method name. */
  readonly method: string;
  /** What was computed, in words. */
  readonly description: string;
  readonly checks: readonly NoiseCheck[];
  /** False when any testable check failed; the checks say which. */
  readonly assumptionsHeld: boolean;
}

/** Robust z beyond which a smoothed second difference marks a feature. Our choice (about 6·10⁻⁵ false marks per point and scale on white noise). */
export const FEATURE_Z = 4;
/**
 * Largest lag of the correlation model by default (8, 16 or 32 allowed). 16
 * by test: on the MALDI-TOF replicates in test/fixtures/real, 32 lags let the
 * spectrum's small shared bumps pass for noise (σ 1.2–1.6 × the replicate
 * figure in peak-free ranges), 8 and 16 agree with it within 0.9–1.4 ×.
 */
export const MAX_LAGS = 16;
/**
 * Largest factor the measured correlation may raise σ above the finest-scale
 * figure (ρ₁ about 0.85). Beyond it the "noise" is as smooth as the trace's
 * own shape at the scale of the pieces and the two cannot be told apart;
 * white noise is then assumed and said. Our choice (AR(1) φ = 0.5 needs 1.55;
 * the MALDI-TOF replicates in test/fixtures/real, about 2).
 */
export const MAX_CORRELATION_FACTOR = 3;
/** Pooled points beyond which correlation pieces are thinned (evenly) to bound the cost. */
const CORRELATION_POINT_CAP = 1 << 18;

const fmt = (v: number, d = 3): string => fmtNoiseNumber(v, d);

// ---------------------------------------------------------------------------------------------
// 1. Feature mask

/** Second-difference stencils at scale s: trailing means of s points, then m[i−s] − 2m[i] + m[i+s]. */
function scalesFor(n: number): number[] {
  const out = [1];
  for (const s of [2, 4, 8, 16]) if (4 * s + 1 <= n / 20) out.push(s);
  return out;
}

/**
 * Mark the points of a raw trace that belong to features (peaks, dips,
 * spikes, sharp shoulders) so the noise is measured elsewhere: 1 = masked.
 * See the file comment, step 1. O(n) per scale and pass (two passes: the
 * second measures the scales without the first pass's marks).
 */
export function curvatureMask(y: Float64Array): Uint8Array {
  const n = y.length;
  let mask = new Uint8Array(n);
  if (n < 7) return mask;
  const cs = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) cs[i + 1] = cs[i] + y[i];
  const scales = scalesFor(n);
  const z = new Float64Array(n);
  const scratch = new Float64Array(n);
  const block = Math.max(256, Math.ceil(n / 64));
  for (let pass = 0; pass < 2; pass++) {
    const marks = new Int32Array(n + 1);
    for (const s of scales) {
      const lo = 2 * s - 1, hi = n - 1 - s; // z defined for lo ≤ i ≤ hi
      if (hi < lo) continue;
      // z[i] = m[i − s] − 2m[i] + m[i + s] with m[i] = (cs[i + 1] − cs[i + 1 − s])/s, the trailing mean of s points.
      const inv = 1 / s;
      for (let i = lo; i <= hi; i++) {
        z[i] = (cs[i + 1 - s] - cs[i + 1 - 2 * s] - 2 * (cs[i + 1] - cs[i + 1 - s]) + cs[i + 1 + s] - cs[i + 1]) * inv;
      }
      // Each block's robust scale from at most ~1,024 evenly spaced free values; the median over
      // blocks stands in for blocks with too few free values.
      const nb = Math.ceil((hi - lo + 1) / block);
      const meds = new Float64Array(nb), mads = new Float64Array(nb), ok = new Uint8Array(nb);
      for (let b = 0; b < nb; b++) {
        const b0 = lo + b * block, b1 = Math.min(hi, b0 + block - 1);
        const step = Math.max(1, Math.floor((b1 - b0 + 1) / 1024));
        let k = 0;
        for (let i = b0; i <= b1; i += step) if (!mask[i]) scratch[k++] = z[i];
        if (k < 32) continue;
        const r = medianMadInPlace(scratch, k);
        meds[b] = r.median; mads[b] = r.mad; ok[b] = 1;
      }
      let g = 0;
      for (let b = 0; b < nb; b++) if (ok[b]) scratch[g++] = mads[b];
      const globalMad = g > 0 ? medianInPlace(scratch.subarray(0, g)) : 0;
      g = 0;
      for (let b = 0; b < nb; b++) if (ok[b]) scratch[g++] = meds[b];
      const globalMedian = g > 0 ? medianInPlace(scratch.subarray(0, g)) : 0;
      for (let b = 0; b < nb; b++) {
        const b0 = lo + b * block, b1 = Math.min(hi, b0 + block - 1);
        const local = ok[b] ? { median: meds[b], mad: mads[b] } : { median: globalMedian, mad: globalMad };
        const scale = local.mad > 0 ? local.mad : globalMad;
        // Noise-free (or quantised) data: every departure from the median is a feature.
        const limit = scale > 0 ? FEATURE_Z * MAD_TO_SIGMA * scale : 0;
        for (let i = b0; i <= b1; i++) {
          if (Math.abs(z[i] - local.median) <= limit) continue;
          // Mark the stencil's centre, i − (s − 1)/2, and s + 1 points on each side of it.
          const c0 = i - ((s - 1) >> 1);
          const a = Math.max(0, c0 - s - 1), e = Math.min(n - 1, c0 + s + 1);
          marks[a]++; marks[e + 1]--;
        }
      }
    }
    const next = new Uint8Array(n);
    let acc = 0, same = true;
    for (let i = 0; i < n; i++) { acc += marks[i]; next[i] = acc > 0 ? 1 : 0; if (next[i] !== mask[i]) same = false; }
    mask = next;
    if (same) break;
  }
  return mask;
}

/**
 * Each masked run widened by its own length on each side: a feature's
 * flanks, where its curvature no longer stands out but its shape is still
 * far from a low-order polynomial, stay out of the correlation measure
 * (which, unlike the median of step 2, takes every residual at face value).
 */
export function widenRuns(mask: Uint8Array): Uint8Array {
  const n = mask.length;
  const marks = new Int32Array(n + 1);
  let i = 0;
  while (i < n) {
    if (!mask[i]) { i++; continue; }
    let j = i;
    while (j < n && mask[j]) j++;
    const g = j - i;
    marks[Math.max(0, i - g)]++; marks[Math.min(n, j + g)]--;
    i = j;
  }
  const out = new Uint8Array(n);
  let acc = 0;
  for (let k = 0; k < n; k++) { acc += marks[k]; out[k] = acc > 0 ? 1 : 0; }
  return out;
}

// ---------------------------------------------------------------------------------------------
// 2. Finest-scale σ

const DIFF2 = Float64Array.of(1, -2, 1); // Σc² = 6
const DIFF3 = Float64Array.of(-1, 3, -3, 1); // Σc² = 20

/** Differences with coefficients c over the unmasked stretches, into scratch; returns the count. */
function maskedDifferences(y: Float64Array, mask: Uint8Array | null, c: Float64Array, out: Float64Array, from = 0, to = y.length): number {
  const w = c.length;
  let k = 0, run = 0;
  for (let i = from; i < to; i++) {
    run = mask && mask[i] ? 0 : run + 1;
    if (run < w) continue;
    let s = 0;
    for (let j = 0; j < w; j++) s += c[j] * y[i - w + 1 + j];
    out[k++] = s;
  }
  return k;
}

interface FinestScale { sigma: number; points: number; zeroMad: boolean }

/** 1.4826 × MAD of the differences c over unmasked points / √Σc²; RMS when the MAD is 0 (quantised data). */
function finestScale(y: Float64Array, mask: Uint8Array | null, c: Float64Array, scratch: Float64Array, from = 0, to = y.length): FinestScale {
  const k = maskedDifferences(y, mask, c, scratch, from, to);
  let ss = 0;
  for (let i = 0; i < k; i++) ss += scratch[i] * scratch[i];
  const norm = Math.sqrt(c.reduce((a, v) => a + v * v, 0));
  const { mad } = medianMadInPlace(scratch, k);
  if (k > 0 && mad === 0) return { sigma: Math.sqrt(ss / k) / norm, points: k, zeroMad: true };
  return { sigma: (MAD_TO_SIGMA * mad) / norm, points: k, zeroMad: false };
}

// ---------------------------------------------------------------------------------------------
// 3. Correlation by the method of moments on polynomial residuals

/** Piece lengths for each largest lag (pieces at least twice the lag). */
const PIECE_SETS: Record<number, readonly number[]> = { 8: [16, 24, 32, 48], 16: [32, 48, 64, 96], 32: [64, 96, 128, 192] };

interface PieceAlgebra {
  /** Orthonormal polynomial basis, column-major: q[p·w + t]. */
  q: Float64Array;
  r: number;
  /** A[k·(L+1) + j] = Σₜ [(I − H) Tⱼ (I − H)]ₜ,ₜ₊ₖ. */
  a: Float64Array;
}
const ALGEBRA = new Map<string, PieceAlgebra>();

/** Orthonormal basis of polynomials of degree ≤ deg on w equally spaced points (modified Gram–Schmidt). */
function polyBasis(w: number, deg: number): Float64Array {
  const r = deg + 1;
  const q = new Float64Array(r * w);
  const c = (w - 1) / 2;
  for (let p = 0; p < r; p++) {
    for (let t = 0; t < w; t++) q[p * w + t] = Math.pow((t - c) / w, p);
    for (let o = 0; o < p; o++) {
      let d = 0;
      for (let t = 0; t < w; t++) d += q[p * w + t] * q[o * w + t];
      for (let t = 0; t < w; t++) q[p * w + t] -= d * q[o * w + t];
    }
    let nn = 0;
    for (let t = 0; t < w; t++) nn += q[p * w + t] ** 2;
    nn = Math.sqrt(nn);
    for (let t = 0; t < w; t++) q[p * w + t] /= nn;
  }
  return q;
}

/**
 * Expected pooled lag products of residuals about a least-squares polynomial
 * of degree `deg` over w points, as a linear map of γ(0..L):
 * E[Σₜ eₜeₜ₊ₖ] = Σⱼ A[k][j] γ(j). With M = I − QQᵀ and Tⱼ the symmetric
 * lag-j indicator, A[k][j] = Σₜ (M Tⱼ M)ₜ,ₜ₊ₖ, expanded as
 * Tⱼ − PTⱼ − TⱼP + PTⱼP (P = QQᵀ) so each entry costs O(w·r²).
 */
export function pieceAlgebra(w: number, lags: number, deg: number): PieceAlgebra {
  const key = `${w},${lags},${deg}`;
  const hit = ALGEBRA.get(key);
  if (hit) return hit;
  const r = deg + 1;
  const q = polyBasis(w, deg);
  const P = (s: number, t: number) => {
    if (s < 0 || t < 0 || s >= w || t >= w) return 0;
    let v = 0;
    for (let p = 0; p < r; p++) v += q[p * w + s] * q[p * w + t];
    return v;
  };
  const L = lags;
  const a = new Float64Array((L + 1) * (L + 1));
  // U[j] = Qᵀ Tⱼ Q and V[k][p][q] = Σₜ Q[t,p] Q[t+k,q]
  const U: Float64Array[] = [], V: Float64Array[] = [];
  for (let j = 0; j <= L; j++) {
    const u = new Float64Array(r * r);
    for (let p = 0; p < r; p++) {
      for (let pp = 0; pp < r; pp++) {
        let s = 0;
        if (j === 0) for (let t = 0; t < w; t++) s += q[p * w + t] * q[pp * w + t];
        else for (let t = 0; t + j < w; t++) s += q[p * w + t] * q[pp * w + t + j] + q[p * w + t + j] * q[pp * w + t];
        u[p * r + pp] = s;
      }
    }
    U.push(u);
    const v = new Float64Array(r * r);
    for (let p = 0; p < r; p++) {
      for (let pp = 0; pp < r; pp++) {
        let s = 0;
        for (let t = 0; t + j < w; t++) s += q[p * w + t] * q[pp * w + t + j];
        v[p * r + pp] = s;
      }
    }
    V.push(v);
  }
  for (let k = 0; k <= L; k++) {
    for (let j = 0; j <= L; j++) {
      const tj = j === 0 ? (k === 0 ? w : 0) : k === j ? w - j : 0;
      let ptj = 0, tjp = 0;
      for (let t = 0; t + k < w; t++) {
        if (j === 0) { ptj += P(t, t + k); tjp += P(t, t + k); continue; }
        ptj += P(t, t + k - j) + P(t, t + k + j);
        tjp += P(t + j, t + k) + P(t - j, t + k);
      }
      let ptp = 0;
      for (let e = 0; e < r * r; e++) ptp += U[j][e] * V[k][e];
      a[k * (L + 1) + j] = tj - ptj - tjp + ptp;
    }
  }
  const out = { q, r, a };
  ALGEBRA.set(key, out);
  return out;
}

/** Solve the small dense system A x = b (Gaussian elimination with partial pivoting); null when singular. */
function solveDense(aIn: Float64Array, bIn: Float64Array, m: number): Float64Array | null {
  const a = Float64Array.from(aIn), b = Float64Array.from(bIn);
  for (let c = 0; c < m; c++) {
    let p = c;
    for (let r = c + 1; r < m; r++) if (Math.abs(a[r * m + c]) > Math.abs(a[p * m + c])) p = r;
    if (!(Math.abs(a[p * m + c]) > 1e-12)) return null;
    if (p !== c) {
      for (let k = 0; k < m; k++) { const t = a[c * m + k]; a[c * m + k] = a[p * m + k]; a[p * m + k] = t; }
      const t = b[c]; b[c] = b[p]; b[p] = t;
    }
    for (let r = c + 1; r < m; r++) {
      const f = a[r * m + c] / a[c * m + c];
      if (f === 0) continue;
      for (let k = c; k < m; k++) a[r * m + k] -= f * a[c * m + k];
      b[r] -= f * b[c];
    }
  }
  const x = new Float64Array(m);
  for (let r = m - 1; r >= 0; r--) {
    let s = b[r];
    for (let k = r + 1; k < m; k++) s -= a[r * m + k] * x[k];
    x[r] = s / a[r * m + r];
  }
  return x;
}

/** Pieces [start, length) of the free stretches, greedily cut into the allowed lengths. */
function pieces(n: number, mask: Uint8Array | null, sizes: readonly number[], from = 0, to = n): [number, number][] {
  const out: [number, number][] = [];
  let i = from;
  while (i < to) {
    while (i < to && mask && mask[i]) i++;
    let j = i;
    while (j < to && !(mask && mask[j])) j++;
    let a = i;
    while (j - a >= sizes[0]) {
      let w = sizes[0];
      for (const s of sizes) if (s <= j - a) w = s;
      out.push([a, w]);
      a += w;
    }
    i = j;
  }
  return out;
}

export interface CorrelationModel {
  /** Autocovariance γ(0..L), y-units². */
  gamma: Float64Array;
  /** ρ(0..L). */
  rho: Float64Array;
  lags: number;
  points: number;
}

/**
 * Autocovariance γ(0..L) of the noise from residuals about a least-squares
 * polynomial of degree `deg` in pieces between masked features (see the
 * file comment, step 3). Null when there are no pieces, or the system is
 * singular or gives γ(0) ≤ 0.
 */
export function correlationModel(
  y: Float64Array, mask: Uint8Array | null, lags: number, deg = 2, from = 0, to = y.length, scaleAt?: (index: number) => number,
  pointCap = CORRELATION_POINT_CAP,
): CorrelationModel | null {
  const sizes = PIECE_SETS[lags];
  if (!sizes) throw new RangeError(`The correlation model takes 8, 16 or 32 lags, not ${lags}.`);
  let list = pieces(y.length, mask, sizes, from, to);
  let total = list.reduce((s, p) => s + p[1], 0);
  if (total > pointCap) {
    const keep = Math.ceil(total / pointCap);
    list = list.filter((_, k) => k % keep === 0);
    total = list.reduce((s, p) => s + p[1], 0);
  }
  if (list.length === 0) return null;
  const L = lags, m = L + 1;
  const A = new Float64Array(m * m), C = new Float64Array(m);
  const e = new Float64Array(sizes[sizes.length - 1]);
  for (const [a, w] of list) {
    const alg = pieceAlgebra(w, L, deg);
    const { q, r } = alg;
    for (let t = 0; t < w; t++) e[t] = y[a + t];
    for (let p = 0; p < r; p++) {
      let d = 0;
      for (let t = 0; t < w; t++) d += q[p * w + t] * y[a + t];
      for (let t = 0; t < w; t++) e[t] -= d * q[p * w + t];
    }
    // Where the noise level varies along the trace, each piece counts in units of its local σ.
    const sc = scaleAt ? scaleAt(a + (w >> 1)) : 1;
    const wt = sc > 0 ? 1 / (sc * sc) : 1;
    for (let k = 0; k <= L; k++) {
      let s = 0;
      for (let t = 0; t + k < w; t++) s += e[t] * e[t + k];
      C[k] += wt * s;
    }
    for (let i = 0; i < m * m; i++) A[i] += alg.a[i];
  }
  const gamma = solveDense(A, C, m);
  if (!gamma || !(gamma[0] > 0)) return null;
  const rho = new Float64Array(m);
  for (let k = 0; k < m; k++) rho[k] = gamma[k] / gamma[0];
  return { gamma, rho, lags: L, points: total };
}

/** Share of the noise variance a difference filter c sees: Σᵢⱼ cᵢcⱼ ρ(|i − j|) / Σc². */
export function differenceShare(c: Float64Array, rho: Float64Array): number {
  let num = 0, den = 0;
  for (let i = 0; i < c.length; i++) {
    den += c[i] * c[i];
    for (let j = 0; j < c.length; j++) {
      const k = Math.abs(i - j);
      if (k < rho.length) num += c[i] * c[j] * rho[k];
    }
  }
  return num / den;
}

/** Free points per correlation block (fewer blocks on short traces; at most {@link MAX_CORRELATION_BLOCKS}). */
const BLOCK_FREE_POINTS = 2048;
const MAX_CORRELATION_BLOCKS = 24;

/** One stretch of the trace with its own correlation figures. */
interface CorrelationBlock {
  from: number; to: number;
  /** σ factor 1/√share from a quadratic and from a cubic (Infinity beyond {@link MAX_CORRELATION_FACTOR}, NaN when not measurable). */
  k2: number; k3: number;
  model: CorrelationModel | null;
  good: boolean;
}

export interface BlockedCorrelation {
  /** Median σ factor over the separable blocks, or null when fewer than half are separable. */
  factor: number | null;
  /** Element-wise median ρ(0..L) over the separable blocks. */
  rho: Float64Array;
  lags: number;
  /** Points in the separable blocks' pieces. */
  points: number;
  blocks: number;
  good: number;
  /** Largest finite factor among blocks that were not separable (what σ could be if their correlation were noise). */
  worst: number;
  /** ρ(L) still above max(0.05, 3/√N) at the largest lag allowed. */
  beyond: boolean;
}

/** Cut [0, n) into blocks holding at least {@link BLOCK_FREE_POINTS} unmasked points each. */
function correlationBlocks(n: number, mask: Uint8Array | null): [number, number][] {
  let free = 0;
  for (let i = 0; i < n; i++) if (!(mask && mask[i])) free++;
  const per = Math.max(BLOCK_FREE_POINTS, Math.ceil(free / MAX_CORRELATION_BLOCKS));
  const out: [number, number][] = [];
  let start = 0, count = 0, left = free;
  for (let i = 0; i < n; i++) {
    if (!(mask && mask[i])) { count++; left--; }
    if (count >= per && left >= per) { out.push([start, i + 1]); start = i + 1; count = 0; }
  }
  out.push([start, n]);
  return out;
}

const median = (a: number[]) => { const s = [...a].sort((p, q) => p - q); const h = s.length >> 1; return s.length % 2 ? s[h] : (s[h - 1] + s[h]) / 2; };

/**
 * The correlation measured block by block (each with at least 2,048 free
 * points, at most 24 blocks). A block is separable when its quadratic and
 * cubic figures agree within 10 % + 2√(L/N) and neither implies a factor
 * above {@link MAX_CORRELATION_FACTOR}: where the trace's own shape leaks
 * into the pieces, the cubic takes out more of it and the two part. The
 * medians over separable blocks are used when at least half the blocks are
 * separable. L grows 8 → 16 → 32 (up to maxLags) while the median |ρ(L)|
 * stays above max(0.05, 3/√N).
 */
export function blockedCorrelation(y: Float64Array, mask: Uint8Array | null, maxLags: number, scaleAt?: (index: number) => number): BlockedCorrelation | null {
  const ranges = correlationBlocks(y.length, mask);
  const cap = Math.max(BLOCK_FREE_POINTS, Math.floor(CORRELATION_POINT_CAP / ranges.length));
  let result: BlockedCorrelation | null = null;
  for (const L of [8, 16, 32].filter((v) => v <= maxLags)) {
    const blocks: CorrelationBlock[] = ranges.map(([from, to]) => {
      const m2 = correlationModel(y, mask, L, 2, from, to, scaleAt, cap);
      const m3 = correlationModel(y, mask, L, 3, from, to, scaleAt, cap);
      const kOf = (m: CorrelationModel | null) => {
        if (!m || m.points < FEWEST_CORRELATION_POINTS) return NaN;
        const share = differenceShare(DIFF2, m.rho);
        return share > 1 / MAX_CORRELATION_FACTOR ** 2 ? 1 / Math.sqrt(share) : Infinity;
      };
      const k2 = kOf(m2), k3 = kOf(m3);
      const tol = m2 ? 0.1 + 2 * Math.sqrt(L / m2.points) : 0;
      const good = Number.isFinite(k2) && Number.isFinite(k3) && Math.abs(k3 / k2 - 1) <= tol;
      return { from, to, k2, k3, model: m2, good };
    });
    const measurable = blocks.filter((b) => !Number.isNaN(b.k2) && !Number.isNaN(b.k3));
    if (measurable.length === 0) return result;
    const good = measurable.filter((b) => b.good);
    const worst = Math.max(0, ...measurable.filter((b) => !b.good).flatMap((b) => [b.k2, b.k3]).filter(Number.isFinite));
    if (good.length === 0 || good.length * 3 < measurable.length) {
      return result ?? { factor: null, rho: Float64Array.of(1), lags: L, points: 0, blocks: measurable.length, good: good.length, worst, beyond: false };
    }
    const rho = new Float64Array(L + 1);
    for (let k = 0; k <= L; k++) rho[k] = median(good.map((b) => b.model!.rho[k]));
    const points = good.reduce((s, b) => s + b.model!.points, 0);
    const thr = Math.max(0.05, 3 / Math.sqrt(points / good.length));
    const beyond = Math.abs(rho[L]) >= thr || Math.abs(rho[L - 1]) >= thr;
    result = { factor: median(good.map((b) => b.k2)), rho, lags: L, points, blocks: measurable.length, good: good.length, worst, beyond };
    if (!beyond) break;
  }
  return result;
}

// ---------------------------------------------------------------------------------------------
// 4. Noise against signal level

interface LevelTest { check: NoiseCheck; along: NoiseCheck; blocks: { start: number; sigma: number; points: number }[] | null }

/**
 * Compare the finest-scale spread in blocks at the lowest and highest third
 * of the signal level (median y of each block). Fails when the ratio of the
 * two thirds' median spreads is beyond 1.2 (either way) and beyond 3
 * standard errors (MAD-based σ of m values: relative SE ≈ 1.17/√m, Hampel
 * 1974; × 1.25 for a median of blocks). Not testable with fewer than 6
 * blocks of 64 free differences, or when the level varies by less than 5 σ.
 */
function levelTest(y: Float64Array, mask: Uint8Array, sigma: number, scratch: Float64Array): LevelTest {
  const n = y.length;
  const nb = Math.max(1, Math.min(48, Math.floor(n / 256)));
  const size = Math.ceil(n / nb);
  const blocks: { start: number; sigma: number; points: number; level: number }[] = [];
  const lv = new Float64Array(size);
  for (let b = 0; b < nb; b++) {
    const from = b * size, to = Math.min(n, from + size);
    const f = finestScale(y, mask, DIFF2, scratch, from, to);
    for (let i = from; i < to; i++) lv[i - from] = y[i];
    const level = medianInPlace(lv.subarray(0, to - from));
    blocks.push({ start: from, sigma: f.sigma, points: f.points, level });
  }
  const usable = blocks.filter((b) => b.points >= 64 && b.sigma > 0);
  const untestable = (why: string): LevelTest => ({
    check: { id: 'level', held: null, text: `Whether noise grows with the signal could not be tested: ${why}.` },
    along: { id: 'along', held: null, text: `Whether the noise varies along the trace could not be tested: ${why}.` },
    blocks: null,
  });
  if (usable.length < 6) return untestable(`fewer than 6 stretches of ${size} points hold 64 or more points outside features`);
  const med = (a: number[]) => { const s = [...a].sort((p, q) => p - q); const h = s.length >> 1; return s.length % 2 ? s[h] : (s[h - 1] + s[h]) / 2; };
  // Along the trace: is the scatter of the stretches' log σ beyond what sampling gives? The sampling SD of a
  // MAD-based log σ is 1.17/√m (Hampel 1974), × 1.3 measured for overlapping second differences (white,
  // AR(1) and drifting seeded noise: 0.9–1.4 ×); χ² test at p = 0.001 (Wilson–Hilferty quantile), and the
  // upper third's median spread at least 1.25 × the lower third's.
  const zs = usable.map((b) => Math.log(b.sigma)), ws = usable.map((b) => b.points / (1.3 * 1.17) ** 2);
  const zbar = zs.reduce((s, z, k) => s + ws[k] * z, 0) / ws.reduce((s, w) => s + w, 0);
  const q = zs.reduce((s, z, k) => s + ws[k] * (z - zbar) ** 2, 0);
  const nu = usable.length - 1;
  const q999 = nu * (1 - 2 / (9 * nu) + 3.090 * Math.sqrt(2 / (9 * nu))) ** 3;
  const bySigma = usable.map((b) => b.sigma).sort((p, q2) => p - q2);
  const third = Math.max(1, Math.floor(bySigma.length / 3));
  const spread = med(bySigma.slice(bySigma.length - third)) / med(bySigma.slice(0, third));
  const varies = q > q999 && spread > 1.25;
  const along: NoiseCheck = varies
    ? { id: 'along', held: false, text: `The noise varies along the trace: the spread in the noisiest third of ${usable.length} stretches is ${fmt(spread, 2)} × that in the quietest third, beyond sampling (χ² ${fmt(q, 3)} against ${fmt(q999, 3)} at p = 0.001); σ is therefore given along the trace.` }
    : { id: 'along', held: true, text: `The noise is steady along the trace (${usable.length} stretches, noisiest third ${fmt(spread, 2)} × the quietest, within sampling or 1.25 ×).` };
  usable.sort((p, q2) => p.level - q2.level);
  const t = Math.floor(usable.length / 3);
  const low = usable.slice(0, t), high = usable.slice(usable.length - t);
  const sLow = med(low.map((b) => b.sigma)), sHigh = med(high.map((b) => b.sigma));
  const lLow = med(low.map((b) => b.level)), lHigh = med(high.map((b) => b.level));
  const profileBlocks = () => blocks.map((b) => ({ start: b.start, sigma: b.sigma, points: b.points }));
  if (!(lHigh - lLow > 5 * sigma)) {
    return { check: { id: 'level', held: null, text: 'Whether noise grows with the signal could not be tested: the signal level varies by less than 5 σ along the trace.' }, along, blocks: varies ? profileBlocks() : null };
  }
  // Relative SE of a third's median spread: 1.25 × 1.17 / √(points in that third).
  const se = (g: typeof low) => (1.25 * 1.17) / Math.sqrt(g.reduce((s, b) => s + b.points, 0));
  const seRatio = Math.hypot(se(low), se(high));
  const ratio = sHigh / sLow;
  const grows = Math.abs(Math.log(ratio)) > Math.max(Math.log(1.2), 3 * seRatio);
  const text = grows
    ? `Noise ${ratio > 1 ? 'grows' : 'falls'} with the signal: the spread at the highest third of the signal level (median ${fmt(lHigh)}) is ${fmt(ratio, 2)} × that at the lowest third (median ${fmt(lLow)}), beyond the 1.2 × and 3-standard-error limits; σ is therefore given along the trace, in ${blocks.length} stretches of ${size} points.`
    : `Noise does not grow with the signal: the spread at the highest third of the signal level is ${fmt(ratio, 2)} × that at the lowest third (within 1.2 × or 3 standard errors).`;
  return { check: { id: 'level', held: !grows, text }, along, blocks: grows || varies ? profileBlocks() : null };
}

// ---------------------------------------------------------------------------------------------
// The estimate

const MASKS = new WeakMap<Float64Array, Uint8Array>();

/** {@link curvatureMask} of a raw array, kept while the array lives (raw arrays are never changed). */
export function featureMaskOf(y: Float64Array): Uint8Array {
  let m = MASKS.get(y);
  if (!m) { m = curvatureMask(y); MASKS.set(y, m); }
  return m;
}

/** Fewest free second differences for a σ at all. */
export const FEWEST_NOISE_POINTS = 20;
/** Fewest points between features for measuring the correlation (below it white noise is assumed, and said). */
export const FEWEST_CORRELATION_POINTS = 400;

/**
 * The noise model of a raw trace (see the file comment): σ, ρ(0..L), a σ
 * profile along the grid, and the checks. y is not changed.
 * @returns null when fewer than {@link FEWEST_NOISE_POINTS} second
 *   differences lie outside features (the caller says so on the page).
 */
export function rawNoiseModel(y: Float64Array, options: { maxLags?: number } = {}): RawNoiseModel | null {
  const maxLags = options.maxLags ?? MAX_LAGS;
  const n = y.length;
  if (n < 5) return null;
  const mask = featureMaskOf(y);
  let masked = 0;
  for (let i = 0; i < n; i++) masked += mask[i];
  const scratch = new Float64Array(n);
  const checks: NoiseCheck[] = [];
  let useMask: Uint8Array | null = mask;
  let f2 = finestScale(y, mask, DIFF2, scratch);
  if (f2.points < FEWEST_NOISE_POINTS) {
    // Features everywhere: measure on every point and say so.
    useMask = null;
    f2 = finestScale(y, null, DIFF2, scratch);
    checks.push({ id: 'points', held: false, text: `Features cover ${fmt((100 * masked) / n, 2)} % of the trace, leaving too few points between them; σ was measured over every point, features included, and may be too large.` });
    if (f2.points < FEWEST_NOISE_POINTS) return null;
  } else {
    checks.push({ id: 'points', held: true, text: `${f2.points} second differences lie outside features (${fmt((100 * masked) / n, 2)} % of the trace masked as features).` });
  }
  if (f2.zeroMad) checks.push({ id: 'quantised', held: false, text: 'More than half the second differences are exactly 0 (values quantised or constant), so their root mean square was used instead of the median absolute deviation.' });
  const f3 = finestScale(y, useMask, DIFF3, scratch);
  const se3 = 1.5 / Math.sqrt(Math.max(1, f3.points));
  const agree = f2.sigma > 0 && Math.abs(f3.sigma / f2.sigma - 1) <= 0.1 + 3 * se3;
  checks.push({
    id: 'finest-scale', held: f2.sigma > 0 ? agree : null,
    text: agree
      ? `The finest scale holds noise only: second and third differences give σ ${fmt(f2.sigma)} and ${fmt(f3.sigma)}.`
      : `The trace's shape reaches the finest scale (second differences give σ ${fmt(f2.sigma)}, third differences ${fmt(f3.sigma)}); σ may be too large.`,
  });

  // Noise against the signal level first: where it varies, the correlation is pooled in units of the local σ.
  const lt: LevelTest = useMask ? levelTest(y, mask, f2.sigma, scratch) : {
    check: { id: 'level', held: null, text: 'Whether noise grows with the signal could not be tested (features everywhere).' },
    along: { id: 'along', held: null, text: 'Whether the noise varies along the trace could not be tested (features everywhere).' },
    blocks: null,
  };
  const blocks = lt.blocks;
  let localFinest: Float64Array | null = null;
  if (blocks) {
    const good = blocks.map((b) => b.points >= 64 && b.sigma > 0);
    localFinest = Float64Array.from(blocks.map((b, k) => {
      if (good[k]) return b.sigma;
      for (let d = 1; d < blocks.length; d++) { if (good[k - d]) return blocks[k - d].sigma; if (good[k + d]) return blocks[k + d].sigma; }
      return f2.sigma;
    }));
  }
  const blockStarts = blocks ? Int32Array.from(blocks.map((b) => b.start)) : null;
  const scaleAt = localFinest && blockStarts
    ? (i: number) => sigmaAt({ points: n, starts: blockStarts, sigma: localFinest }, i)
    : undefined;

  // Correlation, and whether it can be told from the trace's shape.
  const bc = blockedCorrelation(y, useMask ? widenRuns(useMask) : null, maxLags, scaleAt);
  let factor = 1;
  let rho: Float64Array = Float64Array.of(1);
  let corrPoints = 0;
  let corrText: string;
  if (!bc) {
    checks.push({ id: 'correlation', held: null, text: `Fewer than ${FEWEST_CORRELATION_POINTS} points lie in stretches between features long enough to measure the noise correlation; white noise is assumed, untested, so σ is too small if the noise is correlated.` });
    corrText = ', white noise assumed (too few points between features to measure the correlation)';
  } else if (bc.factor === null) {
    checks.push({
      id: 'correlation', held: false,
      text: `The noise correlation cannot be told apart from the trace's shape in ${bc.blocks - bc.good} of ${bc.blocks} stretches (a quadratic and a cubic fitted between features disagree, or imply σ more than ${MAX_CORRELATION_FACTOR} × the finest-scale figure); σ is the finest-scale figure, white noise assumed.${bc.worst > 1 ? ` If the noise is correlated, σ is larger, up to about ${fmt(bc.worst * f2.sigma)}.` : ''}`,
    });
    corrText = ', white noise assumed (correlation not separable from the trace\'s shape)';
  } else {
    factor = bc.factor; rho = bc.rho; corrPoints = bc.points;
    const significant = Math.abs(rho[1]) > 3 / Math.sqrt(bc.points);
    const where = bc.blocks > 1 ? ` (median over ${bc.good} of ${bc.blocks} stretches${bc.good < bc.blocks ? '; the others, where the trace\'s shape leaks in, left out' : ''})` : '';
    checks.push({
      id: 'correlation', held: true,
      text: significant
        ? `The noise is correlated: ρ₁ = ${fmt(rho[1], 2)}, ρ₂ = ${fmt(rho[2], 2)}, measured over ${bc.lags} lags in ${bc.points} points between features${where}; σ = finest-scale σ × ${fmt(factor, 4)}.`
        : `The noise is white within the measurement (ρ₁ = ${fmt(rho[1], 2)}, ${bc.lags} lags over ${bc.points} points between features${where}).`,
    });
    corrText = `, × ${fmt(factor, 4)} for the noise correlation measured over ${bc.lags} lags in ${bc.points} points between features`;
    if (bc.beyond) checks.push({ id: 'correlation-length', held: false, text: `The noise is still correlated at lag ${bc.lags} (ρ = ${fmt(rho[bc.lags], 2)}); correlation beyond ${bc.lags} points is not counted, so σ and the carried σ may be too small.` });
  }
  const sigma0 = f2.sigma * factor;
  checks.push(lt.check, lt.along);
  const profile = localFinest && blockStarts
    ? { points: n, starts: blockStarts, sigma: localFinest.map((v) => v * factor) }
    : constantProfile(n, sigma0);
  const sigma = profileMedian(profile);
  const assumptionsHeld = checks.every((c) => c.held !== false);
  const description = `σ = 1.4826 × median absolute deviation of the second differences / √6 over ${f2.points} points outside features (finest scale, after Donoho and Johnstone 1994)${corrText}${blocks ? `; given along the trace in ${blocks.length} stretches since the noise is not the same everywhere (median ${fmt(sigma)})` : ''}.`;
  return {
    sigma, profile, sigmaFinest: f2.sigma, rho, points: f2.points, correlationPoints: corrPoints,
    maskedFraction: masked / n, method: 'finest-scale-mad', description, checks, assumptionsHeld,
  };
}
