import type { StateCreator } from 'zustand';
import type { AnalyseResult } from '../core/analyse.ts';
import type { AppState } from './store.ts';

export interface ResultsSlice {
  result: AnalyseResult | null;
  busy: boolean;
  computeError: string | null;
  setResult: (r: AnalyseResult | null) => void;
  setBusy: (b: boolean) => void;
  setComputeError: (m: string | null) => void;
}

export const createResultsSlice: StateCreator<AppState, [], [], ResultsSlice> = (set) => ({
  result: null,
  busy: false,
  computeError: null,
  setResult: (result) => set({ result, computeError: null }),
  setBusy: (busy) => set({ busy }),
  setComputeError: (computeError) => set({ computeError }),
});
