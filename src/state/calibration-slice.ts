/**
 * Issue 21: what the user gave for turning peaks into amounts: the
 * named-peak table, the standards' known amounts and the calibration
 * settings (the first and last are saved with the method), plus the peaks
 * measured on each standard trace (from the computation worker). Derived
 * figures (names, curves, amounts) are computed where they are shown.
 */
import type { StateCreator } from 'zustand';
import { emptyNamedPeakTable, type MatchRule, type NamedPeak, type NamedPeakTable } from '../core/calibration/named-peaks.ts';
import { defaultCalibrationSettings, type CalibrationSettings, type PeakCalibrationSettings } from '../core/calibration/settings.ts';
import type { StandardsTable } from '../core/calibration/standards.ts';
import type { Peak } from '../core/measure/peak-types.ts';
import type { AppState } from './store.ts';

/** Peaks measured on one standard trace, or why there are none. */
export type StandardPeaks = { ok: true; peaks: readonly Peak[] } | { ok: false; problem: string };

export interface CalibrationSlice {
  namedPeaks: NamedPeakTable;
  /** Known amounts of the named peaks in each standard (null: none given yet). */
  standardsTable: StandardsTable | null;
  calibrationSettings: CalibrationSettings;
  /** Peaks of each standard trace by trace id, measured with the sample's method. */
  standardPeaks: Record<string, StandardPeaks>;
  standardsBusy: boolean;
  /** When on, a click on a peak of the plot adds it to the named-peak table. */
  namePickMode: boolean;
  setNamedPeaks: (t: NamedPeakTable) => void;
  addNamedPeak: (p: NamedPeak) => void;
  updateNamedPeak: (index: number, p: Partial<NamedPeak>) => void;
  removeNamedPeak: (index: number) => void;
  setMatchRule: (rule: MatchRule) => void;
  setStandardsTable: (t: StandardsTable | null) => void;
  setCalibrationSettings: (p: Partial<CalibrationSettings>) => void;
  /** Change one named peak's own settings (null: back to the common ones). */
  setPeakCalibration: (name: string, p: Partial<PeakCalibrationSettings> | null) => void;
  setStandardPeaks: (peaks: Record<string, StandardPeaks>) => void;
  setStandardsBusy: (b: boolean) => void;
  setNamePickMode: (v: boolean) => void;
}

export const createCalibrationSlice: StateCreator<AppState, [], [], CalibrationSlice> = (set) => ({
  namedPeaks: emptyNamedPeakTable(),
  standardsTable: null,
  calibrationSettings: defaultCalibrationSettings(),
  standardPeaks: {},
  standardsBusy: false,
  namePickMode: false,
  setNamedPeaks: (namedPeaks) => set({ namedPeaks }),
  addNamedPeak: (p) => set((s) => ({ namedPeaks: { ...s.namedPeaks, peaks: [...s.namedPeaks.peaks, p] } })),
  updateNamedPeak: (i, p) => set((s) => ({ namedPeaks: { ...s.namedPeaks, peaks: s.namedPeaks.peaks.map((q, k) => (k === i ? { ...q, ...p } : q)) } })),
  removeNamedPeak: (i) => set((s) => ({ namedPeaks: { ...s.namedPeaks, peaks: s.namedPeaks.peaks.filter((_, k) => k !== i) } })),
  setMatchRule: (rule) => set((s) => ({ namedPeaks: { ...s.namedPeaks, rule } })),
  setStandardsTable: (standardsTable) => set({ standardsTable }),
  setCalibrationSettings: (p) => set((s) => ({ calibrationSettings: { ...s.calibrationSettings, ...p } })),
  setPeakCalibration: (name, p) => set((s) => {
    const rest = s.calibrationSettings.perPeak.filter((e) => e.name !== name);
    const own = s.calibrationSettings.perPeak.find((e) => e.name === name)?.settings ?? {};
    const perPeak = p === null ? rest : [...rest, { name, settings: { ...own, ...p } }];
    return { calibrationSettings: { ...s.calibrationSettings, perPeak } };
  }),
  setStandardPeaks: (standardPeaks) => set({ standardPeaks }),
  setStandardsBusy: (standardsBusy) => set({ standardsBusy }),
  setNamePickMode: (namePickMode) => set({ namePickMode, addPeakMode: false }),
});
