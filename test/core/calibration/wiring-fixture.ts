/**
 * One calibration of invented standards, shared by the tests of the
 * calibration exports (test/core/export/{calibration-csv,peak-names,report-calibration}.test.ts):
 * named peaks A and B, six standards, A's area 3·amount + 0.1 and B's 0.5·amount
 * with small scatter, and one sample.
 */
import { calibrate, quantifySamples } from '../../../src/core/calibration/calibrate.ts';
import { calibrationExport } from '../../../src/core/calibration/export.ts';
import { readNamedPeaksCsv } from '../../../src/core/calibration/named-peaks.ts';
import { defaultCalibrationSettings } from '../../../src/core/calibration/settings.ts';
import { readStandardsCsv } from '../../../src/core/calibration/standards.ts';

export const named = (() => { const r = readNamedPeaksCsv('name,position,window\nA,1,0.2\nB,2,0.2\n', 't.csv'); if (!r.ok) throw new Error(); return r.table; })();
export const amounts = (() => { const r = readStandardsCsv('standard,A (mg/L),B (mg/L)\ns1.csv,1,2\ns2.csv,1,2\ns3.csv,2,4\ns4.csv,2,4\ns5.csv,4,8\ns6.csv,4,8\n', 'a.csv'); if (!r.ok) throw new Error(); return r.table; })();
// Invented responses: A's area 3·amount + 0.1 with small scatter; B's area 0.5·amount with scatter.
const scatter = [0.01, -0.02, 0.015, -0.01, 0.02, -0.015];
const standardTraces = amounts.rows.map((r, i) => ({
  trace: r.standard,
  peaks: [{ x: 1.01, height: 1, area: 3 * (r.amounts[0] as number) + 0.1 + scatter[i] }, { x: 1.99, height: 1, area: 0.5 * (r.amounts[1] as number) - scatter[i] }],
}));
export const set = calibrate({ namedPeaks: named, standards: amounts, standardTraces, settings: defaultCalibrationSettings() });
export const samples = quantifySamples(set, [{ trace: 'sample.csv', peaks: [{ x: 1, height: 1, area: 3 * 2.5 + 0.1 }, { x: 5, height: 1, area: 1 }] }]);
export const exp = calibrationExport(set, samples, '2026-12-02T00:00:00.000Z');

