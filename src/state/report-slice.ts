import type { StateCreator } from 'zustand';
import { EMPTY_REPORT_FIELDS, FIELD_MAX_CHARS, type HandChangeKind, type HandReason, type ReportFields } from '../core/export/report-fields.ts';
import type { AppState } from './store.ts';

/**
 * Issue 17: what the user writes for the record. The report's fields, and
 * a short reason per hand change; both kept with the session and written
 * into the exports. Typing them never starts an analysis (they are not part
 * of the decisions the worker receives).
 */
export interface ReportSlice {
  reportFields: ReportFields;
  setReportField: (key: keyof ReportFields, value: string) => void;
  handReasons: HandReason[];
  /** Set (or, with an empty text, clear) the reason for one hand change. */
  setHandReason: (kind: HandChangeKind, x: number, reason: string) => void;
  /** The hand change just made, whose reason the inline field under the plot asks for; null when none is waiting. */
  lastHandChange: { kind: HandChangeKind; x: number } | null;
  setLastHandChange: (c: { kind: HandChangeKind; x: number } | null) => void;
}

export const createReportSlice: StateCreator<AppState, [], [], ReportSlice> = (set) => ({
  reportFields: { ...EMPTY_REPORT_FIELDS },
  setReportField: (key, value) => set((s) => ({ reportFields: { ...s.reportFields, [key]: value.slice(0, FIELD_MAX_CHARS) } })),
  handReasons: [],
  setHandReason: (kind, x, reason) => set((s) => {
    const rest = s.handReasons.filter((r) => !(r.kind === kind && r.x === x));
    const text = reason.slice(0, FIELD_MAX_CHARS);
    return { handReasons: text.trim() ? [...rest, { kind, x, reason: text }] : rest };
  }),
  lastHandChange: null,
  setLastHandChange: (lastHandChange) => set({ lastHandChange }),
});
