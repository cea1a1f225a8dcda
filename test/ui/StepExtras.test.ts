import { describe, expect, it, vi } from 'vitest';
import type { PlotData } from 'plotly.js-strict-dist-min';
import { StepExtras } from '../../src/ui/StepExtras.tsx';
import { tree } from './harness.ts';

// src/ui/StepExtras.tsx: small figures of what a step reports per frequency
// or per point. Plotly itself needs a browser; the figure is read from the
// props handed to the plot component (nothing is drawn without a browser).
vi.mock('plotly.js-strict-dist-min', () => ({ default: {} }));

type Fig = { data: (PlotData & { x: number[]; y: (number | null)[] })[]; layout: Record<string, Record<string, unknown>>; label: string } | null;
const fig = (props: Parameters<typeof StepExtras>[0]): Fig => {
  const el = tree(StepExtras, props) as { props: Fig } | null;
  return el ? el.props : null;
};

describe('StepExtras', () => {
  it('nothing for a step that reports no per-point figures', () => {
    expect(fig({ extra: {}, x: null, xUnit: 'min' })).toBeNull();
    expect(fig({ extra: { order: new Float64Array([1, 2]) }, x: new Float64Array([0, 1, 2]), xUnit: 'min' })).toBeNull(); // lengths differ: not drawn against the wrong x
  });
  it('the spectrum before and after on a log power axis, without the zero-frequency bin, with no value ≤ 0 drawn on the log axis', () => {
    const f = new Float64Array([0, 1, 2, 3, 4]);
    const before = new Float64Array([100, 4, 3, 2, 1]);
    const after = new Float64Array([100, 4, 0, -1e-18, 0.5]);
    const g = fig({ extra: { spectrumFreq: f, spectrumBefore: before, spectrumAfter: after }, x: null, xUnit: 'min' })!;
    expect(g.label).toBe('Power spectrum before and after the frequency filter');
    expect(g.layout.yaxis.type).toBe('log');
    expect((g.layout.xaxis.title as { text: string }).text).toBe('frequency (cycles per min)');
    expect(g.data.map((d) => d.name)).toEqual(['before', 'after']);
    expect(g.data[0].x).toEqual([1, 2, 3, 4]);
    expect(g.data[0].y).toEqual([4, 3, 2, 1]);
    expect(g.data[1].y).toEqual([4, null, null, 0.5]);
    expect((fig({ extra: { spectrumFreq: f, spectrumBefore: before, spectrumAfter: after }, x: null, xUnit: '' })!.layout.xaxis.title as { text: string }).text).toBe('frequency (cycles per x-unit)');
  });
  it('a long spectrum (thinned for the screen) still leaves the zero-frequency bin out', () => {
    // Found by this test: thinning keeps one point outside the x-range it is given, so the
    // mean's bin (here 10^6, squashing the noise on the log axis) was drawn; fixed in StepExtras.tsx.
    const n = 5000;
    const f = Float64Array.from({ length: n }, (_, i) => i / n);
    const p = Float64Array.from({ length: n }, (_, i) => (i === 0 ? 1e6 : 1 + (i % 3)));
    const g = fig({ extra: { spectrumFreq: f, spectrumBefore: p, spectrumAfter: p }, x: null, xUnit: 'min' })!;
    for (const d of g.data) {
      expect(d.x[0]).toBe(1 / n);
      expect(Math.max(...d.y.map((v) => v ?? 0))).toBe(3);
    }
  });
  it('the order chosen at each point, as a step line with the orders named', () => {
    const x = new Float64Array([0, 0.1, 0.2, 0.3]);
    const g = fig({ extra: { order: new Float64Array([1, 1, 2, 2]) }, x, xUnit: 'min' })!;
    expect(g.label).toBe('Polynomial order chosen at each point');
    expect(g.data[0].x).toEqual([0, 0.1, 0.2, 0.3]);
    expect(g.data[0].y).toEqual([1, 1, 2, 2]);
    expect((g.data[0].line as { shape: string }).shape).toBe('hv');
    expect(g.layout.yaxis).toMatchObject({ tickvals: [1, 2], ticktext: ['line', 'quadratic'] });
    expect((g.layout.xaxis.title as { text: string }).text).toBe('x (min)');
  });
});
