import { describe, expect, test } from 'vitest';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS } from '../../src/core/analysis/index.ts';
import { createTrace } from '../../src/core/trace.ts';
import type { SessionSnapshot } from '../../src/state/session-db.ts';
import { float64ToBase64, sessionFileText, sessionFromFileText } from '../../src/state/session-file.ts';
import { recipeOf } from '../core/export/helpers.ts';

/** Values where a text round trip would lose bits: subnormals, −0, the largest double, values of 17 significant digits. */
const AWKWARD = [0, -0, 5e-324, -2.5e-310, Number.MAX_VALUE, -Number.MAX_VALUE, 0.1 + 0.2, 1 / 3, Math.PI * 1e-300, 123456789.12345679];

describe('session file', () => {
  const t = createTrace({
    id: 'tr-1', name: 'odd.csv: Signal', x: [1, 2, 3, 4, 5, 6], y: AWKWARD.slice(0, 6), xName: 'Time', xUnit: 's', yName: 'Signal', yUnit: 'mV',
    source: { fileName: 'odd.csv', sha256: 'ab'.repeat(32), rowsRead: 6, rowsSkipped: 0 }, metadata: { Operator: 'Ö. N. <b>' },
  });
  const snap: SessionSnapshot = {
    traces: [t], roles: { 'tr-1': 'sample' }, sampleId: 'tr-1',
    reports: { 'tr-1': { fileName: 'odd.csv', sha256: 'ab'.repeat(32), format: 'test', rowsRead: 6, skipped: [], notices: ['a notice'], metadata: {} } },
    recipe: recipeOf('savitzky-golay', 'despike'), noiseSettings: { ...DEFAULT_NOISE_SETTINGS, quietRange: [2, 4] },
    peakSettings: { ...DEFAULT_PEAK_SETTINGS, minSnr: 5 }, decisions: { added: [3.5], removed: [2.5] },
    alternatives: [{ id: 'alt-1', label: 'moving average', recipe: recipeOf('moving-average') }],
    past: [recipeOf(), recipeOf('savitzky-golay')], future: [],
  };

  test('a whole session comes back from its file exactly: numbers bit for bit, stack, undo steps, quiet range, hand peaks, alternatives', () => {
    const text = sessionFileText(snap, new Date('2026-01-02T03:04:05Z'), 'Tracewright test');
    const parsed = JSON.parse(text);
    expect(parsed.format).toBe('tracewright-session-file');
    expect(parsed.caution).toMatch(/not a validated system/i);
    const out = sessionFromFileText(text, 'session.json');
    expect(out.ok, out.ok ? '' : out.problem).toBe(true);
    if (!out.ok) return;
    expect(out.notes).toEqual([]);
    const back = out.snapshot;
    expect(back.traces).toHaveLength(1);
    for (let i = 0; i < 6; i++) expect(Object.is(back.traces[0].y[i], t.y[i])).toBe(true);
    expect(Array.from(back.traces[0].x)).toEqual([1, 2, 3, 4, 5, 6]);
    expect(back.traces[0].metadata).toEqual(t.metadata);
    expect(back.traces[0].source).toEqual(t.source);
    expect(back.recipe).toEqual(snap.recipe);
    expect(back.past).toEqual(snap.past);
    expect(back.noiseSettings.quietRange).toEqual([2, 4]);
    expect(back.decisions).toEqual(snap.decisions);
    expect(back.alternatives).toEqual(snap.alternatives);
    expect(back.reports['tr-1'].notices).toEqual(['a notice']);
  });

  test('files that are not sessions, or are damaged, are refused by name and never throw', () => {
    const good = JSON.parse(sessionFileText(snap, new Date(0)));
    const cases: [string, RegExp][] = [
      ['', /empty/],
      ['{"steps": []', /not valid JSON/],
      [JSON.stringify({ format: 'tracewright-recipe', version: 1, steps: [] }), /not a session file saved by this page/],
      [JSON.stringify({ ...good, version: 99 }), /newer version/],
      [JSON.stringify({ ...good, numbers: undefined }), /incomplete/],
    ];
    for (const [text, want] of cases) {
      const out = sessionFromFileText(text, 'x.json');
      expect(out.ok).toBe(false);
      if (!out.ok) { expect(out.problem).toMatch(want); expect(out.problem.startsWith('x.json: ')).toBe(true); }
    }
    // Damaged numbers: the trace is left out with notes; nothing is made up.
    const broken = { ...good, numbers: { 'tr-1': { x: good.numbers['tr-1'].x, y: 'AAAA' } } };
    const out = sessionFromFileText(JSON.stringify(broken), 'x.json');
    expect(out.ok && out.snapshot.traces).toEqual([]);
    expect(out.ok && out.notes.join(' ')).toMatch(/not a whole number of 8-byte values/);
    // x no longer rising: the trace invariants are checked again.
    const swapped = { ...good, numbers: { 'tr-1': { x: float64ToBase64(Float64Array.from([1, 2, 3, 3, 5, 6])), y: good.numbers['tr-1'].y } } };
    const out2 = sessionFromFileText(JSON.stringify(swapped), 'x.json');
    expect(out2.ok && out2.snapshot.traces).toEqual([]);
    expect(out2.ok && out2.notes.join(' ')).toMatch(/not strictly ascending/);
  });
});
