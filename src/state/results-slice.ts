import type { StateCreator } from 'zustand';
import type { AnalyseResult } from '../core/analysis/index.ts';
import type { AppState } from './store.ts';

export interface ResultsSlice {
  result: AnalyseResult | null;
  /** Counts the results taken in (1 for the first); the drawn panels carry it as data-result-seq, so timing scripts can tell which result a panel shows. */
  resultSeq: number;
  busy: boolean;
  computeError: string | null;
  setResult: (r: AnalyseResult | null) => void;
  setBusy: (b: boolean) => void;
  setComputeError: (m: string | null) => void;
}

export const createResultsSlice: StateCreator<AppState, [], [], ResultsSlice> = (set) => ({
  result: null,
  resultSeq: 0,
  busy: false,
  computeError: null,
  setResult: (result) => set((s) => ({ result, computeError: null, resultSeq: result ? s.resultSeq + 1 : s.resultSeq })),
  setBusy: (busy) => set({ busy }),
  setComputeError: (computeError) => set({ computeError }),
});
