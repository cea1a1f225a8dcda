import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { calNum } from '../../../src/core/export/report-calibration.ts';
import { useApp } from '../../../src/state/store.ts';
import { CurveCard, FLAG_SHORT } from '../../../src/ui/calibration/CurveCard.tsx';
import { useCalibrationView } from '../../../src/ui/calibration/derive.ts';
import { calibrationSetup, olsLine, resetStore, text } from '../harness.ts';

// src/ui/calibration/CurveCard.tsx: one named peak's calibration. Figures
// checked against an ordinary least-squares line computed here (olsLine,
// textbook formulas) and the ICH Q2(R1) limits DL = 3.3 σ/S, QL = 10 σ/S
// with σ the residual SD (the default setting "residual SD of the curve").
vi.mock('plotly.js-strict-dist-min', () => ({ default: {} }));
beforeEach(() => resetStore());

function card(): string {
  const Probe = () => {
    const v = useCalibrationView()!;
    return createElement(CurveCard, { cal: v.set.calibrations[0], exp: v.exp.calibrations[0], amount: v.sample?.amounts[0] ?? null });
  };
  return renderToStaticMarkup(createElement(Probe));
}

describe('CurveCard', () => {
  it('states the line, its residual SD and the limits in amount as least squares and ICH Q2(R1) give them', async () => {
    const { amounts, areas } = await calibrationSetup();
    const { b, sy } = olsLine(amounts, areas);
    const t = text(card(), true);
    expect(t).toContain('Lagoon Blue');
    expect(t).toContain(`residual SD ${calNum(sy)} with 2 degrees of freedom; calibrated range 1 – 8 mg/L`);
    expect(t).toContain(`Detection limit ${calNum(3.3 * sy / b)} mg/L and quantitation limit ${calNum(10 * sy / b)} mg/L in amount`);
    expect(t).toContain('(a figure only; it did not choose the curve)');
  });
  it('the S/N limits of the sample’s peak beside the limits in amount: detection 3, quantitation 10', async () => {
    await calibrationSetup();
    expect(text(card(), true)).toMatch(/beside the S\/N limits of this sample’s peak: detection S\/N 3, quantitation S\/N 10, this peak S\/N [\d.]+\./);
  });
  it('each standard read back through the curve with its deviation in %', async () => {
    const { amounts, areas } = await calibrationSetup();
    const { a, b } = olsLine(amounts, areas);
    const h = card();
    for (let i = 0; i < amounts.length; i++) {
      const back = (areas[i] - a) / b;
      expect(h).toContain(`<td>s${i + 1}.csv</td><td>${calNum(amounts[i])}</td><td>${calNum(areas[i])}</td><td>${calNum(back)}</td><td>${calNum((back - amounts[i]) / amounts[i] * 100)}</td>`);
    }
  });
  it('a sample above the highest standard is marked as such', async () => {
    await calibrationSetup();
    const s = useApp.getState();
    const t = s.standardsTable!;
    // Standards up to amount 0.4 only (areas scaled down alike, slope still 2): the demo peak (area about 1.6 mAU·min, so amount about 0.8) lies above them.
    useApp.getState().setStandardsTable({ ...t, rows: t.rows.map((r) => ({ ...r, amounts: r.amounts.map((v) => (v === null ? null : v / 20)) })) });
    useApp.getState().setStandardPeaks(Object.fromEntries(Object.entries(s.standardPeaks).map(([k, v]) => [k, v.ok ? { ok: true as const, peaks: v.peaks.map((p) => ({ ...p, area: p.area / 20 })) } : v])));
    expect(text(card())).toContain(FLAG_SHORT['extrapolated-above']);
  });
});
