// src/core/trace.ts: the invariants every trace keeps (DESIGN's conventions:
// x ascending, finite values, units; raw data never changed). Expected
// messages are the module's own wording; values are invented.
import { describe, expect, it } from 'vitest';
import { axisLabel, checkTraceData, createTrace, MIN_POINTS, TraceError } from '../../src/core/trace.ts';

const source = { fileName: 'made-up.csv', sha256: '0'.repeat(64), rowsRead: 5, rowsSkipped: 0 };

describe('trace invariants', () => {
  it('accepts five finite points with strictly ascending x', () => {
    expect(MIN_POINTS).toBe(5);
    expect(checkTraceData([0, 1, 2, 3, 4], [1, 2, 3, 2, 1])).toBeNull();
  });

  it('names what is wrong and where (1-based points)', () => {
    expect(checkTraceData([0, 1, 2, 3], [1, 2, 3, 4])).toBe('Only 4 point(s); a trace needs at least 5.');
    expect(checkTraceData([0, 1, 2, 3, 4], [1, 2, 3])).toMatch(/x has 5 values but y has 3/);
    expect(checkTraceData([0, 1, NaN, 3, 4], [1, 2, 3, 4, 5])).toBe('x at point 3 is not a finite number (NaN).');
    expect(checkTraceData([0, 1, 2, 3, 4], [1, 2, 3, Infinity, 5])).toBe('y at point 4 is not a finite number (Infinity).');
    expect(checkTraceData([0, 1, 1, 3, 4], [1, 2, 3, 4, 5])).toBe('x is not strictly ascending at point 3 (1 then 1).');
  });

  it('createTrace copies and freezes: later changes to the caller’s arrays cannot reach it', () => {
    const x = [0, 1, 2, 3, 4];
    const y = Float64Array.of(5, 4, 3, 2, 1);
    const t = createTrace({ name: 'a', x, y, xUnit: 'min', source });
    x[0] = 99;
    y[0] = 99;
    expect(Array.from(t.x)).toEqual([0, 1, 2, 3, 4]);
    expect(Array.from(t.y)).toEqual([5, 4, 3, 2, 1]);
    expect(Object.isFrozen(t)).toBe(true);
    expect(Object.isFrozen(t.source)).toBe(true);
    expect(t.yName).toBe('y');
    expect(t.xUnit).toBe('min');
  });

  it('createTrace throws a TraceError with the same sentence for bad data', () => {
    expect(() => createTrace({ name: 'b', x: [0, 1, 2, 3, 2], y: [1, 1, 1, 1, 1], source })).toThrow(TraceError);
    expect(() => createTrace({ name: 'b', x: [0, 1, 2, 3, 2], y: [1, 1, 1, 1, 1], source })).toThrow('x is not strictly ascending at point 5 (3 then 2).');
  });

  it('gives each trace its own id unless one is given', () => {
    const a = createTrace({ name: 'a', x: [0, 1, 2, 3, 4], y: [0, 0, 0, 0, 0], source });
    const b = createTrace({ name: 'b', x: [0, 1, 2, 3, 4], y: [0, 0, 0, 0, 0], source });
    expect(a.id).not.toBe(b.id);
    expect(createTrace({ id: 'mine', name: 'c', x: [0, 1, 2, 3, 4], y: [0, 0, 0, 0, 0], source }).id).toBe('mine');
  });

  it('axis labels carry the unit in brackets, or just the name', () => {
    expect(axisLabel('Time', 'min')).toBe('Time (min)');
    expect(axisLabel('Counts', '')).toBe('Counts');
  });
});
