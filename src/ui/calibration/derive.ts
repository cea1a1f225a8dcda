/**
 * Issue 21: what the page derives from the calibration slice: the names of
 * the sample's peaks, the calibration set from the standards' peaks, the
 * sample's amounts and the export object. Memoised on the store's values.
 */
import { useMemo } from 'react';
import { calibrate, quantifySamples, type CalibrationSet, type SampleAmounts } from '../../core/calibration/calibrate.ts';
import { calibrationExport, type CalibrationExport } from '../../core/calibration/export.ts';
import { nameTracePeaks, validateNamedPeakTable, type PeakNaming } from '../../core/calibration/named-peaks.ts';
import { standardKeyOf } from '../../core/calibration/trace-keys.ts';
import type { Peak } from '../../core/measure/peak-types.ts';
import { useApp } from '../../state/store.ts';
import { currentResult } from '../../state/selectors.ts';

/** The sample's result, when it is for the current sample. */
export function useSampleResult() {
  return useApp((s) => currentResult(s));
}

/** The sample's peaks only: a stage that leaves them alone (the processed trace, noise, loss) changes nothing here (issue 16). */
function useSamplePeaks(): Peak[] | null {
  return useApp((s) => (s.result && s.result.sampleId === s.sampleId ? s.result.peaks : null));
}

/** The naming of the sample's peaks, or null when no named peaks are set (or the table has problems). */
export function useSampleNaming(): PeakNaming | null {
  const table = useApp((s) => s.namedPeaks);
  const peaks = useSamplePeaks();
  return useMemo(() => {
    if (!peaks || table.peaks.length === 0 || validateNamedPeakTable(table).problems.length) return null;
    return nameTracePeaks(table, peaks);
  }, [table, peaks]);
}

/** Each of the sample's peaks (the result's objects) with its name. */
export function useNameOfPeak(): Map<Peak, string> {
  const naming = useSampleNaming();
  const peaks = useSamplePeaks();
  return useMemo(() => {
    const m = new Map<Peak, string>();
    if (naming && peaks) peaks.forEach((p, i) => { const n = naming.names[i]; if (n) m.set(p, n); });
    return m;
  }, [naming, peaks]);
}

export interface CalibrationView {
  set: CalibrationSet;
  sample: SampleAmounts | null;
  exp: CalibrationExport;
  /** Standard traces whose peaks could not be measured, with why. */
  standardProblems: string[];
}

/** The calibration from the standards and the sample's amounts, or null without named peaks, amounts or standards. */
export function useCalibrationView(): CalibrationView | null {
  const table = useApp((s) => s.namedPeaks);
  const standards = useApp((s) => s.standardsTable);
  const settings = useApp((s) => s.calibrationSettings);
  const standardPeaks = useApp((s) => s.standardPeaks);
  const traces = useApp((s) => s.traces);
  const roles = useApp((s) => s.roles);
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const result = useSampleResult();
  return useMemo(() => {
    if (!standards || table.peaks.length === 0 || validateNamedPeakTable(table).problems.length) return null;
    const standardProblems: string[] = [];
    const standardTraces = traces.filter((t) => roles[t.id] === 'standard').flatMap((t) => {
      const sp = standardPeaks[t.id];
      if (!sp) return [];
      if (!sp.ok) { standardProblems.push(`${t.name}: peaks could not be measured (${sp.problem})`); return []; }
      return [{ trace: standardKeyOf(t, standards), peaks: sp.peaks }];
    });
    const set = calibrate({ namedPeaks: table, standards, standardTraces, settings });
    const samples = sample && result ? quantifySamples(set, [{ trace: sample.name, peaks: result.peaks }]) : [];
    return { set, sample: samples[0] ?? null, exp: calibrationExport(set, samples, new Date().toISOString()), standardProblems };
  }, [table, standards, settings, standardPeaks, traces, roles, sample, result]);
}
