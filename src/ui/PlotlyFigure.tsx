import { useEffect, useRef } from 'react';
import Plotly, { type PlotData, type PlotLayout, type PlotlyHTMLElement } from 'plotly.js-strict-dist-min';

export interface FigureEvents {
  /** x-range after a zoom or pan; null after autoscale. */
  onXRange?: (range: [number, number] | null) => void;
  onClickPoint?: (x: number, y: number, curve: number) => void;
  onSelectX?: (range: [number, number]) => void;
}

interface Props extends FigureEvents {
  data: PlotData[];
  layout: PlotLayout;
  className?: string;
  label: string;
  /** Receives the element so callers can export pictures. */
  onReady?: (el: HTMLElement | null) => void;
  /** Test id; the main trace plot is "figure". */
  testId?: string;
  /** Set as the element's data-drawn attribute once Plotly has drawn this data (timing scripts wait for it). */
  drawnTag?: string;
}

/** A thin wrapper: Plotly.react in an effect, events forwarded, purge on unmount. */
export function PlotlyFigure({ data, layout, className, label, onXRange, onClickPoint, onSelectX, onReady, testId = 'figure', drawnTag }: Props) {
  const ref = useRef<HTMLDivElement>(null);
  const handlers = useRef<FigureEvents>({});
  handlers.current = { onXRange, onClickPoint, onSelectX };
  const bound = useRef(false);

  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    let cancelled = false;
    Plotly.react(el, data, layout, { displaylogo: false, responsive: true, scrollZoom: true, modeBarButtonsToRemove: ['lasso2d', 'toImage'] })
      .then((gd) => {
        if (!cancelled && drawnTag !== undefined) el.setAttribute('data-drawn', drawnTag);
        if (cancelled || bound.current) return;
        bound.current = true;
        bindEvents(gd, handlers);
      })
      .catch(() => undefined);
    return () => { cancelled = true; };
  }, [data, layout, drawnTag]);

  useEffect(() => {
    const el = ref.current;
    onReady?.(el);
    return () => {
      if (el) Plotly.purge(el);
      bound.current = false;
      onReady?.(null);
    };
  }, [onReady]);

  return <div ref={ref} className={className} role="figure" aria-label={label} data-testid={testId} />;
}

function bindEvents(gd: PlotlyHTMLElement, handlers: { current: FigureEvents }) {
  gd.on('plotly_relayout', (ev) => {
    const e = ev as Record<string, unknown>;
    const a = e['xaxis.range[0]'] ?? (Array.isArray(e['xaxis.range']) ? (e['xaxis.range'] as number[])[0] : undefined);
    const b = e['xaxis.range[1]'] ?? (Array.isArray(e['xaxis.range']) ? (e['xaxis.range'] as number[])[1] : undefined);
    if (typeof a === 'number' && typeof b === 'number') handlers.current.onXRange?.([a, b]);
    else if (e['xaxis.autorange'] === true) handlers.current.onXRange?.(null);
  });
  gd.on('plotly_click', (ev) => {
    const pts = (ev as { points?: { x: number; y: number; curveNumber: number }[] }).points;
    if (pts && pts.length) handlers.current.onClickPoint?.(pts[0].x, pts[0].y, pts[0].curveNumber);
  });
  gd.on('plotly_selected', (ev) => {
    const r = (ev as { range?: { x?: [number, number] } } | undefined)?.range?.x;
    if (r) handlers.current.onSelectX?.([Math.min(r[0], r[1]), Math.max(r[0], r[1])]);
  });
}
