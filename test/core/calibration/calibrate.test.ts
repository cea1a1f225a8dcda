/**
 * From peak tables to amounts: limits in amount (ICH Q2(R1): DL = 3.3σ/S,
 * QL = 10σ/S), the per-peak calibration with its standards' back-calculated
 * amounts, the samples' amounts with flags, and the export object.
 * The fits themselves are checked against NIST and NumPy in regression.test.ts;
 * here each figure is recomputed from its definition.
 */
import { describe, expect, it } from 'vitest';
import { calibrate, quantifySamples } from '../../../src/core/calibration/calibrate.ts';
import type { TracePeaks } from '../../../src/core/calibration/calibrate.ts';
import { calibrationExport, calibrationExportJson } from '../../../src/core/calibration/export.ts';
import { predictAmount } from '../../../src/core/calibration/inverse.ts';
import { emptyNamedPeakTable } from '../../../src/core/calibration/named-peaks.ts';
import type { PeakLike } from '../../../src/core/calibration/named-peaks.ts';
import { defaultCalibrationSettings } from '../../../src/core/calibration/settings.ts';
import type { CalibrationSettings } from '../../../src/core/calibration/settings.ts';
import { readStandardsCsv } from '../../../src/core/calibration/standards.ts';
import { CAUTION } from '../../../src/core/export/version.ts';



// Invented peak tables: "A" near 4.3 min with area 0.4 per unit amount (+ noise), "IS" at 6 min
// (area 1.0 in every trace), an unnamed peak at 7 min.
const noise = [0.004, -0.006, 0.003, -0.002, 0.005, -0.004];
function standardTrace(name: string, amountA: number, k: number, opts: { dropA?: boolean; dropIS?: boolean } = {}): TracePeaks {
  const peaks: PeakLike[] = [];
  if (!opts.dropA) peaks.push({ x: 4.3 + 0.01 * k, height: 2 * amountA, area: 0.4 * amountA + noise[k % noise.length] });
  if (!opts.dropIS) peaks.push({ x: 6.0, height: 3, area: 1.0 });
  peaks.push({ x: 7.0, height: 1, area: 0.2 });
  return { trace: name, peaks };
}
const named = { ...emptyNamedPeakTable('min'), peaks: [{ name: 'A', position: 4.3, window: 0.1 }, { name: 'IS', position: 6.0, window: 0.1 }] };
const amountsCsv = 'standard,A (mg/L)\ns1a,1\ns1b,1\ns2a,4\ns2b,4\ns3a,10\ns3b,10\nghost,10\n';
const standards = (() => { const r = readStandardsCsv(amountsCsv, 'amounts.csv'); if (!r.ok) throw new Error('csv'); return r.table; })();
const traces = ['s1a', 's1b', 's2a', 's2b', 's3a', 's3b'].map((n, k) => standardTrace(n, [1, 1, 4, 4, 10, 10][k], k, { dropA: n === 's2b' }));
traces.push(standardTrace('unlisted', 3, 0));

describe('calibrate', () => {
  const settings: CalibrationSettings = { ...defaultCalibrationSettings(), perPeak: [] };
  const set = calibrate({ namedPeaks: named, standards, standardTraces: traces, settings });
  const cal = set.calibrations.find((c) => c.name === 'A')!;

  it('lists input problems: a standard without a trace, a trace without a row', () => {
    expect(set.problems).toEqual([
      'Standard "ghost" (line 8) has no trace among the standard traces; load it or correct its name.',
      'The trace "unlisted" is marked as a standard but has no row in the standards table; it is not used.',
    ]);
  });

  it('fits the standards found, leaves out the missing one with the reason, and back-calculates each', () => {
    expect(cal.status).toBe('calibrated');
    expect(cal.amountUnit).toBe('mg/L');
    expect(cal.points.map((p) => [p.standard, p.used])).toEqual([['s1a', true], ['s1b', true], ['s2a', true], ['s2b', false], ['s3a', true], ['s3b', true], ['ghost', false]]);
    expect(cal.points[3].note).toBe('"A" was not found (No peak within 4.3 ± 0.1 min).');
    expect(cal.fit!.n).toBe(5);
    // Replicates at 1 and 10, three levels: lack-of-fit test decides (Draper & Smith 1998, §2.1).
    expect(cal.choice!.rule).toBe('lack-of-fit');
    for (const p of cal.points.filter((v) => v.used)) {
      const back = predictAmount(cal.fit!, p.response!).amount!;
      expect(p.backCalculated).toBeCloseTo(back, 12);
      expect(p.deviationPercent).toBeCloseTo((100 * (back - p.amount)) / p.amount, 10);
      expect(p.residual).toBeCloseTo(p.response! - p.fitted!, 14);
    }
    expect(cal.limits!.detection).toBeGreaterThan(0);
    // The internal standard named in no settings is calibrated too when it has amounts; here it has none.
    expect(set.calibrations.find((c) => c.name === 'IS')).toEqual(expect.objectContaining({ status: 'not-calibrated', problem: 'The standards give no amount for this peak.' }));
  });

  it('with an internal standard: responses are ratios to it, it is not calibrated itself, a trace without it is left out', () => {
    const is = calibrate({
      namedPeaks: named, standards,
      standardTraces: traces.map((t) => (t.trace === 's1b' ? standardTrace('s1b', 1, 1, { dropIS: true }) : t)),
      settings: { ...settings, internalStandard: 'IS' },
    });
    expect(is.calibrations.map((c) => c.name)).toEqual(['A']);
    const c = is.calibrations[0];
    expect(c.responseInWords).toMatch(/area ratio to "IS"/);
    expect(c.points.find((p) => p.standard === 's1b')!.note).toBe('The internal standard "IS" was not found in this trace.');
    expect(c.points.find((p) => p.standard === 's3a')!.response).toBeCloseTo((0.4 * 10 + noise[4]) / 1.0, 14);
  });

  it('a peak with too few standards is not calibrated, with the fit\'s own reason', () => {
    const few = calibrate({ namedPeaks: named, standards, standardTraces: traces.slice(0, 2), settings });
    expect(few.calibrations[0].status).toBe('not-calibrated');
    expect(few.calibrations[0].problem).toBe('A straight line has 2 coefficients and needs at least 3 standards (so that the scatter about it can be measured); there are 2.');
  });

  describe('quantify samples', () => {
    const samples: TracePeaks[] = [
      { trace: 'mid', peaks: [{ x: 4.31, height: 10, area: 2.0 }, { x: 6, height: 3, area: 1 }] },
      { trace: 'high', peaks: [{ x: 4.29, height: 30, area: 6.0 }] },
      { trace: 'tiny', peaks: [{ x: 4.3, height: 0.01, area: 0.002 }] },
      { trace: 'none', peaks: [{ x: 7, height: 1, area: 1 }] },
    ];
    const out = quantifySamples(set, samples);
    const a = (trace: string) => out.find((s) => s.trace === trace)!.amounts.find((v) => v.name === 'A')!;

    it('reads amounts with their interval; inside the range no flag', () => {
      const m = a('mid');
      expect(m.status).toBe('measured');
      const direct = predictAmount(cal.fit!, 2.0);
      expect(m.estimate!.amount).toBe(direct.amount);
      expect(m.estimate!.interval).toEqual(direct.interval);
      expect(m.flags).toEqual([]);
      expect(m.estimate!.amount!).toBeCloseTo(5, 1);
    });

    it('flags extrapolation above the highest standard and amounts below the limits', () => {
      expect(a('high').flags).toEqual(['extrapolated-above']);
      expect(a('high').notes[0]).toBe('Above the highest standard (10 mg/L): extrapolated.');
      const t = a('tiny');
      expect(t.flags).toContain('extrapolated-below');
      expect(t.flags.filter((f) => f.startsWith('below-'))).toHaveLength(1);
      expect(t.estimate!.amount! < cal.limits!.quantitation).toBe(true);
    });

    it('a missing named peak is not found, with the reason', () => {
      expect(a('none')).toEqual(expect.objectContaining({ status: 'not-found', estimate: null, notes: ['"A" was not found (No peak within 4.3 ± 0.1 min).'] }));
      expect(out.find((s) => s.trace === 'none')!.naming.missing).toEqual(['A', 'IS']);
    });

    it('the export object is plain JSON (no NaN or Infinity), carries the caution, the methods and every figure', () => {
      const exp = calibrationExport(set, out, '2026-12-21T10:00:00.000Z');
      const text = calibrationExportJson(exp);
      expect(JSON.parse(text)).toEqual(JSON.parse(JSON.stringify(exp)));
      expect(text).not.toMatch(/NaN|Infinity/);
      expect(exp.format).toBe('tracewright-calibration');
      expect(exp.version).toBe(1);
      expect(exp.caution).toBe(CAUTION);
      expect(exp.intervalMethod).toMatch(/Draper & Smith/);
      expect(exp.modelChoiceRule).toMatch(/Never R²/);
      const c = exp.calibrations.find((v) => v.name === 'A')!;
      expect(c.coefficients.map((v) => [v.term, v.value, v.standardError])).toEqual(cal.fit!.terms.map((t, j) => [t, cal.fit!.coefficients[j], cal.fit!.standardErrors[j]]));
      expect(c.residualSd).toBe(cal.fit!.residualSd);
      expect(c.standards.find((p) => p.standard === 's1a')!.deviationPercent).toBe(cal.points[0].deviationPercent);
      expect(c.limits!.quantitation).toBe(cal.limits!.quantitation);
      expect(c.rSquaredNote).toMatch(/figure only/);
      const mid = exp.samples.find((s) => s.trace === 'mid')!.amounts.find((v) => v.name === 'A')!;
      expect(mid.interval).toEqual({ low: a('mid').estimate!.interval!.low, high: a('mid').estimate!.interval!.high, level: 0.95 });
      expect(mid.x).toBe(4.31);
      expect(exp.standardTraces.find((s) => s.trace === 's2b')!.missing).toEqual(['A']);
    });
  });
});
