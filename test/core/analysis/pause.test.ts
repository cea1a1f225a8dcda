// drain (src/core/analysis/pause.ts): runs a stepwise computation to its end,
// ignoring its pauses (definition in the module).
import { describe, expect, it } from 'vitest';
import { drain, type Stepwise } from '../../../src/core/analysis/pause.ts';

describe('drain', () => {
  it('returns the value after every pause has passed, and runs the work between pauses exactly once', () => {
    let work = 0;
    function* sum(n: number): Stepwise<number> {
      let s = 0;
      for (let i = 1; i <= n; i++) { s += i; work++; if (i % 3 === 0) yield undefined; }
      return s;
    }
    expect(drain(sum(10))).toBe(55);
    expect(work).toBe(10);
    expect(drain(sum(0))).toBe(0);
  });

  it('passes on an error thrown inside the computation', () => {
    function* bad(): Stepwise<number> { yield undefined; throw new RangeError('inside'); }
    expect(() => drain(bad())).toThrow(/inside/);
  });
});
