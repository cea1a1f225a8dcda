import { useShallow } from 'zustand/react/shallow';
import { useCallback, useMemo, useRef, useState, useEffect } from 'react';
import type { PlotData, PlotLayout } from 'plotly.js-strict-dist-min';
import { decimateMinMax } from '../core/numeric/decimate.ts';
import { axisLabel } from '../core/trace.ts';
import { useApp } from '../state/store.ts';
import { ALTERNATIVE_COLOURS, COLOURS } from './palette.ts';
import { interpolateLinear } from '../core/numeric/interpolate.ts';
import { PlotlyFigure } from './PlotlyFigure.tsx';
import { MARK_TEXT } from '../core/export/peak-csv.ts';
import { markDrawFailed, markDrawn } from './draw-health.ts';
import { useNameOfPeak } from './calibration/derive.ts';
import { pickNamedPeakAt } from './calibration/pick.ts';
import { visibleYRange } from './plot-view.ts';

/** Plot width in pixel columns used for decimation (two points per column). */
function useWidth(): [React.RefObject<HTMLDivElement | null>, number] {
  const ref = useRef<HTMLDivElement>(null);
  const [w, setW] = useState(1000);
  useEffect(() => {
    const el = ref.current;
    if (!el || typeof ResizeObserver === 'undefined') return;
    const ro = new ResizeObserver(() => setW(Math.max(200, Math.round(el.clientWidth))));
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
  return [ref, w];
}

function arr(a: Float64Array): number[] {
  return Array.from(a);
}

export function TracePlot({ onFigure }: { onFigure?: (el: HTMLElement | null) => void }) {
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  // Only the fields drawn: a stage that changes none of them (noise, say) does not redraw the plot.
  const result = useApp(useShallow((s) => (s.result && s.result.sampleId === s.sampleId
    ? { processed: s.result.processed, residual: s.result.residual, baseline: s.result.baseline, intermediate: s.result.intermediate, events: s.result.events, peaks: s.result.peaks, loss: s.result.loss }
    : null)));
  const resultSeq = useApp((s) => s.stageSeq.processed);
  const xRange = useApp((s) => s.xRange);
  const showRaw = useApp((s) => s.showRaw);
  const showAlt = useApp((s) => s.showAlternatives);
  const altList = useApp((s) => s.alternatives);
  const setXRange = useApp((s) => s.setXRange);
  const markMode = useApp((s) => s.markMode);
  const setMarked = useApp((s) => s.setMarkedRange);
  const marked = useApp((s) => s.markedRange);
  const selectedX = useApp((s) => s.selectedPeakX);
  const yFits = useApp((s) => s.yFitsView);
  const [boxRef, width] = useWidth();
  const names = useNameOfPeak(); // issue 21: named peaks carry their name
  const namePick = useApp((s) => s.namePickMode);
  /** Which shapes are the selected peak's start and end (issue 17), for dragging. */
  const boundShapes = useRef<{ start: number; end: number; peak: { x: number; start: number; end: number } } | null>(null);

  const data = useMemo<PlotData[]>(() => {
    if (!sample) return [];
    const from = xRange ? xRange[0] : -Infinity;
    const to = xRange ? xRange[1] : Infinity;
    const cols = Math.max(200, width - 120);
    const traces: PlotData[] = [];
    if (showRaw || !result) {
      const d = decimateMinMax(sample.x, sample.y, from, to, cols);
      traces.push({ type: 'scatter', mode: 'lines', name: 'raw', x: arr(d.x), y: arr(d.y), line: { color: COLOURS.raw, width: 1 }, hoverinfo: 'x+y', xaxis: 'x', yaxis: 'y' });
    }
    if (result) {
      if (result.baseline && result.baseline.length === result.processed.x.length) {
        const d = decimateMinMax(result.processed.x, result.baseline, from, to, cols);
        traces.push({ type: 'scatter', mode: 'lines', name: 'baseline', x: arr(d.x), y: arr(d.y), line: { color: COLOURS.baseline, width: 1.5, dash: 'dash' }, xaxis: 'x', yaxis: 'y' });
      }
      if (result.intermediate) {
        const d = decimateMinMax(result.intermediate.x, result.intermediate.y, from, to, cols);
        traces.push({ type: 'scatter', mode: 'lines', name: 'chosen step output', x: arr(d.x), y: arr(d.y), line: { color: COLOURS.intermediate, width: 1.2, dash: 'dot' }, xaxis: 'x', yaxis: 'y' });
      }
      if (showAlt && result.loss) {
        result.loss.outcomes.forEach((o) => {
          const i = altList.findIndex((a) => a.id === o.id);
          const d = decimateMinMax(o.processed.x, o.processed.y, from, to, cols);
          traces.push({ type: 'scatter', mode: 'lines', name: o.label, x: arr(d.x), y: arr(d.y), line: { color: ALTERNATIVE_COLOURS[(i < 0 ? 0 : i) % ALTERNATIVE_COLOURS.length], width: 1.2, dash: ['dash', 'dot', 'dashdot', 'longdash', 'longdashdot', 'solid'][(i < 0 ? 0 : i) % 6] }, xaxis: 'x', yaxis: 'y' });
        });
      }
      if (result.loss) {
        // Features detectable on the raw trace that some column loses: marked where they were found.
        const lost = result.loss.ledger.rows.filter((r) => { const ref = r.cells[r.firstFoundIn]; return (ref.standing === 'detectable' || ref.standing === 'quantifiable') && r.cells.some((c, k) => k > r.firstFoundIn && !c.found); });
        if (lost.length) {
          const lx = Float64Array.from(lost.map((r) => r.position));
          const ly = interpolateLinear(sample.x, sample.y, lx);
          traces.push({
            type: 'scatter', mode: 'markers', name: 'features lost by some choice',
            x: arr(lx), y: arr(ly),
            text: lost.map((r) => `lost with: ${r.cells.map((c, k) => (c.found || k < r.firstFoundIn ? null : result.loss!.ledger.alternatives[k].label)).filter(Boolean).join(', ')}`),
            hoverinfo: 'x+text',
            marker: { symbol: 'circle-open', size: 22, color: '#c0392b', line: { width: 2.5, color: '#c0392b' } },
            xaxis: 'x', yaxis: 'y',
          });
        }
      }
      const p = decimateMinMax(result.processed.x, result.processed.y, from, to, cols);
      traces.push({ type: 'scatter', mode: 'lines', name: 'processed', x: arr(p.x), y: arr(p.y), line: { color: COLOURS.processed, width: 1.8 }, xaxis: 'x', yaxis: 'y' });
      if (result.events.length) {
        traces.push({
          type: 'scatter', mode: 'markers', name: 'replaced points',
          x: result.events.map((e) => e.x), y: result.events.map((e) => e.original),
          marker: { color: COLOURS.spike, symbol: 'x', size: 10, line: { width: 2, color: COLOURS.spike } },
          text: result.events.map((e) => `replaced ${e.original.toPrecision(5)} → ${e.replacement.toPrecision(5)}`),
          hoverinfo: 'x+text', xaxis: 'x', yaxis: 'y',
        });
      }
      // At most 300 markers (highest S/N first, hand-added always): thousands of labels would stall the page.
      let live = result.peaks.filter((pk) => !pk.removedByUser);
      if (live.length > 300) {
        const mine = live.filter((pk) => pk.origin === 'added-by-user');
        live = [...mine, ...live.filter((pk) => pk.origin !== 'added-by-user').sort((a, b) => (b.snr ?? 0) - (a.snr ?? 0)).slice(0, 300 - mine.length)];
      }
      // Features the raw trace does not have: ringed again, so they cannot be taken for ordinary peaks.
      const born = live.filter((pk) => pk.marks.includes('appears-only-after-processing') && pk.flag !== 'below-detection');
      if (born.length) {
        traces.push({
          type: 'scatter', mode: 'markers', name: 'appears only after processing',
          x: born.map((pk) => pk.x), y: born.map((pk) => pk.y),
          text: born.map((pk) => `appears only after processing: the raw trace has nothing here that passes the same thresholds (S/N ${pk.snr === null ? '—' : pk.snr.toPrecision(3)} now)`),
          hoverinfo: 'x+text',
          marker: { symbol: 'square-open', size: 20, color: COLOURS.spike, line: { width: 2.5, color: COLOURS.spike } },
          xaxis: 'x', yaxis: 'y',
        });
      }
      if (live.length) {
        const sym: Record<string, string> = { quantifiable: 'triangle-down', detectable: 'diamond', 'below-detection': 'circle-open', 'not-measured': 'circle-open' };
        const col: Record<string, string> = { quantifiable: COLOURS.peak, detectable: COLOURS.baseline, 'below-detection': COLOURS.spike, 'not-measured': COLOURS.raw };
        traces.push({
          type: 'scatter', mode: 'text+markers', name: 'peaks (S/N)',
          x: live.map((pk) => pk.x), y: live.map((pk) => pk.y),
          text: live.map((pk) => `${names.has(pk) ? `${names.get(pk)} · ` : ''}${pk.snr === null ? '?' : pk.snr.toFixed(pk.snr < 10 ? 1 : 0)}`),
          textposition: 'top center', textfont: { size: 11, color: COLOURS.ink },
          hovertext: live.map((pk) => `apex ${pk.x.toPrecision(6)}<br>height ${pk.height.toPrecision(4)}<br>FWHM ${pk.fwhm.toPrecision(4)} (${pk.leftHalf.toPrecision(6)} – ${pk.rightHalf.toPrecision(6)})<br>start – end ${pk.start.toPrecision(6)} – ${pk.end.toPrecision(6)}<br>S/N ${pk.snr === null ? '—' : pk.snr.toPrecision(3)}${pk.marks.map((m) => `<br>${MARK_TEXT[m]}`).join('')}${pk.origin === 'added-by-user' ? '<br>added by hand' : ''}`),
          hoverinfo: 'text',
          marker: { symbol: live.map((pk) => sym[pk.flag]), color: live.map((pk) => col[pk.flag]), size: 10, line: { width: 1.5, color: live.map((pk) => col[pk.flag]) } },
          xaxis: 'x', yaxis: 'y',
        });
      }
      const r = decimateMinMax(result.residual.x, result.residual.y, from, to, cols);
      traces.push({ type: 'scatter', mode: 'lines', name: 'residual (raw − processed)', x: arr(r.x), y: arr(r.y), line: { color: COLOURS.residual, width: 1 }, xaxis: 'x', yaxis: 'y2' });
    }
    return traces;
  }, [sample, result, xRange, showRaw, width, showAlt, altList, names]);

  const yView = useMemo(() => {
    if (!xRange || !yFits) return null;
    const y = visibleYRange(data, xRange[0], xRange[1], 'y');
    return y ? { y, y2: visibleYRange(data, xRange[0], xRange[1], 'y2') } : null;
  }, [data, xRange, yFits]);

  const layout = useMemo<PlotLayout>(() => {
    const xTitle = sample ? axisLabel(sample.xName, sample.xUnit) : 'x';
    const yTitle = sample ? axisLabel(sample.yName, sample.yUnit) : 'y';
    const shapes: Record<string, unknown>[] = marked ? [{ type: 'rect', xref: 'x', yref: 'paper', x0: marked[0], x1: marked[1], y0: 0, y1: 1, fillcolor: 'rgba(0,158,115,0.10)', line: { width: 0 } }] : [];
    const pk = selectedX === null ? undefined : result?.peaks.find((p) => Math.abs(p.x - selectedX) < 1e-12);
    boundShapes.current = null;
    if (pk) {
      // The peak's own local baseline between its bounds, and its half-height width measured above that line.
      const base = (v: number) => (pk.end === pk.start ? pk.baselineStart : pk.baselineStart + ((pk.baselineEnd - pk.baselineStart) * (v - pk.start)) / (pk.end - pk.start));
      shapes.push(
        { type: 'line', xref: 'x', yref: 'y', x0: pk.start, x1: pk.end, y0: pk.baselineStart, y1: pk.baselineEnd, line: { color: COLOURS.peak, width: 2, dash: 'dash' } },
        { type: 'line', xref: 'x', yref: 'y', x0: pk.leftHalf, x1: pk.rightHalf, y0: base(pk.leftHalf) + pk.height / 2, y1: base(pk.rightHalf) + pk.height / 2, line: { color: COLOURS.peak, width: 2 } },
        // Issue 17: start and end can be dragged; the new ones are kept as a decision (setPeakBounds).
        { type: 'line', xref: 'x', yref: 'paper', x0: pk.start, x1: pk.start, y0: 0.3, y1: 1, line: { color: COLOURS.peak, width: 3, dash: 'dot' }, name: 'start' },
        { type: 'line', xref: 'x', yref: 'paper', x0: pk.end, x1: pk.end, y0: 0.3, y1: 1, line: { color: COLOURS.peak, width: 3, dash: 'dot' }, name: 'end' },
      );
      boundShapes.current = { start: shapes.length - 2, end: shapes.length - 1, peak: pk };
    }
    return {
      autosize: true,
      height: 560,
      margin: { l: 70, r: 20, t: 10, b: 50 },
      showlegend: true,
      legend: { orientation: 'h', y: 1.02, x: 0, yanchor: 'bottom' },
      dragmode: markMode ? 'select' : 'zoom',
      selectdirection: 'h',
      hovermode: 'closest',
      xaxis: { title: { text: xTitle }, anchor: 'y2', range: xRange ?? undefined, autorange: xRange ? false : true, gridcolor: COLOURS.grid, zeroline: false },
      // Issue 17: zoomed in x, y fits the data in view (unless the user keeps y where they put it).
      yaxis: { title: { text: yTitle }, domain: [0.3, 1], gridcolor: COLOURS.grid, zeroline: false, ...(yView ? { range: yView.y, autorange: false } : { autorange: true }) },
      yaxis2: { title: { text: sample?.yUnit ? `residual (${sample.yUnit})` : 'residual' }, domain: [0, 0.22], gridcolor: COLOURS.grid, zeroline: true, zerolinecolor: '#b0b6bd', ...(yView?.y2 ? { range: yView.y2, autorange: false } : { autorange: true }) },
      shapes,
      uirevision: sample?.id ?? 'none',
      paper_bgcolor: '#ffffff',
      plot_bgcolor: '#ffffff',
      font: { family: 'system-ui, sans-serif', size: 12, color: COLOURS.ink },
    };
  }, [sample, xRange, markMode, marked, selectedX, result, yView]);

  const onXRange = useCallback((r: [number, number] | null) => setXRange(r), [setXRange]);
  const onShapeX = useCallback((index: number, x0: number) => {
    const b = boundShapes.current;
    if (!b || (index !== b.start && index !== b.end)) return;
    const start = index === b.start ? x0 : b.peak.start, end = index === b.end ? x0 : b.peak.end;
    useApp.getState().setPeakBounds(b.peak.x, start, end);
  }, []);
  const onSelectX = useCallback((r: [number, number]) => setMarked(r), [setMarked]);
  // Issue 21: a click names a peak while naming is on (clicks to add peaks go through the cursor readout, issue 17).
  const onClickPoint = useCallback((x: number) => { if (namePick) pickNamedPeakAt(x); }, [namePick]);
  const onDrawn = useCallback((problem: string | null) => { if (problem) markDrawFailed(`the plot: ${problem}`); else markDrawn(); }, []);

  if (!sample) {
    return <div className="plot-empty" ref={boxRef}>No trace yet. Drop a file here or choose one with “Open file”.</div>;
  }
  return (
    <div ref={boxRef} className="plot-box">
      <PlotlyFigure data={data} layout={layout} className="plot" label={`Plot of ${sample.name}: raw and processed trace with the residual below`} onXRange={onXRange} onSelectX={onSelectX} onClickPoint={onClickPoint} onShapeX={onShapeX} dragShapes={selectedX !== null} onReady={onFigure} onDrawn={onDrawn} pictureName={`${sample.source.fileName.replace(/\.[^.]*$/, '')}-plot`} drawnTag={String(result ? resultSeq : 0)} />
    </div>
  );
}
