/**
 * Per-peak figures of chromatography measured on the trace itself against
 * each peak's own straight local baseline: retention time, widths at 5 %,
 * 10 % and 50 % of height, tailing factor, asymmetry factor, plate number,
 * resolution to the previous peak, and with a dead time the retention
 * factor and selectivity.
 *
 * Formulas as the pharmacopoeias write them (USP <621> Chromatography;
 * Ph. Eur. 2.2.46 Chromatographic separation techniques; recalled from
 * memory). The asymmetry factor at 10 % is
 * common practice with no single standard.
 *
 * How a width is measured: the apex is the highest point of y − baseline
 * inside the peak's bounds, refined by a parabola through it and its two
 * neighbours; from the apex sample the trace is followed outward to the
 * first sample at or below the level, and the crossing is interpolated
 * linearly between that sample and the one before it. When the peak's
 * bound (the valley to a neighbour, or the end of the trace) comes first,
 * the width is "not measurable" and says why.
 */

/** y = intercept + slope·x, the peak's own local baseline (signal units, x-units). */
export interface StraightBaseline {
  intercept: number;
  slope: number;
}

export interface PeakForFigures {
  /** First and last sample of the peak (its bounds from the peak table), indices into x, both included. */
  start: number;
  end: number;
  /** The baseline under this peak. */
  baseline: StraightBaseline;
}

export interface FiguresOptions {
  /** Dead time t_M (x-units, usually min): enables retention factor and selectivity. */
  deadTime?: number;
}

export type FigureStatus = 'ok' | 'not-measurable' | 'not-applicable';

export interface FigureValue {
  value: number | null;
  status: FigureStatus;
  /** Why the value is missing, in words; empty when status is 'ok'. */
  reason: string;
}

export interface PeakChromatographicFigures {
  retentionTime: FigureValue;
  height: FigureValue;
  width50: FigureValue;
  width10: FigureValue;
  width5: FigureValue;
  tailing: FigureValue;
  asymmetry: FigureValue;
  plates: FigureValue;
  resolution: FigureValue;
  retentionFactor: FigureValue;
  selectivity: FigureValue;
}

export type ChromatographicFigureName = keyof PeakChromatographicFigures;

/** Header text and formula of each figure, for table tooltips and reports. */
export const FIGURE_FORMULAS: Record<ChromatographicFigureName, { label: string; formula: string }> = {
  retentionTime: { label: 't_R', formula: 't_R: x at the apex of y − baseline (parabola through the highest sample and its neighbours)' },
  height: { label: 'H', formula: 'H: apex of y − baseline, the peak’s own straight baseline' },
  width50: { label: 'W₀.₅', formula: 'W₀.₅: width at 50 % of H, crossings interpolated linearly' },
  width10: { label: 'W₀.₁', formula: 'W₀.₁: width at 10 % of H' },
  width5: { label: 'W₀.₀₅', formula: 'W₀.₀₅: width at 5 % of H' },
  tailing: { label: 'T', formula: 'T = W₀.₀₅ / (2 f), f = t_R − leading edge at 5 % of H (USP <621>; the Ph. Eur. symmetry factor)' },
  asymmetry: { label: 'As', formula: 'As = b / a at 10 % of H, b = trailing edge − t_R, a = t_R − leading edge (common practice)' },
  plates: { label: 'N', formula: 'N = 8 ln 2 · (t_R / W₀.₅)² = 5.545 (t_R / W₀.₅)² (USP <621>, Ph. Eur. 2.2.46, which round to 5.54)' },
  resolution: { label: 'R_s', formula: 'R_s = 1.18 (t_R2 − t_R1) / (W₀.₅,1 + W₀.₅,2), to the previous peak (USP <621>, Ph. Eur. 2.2.46)' },
  retentionFactor: { label: 'k', formula: 'k = (t_R − t_M) / t_M, t_M the dead time' },
  selectivity: { label: 'α', formula: 'α = k₂ / k₁, to the previous peak' },
};

/** Tailing factor T = W₀.₀₅ / (2f) (USP <621>). */
export function tailingFactor(width5: number, leadingHalfWidth5: number): number {
  return width5 / (2 * leadingHalfWidth5);
}

/** Asymmetry factor As = b / a at 10 % height (common practice). */
export function asymmetryFactor(leading10: number, trailing10: number): number {
  return trailing10 / leading10;
}

/** Plate number from the half-height width, N = 8 ln 2 · (t_R / W₀.₅)² (USP <621>, Ph. Eur. 2.2.46). */
export function plateNumber(retentionTime: number, width50: number): number {
  return 8 * Math.LN2 * (retentionTime / width50) ** 2;
}

/** Resolution from half-height widths as the pharmacopoeias write it: 1.18 (t₂ − t₁) / (W₀.₅,₁ + W₀.₅,₂). */
export function resolutionHalfHeight(t1: number, width1: number, t2: number, width2: number): number {
  return (1.18 * (t2 - t1)) / (width1 + width2);
}

/** Retention factor k = (t_R − t_M) / t_M. */
export function retentionFactor(retentionTime: number, deadTime: number): number {
  return (retentionTime - deadTime) / deadTime;
}

const ok = (value: number): FigureValue => ({ value, status: 'ok', reason: '' });
const missing = (status: FigureStatus, reason: string): FigureValue => ({ value: null, status, reason });

interface Edge {
  x: number | null;
  reason: string;
}

function levelText(fraction: number): string {
  return `${Math.round(fraction * 100)} % of the height`;
}

/** Walk from `apex` in direction `dir` to the first sample at or below `level`; interpolate the crossing. */
function crossing(x: Float64Array, f: (i: number) => number, apex: number, bound: number, level: number, dir: -1 | 1, fraction: number, atTraceEnd: boolean): Edge {
  let prev = apex;
  for (let i = apex + dir; dir < 0 ? i >= bound : i <= bound; i += dir) {
    const v = f(i);
    if (v <= level) {
      const vp = f(prev);
      return { x: x[prev] + ((vp - level) / (vp - v)) * (x[i] - x[prev]), reason: '' };
    }
    prev = i;
  }
  const side = dir < 0 ? 'leading' : 'trailing';
  return {
    x: null,
    reason: atTraceEnd
      ? `the trace ends before the ${side} edge falls to ${levelText(fraction)}`
      : `the ${side} bound (x = ${x[bound]}) lies above ${levelText(fraction)}: a neighbour cuts the level`,
  };
}

interface Measured {
  tR: number;
  height: number;
  edges: Record<'5' | '10' | '50', { left: Edge; right: Edge }>;
}

function measureOne(x: Float64Array, y: Float64Array, peak: PeakForFigures): Measured | string {
  const { start, end, baseline } = peak;
  if (!(Number.isInteger(start) && Number.isInteger(end) && start >= 0 && end < x.length && end - start >= 2)) {
    return `bounds ${start} to ${end} are not at least three samples inside the trace`;
  }
  if (!Number.isFinite(baseline.intercept) || !Number.isFinite(baseline.slope)) return 'the baseline is not a finite line';
  const f = (i: number) => y[i] - (baseline.intercept + baseline.slope * x[i]);
  let apex = start;
  for (let i = start + 1; i <= end; i++) if (f(i) > f(apex)) apex = i;
  let tR = x[apex];
  let height = f(apex);
  if (!(height > 0)) return 'the signal does not rise above its baseline inside the bounds';
  if (apex > start && apex < end) {
    // Vertex of the parabola through three samples (uneven spacing allowed).
    const x0 = x[apex - 1] - x[apex];
    const x2 = x[apex + 1] - x[apex];
    const y0 = f(apex - 1) - height;
    const y2 = f(apex + 1) - height;
    const den = x0 * x2 * (x0 - x2);
    const a = (x2 * y0 - x0 * y2) / den;
    const b = (x0 * x0 * y2 - x2 * x2 * y0) / den;
    if (a < 0) {
      const d = -b / (2 * a);
      if (d > x0 && d < x2) {
        tR += d;
        height += a * d * d + b * d;
      }
    }
  }
  const edges = {} as Measured['edges'];
  for (const [key, fraction] of [['5', 0.05], ['10', 0.1], ['50', 0.5]] as const) {
    const level = fraction * height;
    edges[key] = {
      left: crossing(x, f, apex, start, level, -1, fraction, start === 0),
      right: crossing(x, f, apex, end, level, 1, fraction, end === x.length - 1),
    };
  }
  return { tR, height, edges };
}

function width(m: Measured, key: '5' | '10' | '50'): FigureValue {
  const e = m.edges[key];
  if (e.left.x === null) return missing('not-measurable', e.left.reason);
  if (e.right.x === null) return missing('not-measurable', e.right.reason);
  return ok(e.right.x - e.left.x);
}

/**
 * The figures of each peak, in the order given (sort by retention time for
 * "previous peak" to mean the one eluting before). Never changes its inputs;
 * a peak whose bounds or baseline cannot be used gets every figure
 * "not measurable" with the reason.
 * @param x time (x-units), strictly increasing
 * @param y signal
 * @param peaks each peak's bounds (sample indices) and straight baseline
 */
export function chromatographicFigures(x: Float64Array, y: Float64Array, peaks: readonly PeakForFigures[], options: FiguresOptions = {}): PeakChromatographicFigures[] {
  if (x.length !== y.length) throw new RangeError(`x and y have different lengths (${x.length} and ${y.length}).`);
  const t0 = options.deadTime;
  const deadTimeProblem =
    t0 === undefined ? 'no dead time entered' : !(Number.isFinite(t0) && t0 > 0) ? `the dead time must be a positive number (got ${t0})` : '';
  const rows: PeakChromatographicFigures[] = [];
  let previous: { m: Measured | null; w50: FigureValue; k: FigureValue } | null = null;
  for (const peak of peaks) {
    const m = measureOne(x, y, peak);
    if (typeof m === 'string') {
      const v = missing('not-measurable', m);
      rows.push({ retentionTime: v, height: v, width50: v, width10: v, width5: v, tailing: v, asymmetry: v, plates: v, resolution: v, retentionFactor: v, selectivity: v });
      previous = { m: null, w50: v, k: v };
      continue;
    }
    const w50 = width(m, '50');
    const w10 = width(m, '10');
    const w5 = width(m, '5');
    const tailing = w5.value === null ? missing('not-measurable', w5.reason) : ok(tailingFactor(w5.value, m.tR - (m.edges['5'].left.x as number)));
    const asymmetry =
      w10.value === null ? missing('not-measurable', w10.reason) : ok(asymmetryFactor(m.tR - (m.edges['10'].left.x as number), (m.edges['10'].right.x as number) - m.tR));
    const plates = w50.value === null ? missing('not-measurable', w50.reason) : ok(plateNumber(m.tR, w50.value));
    let resolution: FigureValue;
    if (!previous) resolution = missing('not-applicable', 'first peak: no previous peak');
    else if (!previous.m || previous.w50.value === null) resolution = missing('not-measurable', `the previous peak's half-height width is not measurable (${previous.w50.reason})`);
    else if (w50.value === null) resolution = missing('not-measurable', w50.reason);
    else resolution = ok(resolutionHalfHeight(previous.m.tR, previous.w50.value, m.tR, w50.value));
    let k: FigureValue;
    if (deadTimeProblem) k = missing('not-applicable', deadTimeProblem);
    else if (!(m.tR > (t0 as number))) k = missing('not-measurable', `t_R (${m.tR}) is not after the dead time (${t0})`);
    else k = ok(retentionFactor(m.tR, t0 as number));
    let selectivity: FigureValue;
    if (deadTimeProblem) selectivity = missing('not-applicable', deadTimeProblem);
    else if (!previous) selectivity = missing('not-applicable', 'first peak: no previous peak');
    else if (previous.k.value === null || previous.k.value <= 0) selectivity = missing('not-measurable', `the previous peak has no positive retention factor (${previous.k.reason || 'k ≤ 0'})`);
    else if (k.value === null) selectivity = missing('not-measurable', k.reason);
    else selectivity = ok(k.value / previous.k.value);
    rows.push({ retentionTime: ok(m.tR), height: ok(m.height), width50: w50, width10: w10, width5: w5, tailing, asymmetry, plates, resolution, retentionFactor: k, selectivity });
    previous = { m, w50, k };
  }
  return rows;
}
