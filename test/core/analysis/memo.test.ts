// Per-trace memos (src/core/analysis/memo.ts): keyed by trace id and settings,
// dropped when the id now names another array, at most 8 settings per trace,
// nothing kept from a stepwise computation dropped half-way (module contract).
import { describe, expect, it } from 'vitest';
import { AnalysisMemo } from '../../../src/core/analysis/memo.ts';
import type { Measured } from '../../../src/core/analysis/stages/measure.ts';
import type { Stepwise } from '../../../src/core/analysis/pause.ts';

const value = (tag: string) => ({ noise: null, peaks: [], peakOptions: null, peakProblem: tag }) as Measured;

describe('AnalysisMemo', () => {
  it('makes a value once per trace and settings, again for other settings', () => {
    const memo = new AnalysisMemo();
    const y = new Float64Array(4);
    let made = 0;
    const make = () => { made++; return value(`v${made}`); };
    const a = memo.reference.get('t', y, 'k1', make);
    expect(memo.reference.get('t', y, 'k1', make)).toBe(a);
    expect(made).toBe(1);
    memo.reference.get('t', y, 'k2', make);
    memo.reference.get('other', y, 'k1', make);
    expect(made).toBe(3);
  });

  it('never returns a value made from another array under the same id', () => {
    const memo = new AnalysisMemo();
    const a = memo.reference.get('t', new Float64Array(4), 'k', () => value('first'));
    const b = memo.reference.get('t', new Float64Array(4), 'k', () => value('second'));
    expect(a.peakProblem).toBe('first');
    expect(b.peakProblem).toBe('second');
  });

  it('keeps at most 8 settings per trace, dropping the oldest; clear empties both memos', () => {
    const memo = new AnalysisMemo();
    const y = new Float64Array(4);
    let made = 0;
    const make = () => { made++; return value('x'); };
    for (let k = 0; k < 9; k++) memo.reference.get('t', y, `k${k}`, make);
    expect(made).toBe(9);
    memo.reference.get('t', y, 'k8', make);
    expect(made).toBe(9); // newest still there
    memo.reference.get('t', y, 'k0', make);
    expect(made).toBe(10); // oldest was dropped
    memo.clear();
    memo.reference.get('t', y, 'k8', make);
    expect(made).toBe(11);
  });

  it('a stepwise value dropped half-way leaves nothing behind; finished, it is kept', () => {
    const memo = new AnalysisMemo();
    const y = new Float64Array(4);
    let made = 0;
    function* slow(): Stepwise<Measured> { made++; yield undefined; return value('done'); }
    const first = memo.reference.getStepwise('t', y, 'k', slow);
    first.next(); // paused inside, then dropped
    const second = memo.reference.getStepwise('t', y, 'k', slow);
    let r = second.next();
    while (!r.done) r = second.next();
    expect(made).toBe(2);
    const third = memo.reference.getStepwise('t', y, 'k', slow).next();
    expect(third.done).toBe(true);
    expect(third.value).toBe(r.value);
    expect(made).toBe(2);
  });
});
