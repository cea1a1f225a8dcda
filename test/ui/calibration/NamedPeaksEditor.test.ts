import { beforeEach, describe, expect, it } from 'vitest';
import { useApp } from '../../../src/state/store.ts';
import { NamedPeaksEditor } from '../../../src/ui/calibration/NamedPeaksEditor.tsx';
import { elements, html, loadDemoSample, press, resetStore, text, tree } from '../harness.ts';

// src/ui/calibration/NamedPeaksEditor.tsx: the named-peak table; found and
// missing in the sample (the invented demo: peaks at 1.2, 2.6, 4.3, 6.0,
// 6.35 and 8.5 min, demo-truth.json).
beforeEach(() => resetStore());
const loadCsv = async (name: string, body: string) => {
  const input = elements(tree(NamedPeaksEditor)).find((e) => e.type === 'input' && e.props.type === 'file')!;
  (input.props.onChange as (e: unknown) => void)({ target: { files: [{ name, text: async () => body }], value: 'x' } });
  await new Promise((r) => setTimeout(r, 20));
};

describe('NamedPeaksEditor', () => {
  it('empty: says how to name a peak (click, or a CSV with name, position, window)', () => {
    expect(text(html(NamedPeaksEditor))).toContain('No named peaks. Click “Name a peak by clicking it” and then a peak on the plot, or load a CSV with the columns name, position and window.');
  });
  it('the naming button switches the click mode and says so', () => {
    press(tree(NamedPeaksEditor), 'Name a peak by clicking it');
    expect(useApp.getState().namePickMode).toBe(true);
    expect(text(html(NamedPeaksEditor))).toContain('Naming: click a peak on the plot');
  });
  it('a bad CSV: an error naming the file and the line, the table unchanged', async () => {
    await loadCsv('names.csv', 'name,position,window\nOrchard Red,1.2,0.05\nLagoon Blue,four,0.05\n');
    const n = useApp.getState().notices[0];
    expect(n.kind).toBe('error');
    expect(n.title).toBe('names.csv: the named peaks were not loaded');
    expect(n.lines.join(' ')).toMatch(/line 3/i);
    expect(n.lines).toContain('The named-peak table is unchanged.');
    expect(useApp.getState().namedPeaks.peaks).toEqual([]);
  });
  it('a good CSV over the demo: each named peak found at its position, a missing one named', async () => {
    await loadDemoSample();
    await loadCsv('names.csv', 'name,position,window\nOrchard Red,1.2,0.05\nLagoon Blue,4.3,0.05\nNot there,3.5,0.05\n');
    expect(useApp.getState().notices[0].title).toBe('Named peaks loaded from names.csv');
    const h = html(NamedPeaksEditor);
    const t = text(h, true);
    expect(t).toContain('Expected position (min)');
    const found = [...t.matchAll(/found at ([\d.]+)/g)].map((m) => Number(m[1]));
    expect(found).toHaveLength(2);
    expect(Math.abs(found[0] - 1.2)).toBeLessThan(0.01);
    expect(Math.abs(found[1] - 4.3)).toBeLessThan(0.01);
    expect(t).toContain('Missing in this sample: Not there.');
    expect(h).toContain('value="Orchard Red"');
  });
  it('a table with a problem shows it as an alert', () => {
    useApp.getState().setNamedPeaks({ ...useApp.getState().namedPeaks, peaks: [{ name: 'A', position: 1, window: 0.1 }, { name: 'A', position: 2, window: 0.1 }] });
    expect(html(NamedPeaksEditor)).toMatch(/<p class="step-problem" role="alert">[^<]*A[^<]*<\/p>/);
  });
});
