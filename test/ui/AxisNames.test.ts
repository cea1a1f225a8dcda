import { beforeEach, describe, expect, it } from 'vitest';
import { useApp } from '../../src/state/store.ts';
import { AxisNames } from '../../src/ui/AxisNames.tsx';
import { demoBytes, elements, html, resetStore, tree } from './harness.ts';
import { service } from '../../src/state/service.ts';

// src/ui/AxisNames.tsx: rename the axes and units of a trace; only the words change.
beforeEach(() => resetStore());
const sample = () => { const s = useApp.getState(); return s.traces.find((t) => t.id === s.sampleId)!; };

describe('AxisNames', () => {
  it('four labelled fields filled with the trace’s names and units', async () => {
    await service.loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv');
    const t = sample();
    const h = html(AxisNames, { trace: t, onClose: () => {} });
    expect(h).toContain(`aria-label="Axis names and units of ${t.name}"`);
    for (const [label, key] of [['x name', 'xName'], ['x unit', 'xUnit'], ['y name', 'yName'], ['y unit', 'yUnit']] as const) {
      expect(h).toContain(`<span>${label}</span><input type="text" data-testid="axis-${key}" maxLength="80" value="${t[key]}"/>`);
    }
    expect(t.xUnit).toBe('min'); // demo-truth.json x.unit
  });
  it('Apply: names stored, the numbers untouched, a notice says only the words changed; the form closes', async () => {
    await service.loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv');
    const t = { ...sample(), xName: '  ', xUnit: ' s ', yName: 'Absorbance', yUnit: '' }; // what the user typed
    const y = sample().y;
    let closed = 0;
    const form = elements(tree(AxisNames, { trace: t, onClose: () => { closed++; } })).find((e) => e.type === 'form')!;
    (form.props.onSubmit as (e: unknown) => void)({ preventDefault() {} });
    const after = sample();
    expect([after.xName, after.xUnit, after.yName, after.yUnit]).toEqual(['x', 's', 'Absorbance', '']);
    expect(after.y).toBe(y);
    const n = useApp.getState().notices[0];
    expect(n.title).toBe(`Axes of ${t.name} renamed`);
    expect(n.lines[0]).toBe('x: x (s); y: Absorbance, no unit. Only the words changed; the numbers are as loaded. Exports from now on carry these names.');
    expect(closed).toBe(1);
  });
});
