/**
 * src/cli/fits.ts: the fit options' values as a run uses them, and the
 * region fits of one analysed trace. Outside references: a Gaussian's area
 * h·σ·√(2π) and FWHM 2√(2 ln 2)·σ (any handbook; the definition of the
 * normal density), checked within 3 standard errors on a seeded invented
 * trace; the defaults are the page's fit panel's (src/state/fit-slice.ts).
 * The run's end-to-end use of the fits (summary, peak CSV, report) is in
 * test/cli/fit.test.ts.
 */
import { describe, expect, test } from 'vitest';
import { CLI_FIT_DEFAULTS, CLI_PROCESSED_LABEL, fitChoicesFromArgs, fitsForTrace, type CliFitOptions } from '../../src/cli/fits.ts';
import { analyse } from '../../src/core/analysis/index.ts';
import { emptyRecipe, makeRecipeStep } from '../../src/core/method.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { STEP_REGISTRY, stepDefinition } from '../../src/core/steps/registry.ts';
import { createTrace, type Trace } from '../../src/core/trace.ts';
import { DEFAULT_FIT_CHOICES } from '../../src/state/fit-slice.ts';

const none = { shape: null, baseline: null, peaks: null, on: null };

/** One Gaussian (h 2, centre 5, σ 0.1) on a sloping line, noise SD 0.02, 0.01 x-units per point; seeded. */
function trace(): Trace {
  const rng = makeRng(18);
  const x = Array.from({ length: 1001 }, (_, i) => i * 0.01);
  const y = x.map((t) => 0.3 + 0.01 * t + 2 * Math.exp(-0.5 * ((t - 5) / 0.1) ** 2) + 0.02 * rng.normal());
  return createTrace({ name: 'one peak', x, y, source: { fileName: 'one.csv', sha256: '0'.repeat(64), rowsRead: x.length, rowsSkipped: 0 } });
}

function analysed(t: Trace, withStep: boolean) {
  const recipe = emptyRecipe();
  if (withStep) recipe.steps.push(makeRecipeStep(stepDefinition('moving-average')!, { window: 3 }));
  return analyse({ sampleId: t.id, scanIds: [], recipe }, new Map([[t.id, t]]), STEP_REGISTRY);
}

describe('fitChoicesFromArgs', () => {
  test('no values: the page’s fit panel defaults', () => {
    expect(fitChoicesFromArgs(none)).toEqual(CLI_FIT_DEFAULTS);
    expect(CLI_FIT_DEFAULTS).toEqual(DEFAULT_FIT_CHOICES);
  });

  test('each value is taken; the defaults object is not changed', () => {
    expect(fitChoicesFromArgs({ shape: 'pseudo-voigt', baseline: 'quadratic', peaks: '4', on: 'processed' }))
      .toEqual({ shape: 'pseudo-voigt', baseline: 'quadratic', maxPeaks: 4, on: 'processed' });
    expect(fitChoicesFromArgs({ ...none, peaks: ' 1 ' })).toMatchObject({ maxPeaks: 1 });
    expect(CLI_FIT_DEFAULTS).toEqual({ on: 'raw', shape: 'gaussian', baseline: 'line', maxPeaks: 3 });
  });

  test('a wrong value gives the sentence naming the option and what it takes', () => {
    expect(fitChoicesFromArgs({ ...none, shape: 'triangle' })).toBe('--fit-shape takes gaussian, lorentzian, pseudo-voigt, emg; got "triangle".');
    expect(fitChoicesFromArgs({ ...none, baseline: 'cubic' })).toBe('--fit-baseline takes line or quadratic; got "cubic".');
    for (const p of ['0', '5', '2.5', 'two', '-1']) expect(fitChoicesFromArgs({ ...none, peaks: p })).toBe(`--fit-peaks takes a whole number from 1 to 4; got "${p}".`);
    expect(fitChoicesFromArgs({ ...none, on: 'smoothed' })).toBe('--fit-on takes raw or processed; got "smoothed".');
  });
});

describe('fitsForTrace', () => {
  const t = trace();
  const options = (o: Partial<CliFitOptions>): CliFitOptions => ({ regions: [[4.4, 5.6]], ...CLI_FIT_DEFAULTS, ...o });

  test('one Gaussian on the raw trace: one peak, position, area and FWHM within 3 SE of the invented truth; the time stamp kept', () => {
    const { fits, problems } = fitsForTrace(t, analysed(t, false), options({}), '2025-01-01T00:00:00.000Z');
    expect(problems).toEqual([]);
    expect(fits).toHaveLength(1);
    expect(fits[0].madeAt).toBe('2025-01-01T00:00:00.000Z');
    const r = fits[0].result;
    expect(r.count).toBe(1);
    expect(r.fittedLabel).toBe('raw');
    const p = r.fit.peaks[0];
    const area = 2 * 0.1 * Math.sqrt(2 * Math.PI); // h·σ·√(2π)
    const fwhm = 2 * Math.sqrt(2 * Math.LN2) * 0.1;
    expect(Math.abs(p.position.value - 5)).toBeLessThan(3 * p.position.se);
    expect(Math.abs(p.area.value - area)).toBeLessThan(3 * p.area.se);
    expect(Math.abs(p.fwhm.value - fwhm)).toBeLessThan(3 * p.fwhm.se);
    // No step ran: no processed trace to compare with.
    expect(r.processing).toBeNull();
  });

  test('with a step that ran, the processed trace is compared under the command line’s label, and can be the one fitted', () => {
    const res = analysed(t, true);
    const raw = fitsForTrace(t, res, options({}), 'now');
    expect(raw.fits[0].result.processing!.rows.map((row) => row.label)).toContain(CLI_PROCESSED_LABEL);
    const processed = fitsForTrace(t, res, options({ on: 'processed' }), 'now');
    expect(processed.problems).toEqual([]);
    expect(processed.fits[0].result.fittedLabel).toBe(CLI_PROCESSED_LABEL);
  });

  test('--fit-on processed without a step that ran: that region is named as not fitted, the others still come out', () => {
    const res = analysed(t, false);
    const { fits, problems } = fitsForTrace(t, res, options({ on: 'processed', regions: [[4.4, 5.6], [1, 2]] }), 'now');
    expect(fits).toEqual([]);
    expect(problems).toEqual([
      'Region 4.4:5.6 was not fitted: no step of the method ran, so there is no processed trace (use --fit-on raw).',
      'Region 1:2 was not fitted: no step of the method ran, so there is no processed trace (use --fit-on raw).',
    ]);
    const mixed = fitsForTrace(t, res, options({ regions: [[4.4, 5.6], [20, 30]] }), 'now');
    expect(mixed.fits).toHaveLength(1);
    expect(mixed.problems).toHaveLength(1);
    expect(mixed.problems[0]).toMatch(/^Region 20:30 was not fitted: /);
  });

  test('the trace and the analysis are not changed', () => {
    const res = analysed(t, true);
    const y = Float64Array.from(t.y), py = Float64Array.from(res.processed.y);
    fitsForTrace(t, res, options({}), 'now');
    expect(t.y).toEqual(y);
    expect(res.processed.y).toEqual(py);
  });
});
