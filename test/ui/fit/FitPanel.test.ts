import { beforeEach, describe, expect, it, vi } from 'vitest';
import { emptyRecipe, makeRecipeStep } from '../../../src/core/method.ts';
import { stepDefinition } from '../../../src/core/steps/registry.ts';
import { currentResult } from '../../../src/state/selectors.ts';
import { useApp } from '../../../src/state/store.ts';
import { num } from '../../../src/ui/format.ts';
import { FitPanel } from '../../../src/ui/fit/FitPanel.tsx';
import { requestFit } from '../../../src/ui/fit/fit-service.ts';
import { button, html, loadDemoSample, press, resetStore, text, tree } from '../harness.ts';

// src/ui/fit/FitPanel.tsx: how many peaks a region supports, each fitted
// peak with standard errors. Truth from public/demo/demo-truth.json: one
// peak at 4.3 min, height 8, FWHM 0.188386 min.
vi.mock('plotly.js-strict-dist-min', () => ({ default: {} }));
beforeEach(() => resetStore());

describe('FitPanel', () => {
  it('nothing without a sample', () => {
    expect(html(FitPanel)).toBe('');
  });
  it('no region yet: says how to mark one, and the fit button is disabled', async () => {
    await loadDemoSample();
    expect(text(html(FitPanel), true)).toContain('Region: none yet (the marked range, else the zoomed view;');
    expect(button(tree(FitPanel), 'Fit the region').props.disabled).toBe(true);
  });
  it('a fit of the isolated demo peak: one peak, its figures with ± standard errors, and the table’s drop-line area beside it', async () => {
    await loadDemoSample();
    useApp.getState().setMarkedRange([3.8, 4.8]);
    useApp.getState().setFitChoices({ maxPeaks: 2 });
    expect(text(html(FitPanel))).toContain('Region: 3.8 – 4.8 min');
    await requestFit();
    const h = html(FitPanel);
    expect(h).toContain('data-count="1"');
    const q = useApp.getState().fits[0].result.fit.peaks[0];
    const t = text(h, true);
    expect(t).toContain(`${num(q.position.value, 5)} ± ${num(q.position.se, 2)}`);
    expect(Math.abs(q.position.value - 4.3)).toBeLessThan(0.005);
    const row = currentResult(useApp.getState())!.peaks.find((p) => Math.abs(p.x - 4.3) < 0.05)!;
    expect(h).toContain(`<td>${num(row.area)}</td>`);
    expect(t).toContain('Standard errors: covariance scaled by the residual variance');
    expect(t).toContain('1 vs 2: ΔBIC');
  });
  it('a fit of the processed trace made before the stack changed says so', async () => {
    await loadDemoSample();
    useApp.setState({ recipe: { ...emptyRecipe(), steps: [makeRecipeStep(stepDefinition('moving-average')!, { window: 5 })] } });
    useApp.getState().setMarkedRange([3.8, 4.8]);
    useApp.getState().setFitChoices({ on: 'processed', maxPeaks: 1 });
    await requestFit();
    expect(text(html(FitPanel))).not.toContain('made with an earlier step stack');
    useApp.setState({ recipe: { ...emptyRecipe(), steps: [makeRecipeStep(stepDefinition('moving-average')!, { window: 9 })] } });
    expect(text(html(FitPanel))).toContain('This fit of the processed trace was made with an earlier step stack; fit again to update it.');
  });
  it('a fit error is an alert; forget removes the fit', async () => {
    await loadDemoSample();
    useApp.getState().setFitError('The region holds too few points.');
    expect(html(FitPanel)).toContain('role="alert" data-testid="fit-error">The region holds too few points.</p>');
    useApp.getState().setMarkedRange([3.8, 4.8]);
    useApp.getState().setFitChoices({ maxPeaks: 1 });
    await requestFit();
    press(tree(FitPanel), 'forget this fit');
    expect(useApp.getState().fits).toEqual([]);
  });
});
