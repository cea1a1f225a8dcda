/**
 * Fits and the loss check (issue 18): a ledger row inside a fitted region
 * carries the fit's count on each version, worded as the issue asks ("2
 * peaks supported by the fit on raw, not after …"); rows outside any region
 * and fits without a processing check get nothing; the newest covering fit
 * wins; the report's loss section lists the rows. Invented traces: a
 * Gaussian at 5.2 (height 1) with a shoulder at 5.52 (height 0.3), FWHM
 * 0.235, on a sloped baseline with seeded noise σ 0.03.
 */
import { describe, expect, it } from 'vitest';
import { runFitJob } from '../../../../src/core/measure/fit/job.ts';
import { ledgerFitLines, ledgerFitNote } from '../../../../src/core/measure/fit/ledger-fit.ts';
import { FWHM_PER_SIGMA, SHAPES } from '../../../../src/core/measure/fit/shapes.ts';
import { makeRng } from '../../../../src/core/numeric/random.ts';
import { reportHtml } from '../../../../src/core/export/report-html.ts';
import { emptyRecipe } from '../../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../../src/core/steps/registry.ts';
import { analysed, inventedTrace } from '../../export/helpers.ts';

const x = Float64Array.from({ length: 500 }, (_, i) => 3 + i * 0.01);
function trace(peaks: [number, number][], seed: number): Float64Array {
  const rng = makeRng(seed);
  const y = x.map((v) => 0.2 + 0.05 * (v - 3));
  for (const [c, h] of peaks) SHAPES.gaussian.evaluate(x, [c, h, 0.1 * FWHM_PER_SIGMA], 0, y, null, 0);
  return y.map((v) => v + 0.03 * rng.normal());
}

function fit(from: number, to: number, alternatives: { label: string; y: Float64Array }[]) {
  const out = runFitJob({
    settings: { from, to, on: 'raw', shape: 'gaussian', baseline: 'line', maxPeaks: 3 },
    raw: { label: 'raw', x, y: trace([[5.2, 1], [5.52, 0.3]], 9) },
    alternatives: alternatives.map((a) => ({ label: a.label, x, y: a.y })),
  });
  if (!out.ok) throw new Error(out.message);
  return out.result;
}

describe('ledger rows and region fits', () => {
  // Stand-in for a processing that erased the shoulder: the same noise, the shoulder left out.
  const lostShoulder = { label: '7-point average', y: trace([[5.2, 1]], 9) };
  const kept = { label: 'gentle step', y: trace([[5.2, 1], [5.52, 0.3]], 9) };

  it('the shoulder’s row: supported by the fit on raw, not after the processing that erased it', () => {
    const r = fit(3, 8, [lostShoulder, kept]);
    expect(r.count).toBe(2);
    const note = ledgerFitNote(5.52, [{ result: r }]);
    expect(note).not.toBe(null);
    expect(note!.text).toBe('Fit 1 (3–8, gaussian): 2 peaks supported by the fit on raw, not after 7-point average (1).');
    expect(note!.fewer).toBe(true);
    expect(note!.brief).toBe('Fit 1: 2 peaks supported by the fit on raw, not after 7-point average (1).');
    expect(note!.counts).toEqual([{ label: 'raw', count: 2 }, { label: '7-point average', count: 1 }, { label: 'gentle step', count: 2 }]);
  });

  it('outside every region, or a fit without versions to compare: nothing; the newest covering fit wins; a stale fit says so', () => {
    const old = fit(3, 8, [kept]);
    const newer = fit(4.5, 6.5, [lostShoulder]);
    expect(ledgerFitNote(2, [{ result: old }])).toBe(null);
    const alone = runFitJob({ settings: { from: 3, to: 8, on: 'raw', shape: 'gaussian', baseline: 'line', maxPeaks: 2 }, raw: { label: 'raw', x, y: kept.y } });
    if (!alone.ok) throw new Error(alone.message);
    expect(alone.result.processing).toBe(null);
    expect(ledgerFitNote(5.2, [{ result: alone.result }])).toBe(null);
    const both = [{ result: old }, { result: newer, outOfDate: true }];
    expect(ledgerFitNote(5.2, both)!.fitNumber).toBe(2);
    expect(ledgerFitNote(5.2, both)!.text).toMatch(/^Fit 2 \(4\.5–6\.5, gaussian\): 2 peaks supported by the fit on raw, not after 7-point average \(1\)\. \(made with an earlier step stack\)$/);
    expect(ledgerFitNote(7, both)!.text).toMatch(/^Fit 1 .*Every version that could be fitted supports at least the 2 peaks found on raw\.$/);
    expect(ledgerFitNote(7, both)!.brief).toBe('Fit 1: 2 peaks on raw, no fewer after any processing.');
    expect(ledgerFitLines([2, 5.52], both)).toEqual([`Feature at 5.52: ${ledgerFitNote(5.52, both)!.text}`]);
  });

  it('the report’s loss section lists the ledger rows inside a fitted region', () => {
    const t = inventedTrace({ fileName: 'run.csv' });
    const result = analysed(t, emptyRecipe());
    const r = fit(3, 8, [lostShoulder]);
    const html = reportHtml({ trace: t, result, recipe: emptyRecipe(), registry: STEP_REGISTRY, now: new Date(0), fits: [{ madeAt: 'then', result: r }],
      ledger: { sentences: ['A feature weakened.'], rows: [{ position: 5.52 }, { position: 9 }] } });
    expect(html).toContain('data-role="ledger-fits"');
    expect(html).toContain('Feature at 5.52: Fit 1 (3–8, gaussian): 2 peaks supported by the fit on raw, not after 7-point average (1).');
    expect(html).not.toContain('Feature at 9:');
  });
});
