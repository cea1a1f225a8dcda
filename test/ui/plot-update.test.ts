/**
 * src/ui/plot-update.ts: when a figure may be updated in place instead of
 * drawn whole (issue 16), and the steady ranges that make that possible.
 * Worked by hand from the rule in the module's head, which follows the plot
 * library's own autorange (each extreme padded by 5 % of the axis on y for
 * every scatter trace, on x only for markers and text, plus half a marker;
 * read in plotly.js 4.1 src/plots/cartesian/autorange.js and
 * src/traces/scatter/calc.js). That the figure updated in place equals a
 * whole drawing with the library itself as the judge is checked in a browser
 * (e2e/figure-update.spec.ts).
 */
import { describe, expect, it } from 'vitest';
import type { PlotData, PlotLayout } from 'plotly.js-strict-dist-min';
import { extent, figureUpdate, pointsOf, RESIDUAL_RANGE, sameValue, steadyRange, TRACE_RANGE, type LiveFigure } from '../../src/ui/plot-update.ts';

const line = (name: string, y: number[], more: Partial<PlotData> = {}): PlotData =>
  ({ type: 'scatter', mode: 'lines', name, x: Float64Array.from(y, (_, i) => i), y: Float64Array.from(y), line: { color: '#111', width: 1 }, ...more });
const markers = (name: string, x: number[], y: number[], more: Partial<PlotData> = {}): PlotData =>
  ({ type: 'scatter', mode: 'markers', name, x, y, marker: { symbol: 'diamond', size: 10, line: { width: 1.5, color: '#222' } }, ...more });
const auto: PlotLayout = { xaxis: { autorange: true }, yaxis: { autorange: true } } as PlotLayout;
const fixedY: PlotLayout = { xaxis: { autorange: true }, yaxis: { range: [-10, 10], autorange: false } } as PlotLayout;
/** A drawn figure 1000 px wide and 400 px high, 0.01 data units per pixel on both axes, every trace shown. */
const live = (over: Partial<LiveFigure> = {}): LiveFigure => ({ shown: () => true, autoRanged: () => false, scale: (k) => ({ unitsPerPixel: 0.01, lengthPx: k.startsWith('x') ? 1000 : 400 }), ...over });

describe('sameValue', () => {
  it('compares numbers, NaN, arrays, typed arrays and plain objects by value; undefined fields count as absent', () => {
    expect(sameValue(Number.NaN, Number.NaN)).toBe(true);
    expect(sameValue(new Float64Array([1, 2]), [1, 2])).toBe(true);
    expect(sameValue(new Float64Array([1, 2]), [1, 2.0000001])).toBe(false);
    expect(sameValue({ a: 1, b: undefined }, { a: 1 })).toBe(true);
    expect(sameValue({ a: { b: [1, 'x'] } }, { a: { b: [1, 'y'] } })).toBe(false);
    expect(sameValue([1], { 0: 1 })).toBe(false);
  });
});

describe('figureUpdate', () => {
  const raw = line('raw', [0, 5, -3, 8, 1]);
  const before = [raw, line('processed', [0, 4, -1, 6, 1])];

  it('draws whole the first time, when traces come or go, or when the layout changes (naming what changed)', () => {
    expect(figureUpdate(null, { data: before, layout: auto })).toEqual({ kind: 'whole', why: 'first drawing' });
    expect(figureUpdate({ data: before, layout: auto }, { data: [raw], layout: auto }).kind).toBe('whole');
    const u = figureUpdate({ data: before, layout: auto }, { data: before, layout: fixedY });
    expect(u).toEqual({ kind: 'whole', why: 'layout changed (yaxis)' });
  });

  it('replaces a line in place when it stays inside what the unchanged raw trace spans, before and after', () => {
    const after = [raw, line('processed', [0, 3, -2, 7, 1])];
    expect(figureUpdate({ data: before, layout: auto }, { data: after, layout: auto }, live())).toEqual({ kind: 'in-place', traces: [1] });
    // Nothing changed at all: nothing to draw.
    expect(figureUpdate({ data: before, layout: auto }, { data: before.map((t) => ({ ...t })), layout: auto }, live())).toEqual({ kind: 'in-place', traces: [] });
  });

  it('draws whole when the changed line reaches past the others, after or before (the range would grow or shrink)', () => {
    const grows = [raw, line('processed', [0, 3, -2, 8.5, 1])];
    expect(figureUpdate({ data: before, layout: auto }, { data: grows, layout: auto }, live()).kind).toBe('whole');
    expect(figureUpdate({ data: grows, layout: auto }, { data: before, layout: auto }, live()).kind).toBe('whole');
    // With a range of its own on y, the same change is drawn in place (x still spans 0…4 through the raw trace).
    expect(figureUpdate({ data: before, layout: fixedY }, { data: grows, layout: fixedY }, live())).toEqual({ kind: 'in-place', traces: [1] });
    // …unless the user let the library range y again (double-click): the live figure says so.
    expect(figureUpdate({ data: before, layout: fixedY }, { data: grows, layout: fixedY }, live({ autoRanged: (k) => k === 'yaxis' })).kind).toBe('whole');
  });

  it('does not let a trace the user hid hold the range', () => {
    const after = [raw, line('processed', [0, 3, -2, 7, 1])];
    expect(figureUpdate({ data: before, layout: auto }, { data: after, layout: auto }, live({ shown: (i) => i !== 0 })).kind).toBe('whole');
  });

  it('draws whole when a trace changes its style, is not a scatter trace, fills, or drops a field', () => {
    const recoloured = [raw, line('processed', [0, 3, -2, 7, 1], { line: { color: '#f00', width: 1 } })];
    const u = figureUpdate({ data: before, layout: auto }, { data: recoloured, layout: auto }, live());
    expect(u).toEqual({ kind: 'whole', why: 'trace 1 (processed) changed its style (line)' });
    const bar = (y: number[]): PlotData => ({ type: 'bar', name: 'b', x: [0, 1], y });
    expect(figureUpdate({ data: [raw, bar([1, 2])], layout: auto }, { data: [raw, bar([1, 3])], layout: auto }, live()).kind).toBe('whole');
    const filled = (y: number[]) => line('f', y, { fill: 'tozeroy' });
    expect(figureUpdate({ data: [raw, filled([1, 2])], layout: auto }, { data: [raw, filled([1, 3])], layout: auto }, live()).kind).toBe('whole');
    const texted = markers('m', [1, 2], [1, 2], { text: ['a', 'b'] });
    expect(figureUpdate({ data: [raw, texted], layout: auto }, { data: [raw, markers('m', [1, 2], [1, 3])], layout: auto }, live()).kind).toBe('whole');
  });

  it('keeps markers clear of the ends by their padding: on y half a marker and its outline, on x also 5 % of the axis', () => {
    // y: raw spans −3…8; a marker of size 10 with a 1.5 outline reaches 5 + 1.5 + 2 (spare) = 8.5 px = 0.085 units.
    const m = (y: number) => [raw, markers('peaks', [2, 2.5], [0, y])];
    expect(figureUpdate({ data: m(7.9), layout: auto }, { data: m(7.91), layout: auto }, live()).kind).toBe('in-place');
    expect(figureUpdate({ data: m(7.9), layout: auto }, { data: m(7.92), layout: auto }, live()).kind).toBe('whole');
    // x: raw spans 0…4; 5 % of 1000 px + 8.5 px = 58.5 px = 0.585 units from either end.
    const mx = (x: number) => [raw, markers('peaks', [2, x], [0, 1])];
    expect(figureUpdate({ data: mx(3.4), layout: auto }, { data: mx(3.41), layout: auto }, live()).kind).toBe('in-place');
    expect(figureUpdate({ data: mx(3.4), layout: auto }, { data: mx(3.42), layout: auto }, live()).kind).toBe('whole');
    // Text alone has no marker but the same 5 % on x (2 px spare): 52 px = 0.52 units.
    const tx = (x: number): PlotData[] => [raw, { type: 'scatter', mode: 'text', name: 'labels', x: [2, x], y: [0, 1], text: ['a', 'b'] }];
    expect(figureUpdate({ data: tx(3.47), layout: auto }, { data: tx(3.48), layout: auto }, live()).kind).toBe('in-place');
    expect(figureUpdate({ data: tx(3.47), layout: auto }, { data: tx(3.49), layout: auto }, live()).kind).toBe('whole');
    // Without the live scale, markers on a ranged axis are drawn whole.
    expect(figureUpdate({ data: m(1), layout: auto }, { data: m(2), layout: auto }, live({ scale: () => null })).kind).toBe('whole');
  });

  it('names one unchanged trace of each other panel too, the one with the fewest points (the library clears a panel it is given nothing of)', () => {
    const residual = (y: number[]) => line('residual', y, { yaxis: 'y2' });
    const tiny = line('tiny', [0.5, 0.5], { yaxis: 'y2' });
    const a = [raw, markers('peaks', [2, 2.5], [0, 1]), residual([0, 1, 0, 1, 0]), tiny];
    const b = [raw, markers('peaks', [2, 2.6], [0, 1]), residual([0, 1, 0, 1, 0]), tiny];
    expect(figureUpdate({ data: a, layout: auto }, { data: b, layout: auto }, live())).toEqual({ kind: 'in-place', traces: [1, 3] });
    // A change on both panels names no extra trace.
    const c = [raw, markers('peaks', [2, 2.6], [0, 1]), residual([0, 1, 0, 0.5, 0]), tiny];
    expect(figureUpdate({ data: a, layout: { ...auto, yaxis2: { range: [-1, 2] } } as PlotLayout }, { data: c, layout: { ...auto, yaxis2: { range: [-1, 2] } } as PlotLayout }, live())).toEqual({ kind: 'in-place', traces: [1, 2] });
  });

  it('a y axis with a range of its own that only moved its range: the new range is set first, then the traces in place; any other layout change is drawn whole', () => {
    // The residual outgrew its panel (the steady range of the residual, RESIDUAL_RANGE): only yaxis2.range differs.
    const panels = (r: [number, number], more: Partial<PlotLayout> = {}): PlotLayout => ({ ...fixedY, yaxis2: { range: r, autorange: false }, ...more } as PlotLayout);
    const residual = (y: number[]) => line('residual', y, { yaxis: 'y2' });
    const a = [raw, line('processed', [0, 4, -1, 6, 1]), residual([0, 1, -1, 2, 0])];
    const b = [raw, line('processed', [0, 3, -2, 7, 1]), residual([0, 2, -1, 1, 0])];
    expect(figureUpdate({ data: a, layout: panels([-2, 2]) }, { data: b, layout: panels([-5, 5]) }, live()))
      .toEqual({ kind: 'in-place', traces: [1, 2], ranges: { 'yaxis2.range': [-5, 5] } });
    // Both y axes moved: both ranges; nothing else changed: the ranges alone.
    expect(figureUpdate({ data: a, layout: panels([-2, 2]) }, { data: a, layout: { ...panels([-5, 5]), yaxis: { range: [-20, 20], autorange: false } } as PlotLayout }, live()))
      .toEqual({ kind: 'in-place', traces: [], ranges: { 'yaxis.range': [-20, 20], 'yaxis2.range': [-5, 5] } });
    // Whole: the range and anything else of the axis (its title), another part of the layout, the x axis's range, an
    // axis the library ranged before or ranges after, an axis the user let the library range (double-click), a range
    // that is no pair of finite ascending numbers.
    const whole = (p: PlotLayout, n: PlotLayout, l = live()) => figureUpdate({ data: a, layout: p }, { data: b, layout: n }, l);
    expect(whole(panels([-2, 2]), panels([-5, 5], { yaxis2: { range: [-5, 5], autorange: false, title: { text: 'residual' } } } as Partial<PlotLayout>))).toEqual({ kind: 'whole', why: 'layout changed (yaxis2)' });
    expect(whole(panels([-2, 2]), panels([-5, 5], { height: 600 } as Partial<PlotLayout>)).kind).toBe('whole');
    expect(whole(panels([-2, 2]), panels([-2, 2], { xaxis: { range: [1, 3], autorange: false } } as Partial<PlotLayout>)).kind).toBe('whole');
    expect(whole(panels([-2, 2], { yaxis2: { autorange: true } } as Partial<PlotLayout>), panels([-5, 5])).kind).toBe('whole');
    expect(whole(panels([-2, 2]), panels([-5, 5], { yaxis2: { range: [-5, 5] } } as Partial<PlotLayout>)).kind).toBe('whole');
    expect(whole(panels([-2, 2]), panels([-5, 5]), live({ autoRanged: (k) => k === 'yaxis2' })).kind).toBe('whole');
    expect(whole(panels([-2, 2]), panels([5, -5])).kind).toBe('whole');
    expect(whole(panels([-2, 2]), panels([-5, Number.NaN])).kind).toBe('whole');
    // The traces still decide: a style change is drawn whole whatever the layout did.
    expect(figureUpdate({ data: a, layout: panels([-2, 2]) }, { data: [raw, line('processed', [0, 3, -2, 7, 1], { line: { color: '#f00', width: 1 } }), b[2]], layout: panels([-5, 5]) }, live()).kind).toBe('whole');
  });

  it('sends only the points of a trace', () => {
    const t = markers('m', [1], [2], { text: ['a'], hovertext: ['h'] });
    expect(pointsOf(t)).toEqual({ x: [1], y: [2], text: ['a'], hovertext: ['h'] });
  });

  it('sends typed arrays as plain arrays of the same numbers (bits kept), the trace itself unchanged', () => {
    const x = Float64Array.of(0, -0, 1.5, Number.NaN, 1e-310), y = Float32Array.of(1, 2, 3, 4, 5);
    const t = line('processed', [], {});
    const sent = pointsOf({ ...t, x, y });
    expect(Array.isArray(sent.x) && Array.isArray(sent.y)).toBe(true);
    const sx = sent.x as number[];
    expect(sx.map((v, i) => Object.is(v, x[i]))).toEqual([true, true, true, true, true]);
    expect(sent.y).toEqual([1, 2, 3, 4, 5]);
    expect(x).toBeInstanceOf(Float64Array);
  });
});

describe('extent', () => {
  it('smallest and largest finite value, skipping NaN, infinities and gaps; null when none', () => {
    expect(extent(new Float64Array([3, Number.NaN, -1, Number.POSITIVE_INFINITY, 2]))).toEqual([-1, 3]);
    expect(extent([null, 4, null])).toEqual([4, 4]);
    expect(extent([Number.NaN])).toBeNull();
    expect(extent(undefined)).toBeNull();
  });
});

describe('steadyRange', () => {
  it('widens the extent by 4 % and goes out to whole steps of about a fifth of it (the residual panel)', () => {
    // 0…1.03: step 0.25 (0.206 rounded up in 1, 2, 2.5, 5); −0.0412 → −0.25, 1.0712 → 1.25.
    expect(steadyRange([[0, 0.5, 1.03]])).toEqual([-0.25, 1.25]);
    // −0.3…0.2 over two series: span 0.5, step 0.1; −0.32 → −0.4, 0.22 → 0.3.
    expect(steadyRange([[-0.3, 0], new Float64Array([0.2, Number.NaN])])).toEqual([-0.4, 0.3]);
    expect(steadyRange([[Number.NaN], undefined])).toBeNull();
  });

  it('keeps a held range while the data stay inside and fill 40 % of it; else ranges afresh with 40 % on each side', () => {
    const held: [number, number] = [-0.25, 1.25];
    expect(steadyRange([[0.1, 0.9]], held)).toEqual(held); // 0.8 ≥ 0.6
    expect(steadyRange([[0.3, 0.9]], held)).toEqual(held); // 0.6 ≥ 0.6
    // 0…0.5 fills 0.5 < 0.6: pad 0.2, step 0.1: −0.2 → −0.2, 0.7 → 0.7.
    expect(steadyRange([[0, 0.5]], held)).toEqual([-0.2, 0.7]);
    // Outgrown: −0.5…1: pad 0.6, step 0.5: −1.1 → −1.5, 1.6 → 2.
    expect(steadyRange([[-0.5, 1]], held)).toEqual([-1.5, 2]);
  });

  it('the trace panel: 6 % on each side with no rounding, held while the data fill 80 % of it', () => {
    expect(steadyRange([[0, 1]], null, TRACE_RANGE)).toEqual([-0.06, 1.06]);
    expect(steadyRange([[0, 0.9]], [-0.06, 1.06], TRACE_RANGE)).toEqual([-0.06, 1.06]); // 0.9 ≥ 0.896
    const r = steadyRange([[0, 0.85]], [-0.06, 1.06], TRACE_RANGE)!; // 0.85 < 0.896
    expect(r[0]).toBeCloseTo(-0.051, 12);
    expect(r[1]).toBeCloseTo(0.901, 12);
    expect(RESIDUAL_RANGE.wholeSteps).toBe(true);
  });
});
