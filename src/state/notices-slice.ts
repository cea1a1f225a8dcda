import type { StateCreator } from 'zustand';
import type { AppState } from './store.ts';
import { DISPLAY_CAPS } from './display-caps.ts';

export type NoticeKind = 'info' | 'warning' | 'error';
export interface Notice {
  id: number;
  kind: NoticeKind;
  title: string;
  lines: string[];
  /** A button the notice offers: its words and the key of the action (kept outside the store, which holds data only). */
  action?: { label: string; key: string };
}

/** Messages to the user (load problems, worker failures, what a step did), newest first. */
export interface NoticesSlice {
  notices: Notice[];
  notify: (kind: NoticeKind, title: string, lines?: string[], action?: Notice['action']) => void;
  dismissNotice: (id: number) => void;
}

let noticeId = 0;

export const createNoticesSlice: StateCreator<AppState, [], [], NoticesSlice> = (set) => ({
  notices: [],
  notify: (kind, title, lines = [], action) => set((s) => {
    noticeId += 1;
    const n: Notice = { id: noticeId, kind, title, lines };
    if (action) n.action = action;
    return { notices: [n, ...s.notices].slice(0, DISPLAY_CAPS.noticesKept) };
  }),
  dismissNotice: (id) => set((s) => ({ notices: s.notices.filter((n) => n.id !== id) })),
});
