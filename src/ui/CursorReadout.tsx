import { useEffect, useMemo, useState } from 'react';
import { useShallow } from 'zustand/react/shallow';
import { useApp } from '../state/store.ts';
import { num } from './format.ts';
import { addPeakByHand } from '../state/service.ts';
import { axisTransform, toDataUnits } from './plot-guard.ts';
import { nearestPoint, slopeUnit, twoPointMeasure, type ReadSeries } from './plot-view.ts';
import { farOf } from '../worker/bridge.ts';
import { getBackend } from '../state/service.ts';
import { currentResult } from '../state/selectors.ts';

interface PlotAxis { _offset: number; _length: number; range: [number, number] }
interface Point { x: number; y: number; series: string }

const withUnit = (v: number | null, unit: string, digits = 6) => `${num(v, digits)}${unit ? ` ${unit}` : ''}`;

/**
 * Issue 17: under the trace plot, the x under the mouse and the nearest
 * point of each shown series (full resolution, not the drawn thinning),
 * with units; and a two-point measure (Δx, Δy, slope) taken by two clicks
 * on the processed trace (raw when nothing is processed).
 */
export function CursorReadout({ figure }: { figure: HTMLElement | null }) {
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  // Only the series read: other stages do not re-render the readout (issue 16).
  const result = useApp(useShallow((s) => { const r = currentResult(s); return r ? { processed: r.processed, baseline: r.baseline, residual: r.residual } : null; }));
  const showRaw = useApp((s) => s.showRaw);
  const [cursorX, setCursorX] = useState<number | null>(null);
  const measuring = useApp((s) => s.measureMode);
  const setMeasuring = useApp((s) => s.setMeasureMode);
  const [points, setPoints] = useState<Point[]>([]);

  const series = useMemo<ReadSeries[]>(() => {
    if (!sample) return [];
    const out: ReadSeries[] = [];
    if (showRaw || !result) out.push({ name: 'raw', x: sample.x, y: sample.y });
    if (result) {
      out.push({ name: 'processed', x: result.processed.x, y: result.processed.y, far: farOf(result.processed)?.ref });
      const fb = farOf(result.baseline);
      if (result.baseline && (fb || result.baseline.length === result.processed.x.length)) out.push({ name: 'baseline', x: result.processed.x, y: result.baseline, far: fb?.ref });
      out.push({ name: 'residual', x: result.residual.x, y: result.residual.y, far: farOf(result.residual)?.ref });
    }
    return out;
  }, [sample, result, showRaw]);
  // Long series stay in the worker (worker/series.ts): their nearest points are asked for there, the newest question only.
  const [farNear, setFarNear] = useState<ReadonlyMap<string, { x: number; y: number }>>(new Map());
  useEffect(() => {
    const asked = series.filter((s) => s.far !== undefined);
    if (cursorX === null || !asked.length) { setFarNear(new Map()); return; }
    let stale = false;
    getBackend().nearest(asked.map((s) => s.far!), cursorX).then((ps) => {
      if (!stale) setFarNear(new Map(ps.flatMap((p, i) => (p ? [[asked[i].name, p] as const] : []))));
    }, () => undefined /* a result let go meanwhile: the next move asks again */);
    return () => { stale = true; };
  }, [series, cursorX]);
  const pointOf = (s: ReadSeries, x: number) => (s.far === undefined ? nearestPoint(s, x) : farNear.get(s.name) ?? null);

  // A new trace starts without a measure.
  const sampleId = sample?.id;
  useEffect(() => { setPoints([]); setCursorX(null); }, [sampleId]);

  useEffect(() => {
    if (!figure || !sample) return;
    const tr = axisTransform(sample.x[0], sample.x[sample.x.length - 1]) ?? undefined;
    const xAt = (e: MouseEvent): number | null => {
      const ax = (figure as unknown as { _fullLayout?: { xaxis?: PlotAxis } })._fullLayout?.xaxis;
      if (!ax || !ax.range) return null;
      const px = e.clientX - figure.getBoundingClientRect().left - ax._offset;
      if (px < 0 || px > ax._length) return null;
      return toDataUnits(ax.range[0] + (px / ax._length) * (ax.range[1] - ax.range[0]), tr);
    };
    const onMove = (e: MouseEvent) => setCursorX(xAt(e));
    const onLeave = () => setCursorX(null);
    const onClick = (e: MouseEvent) => {
      // Only clicks on the plotting area itself (not the legend below it or the toolbar above it).
      const size = (figure as unknown as { _fullLayout?: { _size?: { t: number; h: number } } })._fullLayout?._size;
      const py = e.clientY - figure.getBoundingClientRect().top;
      if (!size || py < size.t || py > size.t + size.h) return;
      // Issue 17: in "add a peak" mode a click anywhere over the plot adds a peak at the nearest top (or says why not).
      if (useApp.getState().addPeakMode) { const at = xAt(e); if (at !== null) void addPeakByHand(at); return; }
      if (!measuring) return;
      const x = xAt(e);
      const s = series.find((v) => v.name === 'processed') ?? series[0];
      if (x === null || !s) return;
      const take = (p: { x: number; y: number } | null) => { if (p) setPoints((prev) => (prev.length >= 2 ? [{ x: p.x, y: p.y, series: s.name }] : [...prev, { x: p.x, y: p.y, series: s.name }])); };
      if (s.far !== undefined) { getBackend().nearest([s.far], x).then((ps) => take(ps[0]), () => undefined); return; }
      const p = nearestPoint(s, x);
      if (p) setPoints((prev) => (prev.length >= 2 ? [{ x: p.x, y: p.y, series: s.name }] : [...prev, { x: p.x, y: p.y, series: s.name }]));
    };
    figure.addEventListener('mousemove', onMove);
    figure.addEventListener('mouseleave', onLeave);
    figure.addEventListener('click', onClick);
    return () => {
      figure.removeEventListener('mousemove', onMove);
      figure.removeEventListener('mouseleave', onLeave);
      figure.removeEventListener('click', onClick);
    };
  }, [figure, sample, series, measuring]);

  if (!sample) return null;
  const xu = sample.xUnit, yu = sample.yUnit;
  const m = points.length === 2 ? twoPointMeasure(points[0], points[1]) : null;
  const su = slopeUnit(yu, xu);
  return (
    <div className="readout small" data-testid="readout">
      <div aria-live="off" data-testid="cursor-readout">
        {cursorX === null ? <span className="muted">Move the mouse over the plot to read values (nearest point of each line, all points, not only those drawn).</span> : (
          <>
            <span>x {withUnit(cursorX, xu)}</span>
            {series.map((s) => {
              const p = pointOf(s, cursorX);
              return p ? <span key={s.name} data-series={s.name}> · {s.name} {withUnit(p.y, yu)} at {withUnit(p.x, xu)}</span> : null;
            })}
          </>
        )}
      </div>
      <div className="row">
        <button type="button" aria-pressed={measuring} onClick={() => { setMeasuring(!measuring); setPoints([]); }} data-testid="measure-toggle">
          {measuring ? 'Measuring: click two points' : 'Measure between two points'}
        </button>
        {measuring && points.length === 0 && <span className="muted">Click the first point on the plot (the nearest point of the processed line is taken).</span>}
        {points.length === 1 && <span>From x {withUnit(points[0].x, xu)}, y {withUnit(points[0].y, yu)}; click the second point.</span>}
        {m && (
          <span data-testid="measure-result">
            Δx = {withUnit(m.dx, xu)} · Δy = {withUnit(m.dy, yu)} · slope = {m.slope === null ? '— (same x)' : withUnit(m.slope, su, 4)}
            <span className="muted"> (from {num(points[0].x, 6)} to {num(points[1].x, 6)}{xu ? ` ${xu}` : ''} on the {points[0].series} line)</span>
          </span>
        )}
      </div>
    </div>
  );
}
