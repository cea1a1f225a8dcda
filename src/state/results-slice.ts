import type { StateCreator } from 'zustand';
import { applyStage, type AnalyseResult, type StageName, type StageUpdate } from '../core/analysis/index.ts';
import type { AppState } from './store.ts';

/** How many times each stage has landed (panels carry their own as data-result-seq). */
export type StageSeq = Record<StageName, number>;
const NO_SEQ: StageSeq = { processed: 0, residual: 0, noise: 0, peaks: 0, bumps: 0, alternative: 0, loss: 0 };

export interface ResultsSlice {
  /**
   * The newest figures, stage by stage: a stage's update replaces only the
   * fields it sets, so a panel that selects an unchanged field does not
   * re-render. Fields a pending stage may still change are provisional.
   */
  result: AnalyseResult | null;
  /** Counts the updates taken in (1 for the first). */
  resultSeq: number;
  /** Counts each stage's landings: the drawn panels carry theirs as data-result-seq, so timing scripts and tests can tell which result a panel shows. */
  stageSeq: StageSeq;
  /** Stages of the newest request still to come (empty when everything shown is final). */
  pending: StageName[];
  busy: boolean;
  computeError: string | null;
  /** A whole result (every stage final). */
  setResult: (r: AnalyseResult | null) => void;
  /** Stages the newest request will deliver: what they set is provisional until they land. */
  setPending: (p: StageName[]) => void;
  /** One stage's update. */
  takeStage: (u: StageUpdate) => void;
  setBusy: (b: boolean) => void;
  setComputeError: (m: string | null) => void;
}

export const createResultsSlice: StateCreator<AppState, [], [], ResultsSlice> = (set) => ({
  result: null,
  resultSeq: 0,
  stageSeq: NO_SEQ,
  pending: [],
  busy: false,
  computeError: null,
  setResult: (result) => set((s) => ({
    result, computeError: null, pending: [],
    resultSeq: result ? s.resultSeq + 1 : s.resultSeq,
    stageSeq: result ? Object.fromEntries(Object.entries(s.stageSeq).map(([k, v]) => [k, v + 1])) as StageSeq : s.stageSeq,
  })),
  setPending: (pending) => set({ pending }),
  takeStage: (u) => set((s) => ({
    result: applyStage(s.result, u), computeError: null, pending: u.pending,
    resultSeq: s.resultSeq + 1, stageSeq: { ...s.stageSeq, [u.stage]: s.stageSeq[u.stage] + 1 },
  })),
  setBusy: (busy) => set({ busy }),
  setComputeError: (computeError) => set({ computeError }),
});
