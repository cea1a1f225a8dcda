import { beforeEach, describe, expect, it, vi } from 'vitest';
import { currentResult } from '../../../src/state/selectors.ts';
import { useApp } from '../../../src/state/store.ts';
import { CalibrationPanel } from '../../../src/ui/calibration/CalibrationPanel.tsx';
import { calibrationSetup, html, olsLine, press, resetStore, text, tree } from '../harness.ts';

// src/ui/calibration/CalibrationPanel.tsx: from peak to amount. The sample's
// amount is checked against an ordinary least-squares line computed here
// (textbook formulas, olsLine in the harness); the limits' wording against
// ICH Q2(R1) (DL = 3.3 σ/S, QL = 10 σ/S).
vi.mock('plotly.js-strict-dist-min', () => ({ default: {} }));
const saved: { name: string; text: string }[] = [];
vi.mock('../../../src/ui/export/download.ts', () => ({
  downloadText: (text: string, name: string) => { saved.push({ name, text }); },
  downloadCsv: (text: string, name: string) => { saved.push({ name, text }); },
}));
beforeEach(() => { resetStore(); saved.length = 0; });

describe('CalibrationPanel', () => {
  it('before named peaks and amounts: says what is needed', () => {
    expect(text(html(CalibrationPanel))).toContain('Name the peaks and give the standards’ amounts to calibrate.');
  });
  it('the sample’s amount is its area read back through the least-squares line, in the table’s unit, with the limits stated as ICH Q2(R1)', async () => {
    const { amounts, areas } = await calibrationSetup();
    const { a, b } = olsLine(amounts, areas);
    const peak = currentResult(useApp.getState())!.peaks.find((p) => Math.abs(p.x - 4.3) < 0.05)!;
    const expected = (peak.area - a) / b;
    const h = html(CalibrationPanel);
    const t = text(h);
    expect(t).toContain('Limits in amount: DL = 3.3 σ/S and QL = 10 σ/S (ICH Q2(R1)), S the slope.');
    expect(t).toContain('Amounts in demo-sample.csv');
    const shown = Number(/data-name="Lagoon Blue"><td>Lagoon Blue<\/td><td data-role="amount" data-value="([^"]+)"/.exec(h)![1]);
    expect(shown).toBeCloseTo(expected, 6);
    expect(t).toContain('95 % interval');
    expect(t).toMatch(/mg\/L/);
  });
  it('exports named after the sample file; the JSON carries the amount the page shows', async () => {
    await calibrationSetup();
    press(tree(CalibrationPanel), 'Amounts (CSV)');
    press(tree(CalibrationPanel), 'Calibration (JSON)');
    expect(saved.map((s) => s.name)).toEqual(['demo-sample-amounts.csv', 'demo-sample-calibration.json']);
    const h = html(CalibrationPanel);
    const shown = Number(/data-role="amount" data-value="([^"]+)"/.exec(h)![1]);
    expect(saved[0].text).toContain('Lagoon Blue');
    const numbers: number[] = [];
    const walk = (v: unknown): void => { if (typeof v === 'number') numbers.push(v); else if (v && typeof v === 'object') Object.values(v).forEach(walk); };
    walk(JSON.parse(saved[1].text));
    expect(numbers.some((v) => Math.abs(v - shown) <= 1e-9 * Math.abs(shown))).toBe(true);
  });
  it('a standard whose peaks could not be measured is an alert naming it', async () => {
    await calibrationSetup();
    const s = useApp.getState();
    const id = s.traces.find((t) => s.roles[t.id] === 'standard')!.id;
    useApp.getState().setStandardPeaks({ ...s.standardPeaks, [id]: { ok: false, problem: 'no peak above the detection limit' } });
    expect(html(CalibrationPanel)).toMatch(/role="alert">s1\.csv[^<]*: peaks could not be measured \(no peak above the detection limit\)</);
  });
});
