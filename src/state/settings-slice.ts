import type { StateCreator } from 'zustand';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, MAX_ALTERNATIVES, type AlternativeRequest, type NoiseSettings, type PeakSettings } from '../core/analysis/index.ts';
import type { PeakDecisions } from '../core/measure/peak-types.ts';
import type { XUnits } from '../core/units.ts';
import type { AppState } from './store.ts';

/** What the user chose about noise and peaks (settings, decisions on peaks, alternatives for the loss check); kept apart from the step stack. */
export interface SettingsSlice {
  noiseSettings: NoiseSettings;
  peakSettings: PeakSettings;
  decisions: PeakDecisions;
  setNoiseSettings: (s: Partial<NoiseSettings>) => void;
  setPeakSettings: (s: Partial<PeakSettings>) => void;
  addPeakAt: (x: number) => void;
  removePeakAt: (x: number) => void;
  /** Undo the removal of the peak at x (removals within `tolerance` of it, in x-units). */
  restorePeakAt: (x: number, tolerance: XUnits) => void;
  clearDecisions: () => void;
  /** Set the start and end of the peak at x by hand (issue 17); kept as a decision like added and removed peaks. */
  setPeakBounds: (x: number, start: number, end: number) => void;
  /** Other stacks kept beside the current one for the loss check. */
  alternatives: AlternativeRequest[];
  showAlternatives: boolean;
  /** Add alternatives (up to the limit); returns how many were added. */
  addAlternatives: (alts: AlternativeRequest[]) => number;
  removeAlternative: (id: string) => void;
  setShowAlternatives: (v: boolean) => void;
  /** Show ledger rows that stay below the detection limit in every column (off by default). */
  ledgerNoiseLevel: boolean;
  setLedgerNoiseLevel: (v: boolean) => void;
}

export const createSettingsSlice: StateCreator<AppState, [], [], SettingsSlice> = (set) => ({
  noiseSettings: { ...DEFAULT_NOISE_SETTINGS },
  peakSettings: { ...DEFAULT_PEAK_SETTINGS },
  decisions: { added: [], removed: [] },
  setNoiseSettings: (p) => set((s) => ({ noiseSettings: { ...s.noiseSettings, ...p } })),
  setPeakSettings: (p) => set((s) => ({ peakSettings: { ...s.peakSettings, ...p } })),
  // Issue 17: each hand change waits for its reason (lastHandChange, report-slice.ts).
  addPeakAt: (x) => set((s) => ({ decisions: { ...s.decisions, added: [...s.decisions.added, x] }, lastHandChange: { kind: 'added', x } })),
  removePeakAt: (x) => set((s) => (
    // Removing a peak the user added undoes the addition (and drops its reason); a detected one is kept as a decision.
    s.decisions.added.some((a) => a === x)
      ? { decisions: { ...s.decisions, added: s.decisions.added.filter((a) => a !== x) }, handReasons: s.handReasons.filter((r) => !(r.kind === 'added' && r.x === x)), lastHandChange: null }
      : { decisions: { ...s.decisions, removed: [...s.decisions.removed, x] }, lastHandChange: { kind: 'removed' as const, x } }
  )),
  restorePeakAt: (x, tol) => set((s) => ({
    decisions: { ...s.decisions, removed: s.decisions.removed.filter((r) => Math.abs(r - x) > tol) },
    handReasons: s.handReasons.filter((r) => !(r.kind === 'removed' && Math.abs(r.x - x) <= tol)),
    lastHandChange: null,
  })),
  clearDecisions: () => set({ decisions: { added: [], removed: [] }, handReasons: [], lastHandChange: null }),
  setPeakBounds: (x, start, end) => set((s) => ({
    decisions: { ...s.decisions, bounds: [...(s.decisions.bounds ?? []).filter((b) => b.x !== x), { x, start: Math.min(start, end), end: Math.max(start, end) }] },
    lastHandChange: { kind: 'bounds', x },
  })),
  alternatives: [],
  showAlternatives: true,
  ledgerNoiseLevel: false,
  setLedgerNoiseLevel: (ledgerNoiseLevel) => set({ ledgerNoiseLevel }),
  addAlternatives: (alts) => {
    let added = 0;
    set((s) => {
      const room = MAX_ALTERNATIVES - s.alternatives.length;
      const fresh = alts.filter((a) => !s.alternatives.some((b) => b.label === a.label)).slice(0, Math.max(0, room));
      added = fresh.length;
      return { alternatives: [...s.alternatives, ...fresh] };
    });
    return added;
  },
  removeAlternative: (id) => set((s) => ({ alternatives: s.alternatives.filter((a) => a.id !== id) })),
  setShowAlternatives: (showAlternatives) => set({ showAlternatives }),
});
