/**
 * σ of the processed trace, carried from the raw noise through the stack.
 *
 * The noise of a processed trace is not measured on the processed trace
 * (after smoothing, neighbouring points are correlated and every local
 * estimate reads low); it is the raw noise as the processing passes it:
 *
 * * Linear stacks (every step that ran is marked `linear`: moving average,
 *   Savitzky–Golay, frequency filter, blank subtraction, averaging of scans):
 *   exactly. The stack's impulse response g to a unit change of one input
 *   sample is taken as (process(y + A·eₖ) − process(y))/A on the real data
 *   (so blank and scans stay in place), and the variance it passes is
 *   σ²·Σₐ Σ_b g(a) g(b) ρ(|a − b|) with the raw noise's autocorrelation ρ
 *   measured over L lags (zero beyond; white noise gives σ²·Σg²). The blank
 *   and each scan are noise sources of their own, with their own measured σ
 *   and ρ; their shares add. Near the ends, where the response is cut or
 *   reflected, the sample's share is computed row by row from the responses
 *   on the first and last few points (for responses up to 256 points wide;
 *   wider ones, such as a narrow frequency filter, keep the interior figure
 *   there, and say so).
 * * Any other stack: by simulation. A few seeded noise series ε with the
 *   measured σ (profile) and autocorrelation are added to and taken from the
 *   raw trace (and the blank and scans), the stack is run on each, and the
 *   spread of [process(raw + ε) − process(raw − ε)]/2 is the processed noise:
 *   the operator's own behaviour at this data. The pair form is exact for
 *   linear steps and, unlike process(raw + ε) − process(raw), close for
 *   steps that act on the noise itself: raw ± ε hold independent noise of
 *   equal size. Measured while choosing (8 × 2·10⁴ points, drifting
 *   baseline): a running median of 5 points read 1.05 × the true spread in
 *   pair form against 1.24 × one-sided; a Hampel test (7 points, t = 3)
 *   1.02 × against 1.15 ×. Steps whose decisions depend on the noise level
 *   still see √2 × the real noise. Checked in
 *   test/core/measure/noise-carry.test.ts. The spread is pooled in stretches along the
 *   processed grid to give a profile; a constant shift of the whole trace
 *   (an asymmetric baseline settles lower on noisier data) is taken out of
 *   each series first, as a change of level, not noise. Cached per stack and
 *   noise model. The throw-away runs restart from checkpoints: each noisy
 *   input as processed up to the step the user is editing, so a slider drag
 *   on the last of five steps reruns that step alone (see `simulatedRun`).
 */
import { arrayToken as token, PipelineCache, runPipeline, type PipelineResult } from '../pipeline.ts';
import type { Recipe, Registry } from '../method.ts';
import type { Signal, StepContext } from '../steps/types.ts';
import type { Trace } from '../trace.ts';
import { dft, nextPowerOfTwo } from '../numeric/fft.ts';
import { makeRng } from '../numeric/random.ts';
import { constantProfile, profileMedian, ProfileBuilder, sigmaAt, type SigmaProfile } from './noise-profile.ts';
import { fmtNoiseNumber } from './noise-profile.ts';

/** The noise of one input trace, as carried: σ (constant or along its grid) and ρ(0..L). */
export interface SourceNoise {
  readonly profile: SigmaProfile;
  readonly sigma: number;
  readonly rho: Float64Array;
}

/** How the processed σ was obtained. */
export interface CarriedNoise {
  /** 'none': nothing ran (σ is the raw σ); 'linear': exact, from impulse responses; 'simulated': spread of process(raw + ε) − process(raw). */
  readonly route: 'none' | 'linear' | 'simulated';
  /** σ along the processed grid. */
  readonly profile: SigmaProfile;
  /** Median of the profile, y-units of the processed trace. */
  readonly sigma: number;
  /** Interior σ of the processed trace over the raw sample's σ, from the sample's share alone (linear route), or the median ratio (simulated). */
  readonly gain: number;
  /** Lags of the autocorrelation the carriage used. */
  readonly lags: number;
  /**
   * Autocorrelation ρ(0..K) of the processed trace's noise (ρ(0) = 1): the raw ρ through the stack's impulse
   * response (linear route) or measured on the simulated differences (simulated route); what the noise-only
   * count and the S/N box factors need after smoothing.
   */
  readonly rho: Float64Array;
  /** Seeded noise series run through the stack (simulated route). */
  readonly realisations: number;
  /** True while the simulation has not run yet (a staged analysis may post σ late). */
  readonly provisional: boolean;
  /** One sentence: how it was carried. */
  readonly description: string;
  /** Approximations made, in words. */
  readonly notes: readonly string[];
}

/** Inputs of the stack that carry noise of their own. */
export interface NoiseSources {
  readonly sample: SourceNoise;
  readonly blank?: SourceNoise;
  /** By trace id. */
  readonly scans?: ReadonlyMap<string, SourceNoise>;
}

/** Widest impulse response (half-width, points) whose end rows are computed exactly. */
export const EXACT_END_HALF_WIDTH = 256;

const fmt = (v: number, d = 4): string => fmtNoiseNumber(v, d);

/** Which steps ran, from a pipeline result. */
function ranSteps(run: PipelineResult): string[] {
  return run.runs.filter((r) => r.status === 'ok').map((r) => r.step);
}

/** True when every step that ran is marked linear and the grid is unchanged. */
export function isLinearStack(run: PipelineResult, registry: Registry, raw: Signal): boolean {
  if (ranSteps(run).length === 0) return true;
  if (run.final.x.length !== raw.x.length) return false;
  // Each run says whether its step was linear with its parameters (pipeline.ts); the registry is the fallback.
  return run.runs.filter((r) => r.status === 'ok').every((r) => r.linear ?? registry.find((d) => d.id === r.step)?.linear === true);
}

/** Quadratic form Σₐ Σ_b g[a] g[b] ρ(|a − b|) over the entries of g (ρ zero beyond its length). */
export function passedVariance(g: Float64Array, rho: Float64Array, from = 0, to = g.length): number {
  let v = 0;
  const L = rho.length - 1;
  for (let a = from; a < to; a++) {
    const ga = g[a];
    if (ga === 0) continue;
    v += ga * ga;
    for (let d = 1; d <= L && a + d < to; d++) v += 2 * ga * g[a + d] * rho[d];
  }
  return v;
}

/** Most lags of the processed noise's autocorrelation kept (beyond, the noise-only count and box factors barely change). */
export const MAX_CARRIED_LAGS = 32;

/** ρ(0..K) cut after the last lag with |ρ| ≥ 0.01 (ρ(0) = 1 kept). */
function trimRho(cov: Float64Array): Float64Array {
  if (!(cov[0] > 0)) return Float64Array.of(1);
  let last = 0;
  for (let k = 1; k < cov.length; k++) if (Math.abs(cov[k] / cov[0]) >= 0.01) last = k;
  const out = new Float64Array(last + 1);
  for (let k = 0; k <= last; k++) out[k] = cov[k] / cov[0];
  return out;
}

/**
 * Autocorrelation of noise with autocorrelation ρ after a linear filter with impulse response g (centre c,
 * nonzero within ±half): cov(k) = Σ_m (g⋆g)(m) ρ(|k − m|), ρ zero beyond its length.
 */
export function carriedCorrelation(g: Float64Array, c: number, half: number, rho: Float64Array): Float64Array {
  const h = Math.min(half, 2048);
  const a0 = Math.max(0, c - h), a1 = Math.min(g.length - 1, c + h);
  const w = a1 - a0 + 1;
  const auto = new Float64Array(w);
  for (let m = 0; m < w; m++) {
    let s = 0;
    for (let a = a0; a + m <= a1; a++) s += g[a] * g[a + m];
    auto[m] = s;
  }
  const L = rho.length - 1;
  const K = Math.min(MAX_CARRIED_LAGS, w - 1 + L);
  const cov = new Float64Array(K + 1);
  for (let k = 0; k <= K; k++) {
    let s = 0;
    for (let m = -(w - 1); m <= w - 1; m++) {
      const d = Math.abs(k - m);
      if (d > L) continue;
      s += auto[Math.abs(m)] * rho[d];
    }
    cov[k] = s;
  }
  return trimRho(cov);
}

/** A power of two near the largest |y|, so y + A·e and its difference lose no digits. */
function impulseSize(y: Float64Array): number {
  let m = 0;
  for (let i = 0; i < y.length; i++) { const a = Math.abs(y[i]); if (a > m) m = a; }
  return Math.pow(2, Math.round(Math.log2(Math.max(m, 1))));
}

function withY(t: Trace, y: Float64Array): Trace {
  return { ...t, y };
}

/** Copy of ctx where every trace whose y is `target` gets `replacement` instead. */
function ctxReplacing(ctx: StepContext, target: Float64Array, replacement: Float64Array): StepContext {
  return {
    blank: ctx.blank && ctx.blank.y === target ? withY(ctx.blank, replacement) : ctx.blank,
    scans: ctx.scans?.map((s) => (s.y === target ? withY(s, replacement) : s)),
  };
}

/**
 * The blank and scans as processed by the stack, kept between the many throw-away runs of the carriage (issue 20:
 * they follow the sample through every step). Keyed by the identity of their raw arrays, so a bumped copy never
 * meets a stale entry; the sample's own outputs are never cached here.
 */
const COMPANIONS = new PipelineCache(32, 64 * 1024 * 1024);

/** Process `input` with the stack, the sample's steps uncached (these runs are throw-away). */
function processed(input: Signal, recipe: Recipe, registry: Registry, ctx: StepContext): Float64Array {
  return runPipeline(input, 'noise-carry', recipe, registry, ctx, undefined, undefined, COMPANIONS).final.y;
}

/** Column of the stack's linear map for sample index k of `source` (sample, blank or a scan): (P(in + A eₖ) − P(in))/A. */
function responseTo(
  raw: Signal, recipe: Recipe, registry: Registry, ctx: StepContext, base: Float64Array, sourceY: Float64Array, k: number,
): Float64Array {
  const A = impulseSize(sourceY);
  const bumped = Float64Array.from(sourceY);
  bumped[k] += A;
  const isSample = sourceY === raw.y;
  const input: Signal = isSample ? { x: raw.x, y: bumped } : raw;
  const c = ctxReplacing(ctx, sourceY, bumped);
  const out = processed(input, recipe, registry, c);
  const g = new Float64Array(out.length);
  for (let i = 0; i < out.length; i++) g[i] = (out[i] - base[i]) / A;
  return g;
}

/** Points of the piece around the middle on which the centre response is tried first. */
export const CENTRE_PIECE = 8192;

/**
 * The stack's response to a unit change of the middle sample. On traces
 * longer than {@link CENTRE_PIECE} it is first taken on that many points
 * around the middle, and kept when its non-negligible part stays within an
 * eighth of the piece from the centre (the stack then cannot tell the piece
 * from the whole trace there); otherwise on the whole trace.
 */
function centreResponse(raw: Signal, run: PipelineResult, recipe: Recipe, registry: Registry, ctx: StepContext): { g: Float64Array; c: number } {
  const n = raw.x.length;
  if (n > 2 * CENTRE_PIECE) {
    const a = (n >> 1) - (CENTRE_PIECE >> 1);
    const piece: Signal = { x: raw.x.subarray(a, a + CENTRE_PIECE), y: raw.y.subarray(a, a + CENTRE_PIECE) };
    try {
      const base = processed(piece, recipe, registry, ctx);
      if (base.length === CENTRE_PIECE) {
        const c = CENTRE_PIECE >> 1;
        const g = responseTo(piece, recipe, registry, ctx, base, piece.y, c);
        if (halfSupport(g, c) <= CENTRE_PIECE / 8) return { g, c };
      }
    } catch { /* a step that does not fit the piece: use the whole trace */ }
  }
  const c = n >> 1;
  return { g: responseTo(raw, recipe, registry, ctx, run.final.y, raw.y, c), c };
}

/** Half-width of the non-negligible part of g around index c (|g| above 1e-12 of its largest entry). */
function halfSupport(g: Float64Array, c: number): number {
  let m = 0;
  for (let i = 0; i < g.length; i++) m = Math.max(m, Math.abs(g[i]));
  const tiny = 1e-12 * m;
  let k = 0;
  for (let i = 0; i < g.length; i++) if (Math.abs(g[i]) > tiny) k = Math.max(k, Math.abs(i - c));
  return k;
}

/**
 * Exact variance gains (Σ g g ρ per row) of the sample's share for the first
 * `rows` output indices, from the stack run on the first P points (and, with
 * `fromEnd`, the last P points, rows counted from the end).
 */
function endGains(
  raw: Signal, recipe: Recipe, registry: Registry, ctx: StepContext, rho: Float64Array, half: number, fromEnd: boolean,
): Float64Array | null {
  const n = raw.x.length;
  const L = rho.length - 1;
  const P = Math.min(n, 4 * half + 2 * L + 8);
  const off = fromEnd ? n - P : 0;
  const piece: Signal = { x: raw.x.subarray(off, off + P), y: raw.y.subarray(off, off + P) };
  let base: Float64Array;
  try { base = processed(piece, recipe, registry, ctx); } catch { return null; }
  if (base.length !== P) return null;
  const cols = Math.min(P, 2 * half + 1 + L);
  // rowsAt[r][j]: output row r (counted from the cut end) against input column j (same counting).
  const rows = half;
  const m = new Float64Array(rows * cols);
  const A = impulseSize(piece.y);
  for (let j = 0; j < cols; j++) {
    const k = fromEnd ? P - 1 - j : j;
    const y2 = Float64Array.from(piece.y);
    y2[k] += A;
    const out = processed({ x: piece.x, y: y2 }, recipe, registry, ctx);
    if (out.length !== P) return null;
    for (let r = 0; r < rows; r++) {
      const i = fromEnd ? P - 1 - r : r;
      m[r * cols + j] = (out[i] - base[i]) / A;
    }
  }
  const v = new Float64Array(rows);
  for (let r = 0; r < rows; r++) v[r] = passedVariance(m.subarray(r * cols, (r + 1) * cols), rho);
  return v;
}

/** Distinct noise sources the stack reads: the sample, the blank when a step used it, scans when averaging ran. */
function sourcesUsed(run: PipelineResult, ctx: StepContext, noise: NoiseSources): { y: Float64Array; noise: SourceNoise; label: string }[] {
  const ran = new Set(ranSteps(run));
  const out: { y: Float64Array; noise: SourceNoise; label: string }[] = [];
  if (ran.has('blank-subtraction') && ctx.blank && noise.blank) out.push({ y: ctx.blank.y, noise: noise.blank, label: 'the blank' });
  if (ran.has('ensemble-average')) {
    for (const s of ctx.scans ?? []) {
      const sn = noise.scans?.get(s.id);
      if (sn && !out.some((o) => o.y === s.y)) out.push({ y: s.y, noise: sn, label: `the scan "${s.name}"` });
    }
  }
  return out;
}

/**
 * Linear route (see the file comment). `run` is the stack's run on the raw
 * trace. Returns the processed σ profile and how it was made.
 */
export function carryLinear(raw: Signal, run: PipelineResult, recipe: Recipe, registry: Registry, ctx: StepContext, noise: NoiseSources): CarriedNoise {
  const n = raw.x.length;
  const base = run.final.y;
  const rho = noise.sample.rho;
  const L = rho.length - 1;
  const notes: string[] = [];
  // The sample's own share: interior response at the middle, first on a piece around it (cheap on long
  // traces); kept only when the response stays well inside the piece, else taken on the whole trace.
  const { g, c } = centreResponse(raw, run, recipe, registry, ctx);
  const gainVar = passedVariance(g, rho);
  const half = halfSupport(g, c);
  // gainSq: the sample's noise gain at each index, gainVar in the interior, exact within `ends` points of each end.
  let ends = 0;
  let left: Float64Array | null = null, right: Float64Array | null = null;
  if (half > 0 && half <= EXACT_END_HALF_WIDTH && 4 * half + 2 * L + 8 <= n) {
    left = endGains(raw, recipe, registry, ctx, rho, half, false);
    right = endGains(raw, recipe, registry, ctx, rho, half, true);
    if (left && right) {
      ends = half;
    } else {
      notes.push(`Within ${half} points of each end the interior gain is used (the stack could not be run on a short end piece).`);
    }
  } else if (half > 0) {
    notes.push(`The stack's impulse response is ${2 * half + 1} points wide; within ${Math.min(half, n >> 1)} points of each end the interior gain is used, not the exact one.`);
  }
  const gainAt = (i: number): number => (i < ends ? left![i] : i >= n - ends ? right![n - 1 - i] : gainVar);
  // Other sources (blank, scans): interior share, scaled near the ends like the sample's.
  const others = sourcesUsed(run, ctx, noise);
  const otherShares: number[] = [];
  const shares: string[] = [];
  for (const s of others) {
    const ks = s.y.length >> 1;
    const gs = responseTo(raw, recipe, registry, ctx, base, s.y, ks);
    const v = s.noise.sigma * s.noise.sigma * passedVariance(gs, s.noise.rho);
    otherShares.push(v);
    shares.push(`${s.label} adds σ ${fmt(Math.sqrt(v), 3)} (its own σ ${fmt(s.noise.sigma, 3)} × gain ${fmt(Math.sqrt(passedVariance(gs, s.noise.rho)), 4)})`);
  }
  // The other sources' variance at a point whose sample gain is gi (summed in the sources' order).
  const otherAt = (gi: number): number => {
    let o = 0;
    for (const v of otherShares) o += gainVar > 0 ? (v * gi) / gainVar : v;
    return o;
  };
  // σ at each index, √(σ_raw² × gain² + others), fed to the profile stretch by stretch: the raw profile's runs
  // walked in order (issue 16: at 10⁶ points three arrays of every point's gain and σ were most of this function's
  // time on every slider move); the end points one by one, the interior of each raw run as one stretch.
  const { starts, sigma: runSigma } = noise.sample.profile;
  const interiorOther = otherAt(gainVar);
  const builder = new ProfileBuilder();
  for (let run = 0; run < starts.length; run++) {
    const from = Math.max(starts[run], 0), to = Math.min(run + 1 < starts.length ? starts[run + 1] : n, n);
    if (to <= from) continue;
    const sr = runSigma[run];
    const a = Math.min(Math.max(from, ends), to), b = Math.max(Math.min(to, n - ends), a);
    for (let i = from; i < a; i++) { const gi = gainAt(i); builder.push(Math.sqrt(sr * sr * gi + otherAt(gi)), 1); }
    builder.push(Math.sqrt(sr * sr * gainVar + interiorOther), b - a);
    for (let i = b; i < to; i++) { const gi = gainAt(i); builder.push(Math.sqrt(sr * sr * gi + otherAt(gi)), 1); }
  }
  const profile = builder.done();
  const sigma = profileMedian(profile);
  const gain = Math.sqrt(gainVar);
  const desc = `Carried exactly through the linear stack: the raw σ × ${fmt(gain)}, the stack's noise gain from its impulse response (${2 * half + 1} points wide) and ${L === 0 ? 'white raw noise (no correlation measured)' : `the raw noise's autocorrelation over ${L} lag${L === 1 ? '' : 's'}`}${shares.length ? `; ${shares.join('; ')}` : ''}${half > 0 ? '; exact row by row at the ends' : ''}.`;
  return { route: 'linear', profile, sigma, gain, lags: L, rho: carriedCorrelation(g, c, half, rho), realisations: 0, provisional: false, description: desc, notes };
}

// ---------------------------------------------------------------------------------------------
// Simulation

/**
 * Filter taps h (odd length, centred) whose autocorrelation h⋆h matches
 * ρ(0..L): the inverse transform of the square root of the spectrum
 * 1 + 2Σρₖcos(2πfk) (clipped at 0), on a grid of 4(L + 1) rounded up to a
 * power of two, normalised to Σh² = 1. White noise gives [1].
 */
export function noiseShapingTaps(rho: Float64Array): Float64Array {
  const L = rho.length - 1;
  let white = true;
  for (let k = 1; k <= L; k++) if (rho[k] !== 0) white = false;
  if (white) return Float64Array.of(1);
  const F = nextPowerOfTwo(Math.max(16, 4 * (L + 1)));
  const re = new Float64Array(F), im = new Float64Array(F);
  for (let f = 0; f < F; f++) {
    let s = 1;
    for (let k = 1; k <= L; k++) s += 2 * rho[k] * Math.cos((2 * Math.PI * f * k) / F);
    re[f] = Math.sqrt(Math.max(0, s));
  }
  const t = dft(re, im, true).re; // real and even, since the spectrum is
  const T = F / 2 - 1;
  const h = new Float64Array(2 * T + 1);
  for (let j = -T; j <= T; j++) h[j + T] = t[(j + F) % F];
  let ss = 0;
  for (const v of h) ss += v * v;
  const norm = Math.sqrt(ss);
  for (let i = 0; i < h.length; i++) h[i] /= norm;
  return h;
}

/** Seeded Gaussian noise with σ from `profile` (on this grid) and autocorrelation from `taps` (see {@link noiseShapingTaps}). */
export function simulatedNoise(n: number, profile: SigmaProfile, taps: Float64Array, seed: number): Float64Array {
  const rng = makeRng(seed);
  const T = (taps.length - 1) / 2;
  const w = new Float64Array(n + 2 * T);
  for (let i = 0; i < w.length; i++) w[i] = rng.normal();
  const e = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let k = 0; k < taps.length; k++) s += taps[k] * w[i + k];
    e[i] = s * sigmaAt(profile, i);
  }
  return e;
}

/** Pairs of series (ε and −ε) run through the stack for the simulated route: more on short traces, where each run is cheap. */
export function realisationsFor(n: number): number {
  return n <= 1 << 16 ? 4 : n <= 1 << 18 ? 2 : 1;
}

/** Points per stretch over which the simulated spread is pooled along the processed grid. */
function poolWidth(m: number, realisations: number): number {
  return Math.max(Math.ceil(256 / realisations), Math.ceil(m / 256));
}

/** Bytes of the checkpoints the simulated route keeps (see {@link simulatedRun}): at 10⁶ points, the two noisy inputs (one series, added and taken away) for the current stack and for the alternatives. */
export const CHECKPOINT_BYTES = 32 * 1024 * 1024;
let checkpointBytes = CHECKPOINT_BYTES;

/** Set the checkpoints' byte budget (tests exercise the letting-go on short traces); returns the budget before. */
export function setCarryCheckpointBytes(bytes: number): number {
  const before = checkpointBytes;
  checkpointBytes = bytes;
  return before;
}

/**
 * A noisy input of the simulated route as processed by the first `at` entries of the recipe (`sig` says which
 * entries, by value), with the blank and scans as processed that far. `key` names the noisy input itself.
 */
interface Checkpoint {
  readonly key: string;
  /** The checkpoints that serve one run of the carriage (every series and sign of one stack up to `at`): kept or let go together. */
  readonly group: string;
  readonly at: number;
  readonly sig: string;
  readonly signal: Signal;
  readonly ctx: StepContext;
  readonly bytes: number;
}

/** Newest last. */
const CHECKPOINTS: Checkpoint[] = [];

/** Forget every checkpoint (tests; a fresh start). */
export function clearCarryCheckpoints(): void {
  CHECKPOINTS.length = 0;
}

/** How many checkpoints are kept and their bytes (tests, the heap bench). */
export function carryCheckpointStats(): { count: number; bytes: number; groups: number[] } {
  const groups = new Map<string, number>();
  for (const c of CHECKPOINTS) groups.set(c.group, (groups.get(c.group) ?? 0) + 1);
  return { count: CHECKPOINTS.length, bytes: CHECKPOINTS.reduce((s, c) => s + c.bytes, 0), groups: [...groups.values()] };
}

/** The first `at` entries of the recipe, by value (whether on, step, parameters). */
function prefixSig(recipe: Recipe, at: number): string {
  return JSON.stringify(recipe.steps.slice(0, at).map((s) => [s.enabled, s.step, s.params]));
}

/** The recipe's entries from `from` to `to` (a recipe of their own; nothing else of the recipe is read by the pipeline). */
function slice(recipe: Recipe, from: number, to: number): Recipe {
  return { ...recipe, steps: recipe.steps.slice(from, to) };
}

/**
 * Keep `cp` as the newest. Over the byte budget, whole groups go, the least recently used first, never the
 * group of `cp`: one series kept without its partner of the other sign would save half a run and hold the
 * memory of a whole one (an entry-by-entry order let the alternatives' checkpoints push out one sign of the
 * current stack's).
 */
function remember(cp: Checkpoint): void {
  const same = CHECKPOINTS.findIndex((c) => c.key === cp.key && c.at === cp.at && c.sig === cp.sig);
  if (same >= 0) CHECKPOINTS.splice(same, 1);
  CHECKPOINTS.push(cp);
  let held = CHECKPOINTS.reduce((s, c) => s + c.bytes, 0);
  while (held > checkpointBytes) {
    const oldest = CHECKPOINTS.find((c) => c.group !== cp.group);
    if (!oldest) break;
    for (let i = CHECKPOINTS.length - 1; i >= 0; i--) {
      if (CHECKPOINTS[i].group === oldest.group) held -= CHECKPOINTS.splice(i, 1)[0].bytes;
    }
  }
}

/** Bytes a checkpoint holds beyond the arrays it shares with the raw inputs. */
function heldBytes(signal: Signal, ctx: StepContext, raw: Signal): number {
  const seen = new Set<ArrayBufferLike>([raw.x.buffer, raw.y.buffer]);
  let b = 0;
  const add = (a: Float64Array | undefined) => { if (a && !seen.has(a.buffer)) { seen.add(a.buffer); b += a.buffer.byteLength; } };
  add(signal.x); add(signal.y);
  add(ctx.blank?.x); add(ctx.blank?.y);
  for (const s of ctx.scans ?? []) { add(s.x); add(s.y); }
  return b;
}

/**
 * Where the stack's throw-away runs on a noisy input may start again next time: the entry before the first one the
 * sample's own run did not take from the pipeline cache (the step just edited; a slider drag edits it again), or
 * the last entry that ran. Returns -1 when no entry ran. A split must not fall inside the part of the stack that
 * still carries the repeated scans (up to the last averaging step, which consumes them), unless it is at the start.
 */
function splitPoint(run: PipelineResult, recipe: Recipe): number {
  let firstNew = -1, lastOk = -1;
  recipe.steps.forEach((_, i) => {
    const r = run.runs[i];
    if (r?.status === 'ok') { lastOk = i; if (!r.cached && firstNew < 0) firstNew = i; }
  });
  const k = firstNew >= 0 ? firstNew : lastOk;
  return k > 0 && k <= lastScanUse(recipe) ? 0 : k;
}

/** Index of the last averaging step that is on (it consumes the scans; the pipeline processes them up to it), or -1. */
function lastScanUse(recipe: Recipe): number {
  let last = -1;
  recipe.steps.forEach((e, i) => { if (e.enabled && e.step === 'ensemble-average') last = i; });
  return last;
}

/**
 * One throw-away run of the stack on a noisy input (`key` names it; `make` makes it). Runs are kept as
 * checkpoints: the input as processed up to the split point (see {@link splitPoint}), so the next run of
 * the same noisy input whose recipe starts with the same entries runs only the rest. Running the stack in two
 * pieces gives the same numbers bit for bit: every step sees the same input and the same processed blank and
 * scans (issue 16: with five steps at 10⁶ points the two full runs took about 7 s of every slider move).
 */
function simulatedRun(
  key: string, groupOf: (at: number, sig: string) => string, make: () => { signal: Signal; ctx: StepContext }, raw: Signal, run: PipelineResult, recipe: Recipe, registry: Registry,
): Float64Array {
  const n = recipe.steps.length;
  // A checkpoint past the start holds the scans as processed by a stack that averaged them within its part
  // (or never): valid only when this recipe averages nothing after it either.
  const scansTo = lastScanUse(recipe);
  let start: { at: number; signal: Signal; ctx: StepContext } | undefined;
  for (const c of CHECKPOINTS) {
    if (c.key !== key || c.at > n || (c.at > 0 && c.at <= scansTo) || (start && c.at <= start.at)) continue;
    if (c.sig === prefixSig(recipe, c.at)) start = c;
  }
  if (start) remember(start as Checkpoint);
  else start = { at: 0, ...make() };
  const k = splitPoint(run, recipe);
  if (k >= 0 && (k > start.at || (k === 0 && start.at === 0 && !CHECKPOINTS.includes(start as Checkpoint)))) {
    const mid = k > start.at
      ? runPipeline(start.signal, 'noise-carry', slice(recipe, start.at, k), registry, start.ctx, undefined, undefined, COMPANIONS)
      : null;
    const signal = mid ? mid.final : start.signal;
    const ctx = mid ? { blank: mid.companions.blank, scans: mid.companions.scans } : start.ctx;
    const sig = prefixSig(recipe, k);
    const cp: Checkpoint = { key, group: groupOf(k, sig), at: k, sig, signal, ctx, bytes: heldBytes(signal, ctx, raw) };
    remember(cp);
    start = cp;
  }
  return runPipeline(start.signal, 'noise-carry', slice(recipe, start.at, n), registry, start.ctx, undefined, undefined, COMPANIONS).final.y;
}

/**
 * Simulated route (see the file comment): R seeded series per source, the
 * stack run on raw + ε, the spread of the differences pooled in stretches.
 */
export function carrySimulated(
  raw: Signal, run: PipelineResult, recipe: Recipe, registry: Registry, ctx: StepContext, noise: NoiseSources, seed = 20141,
  /** false: run the whole stack on fresh noisy inputs, reading and keeping no checkpoint (the tests' reference). */
  checkpoints = true,
): CarriedNoise {
  const base = run.final;
  const m = base.y.length;
  const R = realisationsFor(raw.x.length);
  const sumSq = new Float64Array(m);
  const others = sourcesUsed(run, ctx, noise);
  const tapsSample = noiseShapingTaps(noise.sample.rho);
  // What the noisy inputs are made of: the data (by identity: the pipeline's array numbers, so a checkpoint never
  // meets other data under the same trace id), the noise models, the seeds.
  const inputs = [
    `x${token(raw.x)}y${token(raw.y)}:${modelKey(noise.sample)}`,
    ...others.map((s) => `${s.label}:y${token(s.y)}:${modelKey(s.noise)}`),
    `b${ctx.blank ? token(ctx.blank.y) : '-'}`,
    `s${(ctx.scans ?? []).map((s) => `${s.id}:${token(s.x)}:${token(s.y)}`).join(',')}`,
  ].join('|');
  const runWith = (sign: 1 | -1, r: number): Float64Array => {
    const make = () => {
      const e = simulatedNoise(raw.x.length, noise.sample.profile, tapsSample, seed + r);
      const y = new Float64Array(raw.y.length);
      for (let i = 0; i < y.length; i++) y[i] = raw.y[i] + sign * e[i];
      let c: StepContext = ctx;
      others.forEach((s, k) => {
        const es = simulatedNoise(s.y.length, constantProfile(s.y.length, s.noise.sigma), noiseShapingTaps(s.noise.rho), seed + 1000 * (k + 1) + r);
        const ys = new Float64Array(s.y.length);
        for (let i = 0; i < ys.length; i++) ys[i] = s.y[i] + sign * es[i];
        c = ctxReplacing(c, s.y, ys);
      });
      return { signal: { x: raw.x, y }, ctx: c };
    };
    const out = checkpoints
      ? simulatedRun(`${inputs}|seed ${seed + r}|sign ${sign}`, (at, sig) => `${inputs}|seed ${seed}|${at}|${sig}`, make, raw, run, recipe, registry)
      : ((m0) => runPipeline(m0.signal, 'noise-carry', recipe, registry, m0.ctx, undefined, undefined, COMPANIONS).final.y)(make());
    if (out.length !== m) throw new Error('the processed grid changed when noise was added');
    return out;
  };
  // Autocovariance of the differences, lags 0..MAX_CARRIED_LAGS, on at most 2^16 points around the middle.
  const covSum = new Float64Array(MAX_CARRIED_LAGS + 1);
  const c0 = Math.max(0, (m >> 1) - (1 << 15)), c1 = Math.min(m, c0 + (1 << 16));
  for (let r = 0; r < R; r++) {
    const plus = runWith(1, r), minus = runWith(-1, r);
    // A constant shift (an asymmetric baseline settles at another level) is a change of level, not noise.
    let mean = 0;
    for (let i = 0; i < m; i++) mean += (plus[i] - minus[i]) / 2;
    mean /= m;
    for (let i = 0; i < m; i++) { const d = (plus[i] - minus[i]) / 2 - mean; sumSq[i] += d * d; }
    for (let k = 0; k <= MAX_CARRIED_LAGS && k < c1 - c0; k++) {
      let acc = 0;
      for (let i = c0; i + k < c1; i++) acc += ((plus[i] - minus[i]) / 2 - mean) * ((plus[i + k] - minus[i + k]) / 2 - mean);
      covSum[k] += acc / (c1 - c0 - k);
    }
  }
  const B = poolWidth(m, R);
  const starts: number[] = [], sig: number[] = [];
  for (let a = 0; a < m; a += B) {
    const b = Math.min(m, a + B);
    let s = 0;
    for (let i = a; i < b; i++) s += sumSq[i];
    starts.push(a); sig.push(Math.sqrt(s / ((b - a) * R)));
  }
  const profile: SigmaProfile = { points: m, starts: Int32Array.from(starts), sigma: Float64Array.from(sig) };
  const sigma = profileMedian(profile);
  const gain = noise.sample.sigma > 0 ? sigma / noise.sample.sigma : NaN;
  const L = noise.sample.rho.length - 1;
  const desc = `Carried by simulation: ${R} seeded noise series with the raw trace's σ and ${L === 0 ? 'no correlation (none measured)' : `autocorrelation (${L} lag${L === 1 ? '' : 's'})`} were added to and taken from the raw trace${others.length ? ` and ${others.map((o) => o.label).join(' and ')}` : ''}, the stack run on each, and half the spread of the difference pooled in stretches of ${B} points (median ${fmt(sigma)}, ${fmt(gain)} × the raw σ).`;
  return { route: 'simulated', profile, sigma, gain, lags: L, rho: trimRho(covSum), realisations: R, provisional: false, description: desc, notes: [] };
}

const CACHE = new Map<string, CarriedNoise>();
const CACHE_ENTRIES = 16;

function modelKey(s: SourceNoise): string {
  return `${s.sigma}|${Array.from(s.profile.sigma).join(',')}|${Array.from(s.rho).join(',')}`;
}

/**
 * The processed trace's σ, carried from the raw noise (see the file
 * comment). `cacheKey` names the input data (trace ids); results are cached
 * per stack and noise model.
 */
export function carryNoise(
  raw: Signal, run: PipelineResult, recipe: Recipe, registry: Registry, ctx: StepContext, noise: NoiseSources, cacheKey: string,
): CarriedNoise {
  const ran = ranSteps(run);
  if (ran.length === 0) {
    return {
      route: 'none', profile: noise.sample.profile, sigma: noise.sample.sigma, gain: 1, lags: noise.sample.rho.length - 1, rho: noise.sample.rho,
      realisations: 0, provisional: false, description: 'No processing step ran, so σ is the raw trace\'s σ.', notes: [],
    };
  }
  const stack = JSON.stringify(recipe.steps.filter((s) => s.enabled).map((s) => [s.step, s.params]));
  const key = `${cacheKey}|${ctx.blank?.id ?? '-'}|${(ctx.scans ?? []).map((s) => s.id).join(',')}|${stack}|${modelKey(noise.sample)}|${noise.blank ? modelKey(noise.blank) : '-'}|${[...(noise.scans?.values() ?? [])].map(modelKey).join(';')}`;
  const hit = CACHE.get(key);
  if (hit) { CACHE.delete(key); CACHE.set(key, hit); return hit; }
  const out = isLinearStack(run, registry, raw)
    ? carryLinear(raw, run, recipe, registry, ctx, noise)
    : carrySimulated(raw, run, recipe, registry, ctx, noise);
  CACHE.set(key, out);
  while (CACHE.size > CACHE_ENTRIES) { const k = CACHE.keys().next().value; if (k === undefined) break; CACHE.delete(k); }
  return out;
}
