import { beforeEach, describe, expect, it } from 'vitest';
import { emptyRecipe, makeRecipeStep } from '../../src/core/method.ts';
import { stepDefinition } from '../../src/core/steps/registry.ts';
import { currentResult } from '../../src/state/selectors.ts';
import { useApp } from '../../src/state/store.ts';
import { ResidualPanel } from '../../src/ui/ResidualPanel.tsx';
import { analyseNow, html, loadDemoSample, resetStore, text } from './harness.ts';

// src/ui/ResidualPanel.tsx: what the processing removed and whether it looks like noise.
beforeEach(() => resetStore());

describe('ResidualPanel', () => {
  it('nothing before the sample is measured', () => {
    expect(html(ResidualPanel)).toBe('');
  });
  it('no step: says nothing was removed', async () => {
    await loadDemoSample();
    const t = text(html(ResidualPanel));
    expect(t).toContain('What the processing removed');
    expect(t).toContain('No processing yet, so nothing was removed.');
  });
  it('with a smoother: the verdict and the three figures, with the result’s own numbers', async () => {
    await loadDemoSample();
    useApp.setState({ recipe: { ...emptyRecipe(), steps: [makeRecipeStep(stepDefinition('moving-average')!, { window: 5 })] } });
    await analyseNow();
    const d = currentResult(useApp.getState())!.diagnostics!;
    const h = html(ResidualPanel);
    expect(h).toContain(`data-level="${d.level}"`);
    const t = text(h);
    expect(t).toContain(d.verdict);
    expect(t).toContain(`RMS of the residual ${d.rms.toPrecision(4)}`);
    expect(t).toContain(`Lag-1 autocorrelation ${d.lag1.toFixed(3)} (white noise stays within ±${d.lag1Threshold.toFixed(3)})`);
    expect(t).toContain(`Runs about the median ${d.runs.runs} (expected ${d.runs.expected.toFixed(1)}`);
    expect(t).not.toContain('Provisional');
  });
  it('while the loss check is still running the verdict is marked provisional and says why', async () => {
    await loadDemoSample();
    useApp.setState({ recipe: { ...emptyRecipe(), steps: [makeRecipeStep(stepDefinition('moving-average')!, { window: 5 })] } });
    await analyseNow();
    useApp.getState().setPending(['loss']);
    const h = html(ResidualPanel);
    expect(h).toContain('data-provisional="true"');
    expect(text(h)).toContain('(the loss check is still running; it may hold this verdict back)');
    useApp.getState().setPending(['residual']);
    expect(text(html(ResidualPanel))).toContain('(from before the latest change)');
  });
});
