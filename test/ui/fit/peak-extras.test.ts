import { createElement, type ReactNode } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { beforeEach, describe, expect, it } from 'vitest';
import { FIGURE_FORMULAS } from '../../../src/core/measure/figures.ts';
import { currentResult } from '../../../src/state/selectors.ts';
import { useApp } from '../../../src/state/store.ts';
import { num } from '../../../src/ui/format.ts';
import { FigureControls, usePeakExtras, type PeakExtras } from '../../../src/ui/fit/peak-extras.tsx';
import { requestFit } from '../../../src/ui/fit/fit-service.ts';
import { elements, html, loadDemoSample, resetStore, text, tree } from '../harness.ts';

// src/ui/fit/peak-extras.tsx: the peak table's optional columns.
beforeEach(() => resetStore());
function extras(): PeakExtras {
  let out!: PeakExtras;
  const Probe = () => { out = usePeakExtras(); return null; };
  renderToStaticMarkup(createElement(Probe));
  return out;
}
const cellText = (n: ReactNode[]) => n.map((c) => text(renderToStaticMarkup(createElement('i', null, c)))).join(' | ');

describe('usePeakExtras', () => {
  it('no columns by default', async () => {
    await loadDemoSample();
    expect(extras().headers).toEqual([]);
  });
  it('figure columns on the raw trace, each header with its formula; retention time of a row is its apex', async () => {
    await loadDemoSample();
    useApp.getState().setPeakSettings({ measureOn: 'raw' });
    useApp.getState().setShowFigures(true);
    const e = extras();
    expect(e.headers.length).toBeGreaterThan(0);
    for (const h of e.headers) expect(h.title).toBe(FIGURE_FORMULAS[h.key as keyof typeof FIGURE_FORMULAS].formula);
    expect(e.headers[0].key).toBe('retentionTime');
    const peaks = currentResult(useApp.getState())!.peaks;
    const i = peaks.findIndex((p) => Math.abs(p.x - 4.3) < 0.05);
    const t = cellText(e.cells(peaks[i], i));
    expect(Math.abs(Number(t.split(' | ')[0]) - 4.3)).toBeLessThan(0.01); // demo-truth.json: centre 4.3 min
  });
  it('a row inside a fitted region shows the fitted area ± SE; a row outside says “not fitted”', async () => {
    await loadDemoSample();
    useApp.getState().setMarkedRange([3.8, 4.8]);
    useApp.getState().setFitChoices({ maxPeaks: 1 });
    await requestFit();
    const e = extras();
    expect(e.headers.map((h) => h.label)).toEqual(['Fitted area ± SE']);
    const peaks = currentResult(useApp.getState())!.peaks;
    const i = peaks.findIndex((p) => Math.abs(p.x - 4.3) < 0.05);
    const j = peaks.findIndex((p) => Math.abs(p.x - 1.2) < 0.05);
    const a = useApp.getState().fits[0].result.fit.peaks[0].area;
    expect(cellText(e.cells(peaks[i], i))).toBe(`${num(a.value)} ± ${num(a.se, 2)}`);
    expect(cellText(e.cells(peaks[j], j))).toBe('not fitted');
  });
});

describe('FigureControls', () => {
  it('the switch; the dead time field only when figures are shown, with the x unit; zero or empty means none', async () => {
    await loadDemoSample();
    expect(text(html(FigureControls))).toBe('chromatography figures');
    useApp.getState().setShowFigures(true);
    expect(text(html(FigureControls))).toContain('dead time t_M (min)');
    const input = () => elements(tree(FigureControls)).find((e) => e.props['data-testid'] === 'dead-time')!;
    (input().props.onChange as (e: unknown) => void)({ target: { value: '0.8' } });
    expect(useApp.getState().deadTime).toBe(0.8);
    (input().props.onChange as (e: unknown) => void)({ target: { value: '0' } });
    expect(useApp.getState().deadTime).toBeNull();
  });
});
