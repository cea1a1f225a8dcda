import { beforeEach, describe, expect, it } from 'vitest';
import { emptyRecipe, makeRecipeStep } from '../../../src/core/method.ts';
import { stepDefinition } from '../../../src/core/steps/registry.ts';
import { currentResult } from '../../../src/state/selectors.ts';
import { useApp } from '../../../src/state/store.ts';
import { exportExtras } from '../../../src/ui/fit/export-extras.ts';
import { requestFit } from '../../../src/ui/fit/fit-service.ts';
import { loadDemoSample, resetStore } from '../harness.ts';

// src/ui/fit/export-extras.ts: what the page's exports add from the store:
// the sample's kept fits (a processed fit made with an earlier stack marked
// so), fitted-area and figure columns, and the lines explaining them.
beforeEach(() => resetStore());

const sample = () => { const s = useApp.getState(); return s.traces.find((t) => t.id === s.sampleId)!; };

describe('exportExtras', () => {
  it('no fit, no figures: nothing added', async () => {
    await loadDemoSample();
    const e = exportExtras(sample(), currentResult(useApp.getState())!);
    expect(e).toEqual({ fits: [], extra: null, lines: [] });
  });
  it('a kept fit of this sample: fitted-area columns, the fitted row filled, the others “not in a fitted region”, and a line per fit', async () => {
    await loadDemoSample();
    useApp.getState().setMarkedRange([3.8, 4.8]);
    useApp.getState().setFitChoices({ maxPeaks: 2 });
    await requestFit();
    useApp.getState().addFit({ ...useApp.getState().fits[0], sampleId: 'another trace' }); // not this sample's: left out
    const r = currentResult(useApp.getState())!;
    const e = exportExtras(sample(), r);
    expect(e.fits).toHaveLength(1);
    expect(e.fits[0].outOfDate).toBe(false);
    expect(e.extra!.header.slice(0, 3)).toEqual(['fitted area (mAU × min)', 'fitted area standard error (mAU × min)', 'fitted area: which fit']);
    const i = r.peaks.findIndex((p) => Math.abs(p.x - 4.3) < 0.05);
    const j = r.peaks.findIndex((p) => Math.abs(p.x - 1.2) < 0.05);
    const fitted = e.extra!.cells(r.peaks[i], i);
    expect(fitted[0]).toBe(e.fits[0].result.fit.peaks[0].area.value);
    expect(String(fitted[2])).toMatch(/^fit 1, peak 1 of 1 /);
    expect(e.extra!.cells(r.peaks[j], j)[2]).toBe('not in a fitted region');
    expect(e.lines).toHaveLength(1);
    expect(e.lines[0]).toMatch(/^Fit 1: raw trace, 3\.8 to 4\.8; 1 peak\(s\)\./);
  });
  it('a fit of the processed trace made before the stack changed is marked as made with an earlier stack', async () => {
    await loadDemoSample();
    useApp.setState({ recipe: { ...emptyRecipe(), steps: [makeRecipeStep(stepDefinition('moving-average')!, { window: 5 })] } });
    useApp.getState().setMarkedRange([3.8, 4.8]);
    useApp.getState().setFitChoices({ on: 'processed', maxPeaks: 1 });
    await requestFit();
    expect(exportExtras(sample(), currentResult(useApp.getState())!).fits[0].outOfDate).toBe(false);
    useApp.setState({ recipe: { ...emptyRecipe(), steps: [makeRecipeStep(stepDefinition('moving-average')!, { window: 7 })] } });
    const e = exportExtras(sample(), currentResult(useApp.getState())!);
    expect(e.fits[0].outOfDate).toBe(true);
    expect(e.lines[0]).toContain('(Made with an earlier step stack.)');
  });
  it('figure columns when asked for, with the dead-time line', async () => {
    await loadDemoSample();
    useApp.getState().setShowFigures(true);
    const e = exportExtras(sample(), currentResult(useApp.getState())!);
    expect(e.extra!.header[0]).toBe('retention time t_R (min)'); // the sample's x unit (demo-truth.json x.unit)
    expect(e.lines.at(-1)).toBe('Retention factor and selectivity need the dead time t_M; none was entered.');
    useApp.getState().setDeadTime(0.5);
    expect(exportExtras(sample(), currentResult(useApp.getState())!).lines.at(-1)).toBe('Dead time t_M = 0.5 (entered by the user).');
  });
});
