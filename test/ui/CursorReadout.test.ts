import { beforeEach, describe, expect, it } from 'vitest';
import { service } from '../../src/state/service.ts';
import { useApp } from '../../src/state/store.ts';
import { CursorReadout } from '../../src/ui/CursorReadout.tsx';
import { demoBytes, html, press, resetStore, text, tree } from './harness.ts';

// src/ui/CursorReadout.tsx: values under the mouse and a two-point measure.
// What it reads follows mouse events on the drawn figure (effects a static
// render does not run); the nearest-point and two-point arithmetic it uses
// is tested in plot-view.test.ts, the readout in the browser by e2e specs.
// Here: what it says before the mouse moves, and the measure switch.
beforeEach(() => resetStore());

describe('CursorReadout', () => {
  it('nothing without a sample', () => {
    expect(html(CursorReadout, { figure: null })).toBe('');
  });
  it('tells how to read values: nearest point of each line, all points, not only those drawn', async () => {
    await service.loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv');
    const h = html(CursorReadout, { figure: null });
    expect(text(h)).toContain('Move the mouse over the plot to read values (nearest point of each line, all points, not only those drawn).');
    expect(h).toContain('aria-pressed="false"');
    expect(text(h)).toContain('Measure between two points');
  });
  it('the measure switch turns measuring on (and add-peak mode off) and says what to click', async () => {
    await service.loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv');
    useApp.getState().setAddPeakMode(true);
    press(tree(CursorReadout, { figure: null }), 'Measure between two points');
    expect(useApp.getState().measureMode).toBe(true);
    expect(useApp.getState().addPeakMode).toBe(false);
    const t = text(html(CursorReadout, { figure: null }));
    expect(t).toContain('Measuring: click two points');
    expect(t).toContain('Click the first point on the plot (the nearest point of the processed line is taken).');
    press(tree(CursorReadout, { figure: null }), 'Measuring: click two points');
    expect(useApp.getState().measureMode).toBe(false);
  });
});
