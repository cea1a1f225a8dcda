import { beforeEach, describe, expect, it } from 'vitest';
import { service } from '../../src/state/service.ts';
import { useApp } from '../../src/state/store.ts';
import { TraceList, VIRTUAL_FROM } from '../../src/ui/TraceList.tsx';
import { demoBytes, elements, html, press, resetStore, text, tree } from './harness.ts';

// src/ui/TraceList.tsx: loaded traces, what each one is, and long lists drawn in part.
beforeEach(() => resetStore());

/** A delimited file with `n` y columns c1…cn over 10 rows (invented numbers). */
const wide = (n: number) => new TextEncoder().encode([
  ['t', ...Array.from({ length: n }, (_, k) => `c${k + 1}`)].join(','),
  ...Array.from({ length: 10 }, (_, i) => [i, ...Array.from({ length: n }, (_, k) => (i * (k + 1)) % 7)].join(',')),
].join('\n') + '\n');
/** The rows of the list (the TraceRow elements), rendered. */
const rows = () => elements(tree(TraceList)).filter((e) => typeof e.type === 'function');

describe('TraceList', () => {
  it('nothing loaded: says so', () => {
    expect(text(html(TraceList))).toBe('Traces Nothing loaded.');
  });
  it('a trace with its points and role; the roles in plain words', async () => {
    await service.loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv');
    await service.loadBytes(demoBytes('demo-blank.csv'), 'demo-blank.csv', { roles: ['blank'] });
    const h = html(TraceList);
    const t = text(h);
    expect(t).toContain('Traces (2)');
    expect(t).toContain('demo-sample.csv: Absorbance 520 nm 1,201 points'); // demo-truth.json x.points
    for (const r of ['sample (processed)', 'blank', 'repeated scan', 'standard (known amounts)', 'set aside']) expect(h).toContain(`>${r}</option>`);
    expect(h).toContain('<option value="blank" selected="">blank</option>');
  });
  it('unload removes that trace only', async () => {
    await service.loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv');
    await service.loadBytes(demoBytes('demo-blank.csv'), 'demo-blank.csv', { roles: ['blank'] });
    const blank = useApp.getState().traces[1];
    const row = rows()[1];
    press(tree(row.type as (p: object) => ReturnType<typeof tree>, row.props), `Unload ${blank.name}`);
    expect(useApp.getState().traces.map((t) => t.name)).toEqual([useApp.getState().traces[0].name]);
    expect(useApp.getState().traces[0].name).toContain('demo-sample.csv');
  });
  it('several traces from one file go by their column name, with the file named beside', async () => {
    await service.loadBytes(wide(3), 'wide.csv');
    const t = text(html(TraceList));
    expect(t).toMatch(/c1 wide\.csv · 10 points/);
    expect(t).toMatch(/c3 wide\.csv · 10 points/);
  });
  it(`a long list (over ${VIRTUAL_FROM}) offers a filter and roles for all shown, and draws only the rows in view with spacers`, async () => {
    await service.loadBytes(wide(45), 'wide.csv');
    const h = html(TraceList);
    expect(text(h)).toContain('all 45 shown');
    expect(h).toContain('trace-list-virtual');
    const drawn = (h.match(/<li class="trace-item/g) ?? []).length;
    expect(drawn).toBeLessThan(45);
    expect(drawn).toBeGreaterThanOrEqual(Math.ceil(330 / 58)); // at least the rows of the window (330 px of 58 px rows)
    expect(h).toMatch(/class="trace-spacer"/);
    press(tree(TraceList), 'set all shown aside');
    const s = useApp.getState();
    expect(s.traces.filter((t) => s.roles[t.id] === 'ignore')).toHaveLength(44); // all but the sample
    expect(s.roles[s.sampleId!]).toBe('sample');
  });
});
