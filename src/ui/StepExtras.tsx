import { useMemo } from 'react';
import type { PlotData, PlotLayout } from 'plotly.js-strict-dist-min';
import { decimateMinMax } from '../core/numeric/decimate.ts';
import { PlotlyFigure } from './PlotlyFigure.tsx';
import { COLOURS } from './palette.ts';

interface Props {
  extra: Record<string, Float64Array>;
  /** x of the step's output, for per-point extras. */
  x: Float64Array | null;
  xUnit: string;
}

const small = (title: string, xTitle: string, yTitle: string, logY = false): PlotLayout => ({
  height: 190, margin: { l: 55, r: 10, t: 24, b: 40 }, showlegend: true,
  legend: { orientation: 'h', y: 1.18, x: 0, font: { size: 10 } },
  title: { text: title, font: { size: 12 }, x: 0.02, y: 0.98 },
  xaxis: { title: { text: xTitle, font: { size: 11 } }, gridcolor: COLOURS.grid },
  yaxis: { title: { text: yTitle, font: { size: 11 } }, type: logY ? 'log' : 'linear', gridcolor: COLOURS.grid },
  font: { family: 'system-ui, sans-serif', size: 11, color: COLOURS.ink },
});

/** Small figures for what a step reports per point or per frequency (spectrum before/after; local order). */
export function StepExtras({ extra, x, xUnit }: Props) {
  const fig = useMemo<{ data: PlotData[]; layout: PlotLayout; label: string } | null>(() => {
    if (extra.spectrumFreq && extra.spectrumBefore && extra.spectrumAfter) {
      const f = extra.spectrumFreq;
      // The zero-frequency bin carries the mean, not noise; leave it out of a log axis
      // (cut off before thinning: decimateMinMax keeps one point outside the x-range it is given).
      const k = f.length > 1 ? 1 : 0;
      const b = decimateMinMax(f.subarray(k), extra.spectrumBefore.subarray(k), -Infinity, Infinity, 300);
      const a = decimateMinMax(f.subarray(k), extra.spectrumAfter.subarray(k), -Infinity, Infinity, 300);
      const pos = (v: Float64Array) => Array.from(v, (p) => (p > 0 ? p : null));
      return {
        label: 'Power spectrum before and after the frequency filter',
        data: [
          { type: 'scatter', mode: 'lines', name: 'before', x: Array.from(b.x), y: pos(b.y), line: { color: COLOURS.raw, width: 1 } },
          { type: 'scatter', mode: 'lines', name: 'after', x: Array.from(a.x), y: pos(a.y), line: { color: COLOURS.processed, width: 1.4 } },
        ],
        layout: small('Power spectrum', `frequency (cycles per ${xUnit || 'x-unit'})`, 'power', true),
      };
    }
    if (extra.order && x && x.length === extra.order.length) {
      const d = decimateMinMax(x, extra.order, -Infinity, Infinity, 400);
      return {
        label: 'Polynomial order chosen at each point',
        data: [{ type: 'scatter', mode: 'lines', name: 'order chosen', x: Array.from(d.x), y: Array.from(d.y), line: { color: COLOURS.processed, shape: 'hv', width: 1.2 } }],
        layout: { ...small('Where each order was chosen', xUnit ? `x (${xUnit})` : 'x', 'order'), showlegend: false, yaxis: { tickvals: [1, 2], ticktext: ['line', 'quadratic'], range: [0.7, 2.3], gridcolor: COLOURS.grid } },
      };
    }
    return null;
  }, [extra, x, xUnit]);
  if (!fig) return null;
  return <PlotlyFigure data={fig.data} layout={fig.layout} className="step-figure" label={fig.label} testId="step-figure" />;
}
