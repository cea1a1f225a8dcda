import { beforeEach, describe, expect, it } from 'vitest';
import { service } from '../../../src/state/service.ts';
import { useApp } from '../../../src/state/store.ts';
import { StandardsEditor } from '../../../src/ui/calibration/StandardsEditor.tsx';
import { withAmount, withUnit, emptyStandards } from '../../../src/ui/calibration/standards-edit.ts';
import { button, demoBytes, elements, html, resetStore, text, tree } from '../harness.ts';

// src/ui/calibration/StandardsEditor.tsx: the standards and their known amounts.
beforeEach(() => resetStore());
const named = (...names: string[]) => useApp.getState().setNamedPeaks({ ...useApp.getState().namedPeaks, peaks: names.map((name, i) => ({ name, position: i + 1, window: 0.1 })) });

describe('StandardsEditor', () => {
  it('no standard yet: says how to get one', () => {
    expect(text(html(StandardsEditor))).toContain('No trace is a standard. Load standard runs here, or set a loaded trace’s role to “standard” in the trace list.');
  });
  it('a grid: one row per standard trace (by its file name), one column per named peak with its unit, and how many peaks each has', async () => {
    named('Orchard Red', 'Lagoon Blue');
    await service.loadBytes(demoBytes('demo-scan-1.csv'), 'std-a.csv', { roles: ['standard'] });
    await service.loadBytes(demoBytes('demo-scan-2.csv'), 'std-b.csv', { roles: ['standard'] });
    let t = withUnit(emptyStandards(['Orchard Red', 'Lagoon Blue']), 'Orchard Red', 'mg/L');
    t = withAmount(withAmount(t, 'std-a.csv', 'Orchard Red', 2.5), 'std-gone.csv', 'Lagoon Blue', 1);
    useApp.getState().setStandardsTable(t);
    const ida = useApp.getState().traces[0].id;
    useApp.getState().setStandardPeaks({ [ida]: { ok: true, peaks: [] } });
    const h = html(StandardsEditor);
    expect(h).toContain('aria-label="Amount of Orchard Red in std-a.csv" value="2.5"');
    expect(h).toContain('aria-label="Amount unit of Orchard Red" placeholder="unit" size="5" value="mg/L"');
    const rows = h.split('<tbody>')[1].split('</tbody>')[0].split('<tr').slice(1).map((r) => text(`<tr${r}`));
    // std-b.csv has no row in the table yet, so it goes by its full trace name until an amount is typed.
    expect(rows).toEqual(['std-a.csv 0 peaks', `${useApp.getState().traces[1].name} …`, 'std-gone.csv no trace loaded']);
  });
  it('typing an amount sets that cell only; clearing it leaves the cell empty (null), never 0', async () => {
    named('A');
    await service.loadBytes(demoBytes('demo-scan-1.csv'), 'std-a.csv', { roles: ['standard'] });
    const key = useApp.getState().traces[0].name; // no row yet: the full trace name
    const cell = () => elements(tree(StandardsEditor)).find((e) => e.props['aria-label'] === `Amount of A in ${key}`)!;
    (cell().props.onChange as (e: unknown) => void)({ target: { value: '4', valueAsNumber: 4 } });
    expect(useApp.getState().standardsTable!.rows).toEqual([{ standard: key, line: null, amounts: [4] }]);
    (cell().props.onChange as (e: unknown) => void)({ target: { value: '', valueAsNumber: Number.NaN } });
    expect(useApp.getState().standardsTable!.rows[0].amounts).toEqual([null]);
  });
  it('the pasted-cells button is disabled while nothing is pasted', () => {
    expect(button(tree(StandardsEditor), 'Read the pasted cells').props.disabled).toBe(true);
  });
  it('a bad amounts file: an error naming the file and the line; the table unchanged', async () => {
    named('A');
    const input = elements(tree(StandardsEditor)).find((e) => e.props['data-testid'] === 'amounts-input')!;
    (input.props.onChange as (e: unknown) => void)({ target: { files: [{ name: 'amounts.csv', text: async () => 'standard,A (mg/L)\ns1.csv,1\ns2.csv,lots\n' }], value: 'x' } });
    await new Promise((r) => setTimeout(r, 20));
    const n = useApp.getState().notices[0];
    expect(n.title).toBe('amounts.csv: the amounts were not read');
    expect(n.lines.join(' ')).toMatch(/line 3/i);
    expect(n.lines).toContain('The amounts table is unchanged.');
    expect(useApp.getState().standardsTable).toBeNull();
  });
});
