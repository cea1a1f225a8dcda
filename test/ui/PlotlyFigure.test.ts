/**
 * src/ui/PlotlyFigure.tsx: the page's one wrapper around the plot library.
 * What can be checked without a browser (Plotly mocked, effects not run):
 * the figure's element carries the label a screen reader reads and its test
 * id, starts visible with no failure message, and lists in words every
 * value the plot library cannot draw (from plot-guard.ts, whose arithmetic
 * is tested in test/ui/plot-guard.test.ts) under the figure's own test id;
 * static rendering never calls the library. The rest runs in effects on a
 * real element and is left to the e2e specs: the drawing under the page's
 * configuration (e2e/no-network.spec.ts reads every figure's merged
 * configuration), the failure message with the library's own words and the
 * rest of the page going on (e2e/session.spec.ts, "figure-failed"), notes
 * of values scaled for the drawing in a browser (e2e/hostile.spec.ts) and
 * zoom events forwarded to the store (e2e/bench-day.spec.ts).
 */
import { describe, expect, it, vi } from 'vitest';
import type { PlotData, PlotLayout } from 'plotly.js-strict-dist-min';
import { afterNextPaint, PlotlyFigure } from '../../src/ui/PlotlyFigure.tsx';
import { html, text } from './harness.ts';

const plotly = vi.hoisted(() => ({ react: vi.fn(() => Promise.resolve({ on() {} })), purge: vi.fn() }));
vi.mock('plotly.js-strict-dist-min', () => ({ default: plotly }));

const layout: PlotLayout = { xaxis: { title: { text: 'Time (min)' } }, yaxis: { title: { text: 'Absorbance (mAU)' } } } as PlotLayout;
const curve = (y: number[], name = 'raw'): PlotData => ({ type: 'scatter', mode: 'lines', name, x: y.map((_, i) => i), y } as PlotData);

describe('PlotlyFigure (static)', () => {
  it('a figure element with its label and test id, shown, no failure message; the library is not called while rendering', () => {
    const h = html(PlotlyFigure, { data: [curve([1, 2, 3])], layout, label: 'Plot of demo-sample.csv', testId: 'figure' });
    expect(h).toMatch(/<div[^>]*role="figure"[^>]*aria-label="Plot of demo-sample.csv"[^>]*data-testid="figure"/);
    expect(h).not.toMatch(/role="figure"[^>]*hidden/);
    expect(h).not.toContain('role="alert"');
    expect(text(h)).not.toContain('could not be drawn');
    expect(h).not.toContain('data-testid="figure-notes"');
    expect(plotly.react).not.toHaveBeenCalled();
    expect(plotly.purge).not.toHaveBeenCalled();
  });

  it('values that are not finite numbers are named under the figure, counted per curve, as gaps in the drawing', () => {
    const h = html(PlotlyFigure, { data: [curve([1, Number.NaN, 3, Number.POSITIVE_INFINITY]), curve([0, 1, 2, 3], 'processed')], layout, label: 'L', testId: 'spectrum' });
    expect(h).toContain('data-testid="spectrum-notes"');
    const t = text(h);
    expect(t).toContain('2 “raw” y values are not a finite number (an overflow, NaN or infinity) and are left out of the drawing as a gap.');
    expect(t).not.toContain('“processed”');
  });

  it('values too large for the library are drawn scaled, and the figure says so, naming the axis; the data are said to be unchanged', () => {
    // plot-guard.ts: magnitudes near the largest double (about 1.8e308, IEEE 754) are drawn divided by 1e308.
    const h = html(PlotlyFigure, { data: [curve([1e308, 1.5e308, 1.7e308])], layout, label: 'L' });
    const t = text(h);
    expect(h).toContain('data-testid="figure-notes"');
    expect(t).toMatch(/Absorbance \(mAU\): values of magnitude up to [\d.e+]+ are too large for the plot to draw, so they are drawn divided by 1e308\. The data and every result are unchanged\./);
  });
});

describe('afterNextPaint (issue 16: markers drawn after the frame that paints the peak table)', () => {
  it('waits for the next animation frame and a task after it, not less', async () => {
    const frames: (() => void)[] = [];
    vi.stubGlobal('requestAnimationFrame', (f: () => void) => { frames.push(f); return frames.length; });
    try {
      let done = false;
      const p = afterNextPaint().then(() => { done = true; });
      await new Promise((r) => setTimeout(r, 20));
      expect(done).toBe(false); // no frame yet: still waiting (the 100 ms fallback has not run out)
      expect(frames).toHaveLength(1);
      frames[0]();
      expect(done).toBe(false); // the frame's own callback is not yet after the paint
      await p;
      expect(done).toBe(true);
    } finally {
      vi.unstubAllGlobals();
    }
  });

  it('goes on after 100 ms when no frame comes (a hidden page paints none)', async () => {
    vi.useFakeTimers();
    vi.stubGlobal('requestAnimationFrame', () => 0);
    try {
      let done = false;
      void afterNextPaint().then(() => { done = true; });
      await vi.advanceTimersByTimeAsync(99);
      expect(done).toBe(false);
      await vi.advanceTimersByTimeAsync(1);
      expect(done).toBe(true);
    } finally {
      vi.useRealTimers();
      vi.unstubAllGlobals();
    }
  });
});
