import { HandReasonField } from './export/HandReasonField.tsx';
import { useCallback, useEffect, useRef, useState } from 'react';
import { useApp } from '../state/store.ts';
import { loadDemo, openFiles } from '../state/service.ts';
import { ErrorBoundary } from './ErrorBoundary.tsx';
import { Notices } from './Notices.tsx';
import { SessionBanner, StartChoice } from './SessionBanner.tsx';
import { LossPanel } from './LossPanel.tsx';
import { ExportPanel } from './export/ExportPanel.tsx';
import { CalibrationPanel } from './calibration/CalibrationPanel.tsx';
import { NoisePanel } from './NoisePanel.tsx';
import { PeakTable } from './PeakTable.tsx';
import { FitPanel } from './fit/FitPanel.tsx';
import { ResidualPanel } from './ResidualPanel.tsx';
import { StepStack } from './StepStack.tsx';
import { TraceList } from './TraceList.tsx';
import { TracePlot } from './TracePlot.tsx';
import { CursorReadout } from './CursorReadout.tsx';
import { AxisNames } from './AxisNames.tsx';
import { FocusedFeature } from './FocusedFeature.tsx';
import { ExcludedRanges } from './ExcludedRanges.tsx';
import { FirstUseGuide, guideDismissed, rememberGuideDismissed, ShortcutList } from './Guide.tsx';
import { nextPeak } from './peak-steps.ts';
import { currentResult } from '../state/selectors.ts';

/** The busy mark beside the plot title: re-renders on its own, not the whole page (issue 16). */
function BusyMark() {
  const busy = useApp((s) => s.busy);
  return busy ? <span className="busy" aria-label="computing"> ·</span> : null;
}

export function App() {
  const fileInput = useRef<HTMLInputElement>(null);
  const [dragging, setDragging] = useState(false);
  const [editAxes, setEditAxes] = useState(false);
  const markMode = useApp((s) => s.markMode);
  const marked = useApp((s) => s.markedRange);
  const showRaw = useApp((s) => s.showRaw);
  const yFits = useApp((s) => s.yFitsView);
  const handNote = useApp((s) => s.handNote);
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const { setMarkMode, setShowRaw, setXRange, setYFitsView, setHandNote, undo, redo } = useApp.getState();
  const figure = useRef<HTMLElement | null>(null);
  const [figureEl, setFigureEl] = useState<HTMLElement | null>(null);
  const onFigure = useCallback((el: HTMLElement | null) => { figure.current = el; setFigureEl(el); }, []);

  const [guideOpen, setGuideOpen] = useState(() => !guideDismissed());
  const [guideAsked, setGuideAsked] = useState(false);
  const [keysOpen, setKeysOpen] = useState(false);
  const closeGuide = useCallback(() => { setGuideOpen(false); rememberGuideDismissed(); }, []);

  useEffect(() => {
    // Issue 17: the shortcuts listed in Guide.tsx (SHORTCUTS); none acts while typing in a field.
    const onKey = (e: KeyboardEvent) => {
      const target = e.target as HTMLElement | null;
      if (target && (target.tagName === 'INPUT' || target.tagName === 'TEXTAREA' || target.tagName === 'SELECT' || target.isContentEditable)) return;
      const k = e.key.toLowerCase();
      if ((e.ctrlKey || e.metaKey) && !e.altKey) {
        if (k === 'z') { e.preventDefault(); if (e.shiftKey) redo(); else undo(); }
        else if (k === 'y') { e.preventDefault(); redo(); }
        return;
      }
      if (e.altKey) return;
      const s = useApp.getState();
      if (e.key === '?') { e.preventDefault(); setKeysOpen((o) => !o); }
      else if (e.key === 'Escape') { s.setMarkMode(false); s.setAddPeakMode(false); s.setMeasureMode(false); s.selectPeak(null); setKeysOpen(false); }
      else if (k === 'a') { const el = document.getElementById('add-step-choice'); if (el) { e.preventDefault(); el.focus(); } }
      else if (k === 'w') s.setXRange(null);
      else if (k === 'm') s.setMarkMode(!s.markMode);
      else if (k === 'n' || k === 'p') {
        const r = currentResult(s);
        const pk = r ? nextPeak(r.peaks, s.selectedPeakX, k === 'n' ? 1 : -1) : null;
        if (pk) {
          s.selectPeak(pk.x);
          const pad = Math.max(pk.fwhm * 3, (pk.end - pk.start) * 0.5);
          s.setXRange([pk.start - pad, pk.end + pad]);
        }
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [undo, redo]);

  return (
    <div
      className={`app ${dragging ? 'drop-active' : ''}`}
      onDragOver={(e) => { if (e.dataTransfer.types.includes('Files')) { e.preventDefault(); setDragging(true); } }}
      onDragLeave={(e) => { if (e.currentTarget === e.target) setDragging(false); }}
      onDrop={(e) => {
        if (!e.dataTransfer.files.length) return;
        e.preventDefault();
        setDragging(false);
        void openFiles(Array.from(e.dataTransfer.files));
      }}
    >
      <header className="topbar">
        <div className="brand">
          <span className="brand-name">Tracewright</span>
          <span className="brand-tag">clean a trace, measure its peaks, see what the cleaning cost</span>
        </div>
        <div className="row">
          <button type="button" className="primary" onClick={() => fileInput.current?.click()}>Open file…</button>
          <input
            ref={fileInput}
            type="file"
            multiple
            className="sr-only"
            data-testid="file-input"
            aria-label="Open trace files"
            onChange={(e) => {
              const files = Array.from(e.target.files ?? []);
              e.target.value = '';
              void openFiles(files);
            }}
          />
          <button type="button" onClick={() => void loadDemo()}>Reload demo</button>
          <button type="button" aria-expanded={guideOpen} onClick={() => { if (guideOpen) closeGuide(); else { setGuideOpen(true); setGuideAsked(true); } }} data-testid="guide-toggle">Guide</button>
          <button type="button" aria-expanded={keysOpen} onClick={() => setKeysOpen(!keysOpen)} title="Keyboard shortcuts (?)">Shortcuts</button>
        </div>
      </header>
      <p className="caution" role="note">
        Not a validated system. Results are for exploration and review; your laboratory’s procedures, validated methods and regulators’ requirements govern. Data stays on this computer.
      </p>
      {guideOpen && <div className="guide-wrap"><FirstUseGuide onClose={closeGuide} focus={guideAsked} /></div>}
      {keysOpen && <div className="guide-wrap"><ShortcutList onClose={() => setKeysOpen(false)} /></div>}
      <StartChoice />
      <div className="notices"><SessionBanner /></div>
      <Notices />
      <main className="layout">
        <aside className="side">
          <ErrorBoundary area="the trace list"><TraceList /></ErrorBoundary>
          <ErrorBoundary area="the processing steps"><StepStack /></ErrorBoundary>
        </aside>
        <div className="main">
          <section className="panel plot-panel" aria-labelledby="plot-title">
            <div className="panel-head">
              <h2 id="plot-title">{sample ? sample.name : 'Trace'}<BusyMark /></h2>
              <div className="row">
                <label className="switch"><input type="checkbox" checked={showRaw} onChange={(e) => setShowRaw(e.target.checked)} /> raw</label>
                <label className="switch" title="On: a zoom in x rescales y to the data in view. Off: y stays where you put it (drag a box to zoom both)."><input type="checkbox" checked={yFits} onChange={(e) => setYFitsView(e.target.checked)} data-testid="y-fits" /> y fits the zoom</label>
                <button type="button" aria-pressed={markMode} onClick={() => setMarkMode(!markMode)}>{markMode ? 'Marking: drag across the plot' : 'Mark a range'}</button>
                {marked && <span className="muted small">marked {marked[0].toPrecision(4)} – {marked[1].toPrecision(4)}</span>}
                <button type="button" onClick={() => setXRange(null)}>Whole trace</button>
                {sample && <button type="button" aria-expanded={editAxes} onClick={() => setEditAxes(!editAxes)}>Axis names and units…</button>}
              </div>
            </div>
            {editAxes && sample && <AxisNames key={sample.id} trace={sample} onClose={() => setEditAxes(false)} />}
            <ErrorBoundary area="the plot" drawsSession actions={<button type="button" onClick={() => window.location.reload()}>Reload and choose whether to restore this session</button>}>
              <TracePlot onFigure={onFigure} />
            </ErrorBoundary>
            {handNote && <p className={`small hand-note hand-${handNote.kind}`} role="status" data-testid="hand-note">{handNote.text} <button type="button" className="link" onClick={() => setHandNote(null)}>dismiss</button></p>}
            <HandReasonField />
            <ErrorBoundary area="the cursor readout"><CursorReadout figure={figureEl} /></ErrorBoundary>
            {sample && <ErrorBoundary area="the excluded ranges"><ExcludedRanges xUnit={sample.xUnit ?? ''} /></ErrorBoundary>}
            <ErrorBoundary area="the selected feature"><FocusedFeature /></ErrorBoundary>
          </section>
          <ErrorBoundary area="the residual checks"><ResidualPanel /></ErrorBoundary>
          <ErrorBoundary area="the peak table"><PeakTable /></ErrorBoundary>
          <ErrorBoundary area="the calibration"><CalibrationPanel /></ErrorBoundary>
          <ErrorBoundary area="the fit panel"><FitPanel /></ErrorBoundary>
          <ErrorBoundary area="the noise panel"><NoisePanel /></ErrorBoundary>
          <ErrorBoundary area="the loss check"><LossPanel /></ErrorBoundary>
          <ErrorBoundary area="the export panel"><ExportPanel getFigure={() => figure.current} /></ErrorBoundary>
        </div>
      </main>
      {dragging && <div className="drop-hint" aria-hidden="true">Drop trace files to load them</div>}
    </div>
  );
}
