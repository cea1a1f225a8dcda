/**
 * From peak tables to amounts: name the standards' peaks, fit one
 * calibration per named peak, and read the amounts of the samples' named
 * peaks off those calibrations, with intervals, limits and flags.
 *
 * Pure: the caller hands in the peak tables (any rows with x, height, area)
 * of the standard and sample traces by name; nothing here detects peaks or
 * touches a trace.
 */
import { predictAmount } from './inverse.ts';
import type { AmountEstimate } from './inverse.ts';
import { amountLimits } from './limits.ts';
import type { AmountLimits } from './limits.ts';
import { nameTracePeaks } from './named-peaks.ts';
import type { NamedPeakTable, PeakLike, PeakNaming } from './named-peaks.ts';
import { chooseCurve } from './regression.ts';
import type { CurveChoice, CurveFit } from './regression.ts';
import { settingsForPeak, validateCalibrationSettings } from './settings.ts';
import type { CalibrationSettings, PeakCalibrationSettings } from './settings.ts';
import { checkStandardsAgainstNames } from './standards.ts';
import type { StandardsTable } from './standards.ts';

/** One trace's peak table, by the trace's name. */
export interface TracePeaks {
  readonly trace: string;
  readonly peaks: readonly PeakLike[];
}

/** One standard as a point of one named peak's calibration. */
export interface StandardPoint {
  readonly standard: string;
  readonly amount: number;
  /** Response (area, height, or its ratio to the internal standard's), or null when it could not be measured. */
  readonly response: number | null;
  /** Whether the point is in the fit. */
  readonly used: boolean;
  /** Why it was left out, or other remarks. */
  readonly note: string | null;
  readonly fitted: number | null;
  readonly residual: number | null;
  /** The amount the curve gives back for this response, and its deviation from the known amount, %. */
  readonly backCalculated: number | null;
  readonly deviationPercent: number | null;
}

/** The calibration of one named peak. */
export interface PeakCalibration {
  readonly name: string;
  readonly amountUnit: string;
  readonly settings: PeakCalibrationSettings;
  /** What the response is, in words: "area", "height ratio to Lagoon Blue", … */
  readonly responseInWords: string;
  readonly status: 'calibrated' | 'not-calibrated';
  /** Why not calibrated, or null. */
  readonly problem: string | null;
  readonly points: readonly StandardPoint[];
  readonly fit: CurveFit | null;
  readonly choice: CurveChoice | null;
  /** The other curve of the line/quadratic pair, for showing beside the chosen one (null when it could not be fitted). */
  readonly alternative: CurveFit | null;
  readonly limits: AmountLimits | null;
  /** Why there are no limits, or null. */
  readonly limitsProblem: string | null;
}

export interface CalibrationSet {
  readonly settings: CalibrationSettings;
  readonly namedPeaks: NamedPeakTable;
  readonly standards: StandardsTable;
  /** The names given to each standard trace's peaks. */
  readonly standardNaming: readonly { readonly trace: string; readonly naming: PeakNaming }[];
  /** Problems with the inputs as a whole (standards without traces, unknown names, bad settings). */
  readonly problems: readonly string[];
  /** One per named peak except the internal standard(s), in table order. */
  readonly calibrations: readonly PeakCalibration[];
}

function responseOf(peak: PeakLike, measure: 'area' | 'height'): number {
  return measure === 'area' ? peak.area : peak.height;
}

function responseWords(s: PeakCalibrationSettings): string {
  return s.internalStandard ? `${s.response} ratio to "${s.internalStandard}" (same amount of internal standard assumed in every trace)` : s.response;
}

/**
 * The response of a named peak in one named trace, or why there is none.
 * With an internal standard, the response is divided by the internal
 * standard's response (same measure) in the same trace.
 */
export function namedResponse(
  naming: PeakNaming,
  peaks: readonly PeakLike[],
  name: string,
  s: PeakCalibrationSettings,
): { ok: true; response: number } | { ok: false; reason: string; missing: 'peak' | 'internal-standard' | 'internal-standard-zero' } {
  const m = naming.matches.find((v) => v.name === name);
  if (!m || m.peakIndex === null) return { ok: false, reason: `"${name}" was not found${m?.note ? ` (${m.note.replace(/\.$/, '')})` : ''}.`, missing: 'peak' };
  const own = responseOf(peaks[m.peakIndex], s.response);
  if (!s.internalStandard) return { ok: true, response: own };
  const is = naming.matches.find((v) => v.name === s.internalStandard);
  if (!is || is.peakIndex === null) return { ok: false, reason: `The internal standard "${s.internalStandard}" was not found in this trace.`, missing: 'internal-standard' };
  const ref = responseOf(peaks[is.peakIndex], s.response);
  if (!(ref > 0)) return { ok: false, reason: `The internal standard's ${s.response} is not above zero in this trace.`, missing: 'internal-standard-zero' };
  return { ok: true, response: own / ref };
}

/**
 * Calibrate every named peak from the standards.
 * Standard rows are matched to standard traces by exact name. Each named
 * peak with amounts is fitted by its settings (line or quadratic by test
 * unless fixed; see chooseCurve); standards whose peak (or internal
 * standard) is missing are listed and left out of the fit.
 */
export function calibrate(input: {
  readonly namedPeaks: NamedPeakTable;
  readonly standards: StandardsTable;
  readonly standardTraces: readonly TracePeaks[];
  readonly settings: CalibrationSettings;
}): CalibrationSet {
  const { namedPeaks, standards, standardTraces, settings } = input;
  const names = namedPeaks.peaks.map((p) => p.name);
  const problems: string[] = [...validateCalibrationSettings(settings, names), ...checkStandardsAgainstNames(standards, namedPeaks)];
  const traceByName = new Map(standardTraces.map((t) => [t.trace, t]));
  for (const r of standards.rows) {
    if (!traceByName.has(r.standard)) problems.push(`Standard "${r.standard}"${r.line !== null ? ` (line ${r.line})` : ''} has no trace among the standard traces; load it or correct its name.`);
  }
  const listed = new Set(standards.rows.map((r) => r.standard));
  for (const t of standardTraces) if (!listed.has(t.trace)) problems.push(`The trace "${t.trace}" is marked as a standard but has no row in the standards table; it is not used.`);
  const standardNaming = standardTraces.filter((t) => listed.has(t.trace)).map((t) => ({ trace: t.trace, naming: nameTracePeaks(namedPeaks, t.peaks) }));
  const namingOf = new Map(standardNaming.map((s) => [s.trace, s.naming]));

  const internalStandards = new Set(names.map((n) => settingsForPeak(settings, n).internalStandard).filter((v): v is string => v !== null));
  const calibrations: PeakCalibration[] = [];
  for (const name of names) {
    if (internalStandards.has(name)) continue;
    const s = settingsForPeak(settings, name);
    const col = standards.names.indexOf(name);
    const amountUnit = col >= 0 ? standards.units[col] : '';
    const base = { name, amountUnit, settings: s, responseInWords: responseWords(s) };
    const notCalibrated = (problem: string, points: StandardPoint[] = []): PeakCalibration => ({
      ...base, status: 'not-calibrated', problem, points, fit: null, choice: null, alternative: null, limits: null, limitsProblem: null,
    });
    if (s.internalStandard !== null && !names.includes(s.internalStandard)) {
      calibrations.push(notCalibrated(`The internal standard "${s.internalStandard}" is not a named peak.`));
      continue;
    }
    if (col < 0) { calibrations.push(notCalibrated('The standards give no amount for this peak.')); continue; }
    const raw: { standard: string; amount: number; response: number | null; note: string | null }[] = [];
    for (const r of standards.rows) {
      const amount = r.amounts[col];
      if (amount === null) continue;
      const trace = traceByName.get(r.standard);
      const naming = namingOf.get(r.standard);
      if (!trace || !naming) { raw.push({ standard: r.standard, amount, response: null, note: 'No trace with this name.' }); continue; }
      const resp = namedResponse(naming, trace.peaks, name, s);
      raw.push(resp.ok ? { standard: r.standard, amount, response: resp.response, note: null } : { standard: r.standard, amount, response: null, note: resp.reason });
    }
    const usable = raw.filter((p) => p.response !== null);
    if (usable.length === 0) {
      calibrations.push(notCalibrated('No standard gives a response for this peak.', raw.map((p) => ({ ...p, used: false, fitted: null, residual: null, backCalculated: null, deviationPercent: null }))));
      continue;
    }
    const chosen = chooseCurve(usable.map((p) => p.amount), usable.map((p) => p.response as number), {
      throughOrigin: s.throughOrigin, weighting: s.weighting, alpha: settings.alpha, fixed: s.model === 'auto' ? undefined : s.model,
    });
    if (!chosen.ok) {
      calibrations.push(notCalibrated(chosen.problem, raw.map((p) => ({ ...p, used: false, fitted: null, residual: null, backCalculated: null, deviationPercent: null }))));
      continue;
    }
    const fit = chosen.fit;
    let k = 0;
    const points: StandardPoint[] = raw.map((p) => {
      if (p.response === null) return { ...p, used: false, fitted: null, residual: null, backCalculated: null, deviationPercent: null };
      const i = k++;
      const back = predictAmount(fit, p.response, { confidence: settings.confidence }).amount;
      return {
        ...p,
        used: true,
        fitted: fit.fitted[i],
        residual: fit.residuals[i],
        backCalculated: back,
        deviationPercent: back !== null && p.amount !== 0 ? (100 * (back - p.amount)) / p.amount : null,
      };
    });
    const lim = amountLimits(fit, s.limitSigma);
    calibrations.push({
      ...base,
      status: 'calibrated',
      problem: null,
      points,
      fit,
      choice: chosen.choice,
      alternative: chosen.alternative,
      limits: lim.ok ? lim.limits : null,
      limitsProblem: lim.ok ? null : lim.problem,
    });
  }
  return { settings, namedPeaks, standards, standardNaming, problems, calibrations };
}

/** Marks on a sample amount. 'below-detection-limit' implies below the quantitation limit and is given alone. */
export type AmountFlag = 'extrapolated-below' | 'extrapolated-above' | 'below-detection-limit' | 'below-quantitation-limit';

/** One named peak's amount in one sample trace. */
export interface SampleAmount {
  readonly name: string;
  readonly amountUnit: string;
  /**
   * 'measured': amount and interval below; 'not-found': the peak is missing in this trace;
   * 'not-calibrated': no calibration for this name; 'no-internal-standard': its internal
   * standard is missing or zero; 'no-amount': the curve never reaches the response.
   */
  readonly status: 'measured' | 'not-found' | 'not-calibrated' | 'no-internal-standard' | 'no-amount';
  /** Index of the peak in the sample's peak list, or null. */
  readonly peakIndex: number | null;
  readonly response: number | null;
  readonly estimate: AmountEstimate | null;
  readonly flags: readonly AmountFlag[];
  readonly notes: readonly string[];
}

export interface SampleAmounts {
  readonly trace: string;
  readonly naming: PeakNaming;
  /** One per calibration in the set (same order). */
  readonly amounts: readonly SampleAmount[];
}

/** Flags of an amount against the calibrated range and the limits. */
export function amountFlags(amount: number, range: { low: number; high: number }, limits: AmountLimits | null): AmountFlag[] {
  const flags: AmountFlag[] = [];
  if (amount < range.low) flags.push('extrapolated-below');
  if (amount > range.high) flags.push('extrapolated-above');
  if (limits) {
    if (amount < limits.detection) flags.push('below-detection-limit');
    else if (amount < limits.quantitation) flags.push('below-quantitation-limit');
  }
  return flags;
}

/** Flags in words, for notes and exports. */
export function amountFlagWords(flag: AmountFlag, unit: string, range: { low: number; high: number }, limits: AmountLimits | null): string {
  const u = unit ? ` ${unit}` : '';
  const g = (v: number) => Number(v.toPrecision(4)).toString();
  switch (flag) {
    case 'extrapolated-below': return `Below the lowest standard (${g(range.low)}${u}): extrapolated.`;
    case 'extrapolated-above': return `Above the highest standard (${g(range.high)}${u}): extrapolated.`;
    case 'below-detection-limit': return `Below the detection limit in amount (${limits ? g(limits.detection) : '?'}${u}).`;
    case 'below-quantitation-limit': return `Below the quantitation limit in amount (${limits ? g(limits.quantitation) : '?'}${u}).`;
  }
}

/**
 * Amounts of the named, calibrated peaks of each sample trace, one response
 * per trace (m = 1), at the set's confidence level.
 */
export function quantifySamples(set: CalibrationSet, samples: readonly TracePeaks[]): SampleAmounts[] {
  return samples.map((sample) => {
    const naming = nameTracePeaks(set.namedPeaks, sample.peaks);
    const amounts = set.calibrations.map((cal): SampleAmount => {
      const base = { name: cal.name, amountUnit: cal.amountUnit };
      const match = naming.matches.find((m) => m.name === cal.name);
      const peakIndex = match?.peakIndex ?? null;
      if (cal.status !== 'calibrated' || !cal.fit) {
        return { ...base, status: 'not-calibrated', peakIndex, response: null, estimate: null, flags: [], notes: [cal.problem ?? 'Not calibrated.'] };
      }
      const resp = namedResponse(naming, sample.peaks, cal.name, cal.settings);
      if (!resp.ok) {
        return { ...base, status: resp.missing === 'peak' ? 'not-found' : 'no-internal-standard', peakIndex, response: null, estimate: null, flags: [], notes: [resp.reason] };
      }
      const estimate = predictAmount(cal.fit, resp.response, { confidence: set.settings.confidence });
      if (estimate.amount === null) {
        return { ...base, status: 'no-amount', peakIndex, response: resp.response, estimate, flags: [], notes: [...estimate.notes] };
      }
      const flags = amountFlags(estimate.amount, cal.fit.range, cal.limits);
      return {
        ...base,
        status: 'measured',
        peakIndex,
        response: resp.response,
        estimate,
        flags,
        notes: [...flags.map((f) => amountFlagWords(f, cal.amountUnit, cal.fit!.range, cal.limits)), ...estimate.notes],
      };
    });
    return { trace: sample.trace, naming, amounts };
  });
}

