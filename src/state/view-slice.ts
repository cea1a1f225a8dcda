import type { StateCreator } from 'zustand';
import type { AppState } from './store.ts';

/** How the page is looked at: zoom, what is drawn, and the plot's click modes (mark, measure, add a peak) and the selected peak. */
export interface ViewSlice {
  /** Visible x-range, or null for all. */
  xRange: [number, number] | null;
  showRaw: boolean;
  /** uid of a step whose output is drawn as well. */
  showUid: string | null;
  setXRange: (r: [number, number] | null) => void;
  setShowRaw: (v: boolean) => void;
  setShowUid: (uid: string | null) => void;
  /** When on, dragging on the plot marks an x-range instead of zooming. */
  markMode: boolean;
  /** The last x-range the user marked (quiet baseline, baseline regions). */
  markedRange: [number, number] | null;
  setMarkMode: (v: boolean) => void;
  setMarkedRange: (r: [number, number] | null) => void;
  /** Each trace's own zoom (x-range), kept while another trace is shown (issue 17). */
  zooms: Record<string, [number, number]>;
  /** Keep the x-range of the trace being left and take up the zoom of the one shown next (full range when it has none). */
  switchZoom: (fromId: string | null, toId: string | null) => void;
  /** When on (the default), a zoom in x rescales y to the data in view; off keeps y where the user put it. */
  yFitsView: boolean;
  setYFitsView: (v: boolean) => void;
  /** What became of the last peak added by hand (issue 17), said under the plot. */
  handNote: { kind: 'added' | 'refused'; text: string } | null;
  setHandNote: (n: { kind: 'added' | 'refused'; text: string } | null) => void;
  /** Two-point measuring on the plot (issue 17): clicks then measure and select nothing. */
  measureMode: boolean;
  setMeasureMode: (v: boolean) => void;
  /** When on, a click on the plot adds a peak there. */
  addPeakMode: boolean;
  setAddPeakMode: (v: boolean) => void;
  /** The peak the table and plot show as chosen (its x), or null. */
  selectedPeakX: number | null;
  selectPeak: (x: number | null) => void;
}

export const createViewSlice: StateCreator<AppState, [], [], ViewSlice> = (set) => ({
  xRange: null,
  showRaw: true,
  showUid: null,
  setXRange: (xRange) => set({ xRange }),
  setShowRaw: (showRaw) => set({ showRaw }),
  setShowUid: (showUid) => set({ showUid }),
  markMode: false,
  markedRange: null,
  setMarkMode: (markMode) => set({ markMode, addPeakMode: false }),
  setMarkedRange: (markedRange) => set({ markedRange }),
  zooms: {},
  switchZoom: (fromId, toId) => set((s) => {
    const zooms = { ...s.zooms };
    if (fromId) { if (s.xRange) zooms[fromId] = s.xRange; else delete zooms[fromId]; }
    return { zooms, xRange: toId ? zooms[toId] ?? null : null };
  }),
  yFitsView: true,
  setYFitsView: (yFitsView) => set({ yFitsView }),
  handNote: null,
  measureMode: false,
  setMeasureMode: (measureMode) => set(measureMode ? { measureMode, addPeakMode: false } : { measureMode }),
  setHandNote: (handNote) => set({ handNote }),
  addPeakMode: false,
  setAddPeakMode: (addPeakMode) => set({ addPeakMode, markMode: false }),
  selectedPeakX: null,
  selectPeak: (selectedPeakX) => set({ selectedPeakX }),
});
