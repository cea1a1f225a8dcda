/**
 * Issue 21: the report's section "Calibration and amounts", drawn from the
 * calibration export object (the same numbers calibration.json holds):
 * per named peak the curve, its coefficients with standard errors, the
 * residual SD, the test that chose line or quadratic (R² as a figure only),
 * the standards with back-calculated amounts and % deviation, and the
 * limits in amount beside the S/N limits; then this trace's amounts with
 * their intervals and marks.
 */
import type { AnalyseResult } from '../analysis/index.ts';
import type { CalibrationExport, ExportAmount, ExportCalibration, Num } from '../calibration/export.ts';
import { escapeText } from './html-text.ts';

/** Numbers for reading: five significant figures; null as a dash. */
export function calNum(v: Num | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  const a = Math.abs(v);
  if (a !== 0 && (a < 1e-4 || a >= 1e7)) return v.toExponential(4);
  return String(Number(v.toPrecision(5)));
}

/** An amount's interval in words: "[1.2, 3.4]", an open end as "unbounded". */
export function intervalText(a: Pick<ExportAmount, 'interval'>): string {
  if (!a.interval) return '—';
  return `[${a.interval.low === null ? 'unbounded' : calNum(a.interval.low)}, ${a.interval.high === null ? 'unbounded' : calNum(a.interval.high)}]`;
}

/** The curve as an equation in words: "response = 0.39 (± 0.01)·amount + 0.02 (± 0.03)". */
export function curveEquation(c: ExportCalibration): string {
  if (!c.coefficients.length) return '—';
  const terms = [...c.coefficients].sort((a, b) => b.power - a.power).map((k, i) => {
    // A negative coefficient after the first is written "− 0.018", not "+ -0.018".
    const negative = i > 0 && k.value !== null && k.value < 0;
    const v = `${calNum(negative ? -(k.value as number) : k.value)} (± ${calNum(k.standardError)})`;
    const term = k.power === 0 ? v : k.power === 1 ? `${v}·amount` : `${v}·amount²`;
    return i === 0 ? term : `${negative ? '−' : '+'} ${term}`;
  });
  return `response = ${terms.join(' ')}`;
}

function rowsTable(head: readonly string[], rows: readonly (readonly string[])[], caption: string, role: string): string {
  return `<table data-role="${role}"><caption>${escapeText(caption)}</caption><thead><tr>${head.map((h) => `<th scope="col">${escapeText(h)}</th>`).join('')}</tr></thead>`
    + `<tbody>${rows.map((r) => `<tr>${r.map((c) => `<td>${escapeText(c)}</td>`).join('')}</tr>`).join('')}</tbody></table>`;
}

/** The S/N of the named peak in this trace and the S/N limits, in words. */
function snrBeside(result: AnalyseResult, x: Num): string {
  const lim = result.peakOptions?.limits;
  const p = x === null ? undefined : result.peaks.find((q) => q.x === x);
  const snr = p?.snr;
  return `${snr === null || snr === undefined ? 'S/N not measured' : `S/N ${calNum(snr)}`}${lim ? ` (S/N limits: detection ${lim.detection}, quantitation ${lim.quantitation})` : ''}`;
}

/** The section as HTML (every text escaped). `exp.samples` should hold this trace only. */
export function calibrationReportSection(exp: CalibrationExport, result: AnalyseResult): string {
  const s: string[] = ['<h2>Calibration and amounts</h2>'];
  s.push(`<p>Amounts with ${Math.round(exp.confidenceLevel * 1000) / 10} % intervals. ${escapeText(exp.intervalMethod)}</p>`);
  s.push(`<p>${escapeText(exp.modelChoiceRule)}</p>`);
  if (exp.problems.length) s.push(`<ul data-role="calibration-problems">${exp.problems.map((p) => `<li>${escapeText(p)}</li>`).join('')}</ul>`);
  s.push(rowsTable(
    ['named peak', 'response', 'model and weights', 'curve (coefficients ± standard error)', 'residual SD (df)', 'chosen by', 'R² (figure only)', 'calibrated range', 'detection limit (amount)', 'quantitation limit (amount)', 'limits from'],
    exp.calibrations.map((c) => {
      const u = c.amountUnit ? ` ${c.amountUnit}` : '';
      return [
        c.name, c.responseInWords, c.model ? c.model.inWords : `not calibrated: ${c.problem ?? ''}`, curveEquation(c),
        c.residualSd === null ? '—' : `${calNum(c.residualSd)} (${c.residualDf ?? '—'})`,
        c.modelChoice ? c.modelChoice.sentence : '—', calNum(c.rSquared),
        c.range ? `${calNum(c.range.low)} – ${calNum(c.range.high)}${u}` : '—',
        c.limits ? `${calNum(c.limits.detection)}${u}` : '—', c.limits ? `${calNum(c.limits.quantitation)}${u}` : '—',
        c.limits ? c.limits.method : c.limitsProblem ?? '—',
      ];
    }),
    'Calibration per named peak', 'calibration-table',
  ));
  s.push(rowsTable(
    ['named peak', 'standard', 'known amount', 'response', 'in the fit', 'back-calculated amount', 'deviation (%)', 'note'],
    exp.calibrations.flatMap((c) => c.standards.map((p) => [c.name, p.standard, calNum(p.amount), calNum(p.response), p.used ? 'yes' : 'no', calNum(p.backCalculated), calNum(p.deviationPercent), p.note ?? ''])),
    'Standards: each one read back through its own curve', 'calibration-standards',
  ));
  for (const sample of exp.samples) {
    s.push(rowsTable(
      ['named peak', 'apex', 'response', 'amount', `${Math.round(exp.confidenceLevel * 1000) / 10} % interval`, 'unit', 'S/N of the peak beside the S/N limits', 'marks and notes'],
      sample.amounts.map((a) => [a.name, calNum(a.x), calNum(a.response), a.status === 'measured' ? calNum(a.amount) : a.status, intervalText(a), a.amountUnit, snrBeside(result, a.x), a.notes.join(' ')]),
      `Amounts in ${sample.trace}`, 'amounts',
    ));
    s.push(`<p data-role="missing-named">${sample.missing.length ? `Named peaks missing in this trace: ${escapeText(sample.missing.join(', '))}.` : 'Every named peak was found in this trace.'}</p>`);
  }
  return s.join('\n');
}
