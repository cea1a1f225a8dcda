/**
 * The calibration as one plain, JSON-ready object: what calibration.json
 * holds, and what the report and the peak-table exports draw their
 * calibration lines from. Every number is finite or null (never NaN or
 * Infinity, which JSON cannot carry); every estimate carries the sentence
 * that says how it was made. The shape is documented field by field on the
 * interfaces below.
 */
import { CAUTION, TOOL_LABEL } from '../export/version.ts';
import type { CalibrationSet, SampleAmounts } from './calibrate.ts';
import { INTERVAL_METHOD } from './inverse.ts';
import type { AmountInterval } from './inverse.ts';
import { namedPeaksToJson } from './named-peaks.ts';
import { modelInWords } from './regression.ts';
import type { CurveKind, LackOfFitTest, TermName, Weighting } from './regression.ts';
import { calibrationSettingsToJson } from './settings.ts';
import { standardsToJson } from './standards.ts';

export const CALIBRATION_EXPORT_FORMAT = 'tracewright-calibration';
export const CALIBRATION_EXPORT_VERSION = 1;

/** A number, or null where it is not finite. */
export type Num = number | null;

export interface ExportLackOfFit {
  readonly f: Num;
  readonly lackOfFitDf: number;
  readonly pureErrorDf: number;
  readonly pValue: Num;
  readonly pureErrorSumOfSquares: Num;
  readonly lackOfFitSumOfSquares: Num;
}

export interface ExportStandardPoint {
  readonly standard: string;
  readonly amount: number;
  readonly response: Num;
  readonly used: boolean;
  readonly note: string | null;
  readonly fitted: Num;
  readonly residual: Num;
  readonly backCalculated: Num;
  /** 100·(back-calculated − known)/known; null for a zero amount. */
  readonly deviationPercent: Num;
}

export interface ExportCalibration {
  readonly name: string;
  readonly amountUnit: string;
  readonly status: 'calibrated' | 'not-calibrated';
  readonly problem: string | null;
  readonly response: 'area' | 'height';
  readonly internalStandard: string | null;
  readonly responseInWords: string;
  readonly model: { readonly kind: CurveKind; readonly throughOrigin: boolean; readonly weighting: Weighting; readonly inWords: string } | null;
  /** Response = Σ value·amount^power. */
  readonly coefficients: readonly { readonly term: TermName; readonly power: number; readonly value: Num; readonly standardError: Num }[];
  /** Residual SD of a weight-1 response (weights normalised to sum n). */
  readonly residualSd: Num;
  readonly residualDf: number | null;
  readonly standardsUsed: number;
  readonly rSquared: Num;
  readonly rSquaredKind: 'centred' | 'uncentred' | null;
  readonly rSquaredNote: string;
  /** Lowest and highest standard used: the calibrated range. */
  readonly range: { readonly low: number; readonly high: number } | null;
  readonly modelChoice: {
    readonly rule: 'user' | 'lack-of-fit' | 'curvature-t-test' | 'untestable';
    readonly alpha: number;
    readonly chosen: CurveKind;
    readonly sentence: string;
    readonly lineLackOfFit: ExportLackOfFit | null;
    readonly quadraticLackOfFit: ExportLackOfFit | null;
    readonly curvature: { readonly t: Num; readonly df: number; readonly pValue: Num } | null;
  } | null;
  readonly standards: readonly ExportStandardPoint[];
  readonly limits: {
    readonly sigmaSource: 'residual' | 'intercept';
    readonly sigma: Num;
    readonly slope: Num;
    readonly slopeAt: Num;
    readonly detection: Num;
    readonly quantitation: Num;
    readonly method: string;
    readonly notes: readonly string[];
  } | null;
  readonly limitsProblem: string | null;
}

export interface ExportInterval {
  readonly low: Num;
  readonly high: Num;
  readonly level: number;
}

export interface ExportAmount {
  readonly name: string;
  readonly amountUnit: string;
  readonly status: 'measured' | 'not-found' | 'not-calibrated' | 'no-internal-standard' | 'no-amount';
  /** Apex of the named peak in this trace, or null. */
  readonly x: Num;
  readonly response: Num;
  readonly amount: Num;
  /** The interval to show (prediction-band inversion); an end is null where the interval is unbounded. */
  readonly interval: ExportInterval | null;
  /** First-order SD of the amount (s_x0) and x̂ ± t·s_x0, for comparison. */
  readonly standardError: Num;
  readonly symmetricInterval: ExportInterval | null;
  readonly flags: readonly string[];
  readonly notes: readonly string[];
}

export interface ExportSample {
  readonly trace: string;
  readonly missing: readonly string[];
  readonly amounts: readonly ExportAmount[];
}

export interface CalibrationExport {
  readonly format: typeof CALIBRATION_EXPORT_FORMAT;
  readonly version: number;
  readonly tool: string;
  /** ISO 8601, UTC. */
  readonly time: string;
  readonly caution: string;
  readonly confidenceLevel: number;
  readonly intervalMethod: string;
  readonly modelChoiceRule: string;
  readonly namedPeaks: ReturnType<typeof namedPeaksToJson>;
  readonly settings: Record<string, unknown>;
  readonly standards: ReturnType<typeof standardsToJson>;
  /** Problems with the inputs as a whole. */
  readonly problems: readonly string[];
  /** Names found in each standard trace. */
  readonly standardTraces: readonly { readonly trace: string; readonly matchRule: string; readonly named: readonly { readonly name: string; readonly x: Num; readonly offset: Num; readonly note: string | null }[]; readonly missing: readonly string[] }[];
  readonly calibrations: readonly ExportCalibration[];
  readonly samples: readonly ExportSample[];
}

/** How the curve is chosen, in words, for the export's header. */
export const MODEL_CHOICE_RULE =
  'Line or quadratic: with replicate standards, the lack-of-fit F-test of the straight line (Draper & Smith 1998, §2.1); ' +
  'without, the t-test of the quadratic term (its square is Mandel\'s F); when neither is possible, the straight line untested. Never R².';

function num(v: number | null | undefined): Num {
  return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

function lof(t: LackOfFitTest | null): ExportLackOfFit | null {
  return t && {
    f: num(t.f), lackOfFitDf: t.lackOfFitDf, pureErrorDf: t.pureErrorDf, pValue: num(t.pValue),
    pureErrorSumOfSquares: num(t.pureErrorSumOfSquares), lackOfFitSumOfSquares: num(t.lackOfFitSumOfSquares),
  };
}

function interval(i: AmountInterval | null): ExportInterval | null {
  return i && { low: num(i.low), high: num(i.high), level: i.level };
}

/**
 * Build the export object from a calibration and the samples' amounts.
 * @param time ISO 8601 time of the export (see exportTime in export/version.ts)
 */
export function calibrationExport(set: CalibrationSet, samples: readonly SampleAmounts[], time: string): CalibrationExport {
  const calibrations: ExportCalibration[] = set.calibrations.map((c) => {
    const f = c.fit;
    return {
      name: c.name,
      amountUnit: c.amountUnit,
      status: c.status,
      problem: c.problem,
      response: c.settings.response,
      internalStandard: c.settings.internalStandard,
      responseInWords: c.responseInWords,
      model: f && { kind: f.model.kind, throughOrigin: f.model.throughOrigin, weighting: f.model.weighting, inWords: modelInWords(f.model) },
      coefficients: f ? f.terms.map((term, j) => ({ term, power: f.powers[j], value: num(f.coefficients[j]), standardError: num(f.standardErrors[j]) })) : [],
      residualSd: num(f?.residualSd),
      residualDf: f ? f.df : null,
      standardsUsed: f ? f.n : 0,
      rSquared: num(f?.rSquared),
      rSquaredKind: f ? f.rSquaredKind : null,
      rSquaredNote: 'R² is given as a figure only; it did not choose the curve.',
      range: f ? { low: f.range.low, high: f.range.high } : null,
      modelChoice: c.choice && {
        rule: c.choice.rule,
        alpha: c.choice.alpha,
        chosen: c.choice.chosen,
        sentence: c.choice.sentence,
        lineLackOfFit: lof(c.choice.lineLackOfFit),
        quadraticLackOfFit: lof(c.choice.quadraticLackOfFit),
        curvature: c.choice.curvature && { t: num(c.choice.curvature.t), df: c.choice.curvature.df, pValue: num(c.choice.curvature.pValue) },
      },
      standards: c.points.map((p) => ({
        standard: p.standard, amount: p.amount, response: num(p.response), used: p.used, note: p.note,
        fitted: num(p.fitted), residual: num(p.residual), backCalculated: num(p.backCalculated), deviationPercent: num(p.deviationPercent),
      })),
      limits: c.limits && {
        sigmaSource: c.limits.sigmaSource, sigma: num(c.limits.sigma), slope: num(c.limits.slope), slopeAt: num(c.limits.slopeAt),
        detection: num(c.limits.detection), quantitation: num(c.limits.quantitation), method: c.limits.method, notes: [...c.limits.notes],
      },
      limitsProblem: c.limitsProblem,
    };
  });
  const exportSamples: ExportSample[] = samples.map((s) => ({
    trace: s.trace,
    missing: [...s.naming.missing],
    amounts: s.amounts.map((a) => {
      const m = s.naming.matches.find((v) => v.name === a.name);
      return {
        name: a.name,
        amountUnit: a.amountUnit,
        status: a.status,
        x: num(m?.x ?? null),
        response: num(a.response),
        amount: num(a.estimate?.amount ?? null),
        interval: interval(a.estimate?.interval ?? null),
        standardError: num(a.estimate?.standardError ?? null),
        symmetricInterval: interval(a.estimate?.symmetricInterval ?? null),
        flags: [...a.flags],
        notes: [...a.notes],
      };
    }),
  }));
  return {
    format: CALIBRATION_EXPORT_FORMAT,
    version: CALIBRATION_EXPORT_VERSION,
    tool: TOOL_LABEL,
    time,
    caution: CAUTION,
    confidenceLevel: set.settings.confidence,
    intervalMethod: INTERVAL_METHOD,
    modelChoiceRule: MODEL_CHOICE_RULE,
    namedPeaks: namedPeaksToJson(set.namedPeaks),
    settings: calibrationSettingsToJson(set.settings),
    standards: standardsToJson(set.standards),
    problems: [...set.problems],
    standardTraces: set.standardNaming.map((s) => ({
      trace: s.trace,
      matchRule: s.naming.ruleInWords,
      named: s.naming.matches.map((m) => ({ name: m.name, x: num(m.x), offset: num(m.offset), note: m.note })),
      missing: [...s.naming.missing],
    })),
    calibrations,
    samples: exportSamples,
  };
}

/** The export as pretty JSON text (calibration.json). */
export function calibrationExportJson(exp: CalibrationExport): string {
  return `${JSON.stringify(exp, null, 2)}\n`;
}
