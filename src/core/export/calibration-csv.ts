/**
 * Issue 21: the calibration as delimited text for spreadsheets, from the
 * calibration export object: one table of the standards per named peak
 * (with the curve's figures on each row) and one of the samples' amounts
 * with their intervals, marks and the limits in amount. Comment lines carry
 * the tool, time, caution, confidence level and the methods in words.
 */
import type { CalibrationExport } from '../calibration/export.ts';
import { writeCsv, type CsvCellOptions } from '../io/csv-write.ts';
import { TOOL_NAME } from './version.ts';

const cell = (v: number | null | undefined): string | number => (v === null || v === undefined ? '' : v);

function headLines(exp: CalibrationExport, what: string): string[] {
  return [
    `${TOOL_NAME} ${what}`, `Written by: ${exp.tool}`, `Written at: ${exp.time}`, `Caution: ${exp.caution}`,
    `Confidence level of the intervals: ${exp.confidenceLevel}`, `Intervals: ${exp.intervalMethod}`, `Curve choice: ${exp.modelChoiceRule}`,
    ...exp.problems.map((p) => `Problem: ${p}`),
  ];
}

/** Standards and curves: one row per standard per named peak. */
export function calibrationTableCsv(exp: CalibrationExport, options: CsvCellOptions): string {
  const rows: (string | number)[][] = [[
    'named peak', 'amount unit', 'status', 'response', 'model', 'through origin', 'weights', 'intercept', 'intercept SE', 'slope', 'slope SE', 'quadratic', 'quadratic SE',
    'residual SD', 'residual df', 'R² (figure only)', 'chosen by', 'detection limit (amount)', 'quantitation limit (amount)', 'limits from σ of',
    'standard', 'known amount', 'standard response', 'in the fit', 'fitted response', 'residual', 'back-calculated amount', 'deviation (%)', 'note',
  ]];
  for (const c of exp.calibrations) {
    const coef = (power: number) => c.coefficients.find((k) => k.power === power);
    const curve = [
      c.name, c.amountUnit, c.status === 'calibrated' ? 'calibrated' : `not calibrated: ${c.problem ?? ''}`, c.responseInWords,
      c.model?.kind ?? '', c.model ? (c.model.throughOrigin ? 'yes' : 'no') : '', c.model?.weighting ?? '',
      cell(coef(0)?.value), cell(coef(0)?.standardError), cell(coef(1)?.value), cell(coef(1)?.standardError), cell(coef(2)?.value), cell(coef(2)?.standardError),
      cell(c.residualSd), cell(c.residualDf), cell(c.rSquared), c.modelChoice?.sentence ?? '',
      cell(c.limits?.detection), cell(c.limits?.quantitation), c.limits?.sigmaSource ?? c.limitsProblem ?? '',
    ];
    if (c.standards.length === 0) rows.push([...curve, '', '', '', '', '', '', '', '', '']);
    for (const p of c.standards) {
      rows.push([...curve, p.standard, p.amount, cell(p.response), p.used ? 'yes' : 'no', cell(p.fitted), cell(p.residual), cell(p.backCalculated), cell(p.deviationPercent), p.note ?? '']);
    }
  }
  return writeCsv(rows, { ...options, comments: headLines(exp, 'calibration table') });
}

/** Amounts: one row per sample trace per named peak, with interval, marks and the limits in amount. */
export function amountsCsv(exp: CalibrationExport, options: CsvCellOptions): string {
  const level = `${Math.round(exp.confidenceLevel * 1000) / 10} %`;
  const rows: (string | number)[][] = [[
    'trace', 'named peak', 'status', 'apex', 'response', 'amount', `interval low (${level})`, `interval high (${level})`, 'amount unit',
    'standard error of the amount (s_x0)', 'detection limit (amount)', 'quantitation limit (amount)', 'marks', 'notes',
  ]];
  for (const s of exp.samples) {
    for (const a of s.amounts) {
      const c = exp.calibrations.find((k) => k.name === a.name);
      rows.push([
        s.trace, a.name, a.status, cell(a.x), cell(a.response), cell(a.amount), cell(a.interval?.low), cell(a.interval?.high), a.amountUnit,
        cell(a.standardError), cell(c?.limits?.detection), cell(c?.limits?.quantitation), a.flags.join('; '), a.notes.join(' '),
      ]);
    }
  }
  return writeCsv(rows, { ...options, comments: headLines(exp, 'amounts') });
}
