import type { StateCreator } from 'zustand';
import type { AppState } from './store.ts';

/** How the session is being kept, and the question asked at start when the last restore did not draw. */
export interface SessionSlice {
  /** Why the session is not being kept in this browser, or null while it is. */
  sessionProblem: string | null;
  /** The user closed the message about `sessionProblem` (it comes back only for a different problem). */
  sessionProblemDismissed: boolean;
  /** ISO time of the last complete save to the browser's database. */
  sessionSavedAt: string | null;
  /** Some edit is not yet in the browser's database (a save is waiting or running). */
  sessionPending: boolean;
  setSessionPending: (v: boolean) => void;
  /** Set at start when the last restored session did not draw: the page asks before restoring it again. */
  startChoice: { message: string; at: string } | null;
  /** A service worker keeps a copy of the page for use without the server. */
  offlineReady: boolean;
  setOfflineReady: (v: boolean) => void;
  setSessionProblem: (problem: string | null) => void;
  dismissSessionProblem: () => void;
  setSessionSavedAt: (at: string | null) => void;
  setStartChoice: (c: { message: string; at: string } | null) => void;
}

export const createSessionSlice: StateCreator<AppState, [], [], SessionSlice> = (set) => ({
  sessionProblem: null,
  sessionProblemDismissed: false,
  sessionSavedAt: null,
  sessionPending: false,
  setSessionPending: (sessionPending) => set({ sessionPending }),
  startChoice: null,
  offlineReady: false,
  setOfflineReady: (offlineReady) => set({ offlineReady }),
  setSessionProblem: (sessionProblem) => set((s) => ({
    sessionProblem,
    sessionProblemDismissed: sessionProblem !== null && sessionProblem === s.sessionProblem ? s.sessionProblemDismissed : false,
  })),
  dismissSessionProblem: () => set({ sessionProblemDismissed: true }),
  setSessionSavedAt: (sessionSavedAt) => set({ sessionSavedAt }),
  setStartChoice: (startChoice) => set({ startChoice }),
});
