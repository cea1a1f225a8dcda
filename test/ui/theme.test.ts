import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import type { PlotData, PlotLayout } from 'plotly.js-strict-dist-min';
import { COLOURS } from '../../src/ui/palette.ts';
import { DARK, themedData, themedLayout, useDarkScheme } from '../../src/ui/theme.ts';

// src/ui/theme.ts: dark figure colours applied to Plotly layouts and traces.
describe('themedLayout', () => {
  const light = { font: { size: 12 }, xaxis: { title: 't' }, yaxis2: { range: [0, 1] }, legend: { x: 1 } } as unknown as PlotLayout;
  it('light: the same object back, untouched', () => {
    expect(themedLayout(light, false)).toBe(light);
  });
  it('dark: background, ink, every x/y axis and the legend get dark colours; other fields stay', () => {
    const d = themedLayout(light, true) as Record<string, Record<string, unknown>>;
    expect(d.paper_bgcolor).toBe(DARK.paper);
    expect(d.plot_bgcolor).toBe(DARK.paper);
    expect(d.font).toEqual({ size: 12, color: DARK.ink });
    expect(d.xaxis).toMatchObject({ title: 't', gridcolor: DARK.grid, zerolinecolor: DARK.zero });
    expect(d.yaxis2).toMatchObject({ range: [0, 1], gridcolor: DARK.grid });
    expect(d.legend).toEqual({ x: 1, bgcolor: DARK.legend });
  });
  it('never changes the layout it was given', () => {
    const before = JSON.stringify(light);
    themedLayout(light, true);
    expect(JSON.stringify(light)).toBe(before);
  });
});

describe('themedData', () => {
  it('swaps the light ink for the dark one in lines, markers (also per-point arrays) and labels; other colours stay', () => {
    const data = [
      { line: { color: COLOURS.ink, width: 2 }, marker: { color: [COLOURS.peak, COLOURS.ink] }, textfont: { color: COLOURS.ink } },
      { line: { color: COLOURS.processed } },
    ] as unknown as PlotData[];
    const before = JSON.stringify(data);
    const out = themedData(data, true) as unknown as { line: { color: string; width?: number }; marker?: { color: string[] }; textfont?: { color: string } }[];
    expect(out[0].line).toEqual({ color: DARK.ink, width: 2 });
    expect(out[0].marker?.color).toEqual([COLOURS.peak, DARK.ink]);
    expect(out[0].textfont?.color).toBe(DARK.ink);
    expect(out[1]).toBe(data[1]); // nothing to swap: the same object (no copy of big series)
    expect(JSON.stringify(data)).toBe(before);
  });
  it('typed arrays of a series are passed through, not copied or scanned', () => {
    const y = new Float64Array([1, 2, 3]);
    const data = [{ y, line: { color: COLOURS.ink } }] as unknown as PlotData[];
    expect((themedData(data, true)[0] as unknown as { y: Float64Array }).y).toBe(y);
  });
  it('light: the same array back', () => {
    const data = [] as PlotData[];
    expect(themedData(data, false)).toBe(data);
  });
});

describe('useDarkScheme', () => {
  it('is false without a browser (server snapshot), so figures start light', () => {
    const Probe = () => createElement('i', null, String(useDarkScheme()));
    expect(renderToStaticMarkup(createElement(Probe))).toBe('<i>false</i>');
  });
});
