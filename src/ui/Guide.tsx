import { useEffect, useRef } from 'react';

/** Remembered in this browser: the guide was put away (it opens by itself only before that). */
export const GUIDE_KEY = 'tracewright.guide-dismissed';

export function guideDismissed(): boolean {
  try { return localStorage.getItem(GUIDE_KEY) === '1'; } catch { return false; }
}

export function rememberGuideDismissed(): void {
  try { localStorage.setItem(GUIDE_KEY, '1'); } catch { /* storage blocked: the guide opens again next time */ }
}

/**
 * Issue 17: the first-use guide, in our own words: what to drop on the page,
 * where the noise figure comes from, what the flags and marks mean, and how
 * to check a feature. Put away with "Close"; "Guide" in the top bar opens it again.
 */
export function FirstUseGuide({ onClose, focus }: { onClose: () => void; focus: boolean }) {
  const head = useRef<HTMLHeadingElement>(null);
  // Focus moves to the guide only when the user opened it (not when it opens by itself on a first visit).
  useEffect(() => { if (focus) head.current?.focus(); }, [focus]);
  return (
    <section className="panel guide" aria-labelledby="guide-title" data-testid="guide">
      <div className="panel-head">
        <h2 id="guide-title" ref={head} tabIndex={-1}>Getting started</h2>
        <button type="button" onClick={onClose} data-testid="guide-close">Close the guide</button>
      </div>
      <div className="guide-grid">
        <div>
          <h3>What to drop here</h3>
          <p>A file from your instrument: delimited text (comma, semicolon, tab or space separated) with an x column and one or more y columns, JCAMP-DX text or netCDF. Headers such as <code>time (min)</code>, <code>signal [mAU]</code> or <code>voltage_mV</code> give the axis names and units; you can change them with “Axis names and units…”.</p>
          <p>The first file is the sample. Give a blank run the role “blank” to subtract it or to measure noise on it, and repeated scans the role “repeated scan” to average them. Your own file sets the demo aside (one undo brings it back). Nothing leaves this computer.</p>
        </div>
        <div>
          <h3>Where the noise comes from</h3>
          <p>σ, the noise the S/N is measured against, comes from the raw trace: by default from the finest-scale spread of the trace with the peaks masked, corrected for noise that is not independent from point to point. You can instead mark a quiet stretch of baseline, or use the blank. σ is then carried through your processing steps by what each step does to noise (it is never measured on the processed trace), so a smoother cannot make its own S/N look better by hiding the noise it averaged. The noise panel says which estimate was used and whether its assumptions held.</p>
        </div>
        <div>
          <h3>What the flags mean</h3>
          <ul>
            <li><strong>quantifiable</strong>: S/N at or above the quantitation limit (10 by default).</li>
            <li><strong>detected, not quantifiable</strong>: between the detection limit (3) and the quantitation limit.</li>
            <li><strong>below detection limit</strong>: kept in the table and marked; most are noise.</li>
            <li><strong>only after processing</strong>: the raw trace has nothing there that passes the same thresholds; processing may have made it.</li>
            <li><strong>flat top</strong>, <strong>thin</strong>, <strong>in blank</strong>: possibly saturated; fewer than 5 points across half height; also in the blank.</li>
          </ul>
        </div>
        <div>
          <h3>Check what the cleaning cost</h3>
          <p>Click a peak on the plot or a row of the peak table: under the plot the same feature appears on the raw trace, the current steps and each alternative, side by side on one scale, each with kept, weakened, lost or appears only after processing. Add alternatives under “What each choice keeps”. Press <kbd>?</kbd> for the keyboard shortcuts.</p>
        </div>
      </div>
    </section>
  );
}

/** The keyboard shortcuts (App.tsx handles them); none acts while typing in a field. */
export const SHORTCUTS: readonly { keys: string; what: string }[] = [
  { keys: 'Ctrl+Z', what: 'undo the last change' },
  { keys: 'Ctrl+Shift+Z or Ctrl+Y', what: 'redo' },
  { keys: 'A', what: 'go to the step menu to add a step' },
  { keys: 'N / P', what: 'next / previous peak by position: select it, zoom to it and show it under each choice' },
  { keys: 'W', what: 'show the whole trace (undo the zoom)' },
  { keys: 'M', what: 'mark a range on the plot (again to stop)' },
  { keys: 'Esc', what: 'stop marking a range, adding peaks or measuring; close the selected feature' },
  { keys: '?', what: 'show or hide this list' },
];

export function ShortcutList({ onClose }: { onClose: () => void }) {
  const head = useRef<HTMLHeadingElement>(null);
  useEffect(() => { head.current?.focus(); }, []);
  return (
    <section className="panel shortcuts" aria-labelledby="shortcuts-title" data-testid="shortcuts">
      <div className="panel-head">
        <h2 id="shortcuts-title" ref={head} tabIndex={-1}>Keyboard shortcuts</h2>
        <button type="button" onClick={onClose}>Close the list</button>
      </div>
      <table className="data shortcut-table">
        <caption className="sr-only">Keyboard shortcuts</caption>
        <thead><tr><th scope="col">Keys</th><th scope="col">What they do</th></tr></thead>
        <tbody>{SHORTCUTS.map((s) => <tr key={s.keys}><td><kbd>{s.keys}</kbd></td><td>{s.what}</td></tr>)}</tbody>
      </table>
    </section>
  );
}
