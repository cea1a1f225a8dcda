/**
 * The loss check: which features survive each choice of processing, and
 * what each choice cost. Peaks found on alternative processings of one
 * trace are matched by position into features; the ledger reports, per
 * feature and alternative, whether it was found, its S/N and flag, and its
 * height, width, apex and area against the least-processed alternative,
 * with a sentence for every limit a feature crosses.
 *
 * Also: the expected height kept by a smoothing filter on a Gaussian,
 * computed from the filter's weights, and window advice from the narrowest
 * peak's half-height width.
 */
import type { Peak, PeakFlag } from './peak-types.ts';
import { savgolCoefficients } from '../numeric/savgol.ts';
import { points, type Points, type XUnits } from '../units.ts';

/** One processing alternative and the peak table measured on its output. */
export interface Alternative {
  readonly id: string;
  /** Words used in sentences, e.g. "5-point moving average". */
  readonly label: string;
  readonly peaks: readonly Peak[];
}

/** Where a feature stands in one alternative: its flag, or 'lost' when not found. */
export type Standing = PeakFlag | 'lost';

export interface MatchOptions {
  /** Sample spacing in x-units (for the tolerance floor and apex shifts in points). */
  dx: XUnits;
  /** x unit for sentences, e.g. "min" (default none). */
  xUnit?: string;
  /** Tolerance as a fraction of the reference peak's FWHM (default 0.5). */
  fwhmFraction?: number;
  /** Tolerance floor in samples (default 2). */
  minPoints?: Points;
  /** The S/N limits the flags were made with (default 3 and 10), for the sentences. */
  limits?: { detection: number; quantitation: number };
}

/** One feature in one alternative. Percentages are against the feature's reference: the least-processed column that has it. */
export interface LedgerCell {
  readonly found: boolean;
  /** Position of the matched peak in that alternative's `peaks` list, or -1. */
  readonly peakIndex: number;
  readonly x: number | null;
  readonly snr: number | null;
  readonly standing: Standing;
  /** The matched peak's own height (y-units), area (y·x-units) and FWHM (x-units) in this column; null when lost (issue 17: the focused view). */
  readonly height: number | null;
  readonly area: number | null;
  readonly fwhm: number | null;
  /** Height as % of the height in the first alternative. */
  readonly heightKept: number | null;
  /** FWHM change, % (positive = broader). */
  readonly widthChange: number | null;
  /** Apex shift in x-units and in samples (positive = later). */
  readonly apexShift: number | null;
  readonly apexShiftPoints: number | null;
  /** Area change, %. */
  readonly areaChange: number | null;
  /** 'down' when the standing fell below the first alternative's, 'up' when it rose. */
  readonly crossed: 'down' | 'up' | null;
}

export interface LedgerRow {
  /** x of the peak that started the feature (first alternative where it was found). */
  readonly position: number;
  /** Matching tolerance used for this feature (x-units). */
  readonly tolerance: number;
  /** Index of the first alternative in which the feature was found. */
  readonly firstFoundIn: number;
  readonly cells: readonly LedgerCell[];
  /** True when any alternative crossed a limit relative to the first. */
  readonly crossed: boolean;
  readonly sentences: readonly string[];
}

export interface Ledger {
  readonly alternatives: readonly { id: string; label: string }[];
  readonly rows: readonly LedgerRow[];
  /** All sentences, in order of position. */
  readonly sentences: readonly string[];
  /** How features were matched, in words. */
  readonly rule: string;
}

const LEVEL: Record<Standing, number> = { 'lost': 0, 'below-detection': 1, 'detectable': 2, 'quantifiable': 3, 'not-measured': -1 };

function decimalsFor(dx: number): number {
  return Math.min(8, Math.max(0, Math.ceil(-Math.log10(Math.abs(dx)) - 1e-9)));
}

function pct(a: number, b: number): number | null {
  return b !== 0 && Number.isFinite(a / b) ? (100 * a) / b : null;
}

interface Feature { position: number; tolerance: number; first: number; match: number[] }

/** Pairs (peak, feature) within the feature's tolerance, in an order the assignment may take them in (see {@link nearestFirstByGroup}). */
interface Pairs { count: number; f: Int32Array; p: Int32Array }

/** Pushes onto growing typed arrays (pairs are few per peak, but their total is not known in advance). */
class PairList {
  d = new Float64Array(64);
  f = new Int32Array(64);
  p = new Int32Array(64);
  count = 0;
  push(d: number, f: number, p: number): void {
    if (this.count === this.d.length) {
      const grow = <T extends Float64Array | Int32Array>(a: T, make: (n: number) => T): T => { const b = make(a.length * 2); b.set(a); return b; };
      this.d = grow(this.d, (n) => new Float64Array(n));
      this.f = grow(this.f, (n) => new Int32Array(n));
      this.p = grow(this.p, (n) => new Int32Array(n));
    }
    this.d[this.count] = d; this.f[this.count] = f; this.p[this.count] = p;
    this.count++;
  }
}

/**
 * Every (peak, feature) pair with |peak.x − feature.position| ≤ feature.tolerance,
 * peaks the user removed left out, nearest first within each group of pairs
 * that share a feature or a peak. The same pairs as testing every peak against
 * every feature, found in O((P + F) log(P + F) + pairs) by a
 * sweep along x: each feature is an interval [position − tolerance,
 * position + tolerance] (widened by a hair so rounding cannot drop a pair; the
 * exact test above decides), peaks are visited in ascending x, features enter
 * the active set when their interval starts and leave it (a min-heap on the
 * interval's end) once a peak lies past it, and each peak is tested against the
 * active features only. Peaks or features with a position or tolerance that is
 * not a finite number are tested against everything, as before.
 */
function candidatePairs(peaks: readonly Peak[], features: readonly Feature[]): Pairs {
  const out = new PairList();
  const nF = features.length;
  const regularF: number[] = [], oddF: number[] = [];
  for (let f = 0; f < nF; f++) {
    const { position, tolerance } = features[f];
    (Number.isFinite(position) && Number.isFinite(tolerance) && tolerance >= 0 ? regularF : oddF).push(f);
  }
  const regularP: number[] = [], oddP: number[] = [];
  for (let p = 0; p < peaks.length; p++) {
    if (peaks[p].removedByUser) continue;
    (Number.isFinite(peaks[p].x) ? regularP : oddP).push(p);
  }
  const test = (p: number, f: number): void => {
    const d = Math.abs(peaks[p].x - features[f].position);
    if (d <= features[f].tolerance) out.push(d, f, p);
  };
  if (regularF.length > 0 && regularP.length > 0) {
    const lo = new Float64Array(nF), hi = new Float64Array(nF);
    for (const f of regularF) {
      const { position, tolerance } = features[f];
      const hair = 1e-9 * (Math.abs(position) + tolerance) + 1e-300;
      lo[f] = position - tolerance - hair;
      hi[f] = position + tolerance + hair;
    }
    regularF.sort((u, v) => lo[u] - lo[v] || u - v);
    regularP.sort((u, v) => peaks[u].x - peaks[v].x || u - v);
    // Active features: an array with O(1) removal (where[f] = place in it) and a min-heap on hi.
    const active = new Int32Array(nF), where = new Int32Array(nF).fill(-1);
    let nActive = 0;
    const heap = new Int32Array(nF);
    let nHeap = 0;
    const heapPush = (f: number): void => {
      let k = nHeap++;
      while (k > 0) {
        const parent = (k - 1) >> 1;
        if (hi[heap[parent]] <= hi[f]) break;
        heap[k] = heap[parent]; k = parent;
      }
      heap[k] = f;
    };
    const heapPop = (): number => {
      const top = heap[0], x = heap[--nHeap];
      let k = 0;
      for (;;) {
        let c = 2 * k + 1;
        if (c >= nHeap) break;
        if (c + 1 < nHeap && hi[heap[c + 1]] < hi[heap[c]]) c++;
        if (hi[heap[c]] >= hi[x]) break;
        heap[k] = heap[c]; k = c;
      }
      heap[k] = x;
      return top;
    };
    let next = 0;
    for (const p of regularP) {
      const x = peaks[p].x;
      while (next < regularF.length && lo[regularF[next]] <= x) {
        const f = regularF[next++];
        where[f] = nActive; active[nActive++] = f;
        heapPush(f);
      }
      while (nHeap > 0 && hi[heap[0]] < x) {
        const f = heapPop();
        const k = where[f], last = active[--nActive];
        active[k] = last; where[last] = k; where[f] = -1;
      }
      for (let k = 0; k < nActive; k++) test(p, active[k]);
    }
  }
  for (const f of oddF) for (const p of [...regularP, ...oddP]) test(p, f);
  for (const p of oddP) for (const f of regularF) test(p, f);
  return nearestFirstByGroup(out, nF, peaks.length);
}

/**
 * The pairs in an order the one-peak-per-feature assignment can take them in:
 * nearest first (ties by feature, then by peak) within each group of pairs
 * that share features or peaks, one group after another. Groups share nothing,
 * so taking them one by one gives the same assignment as sorting all pairs,
 * and only the few groups with more than one pair need sorting (on a long
 * noisy trace most peaks have one candidate feature and that feature one peak).
 */
function nearestFirstByGroup(pairs: PairList, nF: number, nP: number): Pairs {
  const { count, d, f, p } = pairs;
  // Union-find over features 0 … nF − 1 and peaks nF … nF + nP − 1.
  const parent = new Int32Array(nF + nP);
  for (let k = 0; k < parent.length; k++) parent[k] = k;
  const find = (a: number): number => {
    while (parent[a] !== a) { parent[a] = parent[parent[a]]; a = parent[a]; }
    return a;
  };
  for (let k = 0; k < count; k++) {
    const a = find(f[k]), b = find(nF + p[k]);
    if (a !== b) parent[a] = b;
  }
  // Group the pairs by their root (counting sort), keeping their order within a group.
  const root = new Int32Array(count);
  const start = new Int32Array(nF + nP + 1);
  for (let k = 0; k < count; k++) { root[k] = find(f[k]); start[root[k] + 1]++; }
  for (let r = 0; r < nF + nP; r++) start[r + 1] += start[r];
  const fill = start.slice();
  const order = new Int32Array(count);
  for (let k = 0; k < count; k++) order[fill[root[k]]++] = k;
  const before = (u: number, v: number): number => d[u] - d[v] || f[u] - f[v] || p[u] - p[v];
  for (let r = 0; r < nF + nP; r++) {
    const a = start[r], b = start[r + 1];
    if (b - a > 1) order.subarray(a, b).sort(before);
  }
  return { count, f: Int32Array.from(order, (k) => f[k]), p: Int32Array.from(order, (k) => p[k]) };
}

/**
 * Match peaks across alternatives into features and write the survival
 * ledger. The first alternative is the least processed (the reference).
 *
 * Matching: features start from the first alternative's peaks; each later
 * alternative's peaks are paired with the features already known, nearest
 * first, one peak per feature, when within the feature's tolerance
 * max(fwhmFraction × FWHM of the peak that started it, minPoints × dx)
 * (defaults 0.5 and 2; our choice: half a width keeps two resolved peaks
 * apart while absorbing the apex shift smoothing causes). An unpaired peak
 * starts a new feature. Peaks the user removed are left out.
 *
 * Sentences name every limit crossed against the first alternative, e.g.
 * "The feature at 12.41 min drops below S/N 3 with 5-point moving average."
 * @throws RangeError when there are no alternatives or dx is not positive.
 */
export function matchPeaks(alternatives: readonly Alternative[], options: MatchOptions): Ledger {
  if (alternatives.length === 0) throw new RangeError('The loss check needs at least one alternative.');
  const dx = Math.abs(options.dx);
  if (!(dx > 0) || !Number.isFinite(dx)) throw new RangeError(`The sample spacing must be a positive number; got ${options.dx}.`);
  const frac = options.fwhmFraction ?? 0.5;
  const minPts = options.minPoints ?? 2;
  if (!(frac >= 0) || !(minPts >= 0)) throw new RangeError('The matching tolerance settings must be 0 or more.');
  const limits = options.limits ?? { detection: 3, quantitation: 10 };
  const unit = options.xUnit ? ` ${options.xUnit}` : '';
  const dec = decimalsFor(dx);

  const features: Feature[] = [];
  const nAlt = alternatives.length;

  for (let a = 0; a < nAlt; a++) {
    const peaks = alternatives[a].peaks;
    const pairs = candidatePairs(peaks, features);
    const peakUsed = new Uint8Array(peaks.length);
    for (let k = 0; k < pairs.count; k++) {
      const f = pairs.f[k], p = pairs.p[k];
      if (features[f].match[a] >= 0 || peakUsed[p]) continue;
      features[f].match[a] = p;
      peakUsed[p] = 1;
    }
    for (let p = 0; p < peaks.length; p++) {
      if (peakUsed[p] || peaks[p].removedByUser) continue;
      const match = new Array<number>(nAlt).fill(-1);
      match[a] = p;
      features.push({ position: peaks[p].x, tolerance: Math.max(frac * peaks[p].fwhm, minPts * dx), first: a, match });
    }
  }
  features.sort((u, v) => u.position - v.position);

  const rows: LedgerRow[] = features.map((f) => {
    // Each feature is judged against the least-processed column that has it: on a noisy raw trace a small
    // peak may only show once lightly smoothed, and what heavier smoothing then does to it still matters.
    const refCol = f.first;
    const ref = alternatives[refCol].peaks[f.match[refCol]];
    const refStanding: Standing = ref.flag;
    let whereText: string | null = null;
    const where = (): string => (whereText ??= `The feature at ${f.position.toFixed(dec)}${unit}`);
    const sentences: string[] = [];
    if (refCol > 0) sentences.push(`${where()} is not found with ${alternatives[0].label}; it first appears with ${alternatives[refCol].label}, so check that the processing did not make it.`);
    const cells: LedgerCell[] = f.match.map((p, a) => {
      const pk = p >= 0 ? alternatives[a].peaks[p] : null;
      const standing: Standing = pk ? pk.flag : 'lost';
      let crossed: LedgerCell['crossed'] = null;
      if (a > refCol && LEVEL[standing] >= 0 && LEVEL[refStanding] >= 0 && standing !== refStanding) {
        crossed = LEVEL[standing] < LEVEL[refStanding] ? 'down' : 'up';
        const label = alternatives[a].label;
        if (crossed === 'down') {
          if (standing === 'lost') sentences.push(`${where()} is lost with ${label}.`);
          else if (standing === 'below-detection') sentences.push(`${where()} drops below S/N ${limits.detection} with ${label}.`);
          else sentences.push(`${where()} drops below S/N ${limits.quantitation} (quantitation limit) with ${label}.`);
        } else {
          const lim = standing === 'quantifiable' ? limits.quantitation : limits.detection;
          sentences.push(`${where()} rises above S/N ${lim} with ${label}.`);
        }
      }
      const shift = pk && a >= refCol ? pk.x - ref.x : null;
      const cmp = pk !== null && a >= refCol;
      return {
        found: pk !== null, peakIndex: p, x: pk ? pk.x : null, snr: pk ? pk.snr : null, standing,
        height: pk ? pk.height : null, area: pk ? pk.area : null, fwhm: pk ? pk.fwhm : null,
        heightKept: cmp ? pct(pk.height, ref.height) : null,
        widthChange: cmp ? (pct(pk.fwhm - ref.fwhm, ref.fwhm)) : null,
        apexShift: shift, apexShiftPoints: shift === null ? null : shift / dx,
        areaChange: cmp ? pct(pk.area - ref.area, ref.area) : null,
        crossed,
      };
    });
    return {
      position: f.position, tolerance: f.tolerance, firstFoundIn: f.first, cells,
      crossed: cells.some((c) => c.crossed !== null), sentences,
    };
  });

  return {
    alternatives: alternatives.map((a) => ({ id: a.id, label: a.label })),
    rows,
    sentences: allSentences(rows),
    rule: `Peaks are the same feature when their apexes lie within max(${frac} × FWHM, ${minPts} points) of the feature's first apex; nearest pairs first, one peak per feature. Each feature's changes are against the least-processed column that has it (${alternatives[0].label} when found there).`,
  };
}

/** Every row's sentences in order (a plain loop: flatMap over tens of thousands of mostly empty lists is slow). */
function allSentences(rows: readonly LedgerRow[]): string[] {
  const out: string[] = [];
  for (const r of rows) for (const t of r.sentences) out.push(t);
  return out;
}

function checkSigma(sigmaPoints: number): void {
  if (!(sigmaPoints > 0) || !Number.isFinite(sigmaPoints)) {
    throw new RangeError(`The Gaussian's σ must be a positive number of points; got ${sigmaPoints}.`);
  }
}

/**
 * Height kept by an N-point moving average at the apex of a sampled
 * Gaussian of standard deviation σ points:
 * (1/N) Σ_{k=−(N−1)/2}^{(N−1)/2} exp(−k²/2σ²). Exact for an apex on a
 * sample and odd N (even N: the apex midway between samples). For example
 * N = 5, σ = 5 → 0.961326 (the exact sum, worked out by hand). Approximately
 * 1/√(1 + (N² − 1)/(12σ²)).
 * @throws RangeError unless N is a whole number ≥ 1 and σ > 0.
 */
export function gaussianHeightRatioMovingAverage(N: Points, sigmaPoints: Points): number {
  if (!Number.isInteger(N) || N < 1) throw new RangeError(`The moving-average window must be a whole number of points, at least 1; got ${N}.`);
  checkSigma(sigmaPoints);
  let s = 0;
  for (let j = 0; j < N; j++) {
    const k = j - (N - 1) / 2;
    s += Math.exp((-k * k) / (2 * sigmaPoints * sigmaPoints));
  }
  return s / N;
}

/**
 * Height kept by any symmetric smoothing filter with weights c (centred,
 * k = index − (len − 1)/2) at the apex of a sampled Gaussian of σ points:
 * Σ c_k exp(−k²/2σ²). With Savitzky–Golay weights this is the SG height
 * loss (quadratic, window 11 / 25, σ = 5 → 0.98827 / 0.8445, from
 * scipy.signal.savgol_coeffs).
 * @throws RangeError for empty weights or σ ≤ 0.
 */
export function gaussianHeightRatioFromCoefficients(coeffs: ArrayLike<number>, sigmaPoints: Points): number {
  if (coeffs.length === 0) throw new RangeError('The filter needs at least one weight.');
  checkSigma(sigmaPoints);
  const mid = (coeffs.length - 1) / 2;
  let s = 0;
  for (let j = 0; j < coeffs.length; j++) {
    const k = j - mid;
    s += coeffs[j] * Math.exp((-k * k) / (2 * sigmaPoints * sigmaPoints));
  }
  return s;
}

/** FWHM / σ of a Gaussian, 2√(2 ln 2). */
export const GAUSSIAN_FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

export interface WindowAdvice {
  /** Window in units of the narrowest peak's FWHM. */
  readonly ratio: number;
  /** Fraction of a Gaussian's height (of that FWHM) the step keeps, computed from its weights. */
  readonly expectedHeightKept: number;
  /** The rule of thumb applied, with its source. */
  readonly rule: string;
  /** Set when the window passes the rule: what it costs, in words. */
  readonly warning?: string;
}

/**
 * Advice on a smoothing window from the narrowest peak's half-height width
 * (measured on the least-processed trace). Rules of thumb, marked as such:
 * Savitzky–Golay quadratic/cubic window up to about 1 × FWHM (O'Haver,
 * signal-processing notes; common practice), quartic and above up to
 * 1–2 × FWHM (Press & Teukolsky 1990, Comput. Phys. 4:669), moving average
 * (and SG of order 0–1, which is one) up to about 0.5 × FWHM (common
 * practice). The expected height kept is computed for a Gaussian of that
 * FWHM from the filter's own weights.
 * @param windowPoints odd number of samples.
 * @param order polynomial order (SG only; ignored for the moving average).
 * @param narrowestFwhmPoints half-height width of the narrowest peak, in samples.
 * @throws RangeError for windows or widths that are not positive, or an order the window cannot fit.
 */
export function windowAdvice(
  stepKind: 'moving-average' | 'savitzky-golay', windowPoints: Points, order: number, narrowestFwhmPoints: Points,
): WindowAdvice {
  if (!Number.isInteger(windowPoints) || windowPoints < 1) throw new RangeError(`The window must be a whole number of points; got ${windowPoints}.`);
  if (!(narrowestFwhmPoints > 0) || !Number.isFinite(narrowestFwhmPoints)) {
    throw new RangeError(`The narrowest peak width must be a positive number of points; got ${narrowestFwhmPoints}.`);
  }
  const sigma = points(narrowestFwhmPoints / GAUSSIAN_FWHM_PER_SIGMA);
  const ratio = windowPoints / narrowestFwhmPoints;
  let kept: number, limit: number, rule: string, name: string;
  if (stepKind === 'moving-average' || order <= 1) {
    kept = stepKind === 'moving-average'
      ? gaussianHeightRatioMovingAverage(windowPoints, sigma)
      : gaussianHeightRatioFromCoefficients(savgolCoefficients(windowPoints, order), sigma);
    limit = 0.5;
    rule = 'Moving-average window up to about 0.5 × the narrowest FWHM (common practice).';
    name = stepKind === 'moving-average' ? `${windowPoints}-point moving average` : `${windowPoints}-point Savitzky–Golay window (order ${order}, a moving average)`;
  } else {
    kept = gaussianHeightRatioFromCoefficients(savgolCoefficients(windowPoints, order), sigma);
    if (order <= 3) {
      limit = 1;
      rule = "Savitzky–Golay quadratic/cubic window up to about 1 × the narrowest FWHM (O'Haver, signal-processing notes; common practice).";
    } else {
      limit = 2;
      rule = 'Savitzky–Golay quartic or higher window up to 1–2 × the narrowest FWHM (Press & Teukolsky 1990, Comput. Phys. 4:669).';
    }
    name = `${windowPoints}-point Savitzky–Golay window (order ${order})`;
  }
  const advice: WindowAdvice = { ratio, expectedHeightKept: kept, rule };
  if (ratio > limit) {
    return {
      ...advice,
      warning: `The ${name} spans ${ratio.toFixed(2)} × the narrowest peak's half-height width (${narrowestFwhmPoints.toFixed(1)} points), above the usual limit of about ${limit} ×. A Gaussian peak that narrow keeps about ${(100 * kept).toFixed(1)} % of its height.`,
    };
  }
  return advice;
}
