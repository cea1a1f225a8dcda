import { describe, expect, it } from 'vitest';
import type { Peak } from '../../src/core/measure/peak-types.ts';
import { nextPeak } from '../../src/ui/peak-steps.ts';

// src/ui/peak-steps.ts: keys N and P step through the live peaks by position.
const p = (x: number, removedByUser = false) => ({ x, removedByUser }) as unknown as Peak;
const peaks = [p(5), p(1), p(3, true), p(7), p(2)]; // unsorted on purpose; 3 was removed by hand

describe('nextPeak', () => {
  it('from nothing selected: the first peak forward, the last backward', () => {
    expect(nextPeak(peaks, null, 1)?.x).toBe(1);
    expect(nextPeak(peaks, null, -1)?.x).toBe(7);
  });
  it('steps by position, not by list order, and skips peaks removed by hand', () => {
    expect(nextPeak(peaks, 2, 1)?.x).toBe(5);
    expect(nextPeak(peaks, 5, -1)?.x).toBe(2);
    expect(nextPeak(peaks, 1, 1)?.x).toBe(2);
  });
  it('null past either end (no wrap-around) and with no live peak', () => {
    expect(nextPeak(peaks, 7, 1)).toBeNull();
    expect(nextPeak(peaks, 1, -1)).toBeNull();
    expect(nextPeak([p(3, true)], null, 1)).toBeNull();
    expect(nextPeak([], 4, -1)).toBeNull();
  });
  it('a selection between peaks goes to the neighbour on that side', () => {
    expect(nextPeak(peaks, 4, 1)?.x).toBe(5);
    expect(nextPeak(peaks, 4, -1)?.x).toBe(2);
  });
  it('does not reorder the caller’s array', () => {
    const copy = peaks.map((q) => q.x);
    nextPeak(peaks, null, 1);
    expect(peaks.map((q) => q.x)).toEqual(copy);
  });
});
