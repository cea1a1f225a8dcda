/**
 * What reaches the plot library (issue 13): the thresholds come from trying
 * the library in Chromium (1e290 and 1e-300 drew cleanly; 1e308 gave NaN
 * paths and 5e-324 spacing threw); the checks here are that nothing the
 * library cannot draw gets through, that drawable data pass untouched, and
 * that what the plot reports back comes home in data units.
 */
import { describe, expect, test } from 'vitest';
import { axisTransform, guardFigure, toDataUnits, toDrawn } from '../../src/ui/plot-guard.ts';

const line = (name: string, x: number[], y: (number | null)[], yaxis = 'y') => ({ type: 'scatter' as const, name, x, y, xaxis: 'x', yaxis });

describe('guardFigure', () => {
  test('ordinary data pass through as the very same arrays, with no note', () => {
    const t = line('raw', [0, 1, 2], [1e280, -1e-280, 5]);
    const g = guardFigure([t], { xaxis: { range: [0, 2] } });
    expect(g.data[0]).toBe(t);
    expect(g.notes).toEqual([]);
    expect(g.transforms).toEqual({});
    expect(g.layout.xaxis).toEqual({ range: [0, 2] });
  });

  test('x spaced by the smallest double is drawn divided by 1e-323, accurately, and said so', () => {
    const x = Array.from({ length: 8 }, (_, i) => i * 5e-324);
    const g = guardFigure([line('raw', x, [1, 2, 3, 4, 5, 6, 7, 8])], { xaxis: { title: { text: 'Time (s)' } } });
    expect(g.transforms.x).toEqual({ offset: 0, exponent: -323 });
    const drawn = g.data[0].x as number[];
    // 5e-324 is 4.94065645841247e-324 exactly; ÷ 1e-323 that is 0.494065645841247 (to double precision).
    expect(drawn[1]).toBeCloseTo(0.494065645841247, 12);
    for (let i = 0; i < 8; i++) expect(toDataUnits(drawn[i], g.transforms.x)).toBe(x[i]);
    expect((g.layout.xaxis as { title: { text: string } }).title.text).toBe('Time (s), drawn divided by 1e-323');
    expect(g.notes[0]).toMatch(/^Time \(s\): values of magnitude up to 3\.5e-323 are too small for the plot to draw, so they are drawn divided by 1e-323\. The data and every result are unchanged\.$/);
  });

  test('values near the largest double are drawn divided by 1e308; the residual axis keeps its own scale', () => {
    const g = guardFigure([
      line('raw', [0, 1, 2], [1.5e308, -1.5e308, 1]),
      line('residual (raw − processed)', [0, 1, 2], [0.1, -0.1, 0], 'y2'),
    ], { yaxis: { title: { text: 'Signal' } }, yaxis2: { title: { text: 'residual' } } });
    expect(g.transforms).toEqual({ y: { offset: 0, exponent: 308 } });
    expect(g.data[0].y).toEqual([1.5, -1.5, 1e-308]);
    expect(g.data[1].y).toEqual([0.1, -0.1, 0]);
    expect(g.notes).toHaveLength(1);
    expect(g.notes[0]).toMatch(/too large for the plot to draw/);
  });

  test('values that are not finite become gaps and are counted per curve', () => {
    const g = guardFigure([line('processed', [0, 1, 2, 3], [1, Infinity, NaN, 2])], {});
    expect(g.data[0].y).toEqual([1, null, null, 2]);
    expect(g.notes).toEqual(['2 “processed” y values are not a finite number (an overflow, NaN or infinity) and are left out of the drawing as a gap.']);
  });

  test('an axis that spans a million-millionth of its size is drawn as the distance from its first value', () => {
    const eps = 2 ** -52;
    const x = Array.from({ length: 5 }, (_, i) => 1 + i * eps);
    const g = guardFigure([line('raw', x, [1, 2, 3, 4, 5])], { xaxis: { range: [1, 1 + 4 * eps] }, shapes: [{ type: 'rect', xref: 'x', yref: 'paper', x0: 1 + eps, x1: 1 + 2 * eps, y0: 0, y1: 1 }] });
    expect(g.transforms.x).toEqual({ offset: 1, exponent: -16 });
    const drawn = g.data[0].x as number[];
    expect(drawn[0]).toBe(0);
    expect(drawn[4]).toBeCloseTo(4 * eps * 1e16, 10);
    expect((g.layout.xaxis as { range: number[] }).range[1]).toBeCloseTo(4 * eps * 1e16, 10);
    const shape = (g.layout.shapes as { x0: number; y1: number }[])[0];
    expect(shape.x0).toBeCloseTo(eps * 1e16, 10);
    expect(shape.y1).toBe(1);
    expect(toDataUnits(drawn[3], g.transforms.x)).toBe(x[3]);
  });

  test('a range the page asks for that is not finite or not rising is dropped for autorange', () => {
    const g = guardFigure([line('raw', [0, 1], [0, 1])], { xaxis: { range: [NaN, 2] }, yaxis: { range: [3, 3] } });
    expect(g.layout.xaxis).toEqual({ range: undefined, autorange: true });
    expect(g.layout.yaxis).toEqual({ range: undefined, autorange: true });
  });

  test('axisTransform and its inverse', () => {
    expect(axisTransform(0, 1)).toBeNull();
    expect(axisTransform(0, 0)).toBeNull();
    expect(axisTransform(-1e291, 1)).toEqual({ offset: 0, exponent: 291 });
    expect(axisTransform(1e-295, 2e-295)).toEqual({ offset: 0, exponent: -295 });
    for (const tr of [{ offset: 0, exponent: -323 }, { offset: 0, exponent: 300 }, { offset: 1e9, exponent: -3 }]) {
      for (const v of [tr.offset + 3 * 10 ** tr.exponent, tr.offset + 7 * 10 ** tr.exponent]) expect(toDataUnits(toDrawn(v, tr), tr) / v).toBeCloseTo(1, 12);
    }
  });
});
