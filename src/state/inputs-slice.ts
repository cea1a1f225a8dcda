import type { StateCreator } from 'zustand';
import type { LoadReport } from '../core/io/types.ts';
import type { Trace, TraceRole } from '../core/trace.ts';
import type { AppState } from './store.ts';

export interface InputsSlice {
  traces: Trace[];
  roles: Record<string, TraceRole>;
  /** The trace being processed (role sample). */
  sampleId: string | null;
  reports: Record<string, LoadReport>;
  loading: { fileName: string; fraction: number } | null;
  /** Add traces in one change, with one load report for all or one per trace (the demo's ten files at once). */
  addTraces: (traces: Trace[], report: LoadReport | readonly LoadReport[], opts?: { replace?: boolean; roles?: TraceRole[] }) => void;
  setRole: (id: string, role: TraceRole) => void;
  setSample: (id: string) => void;
  /** Give several traces roles in one change (one step for the user, one analysis); a trace given 'sample' becomes the one processed. */
  setRoles: (changes: Record<string, TraceRole>, sampleId?: string | null) => void;
  removeTrace: (id: string) => void;
  /** Name the axes of a trace and their units (issue 17): the trace is replaced by one with the same id, data and source. */
  setAxisNames: (id: string, names: { xName: string; xUnit: string; yName: string; yUnit: string }) => void;
  setLoading: (l: { fileName: string; fraction: number } | null) => void;
}

export const createInputsSlice: StateCreator<AppState, [], [], InputsSlice> = (set) => ({
  traces: [],
  roles: {},
  sampleId: null,
  reports: {},
  loading: null,
  addTraces: (incoming, report, opts) => set((s) => {
    const traces = opts?.replace ? [...incoming] : [...s.traces, ...incoming];
    const roles: Record<string, TraceRole> = opts?.replace ? {} : { ...s.roles };
    const reports = opts?.replace ? {} : { ...s.reports };
    incoming.forEach((t, i) => {
      roles[t.id] = opts?.roles?.[i] ?? (i === 0 ? 'sample' : 'ignore');
      reports[t.id] = Array.isArray(report) ? report[i] : report;
    });
    let sampleId = opts?.replace ? null : s.sampleId;
    const firstSample = incoming.find((t) => roles[t.id] === 'sample');
    if (firstSample) {
      // A newly loaded sample becomes the one processed; the previous sample is kept, set aside.
      if (sampleId && sampleId !== firstSample.id && roles[sampleId] === 'sample') roles[sampleId] = 'ignore';
      sampleId = firstSample.id;
    }
    return { traces, roles, reports, sampleId };
  }),
  setRole: (id, role) => set((s) => {
    const roles = { ...s.roles, [id]: role };
    let sampleId = s.sampleId;
    if (role === 'blank') for (const t of s.traces) if (t.id !== id && roles[t.id] === 'blank') roles[t.id] = 'ignore';
    if (role === 'sample') {
      if (sampleId && sampleId !== id) roles[sampleId] = 'ignore';
      sampleId = id;
    } else if (sampleId === id) sampleId = null;
    return { roles, sampleId };
  }),
  setSample: (id) => set((s) => {
    const roles = { ...s.roles };
    if (s.sampleId && s.sampleId !== id) roles[s.sampleId] = 'ignore';
    roles[id] = 'sample';
    return { roles, sampleId: id };
  }),
  setRoles: (changes, sampleIdIn) => set((s) => {
    const roles = { ...s.roles, ...changes };
    let sampleId = sampleIdIn === undefined ? s.sampleId : sampleIdIn;
    const newSample = Object.keys(changes).find((id) => changes[id] === 'sample');
    if (newSample && sampleIdIn === undefined) sampleId = newSample;
    if (sampleId && roles[sampleId] !== 'sample') sampleId = null;
    // Only one sample and one blank at a time: the others are set aside.
    for (const t of s.traces) if (t.id !== sampleId && roles[t.id] === 'sample') roles[t.id] = 'ignore';
    const blanks = s.traces.filter((t) => roles[t.id] === 'blank');
    const keepBlank = blanks.find((t) => changes[t.id] === 'blank') ?? blanks[0];
    for (const t of blanks) if (t !== keepBlank) roles[t.id] = 'ignore';
    return { roles, sampleId };
  }),
  setAxisNames: (id, names) => set((s) => ({
    traces: s.traces.map((t) => (t.id === id ? Object.freeze({ ...t, ...names }) : t)),
  })),
  removeTrace: (id) => set((s) => {
    const roles = { ...s.roles };
    delete roles[id];
    return { traces: s.traces.filter((t) => t.id !== id), roles, sampleId: s.sampleId === id ? null : s.sampleId };
  }),
  setLoading: (loading) => set({ loading }),
});
