import { useEffect, useMemo, useRef, useState } from 'react';
import Plotly, { type PlotData, type PlotLayout, type PlotlyHTMLElement } from 'plotly.js-strict-dist-min';
import { plotConfig } from './plot-config.ts';
import { guardFigure, toDataUnits, type AxisTransform } from './plot-guard.ts';
import { figureUpdate, pointsOf, type LiveFigure } from './plot-update.ts';
import { themedData, themedLayout, useDarkScheme } from './theme.ts';

export interface FigureEvents {
  /** x-range after a zoom or pan; null after autoscale. */
  onXRange?: (range: [number, number] | null) => void;
  onClickPoint?: (x: number, y: number, curve: number) => void;
  onSelectX?: (range: [number, number]) => void;
  /** A shape the user dragged (issue 17: a peak's start or end): its index in layout.shapes and its new x0, in data units. */
  onShapeX?: (index: number, x0: number) => void;
}

interface Props extends FigureEvents {
  data: PlotData[];
  layout: PlotLayout;
  className?: string;
  label: string;
  /** Receives the element so callers can export pictures. */
  onReady?: (el: HTMLElement | null) => void;
  /** Called after each drawing that worked, and with a message when one failed. */
  onDrawn?: (problem: string | null) => void;
  /** Test id; the main trace plot is "figure". */
  testId?: string;
  /** File name (without extension) of a picture saved from the toolbar. */
  pictureName?: string;
  /** Let the user drag the figure's shapes (issue 17: the selected peak's start and end); only onShapeX reads the result. */
  dragShapes?: boolean;
  /** Set as the element's data-drawn attribute once Plotly has drawn this data (timing scripts wait for it). */
  drawnTag?: string;
  /**
   * Draw this data after the next frame is painted, not as soon as possible: the caller says only markers changed
   * with panels the same task committed (issue 16: the peak table of a new value is painted before the plot library
   * draws its markers, not after).
   */
  afterPaint?: boolean;
}

/**
 * A thin wrapper: the figure is checked by {@link guardFigure} (values the
 * plot library cannot draw are scaled or left out, with a note), drawn with
 * Plotly.react in an effect under the page's own configuration
 * ({@link plotConfig}: no control that can send data away), events are
 * forwarded in data units, and the element is purged on unmount. When the
 * library fails, the figure says what failed in its place and the rest of
 * the page goes on.
 */
export function PlotlyFigure({ data, layout, className, label, onXRange, onClickPoint, onSelectX, onShapeX, dragShapes, onReady, onDrawn, testId = 'figure', pictureName = 'tracewright-plot', drawnTag, afterPaint = false }: Props) {
  const ref = useRef<HTMLDivElement>(null);
  const handlers = useRef<FigureEvents>({});
  handlers.current = { onXRange, onClickPoint, onSelectX, onShapeX };
  const drawn = useRef(onDrawn);
  drawn.current = onDrawn;
  const bound = useRef(false);
  const dark = useDarkScheme(); // issue 17: figures follow the system's dark setting too
  const guarded = useMemo(() => guardFigure(themedData(data, dark), themedLayout(layout, dark)), [data, layout, dark]);
  const transforms = useRef<Record<string, AxisTransform>>({});
  transforms.current = guarded.transforms;
  const [failure, setFailure] = useState<string | null>(null);
  /** Bumped by "Draw again" to run the drawing once more with the same data. */
  const [attempt, setAttempt] = useState(0);
  /** What the library last drew (issue 16: only traces whose points changed are drawn again when nothing else did), and under which options. */
  const last = useRef<{ data: PlotData[]; layout: PlotLayout; options: string } | null>(null);
  /** Drawings run one after another: an update in place settles a frame later, and no later drawing may overtake it. */
  const queue = useRef<Promise<unknown>>(Promise.resolve());
  /** Read by the drawing effect, not watched by it: when to draw is not a reason to draw again. */
  const waitForPaint = useRef(afterPaint);
  waitForPaint.current = afterPaint;
  /** Drawings queued and not yet done. */
  const pending = useRef(0);

  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    let cancelled = false;
    const fail = (e: unknown) => {
      if (cancelled) return;
      const message = e instanceof Error ? e.message : String(e);
      // A half-drawn figure is cleared so the next data start from nothing.
      try { Plotly.purge(el); } catch { /* already unusable */ }
      bound.current = false;
      setFailure(message);
      drawn.current?.(message);
    };
    const draw = () => {
      if (cancelled) return; // a newer drawing is queued behind this one
      const options = `${pictureName}|${attempt}|${dragShapes ? 1 : 0}`;
      // Issue 16: when only traces' points changed and no range can move, those traces are replaced in place
      // (plot-update.ts); anything else is drawn whole.
      let update = bound.current && last.current?.options === options ? figureUpdate(last.current, guarded, liveFigure(el)) : null;
      const config = dragShapes ? { ...plotConfig(pictureName), edits: { shapePosition: true } } : plotConfig(pictureName);
      // Copies: the library writes into what it is given (a trace's uid, the ranges it found, a trace hidden from the key).
      last.current = { data: guarded.data.map((t) => ({ ...t })), layout: structuredClone(guarded.layout), options };
      // Marks the figure drawn once (timing scripts and e2e specs wait for data-drawn), then tells the caller.
      let marked = false;
      const markDrawn = () => {
        if (marked || cancelled) return;
        marked = true;
        if (drawnTag !== undefined) el.setAttribute('data-drawn', drawnTag);
        // Read by e2e/figure-update.spec.ts and e2e/timing.bench.mjs: how it was drawn, and why whole.
        el.setAttribute('data-drawn-as', update?.kind === 'in-place' ? (update.ranges ? 'new range, then in place' : 'in place') : 'whole');
        el.setAttribute('data-drawn-why', update === null ? 'first drawing' : update.kind === 'whole' ? update.why : update.ranges ? Object.keys(update.ranges).join(', ') : '');
        setFailure(null);
        drawn.current?.(null);
      };
      const gd = el as PlotlyHTMLElement;
      /**
       * The library's animation step with no transition and no redraw: the traces' points replaced, only those traces
       * drawn again, the axes left as they are. It draws in the microtasks after its "transitioning" event and
       * settles a frame later; the figure counts as drawn when the drawing is done.
       */
      const inPlace = (traces: number[]): Promise<PlotlyHTMLElement> => {
        if (!traces.length) return Promise.resolve(gd);
        const onDrawing = () => { gd.removeListener?.('plotly_transitioning', onDrawing); queueMicrotask(markDrawn); };
        gd.on('plotly_transitioning', onDrawing);
        return Plotly.animate(el, { data: traces.map((i) => pointsOf(guarded.data[i])), traces }, { mode: 'immediate', transition: { duration: 0 }, frame: { duration: 0, redraw: false } })
          .finally(() => gd.removeListener?.('plotly_transitioning', onDrawing))
          // An update the library broke off (another drawing of the element interrupted it) is drawn whole instead.
          .catch(() => {
            if (cancelled) return gd;
            update = { kind: 'whole', why: 'an update in place was interrupted' };
            return Plotly.react(el, guarded.data, guarded.layout, config);
          });
      };
      let drawing: Promise<PlotlyHTMLElement>;
      if (update?.kind === 'in-place' && update.ranges) {
        // Issue 16: a y axis's new range (the residual outgrew its panel) is set first, where the library draws the
        // axis and the traces as they were, then the changed traces are replaced in place, in the same task: about
        // 60-120 ms against 120-210 ms for a whole drawing at 10^6 points. (Two tasks, with a frame between them,
        // gave shorter tasks but showed the processed trace 100-150 ms later on these moves; see DEVELOPERS.md.)
        // Both steps run even when a newer figure is waiting (it is drawn after them and compared with this one).
        const { ranges, traces } = update;
        drawing = Plotly.relayout(el, ranges).then(() => inPlace(traces));
      } else if (update?.kind === 'in-place') {
        drawing = inPlace(update.traces);
      } else {
        drawing = Plotly.react(el, guarded.data, guarded.layout, config);
      }
      return drawing
        .then((gd) => {
          markDrawn();
          if (cancelled || bound.current) return;
          bound.current = true;
          bindEvents(gd, handlers, transforms);
        })
        .catch((e: unknown) => { last.current = null; fail(e); });
    };
    // Issue 16: the drawing runs in a task of its own, after the one that committed this render (the worker's message,
    // the store and React's commit of every panel), so no single task holds both; a newer render before it runs
    // cancels it (only the newest figure is drawn). Not when what a drag on the figure does has changed (a mark
    // button pressed): the press's own task draws it, so a drag that follows at once can never reach the figure in the
    // mode it had before (seen in a spec under load: a range dragged right after "Mark a range" was taken as a zoom).
    const modeChanged = last.current !== null
      && (last.current.layout.dragmode !== guarded.layout.dragmode || last.current.options !== `${pictureName}|${attempt}|${dragShapes ? 1 : 0}`);
    const run = () => { try { return draw(); } catch (e) { last.current = null; fail(e); return undefined; } };
    // Only after the last drawing is done: one still waiting is cancelled by this one, whose data then hold its lines.
    const wait = waitForPaint.current && pending.current === 0 ? afterNextPaint : nextTask;
    pending.current++;
    const settle = () => { pending.current--; };
    queue.current = (modeChanged ? queue.current.then(run) : queue.current.then(wait).then(run)).then(settle, settle);
    return () => { cancelled = true; };
  }, [guarded, pictureName, attempt, drawnTag, dragShapes]);

  useEffect(() => {
    const el = ref.current;
    onReady?.(el);
    return () => {
      if (el) { try { Plotly.purge(el); } catch { /* nothing left to clear */ } }
      bound.current = false;
      onReady?.(null);
    };
  }, [onReady]);

  return (
    <>
      {failure && (
        <div className="plot-failed" role="alert" data-testid={`${testId}-failed`}>
          <strong>This plot could not be drawn.</strong> The plot library stopped with: “{failure}”. The data, the results and the rest of the page are unaffected; the tables and exports below still work.
          {' '}<button type="button" onClick={() => setAttempt((a) => a + 1)}>Draw again</button>
        </div>
      )}
      <div ref={ref} className={className} role="figure" aria-label={label} data-testid={testId} hidden={!!failure} />
      {guarded.notes.length > 0 && (
        <ul className="plot-notes small" data-testid={`${testId}-notes`}>
          {guarded.notes.map((n, i) => <li key={i}>{n}</li>)}
        </ul>
      )}
    </>
  );
}

/**
 * Resolves in a new task, so the work after it is not part of the task that is running now. The browser's task
 * scheduler at "user-blocking" priority where there is one (Chromium): it runs before the worker's later messages
 * and the page's other waiting tasks (a message to itself, the fallback, waited behind them: at 10⁵ points a figure
 * drawing of the processed trace was still waiting when the peaks arrived 60 ms later, and was drawn only with them).
 * Unlike an animation frame it does not wait for the next frame; unlike a timer it is not clamped.
 */
export function nextTask(): Promise<void> {
  const scheduler = (globalThis as { scheduler?: { postTask?: (f: () => void, o: { priority: string }) => Promise<void> } }).scheduler;
  if (scheduler?.postTask) return scheduler.postTask(() => undefined, { priority: 'user-blocking' });
  return new Promise((resolve) => {
    const channel = new MessageChannel();
    channel.port1.onmessage = () => { channel.port1.close(); resolve(); };
    channel.port2.postMessage(null);
  });
}

/** Longest wait for a frame in {@link afterNextPaint}: a hidden page paints none. */
const PAINT_WAIT_MS = 100;

/**
 * Resolves in a task after the next frame is painted ({@link nextTask} posted from that frame's animation callback),
 * or after {@link PAINT_WAIT_MS} when no frame comes (a hidden page), whichever is first.
 */
export function afterNextPaint(): Promise<void> {
  return new Promise((resolve) => {
    let done = false;
    const go = () => { if (!done) { done = true; resolve(); } };
    if (typeof requestAnimationFrame === 'function') requestAnimationFrame(() => { void nextTask().then(go); });
    setTimeout(go, PAINT_WAIT_MS);
  });
}

/** What the drawn figure says now (plot-update.ts): traces the user hid with the key, axes the user let the library range. */
function liveFigure(el: HTMLElement): LiveFigure {
  type Axis = { autorange?: unknown; range?: unknown; _length?: unknown; type?: unknown };
  const gd = el as PlotlyHTMLElement & { _fullData?: { visible?: unknown }[]; _fullLayout?: Record<string, Axis | undefined> };
  return {
    shown: (i) => gd._fullData?.[i]?.visible === true,
    autoRanged: (key) => gd._fullLayout?.[key]?.autorange === true,
    scale: (key) => {
      const ax = gd._fullLayout?.[key];
      const r = ax?.range, len = ax?._length;
      if (!ax || (ax.type !== undefined && ax.type !== 'linear') || !Array.isArray(r) || typeof len !== 'number' || !(len > 0)) return null;
      const u = Math.abs(Number(r[1]) - Number(r[0])) / len;
      return Number.isFinite(u) ? { unitsPerPixel: u, lengthPx: len } : null;
    },
  };
}

function bindEvents(gd: PlotlyHTMLElement, handlers: { current: FigureEvents }, transforms: { current: Record<string, AxisTransform> }) {
  const x = (v: number) => toDataUnits(v, transforms.current.x);
  gd.on('plotly_relayout', (ev) => {
    const e = ev as Record<string, unknown>;
    const a = e['xaxis.range[0]'] ?? (Array.isArray(e['xaxis.range']) ? (e['xaxis.range'] as number[])[0] : undefined);
    const b = e['xaxis.range[1]'] ?? (Array.isArray(e['xaxis.range']) ? (e['xaxis.range'] as number[])[1] : undefined);
    if (typeof a === 'number' && typeof b === 'number') handlers.current.onXRange?.([x(a), x(b)]);
    else if (e['xaxis.autorange'] === true) handlers.current.onXRange?.(null);
    for (const [k, v] of Object.entries(e)) {
      const m = /^shapes\[(\d+)\]\.x0$/.exec(k);
      if (m && typeof v === 'number') handlers.current.onShapeX?.(Number(m[1]), x(v));
    }
  });
  gd.on('plotly_click', (ev) => {
    const pts = (ev as { points?: { x: number; y: number; curveNumber: number; yaxis?: { _id?: string } }[] }).points;
    if (pts && pts.length) {
      const p = pts[0];
      handlers.current.onClickPoint?.(x(p.x), toDataUnits(p.y, transforms.current[p.yaxis?._id ?? 'y']), p.curveNumber);
    }
  });
  gd.on('plotly_selected', (ev) => {
    const r = (ev as { range?: { x?: [number, number] } } | undefined)?.range?.x;
    if (r) handlers.current.onSelectX?.([Math.min(x(r[0]), x(r[1])), Math.max(x(r[0]), x(r[1]))]);
  });
}
