/**
 * Remembers across a reload whether the restored session drew. A file the
 * plot could not draw used to blank the page, and the session restore
 * brought it back on every reload. Now: before a saved session is restored
 * the page notes "restoring"; the first successful drawing of the main plot
 * clears the note; a failed drawing writes what failed. At the next start,
 * a note still present means the last restore did not draw, and the page
 * asks before restoring again (see StartChoice.tsx).
 *
 * Kept in localStorage (small and synchronous, so it survives a crash right
 * after it is written). Where storage is unavailable nothing is remembered
 * and the page restores as before.
 */
const KEY = 'tracewright-draw-health';

export interface DrawProblem {
  state: 'restoring' | 'failed';
  at: string;
  message?: string;
}

function storage(): Storage | null {
  try {
    return typeof localStorage === 'undefined' ? null : localStorage;
  } catch {
    return null;
  }
}

/** Whether a note is stored, once known (saves reading storage on every drawing). */
let stored: boolean | null = null;

function write(p: DrawProblem | null): void {
  stored = p !== null;
  try {
    const s = storage();
    if (!s) return;
    if (p) s.setItem(KEY, JSON.stringify(p));
    else s.removeItem(KEY);
  } catch {
    // Storage full or refused: the page simply does not remember.
  }
}

/** Call just before a saved session is put back. */
export function markRestoring(): void {
  write({ state: 'restoring', at: new Date().toISOString() });
}

/** Call when the main plot drew (or there was nothing to draw). */
export function markDrawn(): void {
  if (stored === false) return;
  if (stored === true || lastDrawProblem()) write(null);
  stored = false;
}

/** Call when drawing failed. */
export function markDrawFailed(message: string): void {
  write({ state: 'failed', at: new Date().toISOString(), message: message.slice(0, 500) });
}

/** What went wrong last time, or null. */
export function lastDrawProblem(): DrawProblem | null {
  try {
    const raw = storage()?.getItem(KEY);
    if (!raw) return null;
    const p = JSON.parse(raw) as DrawProblem;
    return p && (p.state === 'restoring' || p.state === 'failed') ? p : null;
  } catch {
    return null;
  }
}
