import type { StateCreator } from 'zustand';
import type { AppState } from './store.ts';

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
});
