import type { StateCreator } from 'zustand';
import type { FitJobResult, FitSettings } from '../core/measure/fit/job.ts';
import type { AppState } from './store.ts';

/** The fit panel's choices apart from the region (which comes from the marked range or the zoom). */
export type FitChoices = Omit<FitSettings, 'from' | 'to'>;

export const DEFAULT_FIT_CHOICES: FitChoices = { on: 'raw', shape: 'gaussian', baseline: 'line', maxPeaks: 3 };

/** A fit the user made, kept for the session and written into every export (issue 18). */
export interface KeptFit {
  id: number;
  sampleId: string;
  /** When it was made (ISO time). */
  madeAt: string;
  /** The step stack it was made with, as JSON (a processed fit is out of date once the stack changes). */
  stackKey: string;
  result: FitJobResult;
}

export interface FitSlice {
  fitChoices: FitChoices;
  fits: KeptFit[];
  /** The fit the panel shows; null for the newest. */
  shownFitId: number | null;
  fitBusy: boolean;
  fitError: string | null;
  /** Optional peak table columns: the figures of chromatography. */
  showFigures: boolean;
  /** Dead time t_M (x-units) for retention factor and selectivity; null when not entered. */
  deadTime: number | null;
  setFitChoices: (c: Partial<FitChoices>) => void;
  addFit: (fit: Omit<KeptFit, 'id'>) => void;
  removeFit: (id: number) => void;
  showFit: (id: number | null) => void;
  setFitBusy: (b: boolean) => void;
  setFitError: (m: string | null) => void;
  setShowFigures: (v: boolean) => void;
  setDeadTime: (t: number | null) => void;
}

/** Fits kept at most; the oldest goes first. */
export const MAX_KEPT_FITS = 20;

export const createFitSlice: StateCreator<AppState, [], [], FitSlice> = (set) => ({
  fitChoices: DEFAULT_FIT_CHOICES,
  fits: [],
  shownFitId: null,
  fitBusy: false,
  fitError: null,
  showFigures: false,
  deadTime: null,
  setFitChoices: (c) => set((s) => ({ fitChoices: { ...s.fitChoices, ...c } })),
  addFit: (fit) => set((s) => {
    const id = (s.fits.at(-1)?.id ?? 0) + 1;
    return { fits: [...s.fits, { ...fit, id }].slice(-MAX_KEPT_FITS), shownFitId: id, fitError: null };
  }),
  removeFit: (id) => set((s) => ({ fits: s.fits.filter((f) => f.id !== id), shownFitId: s.shownFitId === id ? null : s.shownFitId })),
  showFit: (shownFitId) => set({ shownFitId }),
  setFitBusy: (fitBusy) => set({ fitBusy }),
  setFitError: (fitError) => set({ fitError }),
  setShowFigures: (showFigures) => set({ showFigures }),
  setDeadTime: (deadTime) => set({ deadTime }),
});
