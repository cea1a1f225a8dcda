/**
 * The peak table: detection (peak-detection.ts) filtered by the user's
 * thresholds, each peak measured against its own local baseline
 * (peak-bounds.ts), S/N by a stated definition (peak-snr.ts), and marks
 * for what the numbers cannot show (thin sampling, a flat top at the
 * trace's largest value, a feature only processing made).
 */
import { applyHandBounds } from './hand-bounds.ts';
import { indexRange } from './noise-estimators.ts';
import { lowerBound } from '../numeric/decimate.ts';
import {
  keepByGap, peakWidths, prominentMaxima, prominenceWalk, checkPeaks, type ProminenceData,
} from './peak-detection.ts';
import {
  areaAbove, blankMeasure, capBounds, copyMeasure, locatingCopy, lineAt, measureLocal, measureLocalInto, mergeShallow, ridersOf, shareValleys, xAt,
  type LocalMeasure, type MeasureContext,
} from './peak-bounds.ts';
import { noiseModel, pharmacopoeialNoise, regionSnr, snrFlag, snrRms } from './peak-snr.ts';
import type { Peak, PeakDecisions, PeakMark, PeakOptions } from './peak-types.ts';
import type { Stepwise } from '../analysis/pause.ts';

/** Fewer samples than this across the half-height width mark a peak as thinly sampled. */
export const THIN_SAMPLING_POINTS = 5;
/** Samples in a row at the trace's largest value that mark a top as flat (possibly saturated). */
export const FLAT_TOP_POINTS = 3;

/** A candidate before its table row is made: the local measures and the SciPy figures. */
interface Candidate {
  m: LocalMeasure;
  prominence: number;
  leftBase: number;
  rightBase: number;
  origin: Peak['origin'];
  note?: string;
}

function checkOptions(x: Float64Array, y: Float64Array, o: PeakOptions): void {
  if (x.length !== y.length) throw new RangeError(`x has ${x.length} values but y has ${y.length}; they must be the same length.`);
  if (x.length < 3) throw new RangeError(`The trace has ${x.length} point(s); peaks need at least 3.`);
  const nonneg: [string, number][] = [
    ['minimum prominence', o.minProminence], ['minimum S/N', o.minSnr], ['minimum width', o.minWidth], ['minimum separation', o.minSeparation],
  ];
  for (const [name, v] of nonneg) if (!(v >= 0) || !Number.isFinite(v)) throw new RangeError(`The ${name} must be a number of 0 or more; got ${v}.`);
  if (!(o.noiseSigma >= 0) || !Number.isFinite(o.noiseSigma)) {
    throw new RangeError(`The noise σ must be a number of 0 or more; got ${o.noiseSigma}. Mark a quiet range or use the automatic estimate.`);
  }
  if (o.noiseProfile && o.noiseProfile.points !== x.length) throw new RangeError(`The noise σ profile belongs to a grid of ${o.noiseProfile.points} points but the trace has ${x.length}.`);
  if (!(o.pharmacopoeialMultiplier > 0)) throw new RangeError(`The noise window multiplier must be positive; got ${o.pharmacopoeialMultiplier}.`);
  if (!(o.limits.detection > 0 && o.limits.quantitation > o.limits.detection)) {
    throw new RangeError(`The detection limit must be positive and below the quantitation limit; got ${o.limits.detection} and ${o.limits.quantitation}.`);
  }
  const b = o.pharmacopoeialNoise;
  if (b && (b.x.length !== b.y.length || b.x.length < 3)) throw new RangeError('The noise trace for the pharmacopoeial S/N must have equal x and y lengths and at least 3 points.');
}

function detectionSignal(y: Float64Array, negative: boolean | undefined): Float64Array {
  if (!negative) return y;
  const s = new Float64Array(y.length);
  for (let i = 0; i < y.length; i++) s[i] = -y[i];
  return s;
}

function context(x: Float64Array, s: Float64Array, o: PeakOptions): MeasureContext {
  return { x, s, noise: noiseModel(s, o), loc: locatingCopy(s) };
}

/** S/N of the definition in use from a local measure, before the row is made (for the thresholds). */
function snrOf(c: MeasureContext, y: Float64Array, m: LocalMeasure, o: PeakOptions): number | null {
  const fwhm = xAt(c.x, m.rightIp) - xAt(c.x, m.leftIp);
  if (o.snrDefinition === 'rms') return snrRms(m.height, c.noise.sigmaAt(m.index));
  if (o.snrDefinition === 'pharmacopoeial') {
    const pn = pharmacopoeialNoise(c.x, y, m.xApex, fwhm, o, m.index);
    return pn && pn.h > 0 ? (2 * Math.abs(m.height)) / pn.h : null;
  }
  return regionSnr(c.s, m.start, m.end);
}

/** True when the top around sample i is flat for {@link FLAT_TOP_POINTS} samples in a row at the value `top`. */
function flatTopAt(s: ArrayLike<number>, i: number, top: number): boolean {
  if (s[i] !== top) return false;
  let a = i, b = i;
  while (a > 0 && s[a - 1] === top) a--;
  while (b < s.length - 1 && s[b + 1] === top) b++;
  return b - a + 1 >= FLAT_TOP_POINTS;
}

/** Largest value of s. */
function maxOf(s: ArrayLike<number>): number {
  let v = -Infinity;
  for (let i = 0; i < s.length; i++) if (s[i] > v) v = s[i];
  return v;
}

function makePeak(c: MeasureContext, y: Float64Array, sign: number, k: Candidate, o: PeakOptions, top: number): Peak {
  const { x, s, noise } = c;
  const m = k.m;
  const i = m.index;
  const leftHalf = xAt(x, m.leftIp), rightHalf = xAt(x, m.rightIp);
  const fwhm = rightHalf - leftHalf;
  const fwhmPoints = m.rightIp - m.leftIp;
  const sigma = noise.sigmaAt(i);
  const rms = snrRms(m.height, sigma);
  const pn = pharmacopoeialNoise(x, y, m.xApex, fwhm, o, i);
  const snrPharma = pn && pn.h > 0 ? (2 * Math.abs(m.height)) / pn.h : null;
  const wantRegion = o.snrDefinition === 'region' || o.regionSnr === true;
  const snrRegionV = wantRegion ? regionSnr(s, m.start, m.end) : null;
  const snr = o.snrDefinition === 'rms' ? rms : o.snrDefinition === 'pharmacopoeial' ? snrPharma : snrRegionV;
  const marks: PeakMark[] = [];
  if (flatTopAt(s, i, top)) marks.push('possibly-saturated');
  if (fwhmPoints < THIN_SAMPLING_POINTS) marks.push('thinly-sampled');
  const notes = [k.note, m.note].filter((t): t is string => !!t);
  const peak: Peak = {
    index: i, x: m.xApex, y: y[i], height: sign * m.height, prominence: k.prominence,
    leftBase: k.leftBase, rightBase: k.rightBase, leftBaseX: x[k.leftBase], rightBaseX: x[k.rightBase],
    fwhm, fwhmPoints, leftHalf, rightHalf,
    startIndex: m.start, endIndex: m.end, start: x[m.start], end: x[m.end], startKind: m.startKind, endKind: m.endKind,
    baselineStart: sign * lineAt(m.line, x[m.start]), baselineEnd: sign * lineAt(m.line, x[m.end]), split: m.split,
    area: sign * areaAbove(x, s, m.line, m.start, m.end),
    noiseSigma: sigma, snrRms: rms, snrPharma, pharmaNoise: pn, snrRegion: snrRegionV, snr, snrDefinition: o.snrDefinition,
    flag: snrFlag(snr, o.limits), marks, origin: k.origin,
  };
  return notes.length ? { ...peak, note: notes.join(' ') } : peak;
}

/**
 * Narrow peaks riding on broad ones are noted, shallow splits of one top
 * are merged, and neighbours share valleys (rule 6 of peak-bounds.ts); then
 * the rows are made. A peak joins a group when it stands at or above the detection
 * limit by its own measure, when its S/N cannot be measured, or when the
 * user placed it. Detected peaks left at or below their baseline (height or
 * area not positive) are dropped.
 */
function finish(c: MeasureContext, y: Float64Array, sign: number, all: Candidate[], o: PeakOptions): Peak[] {
  all.sort((a, b) => a.m.index - b.m.index);
  const riders = ridersOf(c, all.map((k) => k.m));
  for (let k = 0; k < all.length; k++) {
    const host = riders[k];
    if (host >= 0) all[k].note = `Rides on the peak at ${fmtX(all[host].m.xApex)} (narrower than half its width, on its top or a flank it does not split): measured against its own local baseline; its area is also inside that peak's.`;
  }
  const of = new Map(all.map((k) => [k.m, k]));
  const free = all.filter((_, k) => riders[k] < 0);
  const cands = mergeShallow(c, free.map((k) => k.m), o.limits.detection, (m) => of.get(m)?.origin === 'added-by-user', (m) => of.get(m)?.prominence ?? 0).map((m) => of.get(m) as Candidate);
  const grouped = cands.map((k) => {
    if (k.origin === 'added-by-user') return true;
    const snr = snrOf(c, y, k.m, o);
    return snr === null || snr >= o.limits.detection;
  });
  shareValleys(c, cands.map((k) => k.m), grouped, o.split ?? 'perpendicular-drop');
  const rows = cands.concat(all.filter((_, k) => riders[k] >= 0)).sort((a, b) => a.m.index - b.m.index);
  const top = maxOf(c.s);
  const out: Peak[] = [];
  for (const k of rows) {
    capBounds(c, k.m);
    if (k.origin === 'detected' && !(k.m.height > 0)) continue;
    const row = makePeak(c, y, sign, k, o, top);
    // Sharing a valley can lower a height: the thresholds hold for the final measures too.
    if (k.origin === 'detected' && ((row.snr !== null && row.snr < o.minSnr) || (o.minWidth > 0 && row.fwhm < o.minWidth))) continue;
    // A peak is more signal than its baseline between its bounds: a detected bump whose area above its own line is
    // not positive (its apex above the line, its flanks below: noise on a sagging stretch) is no peak.
    if (k.origin === 'detected' && !(sign * row.area > 0)) continue;
    out.push(row);
  }
  return out;
}

/** x for a sentence: six significant digits. */
function fmtX(v: number): string {
  return Number(v.toPrecision(6)).toString();
}

/**
 * Sensible starting thresholds for a trace whose noise σ is known.
 * * minProminence = 2σ: a rise less than 2σ above its bases is within the
 *   swing of ordinary noise wiggles (our choice).
 * * minSnr = 2: the lenient detection limit some labs accept; candidates
 *   between 2 and the detection limit 3 stay in the table flagged
 *   'below-detection' rather than hidden.
 * * minWidth = 2.5 sample spacings: one sample standing out measures a
 *   half-height width of about 1 (crossings interpolated half-way to its
 *   neighbours), two neighbouring samples about 2, three samples (a
 *   one-point spike spread by a 3-point average, or the narrowest peak
 *   worth measuring) 3 less the noise in the interpolated crossings
 *   (common practice: a peak should span several points). Peaks under 5
 *   points are kept and marked thinly sampled.
 * * minSeparation = 0 (off); S/N by the RMS definition, limits 3 and 10
 *   (ICH Q2(R1)), pharmacopoeial window 5 × FWHM (USP <621>, Ph. Eur. 2.2.46),
 *   perpendicular drop between peaks sharing a valley.
 * @param noiseSigma y-units, ≥ 0.
 * @param dx mean sample spacing in x-units (default 1).
 */
export function defaultPeakOptions(noiseSigma: number, dx = 1): PeakOptions {
  return {
    minProminence: 2 * noiseSigma,
    minSnr: 2,
    minWidth: 2.5 * Math.abs(dx),
    minSeparation: 0,
    noiseSigma,
    snrDefinition: 'rms',
    pharmacopoeialMultiplier: 5,
    split: 'perpendicular-drop',
    limits: { detection: 3, quantitation: 10 },
  };
}

/**
 * Detect and measure peaks (dips with `negative`) on a trace.
 *
 * Candidates are the local maxima (SciPy's definition, peak-detection.ts)
 * with prominence ≥ minProminence. Each is measured against its own local
 * baseline (peak-bounds.ts: own half-height width, apex from a parabola
 * over its own top, bounds where the trace returns to the baseline or at a
 * valley, never beyond 8 half-widths of its own) and kept when its height
 * and area above that baseline are positive (looking for peaks never lists a dip,
 * and the other way round), its own half-height width is ≥ minWidth
 * (x-units) and its S/N ≥ minSnr (definition in use; S/N that cannot be
 * measured, e.g. with σ = 0, keeps the candidate). Then SciPy's distance
 * rule with minSeparation (x-units; applied last, so noise wiggles cannot
 * suppress a real peak before they are themselves discarded), and the
 * valleys shared between neighbours (perpendicular drop by default).
 *
 * S/N: H/σ with σ at the apex, 2H/h (USP <621>, Ph. Eur. 2.2.46; h over
 * multiplier × the own FWHM of a blank, else of the trace itself from two
 * stretches 1.5 FWHM either side of the apex, detrended, labelled so), and
 * mean/SD of the region when asked. Candidates below the detection limit
 * are kept and flagged. Returns peaks in ascending x. Never changes x or y.
 * @throws RangeError for unequal lengths, fewer than 3 points, or
 *   thresholds that are negative or not numbers (message says which).
 */
export function detectPeaks(x: Float64Array, y: Float64Array, options: PeakOptions): Peak[] {
  const steps = detectPeaksStepwise(x, y, options);
  for (;;) {
    const r = steps.next();
    if (r.done) return r.value;
  }
}

/** Candidates measured between two pauses of {@link detectPeaksStepwise} (a few ms of work). */
export const DETECT_PAUSE_EVERY = 2048;

/**
 * Candidates another thread could measure (issue 16): the trace, the options,
 * and each candidate's apex and half-prominence width, in order. Every
 * candidate's measure depends on that candidate alone, so the table is the
 * same whoever measures which.
 */
export interface CandidateShare {
  x: Float64Array;
  y: Float64Array;
  options: PeakOptions;
  index: Int32Array;
  halfWidth: Float64Array;
}

/** What the other thread hands back: the kept candidates' places in the share (ascending) and their measures. */
export interface SharedKept {
  at: Int32Array;
  measures: LocalMeasure[];
}

/** One share being measured elsewhere. */
export interface SharedJob {
  /** Settles when the result is in, or the job failed or was cancelled; never rejects. */
  readonly settled: Promise<void>;
  /** The result once in; undefined before, or when the job failed or was cancelled. */
  result(): SharedKept | undefined;
  /** Stop the job (harmless once it is over). */
  cancel(): void;
}

/** Fewest candidates detection offers to share: below it a message costs more than it saves. */
export const SHARE_MIN_CANDIDATES = 4096;
/**
 * The part of the candidates offered (the later ones). Under half: the other thread first takes in the trace
 * and builds its own context, and measured at 10⁶ points it took 157–197 ms for half the candidates where
 * detection took 141–179 ms for the other half (e2e/timing.bench.mjs traces, load 1.3–1.5 on 2 cores).
 */
export const SHARE_FRACTION = 0.45;

/**
 * Measure candidate i into m and say whether it stays: a positive height above its own baseline, its own
 * half-height width ≥ minWidth, its S/N ≥ minSnr (an S/N that cannot be measured keeps it).
 */
function keepCandidate(c: MeasureContext, y: Float64Array, o: PeakOptions, i: number, firstWidth: number, m: LocalMeasure): boolean {
  // A candidate narrower than minWidth is dropped as soon as its final width is known (the test below, the same).
  if (!measureLocalInto(c, i, firstWidth, m, o.minWidth)) return false;
  if (!(m.height > 0)) return false;
  if (o.minWidth > 0 && xAt(c.x, m.rightIp) - xAt(c.x, m.leftIp) < o.minWidth) return false;
  if (o.minSnr > 0) {
    const snr = snrOf(c, y, m, o);
    if (snr !== null && snr < o.minSnr) return false;
  }
  return true;
}

/** Measure candidates from..to−1 (apexes `index`, first widths `halfWidth`), pausing now and then; `keep` gets each one kept. */
function* measureCandidates(c: MeasureContext, y: Float64Array, o: PeakOptions, index: Int32Array, halfWidth: Float64Array, from: number, to: number, keep: (k: number, m: LocalMeasure) => void): Stepwise<void> {
  // Each candidate is measured into this one object (this call's own); the few kept get a copy of their own.
  const m = blankMeasure();
  for (let k = from; k < to; k++) {
    if (k % DETECT_PAUSE_EVERY === DETECT_PAUSE_EVERY - 1) yield;
    if (keepCandidate(c, y, o, index[k], halfWidth[k], m)) keep(k, copyMeasure(m));
  }
}

/**
 * Measure a share of candidates (on the partner thread), in steps: it pauses after every
 * {@link DETECT_PAUSE_EVERY} candidates, so that thread can see a cancel.
 */
export function* measureShareStepwise(share: CandidateShare): Stepwise<SharedKept> {
  const { x, y, options: o } = share;
  checkOptions(x, y, o);
  const c = context(x, detectionSignal(y, o.negative), o);
  const at: number[] = [];
  const measures: LocalMeasure[] = [];
  yield* measureCandidates(c, y, o, share.index, share.halfWidth, 0, share.index.length, (k, m) => { at.push(k); measures.push(m); });
  return { at: Int32Array.from(at), measures };
}

/**
 * {@link detectPeaks} in steps: it pauses (yields) after every
 * {@link DETECT_PAUSE_EVERY} candidates measured, so a caller can let other
 * work in between (the worker lets a newer request stop it there, issue 16)
 * or drop it; the finished generator returns the table. The state it keeps
 * across a pause is its own (no shared scratch arrays), so another detection
 * may run while it is paused.
 *
 * With {@link SHARE_MIN_CANDIDATES} or more candidates it offers the later
 * ones ({@link SHARE_FRACTION} of them) to another thread (it yields a {@link ShareOffer}); a consumer that has
 * one answers with the job (the worker, src/worker/stager.ts), and the
 * generator yields the job's promise when it must wait for that share. A
 * consumer that answers nothing (`drain`), a job that fails or is cancelled,
 * leaves the share to be measured here: the table is the same either way.
 */
export function* detectPeaksStepwise(x: Float64Array, y: Float64Array, options: PeakOptions): Stepwise<Peak[]> {
  checkOptions(x, y, options);
  const o = options;
  const sign = o.negative ? -1 : 1;
  const s = detectionSignal(y, o.negative);
  const c = context(x, s, o);

  // Maxima, prominences, the prominence test and the half-prominence widths in merged passes (peak-detection.ts);
  // the columns are this call's own (the loop pauses). The half-prominence width only limits how far the first
  // feet are looked for.
  const cand = prominentMaxima(s, o.minProminence);
  const n = cand.count, cIdx = cand.index, cPr = cand.prominence, cLb = cand.leftBase, cRb = cand.rightBase, cW = cand.halfWidth;

  const kept: Candidate[] = [];
  const keep = (k: number, m: LocalMeasure) => { kept.push({ m, prominence: cPr[k], leftBase: cLb[k], rightBase: cRb[k], origin: 'detected' }); };
  // The later candidates are offered to another thread when the work is worth a message.
  let split = n;
  let job: SharedJob | undefined;
  if (n >= SHARE_MIN_CANDIDATES) {
    const from = n - Math.floor(n * SHARE_FRACTION);
    job = yield { share: { x, y, options: o, index: cIdx.slice(from, n), halfWidth: cW.slice(from, n) } };
    if (job) split = from;
  }
  try {
    yield* measureCandidates(c, y, o, cIdx, cW, 0, split, keep);
    if (job) {
      if (!job.result()) yield job.settled;
      const shared = job.result();
      if (shared) {
        for (let t = 0; t < shared.at.length; t++) keep(split + shared.at[t], shared.measures[t]);
      } else {
        job.cancel();
        yield* measureCandidates(c, y, o, cIdx, cW, split, n, keep);
      }
    }
  } finally {
    job?.cancel();
  }
  let cands = kept;
  if (o.minSeparation > 0) {
    const pos = Float64Array.from(cands, (k) => x[k.m.index]), pri = Float64Array.from(cands, (k) => s[k.m.index]);
    const keep = keepByGap(pos, pri, o.minSeparation);
    cands = cands.filter((_, t) => keep[t] === 1);
  }
  return finish(c, y, sign, cands, o);
}

/** A candidate at any sample, for a peak placed by hand. */
function candidateAt(c: MeasureContext, index: number): Candidate {
  const { s } = c;
  const [p, l, r] = prominenceWalk(s, index, 0, s.length - 1);
  const pd: ProminenceData = { prominences: Float64Array.of(p), leftBases: Int32Array.of(l), rightBases: Int32Array.of(r) };
  const w = peakWidths(s, [index], 0.5, pd);
  const k: Candidate = { m: measureLocal(c, index, w.widths[0]), prominence: p, leftBase: l, rightBase: r, origin: 'added-by-user' };
  if (!(p > 0)) k.note = 'Not a local maximum here (a neighbouring sample is as high or higher): its prominence is 0.';
  return k;
}

/** A detected row measured again from its apex (the same numbers as detection gives before neighbours share valleys). */
function candidateFromRow(c: MeasureContext, p: Peak): Candidate {
  const w = peakWidths(c.s, [p.index], 0.5, { prominences: Float64Array.of(p.prominence), leftBases: Int32Array.of(p.leftBase), rightBases: Int32Array.of(p.rightBase) });
  return { m: measureLocal(c, p.index, w.widths[0]), prominence: p.prominence, leftBase: p.leftBase, rightBase: p.rightBase, origin: p.origin };
}

/**
 * Measure a peak the user placed by hand at sample `index`, with the same
 * measures as {@link detectPeaks} and origin 'added-by-user'. The index is
 * used as given (snapping a click to an apex is the caller's choice); at a
 * sample that is not a local maximum the prominence is 0 and a note says
 * so. Valleys are shared with the peaks detection finds with the same
 * options, as in the table. O(n).
 * @throws RangeError when index is not a sample, or the options are invalid.
 */
export function measurePeakAt(x: Float64Array, y: Float64Array, index: number, options: PeakOptions): Peak {
  checkOptions(x, y, options);
  checkPeaks(x.length, [index]);
  const s = detectionSignal(y, options.negative);
  const c = context(x, s, options);
  const mine = candidateAt(c, index);
  const set = detectPeaks(x, y, options).filter((p) => p.index !== index).map((p) => candidateFromRow(c, p));
  set.push(mine);
  const rows = finish(c, y, options.negative ? -1 : 1, set, options);
  const row = rows.find((p) => p.origin === 'added-by-user');
  if (!row) throw new Error('the added peak was lost while measuring');
  return row;
}

function nearestIndex(x: Float64Array, v: number): number {
  const [i] = indexRange(x, v, Infinity);
  if (i >= x.length) return x.length - 1;
  if (i === 0) return 0;
  return v - x[i - 1] <= x[i] - v ? i - 1 : i;
}

/**
 * Apply the user's decisions to a detected peak table. A detected peak
 * within half its FWHM (at least half a sample spacing) of a removed x is
 * kept in the list marked `removedByUser: true`, so exports show the
 * decision. Each added x becomes a peak measured at the nearest sample
 * (origin 'added-by-user'), unless a kept peak already sits there. Shared
 * valleys of all kept peaks are then found again with the new neighbours.
 * Returns a new array in ascending x; the inputs are unchanged.
 */
export function applyPeakDecisions(peaks: readonly Peak[], decisions: PeakDecisions, x: Float64Array, y: Float64Array, options: PeakOptions): Peak[] {
  checkOptions(x, y, options);
  const s = detectionSignal(y, options.negative);
  const c = context(x, s, options);
  const removed: Peak[] = [];
  const kept: Candidate[] = [];
  for (const p of peaks) {
    if (p.removedByUser) { removed.push(p); continue; }
    const step = x[Math.min(p.index + 1, x.length - 1)] - x[Math.max(p.index - 1, 0)];
    const tol = Math.max(p.fwhm / 2, step / 4);
    if (decisions.removed.some((r) => Math.abs(r - p.x) <= tol)) { removed.push({ ...p, removedByUser: true }); continue; }
    kept.push(candidateFromRow(c, p));
  }
  for (const a of decisions.added) {
    if (!Number.isFinite(a)) continue;
    const i = nearestIndex(x, a);
    if (kept.some((k) => k.m.index === i)) continue;
    kept.push(candidateAt(c, i));
  }
  // Issue 17: start and end set by hand replace the found ones (hand-bounds.ts).
  const out = applyHandBounds(finish(c, y, options.negative ? -1 : 1, kept, options), decisions.bounds, x, y, options).concat(removed);
  out.sort((a, b) => a.x - b.x);
  return out;
}

/**
 * Mark the peaks of a processed trace that the raw trace does not have:
 * no peak of `raw` (measured with the same thresholds) lies within
 * max(½ FWHM of either peak, 2 sample spacings) of the apex. This is what
 * a one-point spike spread by smoothing, or a bump smoothing made out of
 * noise, looks like. Peaks removed by hand are left alone.
 * @param dx raw sample spacing (x-units).
 * @returns a new array; the inputs are unchanged.
 */
export function markAppearsOnlyAfterProcessing(processed: readonly Peak[], raw: readonly Peak[], dx: number): Peak[] {
  const ref = raw.filter((p) => !p.removedByUser).sort((a, b) => a.x - b.x);
  const at = Float64Array.from(ref, (p) => p.x);
  return processed.map((p) => {
    if (p.removedByUser || p.marks.includes('appears-only-after-processing')) return p;
    const i = lowerBound(at, p.x);
    for (const j of [i - 1, i]) {
      if (j < 0 || j >= ref.length) continue;
      const tol = Math.max(p.fwhm / 2, ref[j].fwhm / 2, 2 * Math.abs(dx));
      if (Math.abs(ref[j].x - p.x) <= tol) return p;
    }
    return { ...p, marks: [...p.marks, 'appears-only-after-processing'] };
  });
}

/**
 * Mark processed peaks whose top is flat at the raw trace's largest value
 * (smallest for dips): smoothing rounds a clipped top, so the flat stretch
 * is looked for on the raw trace between the processed peak's half-height
 * crossings.
 */
export function markSaturatedOnRaw(processed: readonly Peak[], rawX: Float64Array, rawY: Float64Array, negative: boolean): Peak[] {
  const s = negative ? Float64Array.from(rawY, (v) => -v) : rawY;
  const top = maxOf(s);
  return processed.map((p) => {
    if (p.marks.includes('possibly-saturated')) return p;
    const [a, b] = indexRange(rawX, p.leftHalf, p.rightHalf);
    for (let i = a; i <= b; i++) {
      if (flatTopAt(s, i, top)) return { ...p, marks: [...p.marks, 'possibly-saturated'] };
    }
    return p;
  });
}
