import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { beforeEach, describe, expect, it } from 'vitest';
import type { Peak } from '../../../src/core/measure/peak-types.ts';
import { currentResult } from '../../../src/state/selectors.ts';
import { loadBytes } from '../../../src/state/service.ts';
import { useApp } from '../../../src/state/store.ts';
import { useCalibrationView, useNameOfPeak, useSampleNaming, useSampleResult } from '../../../src/ui/calibration/derive.ts';
import { emptyStandards, withAmount, withUnit } from '../../../src/ui/calibration/standards-edit.ts';
import { demoBytes, loadDemoSample, resetStore } from '../harness.ts';

// src/ui/calibration/derive.ts: what the page derives from the calibration
// slice, read through its hooks in a probe component rendered once.
function read<T>(hook: () => T): T {
  let out!: T;
  const Probe = () => { out = hook(); return null; };
  renderToStaticMarkup(createElement(Probe));
  return out;
}
const named = (peaks: { name: string; position: number; window: number }[]) => useApp.getState().setNamedPeaks({ ...useApp.getState().namedPeaks, peaks, xUnit: 'min' });

beforeEach(() => resetStore());

describe('useSampleResult / useSampleNaming / useNameOfPeak', () => {
  it('nothing before the sample is measured or while no peak is named', async () => {
    expect(read(useSampleResult)).toBeNull();
    expect(read(useSampleNaming)).toBeNull();
    await loadDemoSample();
    expect(read(useSampleResult)).toBe(currentResult(useApp.getState()));
    expect(read(useSampleNaming)).toBeNull();
    expect(read(useNameOfPeak).size).toBe(0);
  });
  it('names the demo peaks inside their windows (true centres 1.2 and 4.3 min, demo-truth.json) and no other', async () => {
    await loadDemoSample();
    named([{ name: 'Orchard Red', position: 1.2, window: 0.05 }, { name: 'Lagoon Blue', position: 4.3, window: 0.05 }]);
    const peaks = currentResult(useApp.getState())!.peaks;
    const naming = read(useSampleNaming)!;
    expect(naming.names).toHaveLength(peaks.length);
    const byName = read(useNameOfPeak);
    const named2 = [...byName.entries()].map(([p, n]) => [n, Math.round(p.x * 10) / 10]);
    expect(named2.sort()).toEqual([['Lagoon Blue', 4.3], ['Orchard Red', 1.2]]);
    for (const p of byName.keys()) expect(peaks).toContain(p); // the result's own objects
  });
  it('a named-peak table with problems names nothing (no half-valid naming)', async () => {
    await loadDemoSample();
    named([{ name: 'A', position: 1.2, window: 0.05 }, { name: 'A', position: 4.3, window: 0.05 }]); // the same name twice
    expect(read(useSampleNaming)).toBeNull();
  });
});

describe('useCalibrationView', () => {
  // Invented standards: area = 2 × amount exactly (so any fitted model gives amount = area / 2).
  async function standards(problemIn?: string) {
    await loadDemoSample();
    named([{ name: 'A', position: 4.3, window: 0.05 }]);
    let table = withUnit(emptyStandards(['A']), 'A', 'mg/L');
    const amounts = [1, 2, 4, 8];
    for (let i = 0; i < amounts.length; i++) {
      await loadBytes(demoBytes('demo-blank.csv'), `s${i + 1}.csv`, { roles: ['standard'], quiet: true });
      table = withAmount(table, `s${i + 1}.csv`, 'A', amounts[i]);
    }
    useApp.getState().setStandardsTable(table);
    const s = useApp.getState();
    const std = s.traces.filter((t) => s.roles[t.id] === 'standard');
    useApp.getState().setStandardPeaks(Object.fromEntries(std.map((t, i) => [t.id, t.source.fileName === problemIn
      ? { ok: false as const, problem: 'the trace is flat' }
      : { ok: true as const, peaks: [{ x: 4.3, height: amounts[i], area: 2 * amounts[i], fwhm: 0.2 } as unknown as Peak] }])));
  }
  it('null without a standards table', async () => {
    await loadDemoSample();
    named([{ name: 'A', position: 4.3, window: 0.05 }]);
    expect(read(useCalibrationView)).toBeNull();
  });
  it('the sample’s amount is its response read back through the curve, in the table’s unit', async () => {
    await standards();
    const v = read(useCalibrationView)!;
    expect(v.standardProblems).toEqual([]);
    expect(v.set.calibrations).toHaveLength(1);
    const a = v.sample!.amounts[0];
    const peak = currentResult(useApp.getState())!.peaks[a.peakIndex!];
    expect(a.status).toBe('measured');
    expect(a.amountUnit).toBe('mg/L');
    expect(a.estimate!.amount!).toBeCloseTo(peak.area / 2, 6);
    expect(v.exp.samples).toHaveLength(1);
  });
  it('a standard whose peaks could not be measured is named with why, and left out of the curve', async () => {
    await standards('s2.csv');
    const v = read(useCalibrationView)!;
    expect(v.standardProblems).toHaveLength(1);
    expect(v.standardProblems[0]).toMatch(/s2\.csv.*: peaks could not be measured \(the trace is flat\)$/);
    expect(v.set.standardNaming.map((s) => s.trace)).not.toContain('s2.csv');
  });
});
