import { beforeEach, describe, expect, it } from 'vitest';
import { service } from '../../../src/state/service.ts';
import { useApp } from '../../../src/state/store.ts';
import { ScanAlignment } from '../../../src/ui/steps/ScanAlignment.tsx';
import { demoBytes, html, press, resetStore, text, tree } from '../harness.ts';

// src/ui/steps/ScanAlignment.tsx: each repeated scan's shift and correlation, one click to leave a scan out.
beforeEach(() => resetStore());

async function scans(n: number) {
  await service.loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv');
  for (let i = 1; i <= n; i++) await service.loadBytes(demoBytes(`demo-scan-${i}.csv`), `demo-scan-${i}.csv`, { roles: ['scan'], quiet: true });
  const s = useApp.getState();
  return s.traces.filter((t) => s.roles[t.id] === 'scan');
}

describe('ScanAlignment', () => {
  it('a row per scan in load order: shift in points and in x-units, r, and a scan under the limit named', async () => {
    const list = await scans(3);
    const props = { shifts: new Float64Array([0, -1.5, 2]), correlations: new Float64Array([0.998, 0.95, 0.4]), minCorrelation: 0.9, dx: 0.01, xUnit: 'min' };
    const h = html(ScanAlignment, props);
    expect(text(h)).toContain('Repeated scans against the signal scan shift: points (min) r');
    const rows = h.split('<tr').slice(2).map((r) => text(`<tr${r}`));
    expect(rows).toEqual([
      `${list[0].name} 0.00 (0) 0.998 leave out`,
      `${list[1].name} -1.50 (-0.015) 0.950 leave out`,
      `${list[2].name} 2.00 (0.02) 0.400 below 0.9 leave out`,
    ]);
    expect(h.match(/class="warn-text"/g)).toHaveLength(1);
  });
  it('a scan whose correlation could not be measured is shown as a dash and named as poor; no x shift without a spacing', async () => {
    await scans(1);
    const h = html(ScanAlignment, { shifts: new Float64Array([Number.NaN]), correlations: new Float64Array([Number.NaN]), minCorrelation: 0.9, dx: null, xUnit: '' });
    expect(text(h)).toContain('shift: points (x)');
    expect(text(h)).toMatch(/ — — below 0\.9 leave out$/);
  });
  it('figures for a different number of scans than the list holds: nothing shown rather than rows put against the wrong scans', async () => {
    await scans(2);
    expect(html(ScanAlignment, { shifts: new Float64Array([0]), correlations: new Float64Array([1]), minCorrelation: 0.9, dx: 0.01, xUnit: 'min' })).toBe('');
  });
  it('leave out sets that scan aside (role “ignore”), nothing else', async () => {
    const list = await scans(2);
    press(tree(ScanAlignment, { shifts: new Float64Array([0, 0]), correlations: new Float64Array([1, 1]), minCorrelation: 0.9, dx: 0.01, xUnit: 'min' }), `Leave out the scan ${list[1].name}`);
    const roles = useApp.getState().roles;
    expect([roles[list[0].id], roles[list[1].id]]).toEqual(['scan', 'ignore']);
    expect(useApp.getState().traces).toHaveLength(3);
  });
});
