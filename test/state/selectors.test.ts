/**
 * src/state/selectors.ts: the current sample's result, never another
 * trace's. Checked on plain objects and on a fresh store as the page uses
 * it (a result lands, the user picks another sample, comes back).
 */
import { describe, expect, it } from 'vitest';
import type { AnalyseResult } from '../../src/core/analysis/index.ts';
import { createTrace } from '../../src/core/trace.ts';
import { currentResult, withCurrent } from '../../src/state/selectors.ts';
import { createAppStore } from '../../src/state/store.ts';

const report = { fileName: 'a.csv', sha256: '0'.repeat(64), format: 'test', rowsRead: 5, skipped: [], notices: [], metadata: {} };
const mk = (name: string) => createTrace({ name, x: [0, 1, 2, 3, 4], y: [1, 2, 3, 2, 1], source: { fileName: name, sha256: '0'.repeat(64), rowsRead: 5, rowsSkipped: 0 } });

describe('current result selector', () => {
  it('gives the result only while it belongs to the sample now chosen', () => {
    const result = { sampleId: 'a', peaks: [] } as unknown as AnalyseResult;
    expect(currentResult({ result, sampleId: 'a' })).toBe(result);
    expect(currentResult({ result, sampleId: 'b' })).toBeNull();
    expect(currentResult({ result, sampleId: null })).toBeNull();
    expect(currentResult({ result: null, sampleId: 'a' })).toBeNull();
    expect(withCurrent({ result, sampleId: 'a' }, (r) => r.peaks)).toEqual([]);
    expect(withCurrent({ result, sampleId: 'b' }, (r) => r.peaks)).toBeNull();
  });

  it('on a store: the result of a sample the user has left is not shown, and shows again when the user comes back', () => {
    const app = createAppStore();
    const t1 = mk('one'), t2 = mk('two');
    app.getState().addTraces([t1, t2], report);
    expect(app.getState().sampleId).toBe(t1.id);
    const r1 = { sampleId: t1.id, peaks: [{ x: 2 }] } as unknown as AnalyseResult;
    app.getState().setResult(r1);
    expect(currentResult(app.getState())).toBe(r1);
    app.getState().setSample(t2.id);
    expect(currentResult(app.getState())).toBeNull();
    expect(withCurrent(app.getState(), (r) => r.peaks.length)).toBeNull();
    app.getState().setSample(t1.id);
    expect(currentResult(app.getState())).toBe(r1);
    expect(withCurrent(app.getState(), (r) => r.peaks.length)).toBe(1);
  });

  it('withCurrent calls pick only for the current result', () => {
    let calls = 0;
    const result = { sampleId: 'a' } as unknown as AnalyseResult;
    withCurrent({ result, sampleId: 'b' }, () => ++calls);
    expect(calls).toBe(0);
    expect(withCurrent({ result, sampleId: 'a' }, () => ++calls)).toBe(1);
  });
});
