import { useShallow } from 'zustand/react/shallow';
import { useCallback, useMemo, useRef, useState, useEffect } from 'react';
import type { PlotData, PlotLayout, PlotShape } from 'plotly.js-strict-dist-min';
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
import { bornSquares, lostFeatures, replacedCrosses, visibleYRange } from './plot-view.ts';
import { PLOT_LABELS, labelsStillClear, placeLabels, type PlotGeometry } from './plot-labels.ts';
import type { Peak } from '../core/measure/peak-types.ts';
import type { Signal } from '../core/steps/types.ts';
import { farOf } from '../worker/bridge.ts';
import { sameView, type Drawn, type FarSeries, type View } from '../worker/series.ts';
import { PLOT_MARKERS, plotMarkers, tableTotals } from '../worker/peak-rank.ts';
import { extent, RESIDUAL_RANGE, steadyRange, TRACE_RANGE } from './plot-update.ts';
import { getBackend } from '../state/service.ts';

/** The main plotting area as last drawn: axis ranges and size in pixels (issue 17: label placement). */
type Geometry = PlotGeometry;

/** The x-axis and y-axis ranges and lengths Plotly used, read from the drawn figure. */
function readGeometry(el: HTMLElement | null): Geometry | null {
  const fl = (el as unknown as { _fullLayout?: { xaxis?: { range?: number[]; _length?: number; type?: string }; yaxis?: { range?: number[]; _length?: number; type?: string } } } | null)?._fullLayout;
  const xa = fl?.xaxis, ya = fl?.yaxis;
  if (!xa?.range || !ya?.range || !xa._length || !ya._length || xa.type !== 'linear' || ya.type !== 'linear') return null;
  const g: Geometry = { x: [Number(xa.range[0]), Number(xa.range[1])], y: [Number(ya.range[0]), Number(ya.range[1])], w: xa._length, h: ya._length };
  return [...g.x, ...g.y].every(Number.isFinite) && g.x[1] > g.x[0] && g.y[1] > g.y[0] ? g : null;
}

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

/** Every series of a result that stayed in the worker (worker/series.ts). */
function farSeriesOf(r: { processed: Signal; residual: Signal; baseline?: Float64Array; intermediate?: Signal | null; loss: { outcomes: { processed: Signal }[] } | null } | null): FarSeries[] {
  if (!r) return [];
  return [r.processed, r.residual, r.baseline, r.intermediate, ...(r.loss?.outcomes.map((o) => o.processed) ?? [])]
    .map(farOf).filter((f): f is FarSeries => f !== undefined);
}

/**
 * The worker's drawings of its long series for the view shown: those that came with a stage for another view
 * (a zoom, a pan or a resize since) are asked for again; the view goes to the worker so later stages come
 * drawn for it. Short series are decimated here.
 */
function useDrawn(far: FarSeries[], view: View): (f: FarSeries) => Drawn {
  const [fresh, setFresh] = useState<ReadonlyMap<number, Drawn>>(new Map());
  useEffect(() => {
    const have = (f: FarSeries) => sameView(f.drawn.view, view) || (fresh.get(f.ref) !== undefined && sameView(fresh.get(f.ref)!.view, view));
    const need = far.filter((f) => !have(f));
    if (!need.length && !far.length) return;
    let stale = false;
    getBackend().draw(need.map((f) => f.ref), view).then((ds) => {
      if (stale || !ds.length) return;
      setFresh((m) => {
        const keep = new Map([...m].filter(([ref]) => far.some((f) => f.ref === ref)));
        ds.forEach((d, i) => keep.set(need[i].ref, d));
        return keep;
      });
    }, () => undefined /* a series let go meanwhile: the next stage brings its own drawing */);
    return () => { stale = true; };
    // `fresh` is read, not watched: a drawing that lands must not ask again.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [far, view]);
  return useCallback((f: FarSeries) => {
    const d = fresh.get(f.ref);
    return d && sameView(d.view, view) ? d : f.drawn;
  }, [fresh, view]);
}

export function TracePlot({ onFigure }: { onFigure?: (el: HTMLElement | null) => void }) {
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  // Only the fields drawn: a stage that changes none of them (noise, say) does not redraw the plot.
  const result = useApp(useShallow((s) => (s.result && s.result.sampleId === s.sampleId
    ? { processed: s.result.processed, residual: s.result.residual, baseline: s.result.baseline, intermediate: s.result.intermediate, events: s.result.events, peaks: s.result.peaks, loss: s.result.loss, peakOptions: s.result.peakOptions }
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
  const [geom, setGeom] = useState<Geometry | null>(null);
  const labelCount = useRef<{ shown: number; of: number; below: number } | null>(null);
  /** Issue 16: candidates below the detection limit with a marker, and in all (PLOT_MARKERS_BELOW). */
  const belowMarkers = useRef<{ drawn: number; of: number } | null>(null);
  /** Issue 16: peaks that appear only after processing with a square, and in all (BORN_SQUARES). */
  const bornSquaresDrawn = useRef<{ drawn: number; of: number } | null>(null);
  const figEl = useRef<HTMLElement | null>(null);
  const excluded = useApp((s) => s.peakSettings.excluded);
  const addPeakMode = useApp((s) => s.addPeakMode);
  const boundShapes = useRef<{ start: number; end: number; peak: { x: number; start: number; end: number } } | null>(null);

  const view = useMemo<View>(() => ({ from: xRange ? xRange[0] : -Infinity, to: xRange ? xRange[1] : Infinity, columns: Math.max(200, width - 120) }), [xRange, width]);
  const far = useMemo(() => farSeriesOf(result), [result]);
  const drawnFar = useDrawn(far, view);
  // The raw trace lives on the page (its master copy): decimated here, again only when the view changes.
  const rawDrawn = useMemo(() => (sample ? decimateMinMax(sample.x, sample.y, view.from, view.to, view.columns * 2) : null), [sample, view]);

  // The peak markers and labels: rebuilt only when the peaks, their names or the view change, not at every stage (issue 16).
  const peaks = result?.peaks, peakOptions = result?.peakOptions;
  const peakTraces = useMemo<PlotData[]>(() => {
    const traces: PlotData[] = [];
    labelCount.current = null;
    belowMarkers.current = null;
    bornSquaresDrawn.current = null;
    if (!peaks) return traces;
    // At most PLOT_MARKERS markers (highest S/N first, hand-added always): thousands of labels would stall the page.
    // Ranked by the worker when it sent the peaks (worker/peak-rank.ts), so only these rows are read here.
    const live = plotMarkers(peaks);
    // Counted from the worker's totals (every row) less the peaks added by hand, which always have their own marker.
    const belowDrawn = live.filter((pk) => pk.origin !== 'added-by-user' && pk.flag === 'below-detection').length;
    const belowAll = tableTotals(peaks).below - live.filter((pk) => pk.origin === 'added-by-user' && pk.flag === 'below-detection').length;
    if (belowAll > belowDrawn) belowMarkers.current = { drawn: belowDrawn, of: belowAll };
    // Features the raw trace does not have: ringed again, so they cannot be taken for ordinary peaks.
    // At most BORN_SQUARES of them (quantifiable first, then the highest S/N); a note under the plot says how many of how many.
    const { squared: born, of: bornOf } = bornSquares(live);
    bornSquaresDrawn.current = born.length < bornOf ? { drawn: born.length, of: bornOf } : null;
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
      // Issue 17: one trace per marker shape, so the legend has a key for each; peaks added by hand have their own.
      const lim = peakOptions?.limits ?? { detection: 3, quantitation: 10 };
      const kinds: { name: string; keep: (pk: Peak) => boolean; symbol: string; colour: string; size: number }[] = [
        { name: `quantifiable peak (S/N ≥ ${lim.quantitation})`, keep: (pk) => pk.origin !== 'added-by-user' && pk.flag === 'quantifiable', symbol: 'triangle-down', colour: COLOURS.peak, size: 10 },
        { name: `detected peak (S/N ${lim.detection}–${lim.quantitation})`, keep: (pk) => pk.origin !== 'added-by-user' && pk.flag === 'detectable', symbol: 'diamond', colour: COLOURS.baseline, size: 10 },
        { name: `below the detection limit (S/N < ${lim.detection})`, keep: (pk) => pk.origin !== 'added-by-user' && pk.flag === 'below-detection', symbol: 'circle-open', colour: COLOURS.spike, size: 10 },
        { name: 'S/N not measured', keep: (pk) => pk.origin !== 'added-by-user' && pk.flag === 'not-measured', symbol: 'hexagon-open', colour: COLOURS.raw, size: 10 },
        { name: 'peak added by hand', keep: (pk) => pk.origin === 'added-by-user', symbol: 'star', colour: COLOURS.processed, size: 13 },
      ];
      for (const k of kinds) {
        const pks = live.filter(k.keep);
        if (!pks.length) continue;
        traces.push({
          type: 'scatter', mode: 'markers', name: k.name,
          x: pks.map((pk) => pk.x), y: pks.map((pk) => pk.y),
          hovertext: pks.map((pk) => `${names.has(pk) ? `${names.get(pk)}<br>` : ''}apex ${pk.x.toPrecision(6)}<br>height ${pk.height.toPrecision(4)}<br>FWHM ${pk.fwhm.toPrecision(4)} (${pk.leftHalf.toPrecision(6)} – ${pk.rightHalf.toPrecision(6)})<br>start – end ${pk.start.toPrecision(6)} – ${pk.end.toPrecision(6)}<br>S/N ${pk.snr === null ? '—' : pk.snr.toPrecision(3)}${pk.marks.map((m) => `<br>${MARK_TEXT[m]}`).join('')}${pk.origin === 'added-by-user' ? '<br>added by hand' : ''}<br>click: see it under each choice`),
          hoverinfo: 'text',
          marker: { symbol: k.symbol, color: k.colour, size: k.size, line: { width: 1.5, color: k.colour } },
          xaxis: 'x', yaxis: 'y',
        });
      }
      // Labels that never overlap (issue 17): placed in the figure's own pixels, thinned by priority (plot-labels.ts).
      // Placed only with the geometry of the view asked for (a zoom redraws once more with the new one).
      if (geom && (!xRange || labelsStillClear(geom, { ...geom, x: xRange }))) {
        // Over the whole trace, bumps below the detection limit get no label (they are mostly noise); zoomed in, they may.
        const inView = live.filter((pk) => pk.x >= geom.x[0] && pk.x <= geom.x[1] && (xRange !== null || pk.flag !== 'below-detection' || pk.origin === 'added-by-user' || names.has(pk)));
        const items = inView.map((pk) => ({
          px: ((pk.x - geom.x[0]) / (geom.x[1] - geom.x[0])) * geom.w,
          py: geom.h - ((pk.y - geom.y[0]) / (geom.y[1] - geom.y[0])) * geom.h,
          text: `${names.has(pk) ? `${names.get(pk)} · ` : ''}${pk.snr === null ? '?' : pk.snr.toFixed(pk.snr < 10 ? 1 : 0)}`,
          priority: (names.has(pk) ? 2e9 : 0) + (pk.origin === 'added-by-user' ? 1e9 : 0) + Math.min(pk.snr ?? 0, 1e8),
        }));
        const kept = placeLabels(items, geom.w, geom.h, PLOT_LABELS).map((k) => ({ pk: inView[k.index], text: items[k.index].text, spot: k.spot }));
        traces.push({
          type: 'scatter', mode: 'text', name: 'peak labels (S/N)', showlegend: false, hoverinfo: 'skip',
          x: kept.map((k) => k.pk.x), y: kept.map((k) => k.pk.y), text: kept.map((k) => k.text),
          textposition: kept.map((k) => k.spot), textfont: { size: 11, color: COLOURS.ink }, cliponaxis: false,
          xaxis: 'x', yaxis: 'y',
        });
        const below = live.filter((pk) => pk.x >= geom.x[0] && pk.x <= geom.x[1]).length - inView.length;
        labelCount.current = { shown: kept.length, of: inView.length, below };
      }
    }
    return traces;
  }, [peaks, peakOptions, names, geom, xRange]);

  // Features detectable on the raw trace that some column loses: marked where they were found. At most LOST_RINGS of
  // them (quantifiable first, then the highest S/N); a note under the plot says how many of how many. Issue 16: made
  // again only when the loss check or the trace changes, not at every stage (ranking the ledger's rows and reading
  // the trace under each ring took about 25 ms at 10⁶ points).
  const loss = result?.loss ?? null;
  const lostTrace = useMemo<{ trace: PlotData | null; rings: { drawn: number; of: number } | null }>(() => {
    if (!sample || !loss) return { trace: null, rings: null };
    const { ringed: lost, of } = lostFeatures(loss.ledger.rows);
    const rings = lost.length < of ? { drawn: lost.length, of } : null;
    if (!lost.length) return { trace: null, rings };
    const lx = Float64Array.from(lost.map((r) => r.position));
    const ly = interpolateLinear(sample.x, sample.y, lx);
    return {
      rings,
      trace: {
        type: 'scatter', mode: 'markers', name: 'features lost by some choice',
        x: lx, y: ly,
        text: lost.map((r) => `lost with: ${r.cells.map((c, k) => (c.found || k < r.firstFoundIn ? null : loss.ledger.alternatives[k].label)).filter(Boolean).join(', ')}`),
        hoverinfo: 'x+text',
        marker: { symbol: 'circle-open', size: 22, color: COLOURS.lost, line: { width: 2.5, color: COLOURS.lost } },
        xaxis: 'x', yaxis: 'y',
      },
    };
  }, [sample, loss]);
  const lostRings = result ? lostTrace.rings : null;

  // Replaced points in view, at most REPLACED_CROSSES crosses (the largest changes first); a note says how many of how many.
  const events = result?.events;
  const replaced = useMemo(() => (events ? replacedCrosses(events, view.from, view.to) : { crossed: [], of: 0 }), [events, view]);
  const crossed = replaced.crossed;

  // Issue 16: when the peaks or the loss check land on a processed trace already drawn, only markers, rings and
  // labels change; the figure then waits for the frame that paints the panels committed with them (the peak
  // table first, its markers a frame later).
  const drawnLines = useRef<{ processed: unknown; peaks: unknown; loss: unknown } | null>(null);
  const markersOnly = result !== null && drawnLines.current !== null && drawnLines.current.processed === result.processed
    && (drawnLines.current.peaks !== result.peaks || drawnLines.current.loss !== result.loss);
  useEffect(() => { drawnLines.current = result ? { processed: result.processed, peaks: result.peaks, loss: result.loss } : null; }, [result]);

  const data = useMemo<PlotData[]>(() => {
    if (!sample) return [];
    const { from, to, columns } = view;
    /** A series as drawn: the worker's drawing when it stayed there, else decimated here (it is short). */
    const line = (x: Float64Array, y: Float64Array, key: Signal | Float64Array): { x: Float64Array; y: Float64Array } => {
      const f = farOf(key);
      return f ? drawnFar(f) : decimateMinMax(x, y, from, to, columns * 2);
    };
    const traces: PlotData[] = [];
    if ((showRaw || !result) && rawDrawn) {
      traces.push({ type: 'scatter', mode: 'lines', name: 'raw', x: rawDrawn.x, y: rawDrawn.y, line: { color: COLOURS.raw, width: 1 }, hoverinfo: 'x+y', xaxis: 'x', yaxis: 'y' });
    }
    if (result) {
      if (result.baseline && (farOf(result.baseline) || result.baseline.length === result.processed.x.length)) {
        const d = line(result.processed.x, result.baseline, result.baseline);
        traces.push({ type: 'scatter', mode: 'lines', name: 'baseline', x: d.x, y: d.y, line: { color: COLOURS.baseline, width: 1.5, dash: 'dash' }, xaxis: 'x', yaxis: 'y' });
      }
      if (result.intermediate) {
        const d = line(result.intermediate.x, result.intermediate.y, result.intermediate);
        traces.push({ type: 'scatter', mode: 'lines', name: 'chosen step output', x: d.x, y: d.y, line: { color: COLOURS.intermediate, width: 1.2, dash: 'dot' }, xaxis: 'x', yaxis: 'y' });
      }
      if (showAlt && result.loss) {
        result.loss.outcomes.forEach((o) => {
          const i = altList.findIndex((a) => a.id === o.id);
          const d = line(o.processed.x, o.processed.y, o.processed);
          traces.push({ type: 'scatter', mode: 'lines', name: o.label, x: d.x, y: d.y, line: { color: ALTERNATIVE_COLOURS[(i < 0 ? 0 : i) % ALTERNATIVE_COLOURS.length], width: 1.2, dash: ['dash', 'dot', 'dashdot', 'longdash', 'longdashdot', 'solid'][(i < 0 ? 0 : i) % 6] }, xaxis: 'x', yaxis: 'y' });
        });
      }
      if (lostTrace.trace) traces.push(lostTrace.trace);
      const p = line(result.processed.x, result.processed.y, result.processed);
      traces.push({ type: 'scatter', mode: 'lines', name: 'processed', x: p.x, y: p.y, line: { color: COLOURS.processed, width: 1.8 }, xaxis: 'x', yaxis: 'y' });
      if (crossed.length) {
        traces.push({
          type: 'scatter', mode: 'markers', name: 'replaced points',
          x: crossed.map((e) => e.x), y: crossed.map((e) => e.original),
          marker: { color: COLOURS.spike, symbol: 'x', size: 10, line: { width: 2, color: COLOURS.spike } },
          text: crossed.map((e) => `replaced ${e.original.toPrecision(5)} → ${e.replacement.toPrecision(5)}`),
          hoverinfo: 'x+text', xaxis: 'x', yaxis: 'y',
        });
      }
      traces.push(...peakTraces);
      const r = line(result.residual.x, result.residual.y, result.residual);
      traces.push({ type: 'scatter', mode: 'lines', name: 'residual (raw − processed)', x: r.x, y: r.y, line: { color: COLOURS.residual, width: 1 }, xaxis: 'x', yaxis: 'y2' });
    }
    return traces;
  }, [sample, result, showRaw, view, rawDrawn, drawnFar, showAlt, altList, peakTraces, lostTrace, crossed]);

  const yView = useMemo(() => {
    if (!xRange || !yFits) return null;
    const y = visibleYRange(data, xRange[0], xRange[1], 'y');
    return y ? { y, y2: visibleYRange(data, xRange[0], xRange[1], 'y2') } : null;
  }, [data, xRange, yFits]);

  // Issue 16: over the whole trace, x spans exactly the trace (the library's own range would widen it by 5 % whenever a
  // marker sits near an end, so markers that move could move it), and figures can be updated in place (plot-update.ts).
  const xSpan = useMemo<[number, number] | null>(() => {
    const e = sample ? extent(sample.x) : null;
    return e && e[1] > e[0] ? e : null;
  }, [sample]);

  // Issue 16: both panels keep their range while the data stay about where they were (plot-update.ts), so a slider
  // move redraws only the traces that changed, not the whole figure. A new trace starts afresh.
  const heldRanges = useRef<{ trace: string; y: [number, number] | null; y2: [number, number] | null }>({ trace: '', y: null, y2: null });
  const steadyY = useMemo(() => {
    const id = sample?.id ?? '';
    const held = heldRanges.current.trace === id ? heldRanges.current : { trace: id, y: null, y2: null };
    const y = steadyRange(data.filter((t) => (t.yaxis ?? 'y') === 'y').map((t) => t.y), held.y, TRACE_RANGE);
    const y2 = steadyRange(data.filter((t) => t.yaxis === 'y2').map((t) => t.y), held.y2, RESIDUAL_RANGE);
    heldRanges.current = { trace: id, y, y2 };
    return { y, y2 };
  }, [data, sample]);

  const layout = useMemo<PlotLayout>(() => {
    const xTitle = sample ? axisLabel(sample.xName, sample.xUnit) : 'x';
    const yTitle = sample ? axisLabel(sample.yName, sample.yUnit) : 'y';
    const shapes: PlotShape[] = marked ? [{ type: 'rect', xref: 'x', yref: 'paper', x0: marked[0], x1: marked[1], y0: 0, y1: 1, fillcolor: 'rgba(0,158,115,0.10)', line: { width: 0 } }] : [];
    // Issue 17: ranges left out of peak finding, shaded grey with a legend key (the trace itself is unchanged).
    (excluded ?? []).forEach(([a, b], i) => shapes.push({
      type: 'rect', xref: 'x', yref: 'y domain', x0: a, x1: b, y0: 0, y1: 1, fillcolor: 'rgba(120,128,140,0.22)', line: { width: 0 }, layer: 'below',
      name: 'left out of peak finding', showlegend: i === 0, legendgroup: 'excluded',
    }));
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
      // Issue 17: the key below the plot, clear of the toolbar (one entry per line style and marker shape).
      legend: { orientation: 'h', y: -0.15, x: 0, yanchor: 'top', font: { size: 11 } },
      dragmode: markMode ? 'select' : 'zoom',
      selectdirection: 'h',
      hovermode: 'closest',
      xaxis: { title: { text: xTitle }, anchor: 'y2', ...(xRange ?? xSpan ? { range: xRange ?? xSpan ?? undefined, autorange: false } : { autorange: true }), gridcolor: COLOURS.grid, zeroline: false },
      // Issue 17: zoomed in x, y fits the data in view (unless the user keeps y where they put it).
      yaxis: { title: { text: yTitle }, domain: [0.3, 1], gridcolor: COLOURS.grid, zeroline: false, ...(yView ? { range: yView.y, autorange: false } : steadyY.y ? { range: steadyY.y, autorange: false } : { autorange: true }) },
      yaxis2: { title: { text: sample?.yUnit ? `residual (${sample.yUnit})` : 'residual' }, domain: [0, 0.22], gridcolor: COLOURS.grid, zeroline: true, zerolinecolor: '#b0b6bd', ...(yView?.y2 ? { range: yView.y2, autorange: false } : steadyY.y2 ? { range: steadyY.y2, autorange: false } : { autorange: true }) },
      shapes,
      uirevision: sample?.id ?? 'none',
      paper_bgcolor: '#ffffff',
      plot_bgcolor: '#ffffff',
      font: { family: 'system-ui, sans-serif', size: 12, color: COLOURS.ink },
    };
  }, [sample, xRange, markMode, marked, selectedX, result, yView, excluded, steadyY, xSpan]);

  const onXRange = useCallback((r: [number, number] | null) => setXRange(r), [setXRange]);
  const onShapeX = useCallback((index: number, x0: number) => {
    const b = boundShapes.current;
    if (!b || (index !== b.start && index !== b.end)) return;
    const start = index === b.start ? x0 : b.peak.start, end = index === b.end ? x0 : b.peak.end;
    useApp.getState().setPeakBounds(b.peak.x, start, end);
  }, []);
  const onSelectX = useCallback((r: [number, number]) => setMarked(r), [setMarked]);
  // Issue 21: a click names a peak while naming is on (clicks to add peaks go through the cursor readout, issue 17).
  // Issue 17: otherwise a click on or near a peak (or a feature some choice loses) selects it: the focused view shows it under each choice.
  const onClickPoint = useCallback((x: number) => {
    if (namePick) { pickNamedPeakAt(x); return; }
    if (addPeakMode || useApp.getState().measureMode || !result) return;
    let best: number | null = null, bestD = Infinity;
    for (const pk of result.peaks) {
      if (pk.removedByUser) continue;
      const d = Math.abs(pk.x - x);
      if (d <= Math.max(pk.fwhm, (pk.end - pk.start) / 4) && d < bestD) { best = pk.x; bestD = d; }
    }
    for (const r of result.loss?.ledger.rows ?? []) {
      const d = Math.abs(r.position - x);
      if (d <= r.tolerance && d < bestD) { best = r.position; bestD = d; }
    }
    if (best !== null) useApp.getState().selectPeak(best);
  }, [namePick, addPeakMode, result]);
  const onDrawn = useCallback((problem: string | null) => {
    if (problem) { markDrawFailed(`the plot: ${problem}`); return; }
    markDrawn();
    const g = readGeometry(figEl.current);
    if (g) setGeom((old) => (labelsStillClear(old, g) ? old : g)); // issue 16: a shift under the labels' clear space draws no second time
  }, []);
  const onReady = useCallback((el: HTMLElement | null) => { figEl.current = el; onFigure?.(el); }, [onFigure]);

  if (!sample) {
    return <div className="plot-empty" ref={boxRef}>No trace yet. Drop a file here or choose one with “Open file”.</div>;
  }
  return (
    <div ref={boxRef} className="plot-box" data-labels={labelCount.current ? `${labelCount.current.shown}/${labelCount.current.of}` : undefined}>
      <PlotlyFigure data={data} layout={layout} className="plot" label={`Plot of ${sample.name}: raw and processed trace with the residual below`} onXRange={onXRange} onSelectX={onSelectX} onClickPoint={onClickPoint} onShapeX={onShapeX} dragShapes={selectedX !== null} onReady={onReady} onDrawn={onDrawn} pictureName={`${sample.source.fileName.replace(/\.[^.]*$/, '')}-plot`} drawnTag={String(result ? resultSeq : 0)} afterPaint={markersOnly} />
      {lostRings && (
        <p className="small muted plot-label-note" data-testid="lost-note">
          Rings on {lostRings.drawn} of the {lostRings.of.toLocaleString('en')} features some choice loses (quantifiable first, then the highest S/N); the loss check below lists them.
        </p>
      )}
      {result && replaced.crossed.length < replaced.of && (
        <p className="small muted plot-label-note" data-testid="replaced-note">
          Crosses on {replaced.crossed.length} of the {replaced.of.toLocaleString('en')} replaced points in view (the largest changes first; zoom in for more); the despiking step counts every one.
        </p>
      )}
      {bornSquaresDrawn.current && (
        <p className="small muted plot-label-note" data-testid="born-note">
          Squares on {bornSquaresDrawn.current.drawn} of the {bornSquaresDrawn.current.of.toLocaleString('en')} marked peaks that appear only after processing (quantifiable first, then the highest S/N); the peak table marks every one.
        </p>
      )}
      {belowMarkers.current && (
        <p className="small muted plot-label-note" data-testid="marker-note">
          {belowMarkers.current.drawn > 0
            ? `Markers on ${belowMarkers.current.drawn} of the ${belowMarkers.current.of.toLocaleString('en')} candidates below the detection limit (those with the highest S/N); the peak table and its CSV list every one.`
            : `No markers on the ${belowMarkers.current.of.toLocaleString('en')} candidates below the detection limit: the plot's ${PLOT_MARKERS} markers go to the highest S/N. The peak table and its CSV list every one.`}
        </p>
      )}
      {labelCount.current && (labelCount.current.shown < labelCount.current.of || labelCount.current.below > 0) && (
        <p className="small muted plot-label-note" data-testid="label-note">
          S/N labels on {labelCount.current.shown} of {labelCount.current.of} peaks in view
          {labelCount.current.below > 0 ? ` (and none on the ${labelCount.current.below} below the detection limit until you zoom in)` : ''}:
          named peaks first, then those added by hand, then the highest S/N; labels never overlap. Hover a marker for its figures.
        </p>
      )}
    </div>
  );
}
