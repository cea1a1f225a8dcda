import { beforeEach, describe, expect, it } from 'vitest';
import { currentResult } from '../../src/state/selectors.ts';
import { useApp } from '../../src/state/store.ts';
import { num } from '../../src/ui/format.ts';
import { FocusedFeature } from '../../src/ui/FocusedFeature.tsx';
import { html, loadDemoSample, loadDemoSmoothed, press, resetStore, text, tree } from './harness.ts';

// src/ui/FocusedFeature.tsx: the clicked feature under the raw trace and each
// choice, side by side. A 51-point moving average over the demo's sharp
// 1.2 min peak (FWHM 0.047 min = about 5 points, demo-truth.json) must weaken it.
beforeEach(() => resetStore());

describe('FocusedFeature', () => {
  it('nothing selected: nothing shown', async () => {
    await loadDemoSample();
    expect(html(FocusedFeature)).toBe('');
  });
  it('selected without a comparison: says how to get one', async () => {
    await loadDemoSample();
    useApp.getState().selectPeak(4.3);
    expect(text(html(FocusedFeature))).toContain('Selected: the feature at 4.3 min. Add a step or an alternative');
  });
  it('a narrow peak under a wide average: raw is the reference, the average weakens it, with S/N and the height change against raw', async () => {
    await loadDemoSmoothed(51);
    const row = currentResult(useApp.getState())!.loss!.ledger.rows.find((r) => Math.abs(r.position - 1.2) < 0.05)!;
    useApp.getState().selectPeak(row.position);
    const h = html(FocusedFeature);
    expect(h).toContain('data-testid="focus-card-0" data-verdict="reference"');
    expect(h).toMatch(/data-testid="focus-card-1" data-verdict="(weakened|lost)"/);
    const t = text(h);
    expect(t).toContain(`The feature at ${num(row.position, 5)} min under each choice`);
    expect(t).toContain(`S/N ${num(row.cells[0].snr, 3)}`);
    expect(t).toContain('Weakened: a limit crossed downwards, or less than 80 % of the raw height kept.');
    if (row.cells[1].found) {
      const pct = (row.cells[1].height! - row.cells[0].height!) / row.cells[0].height! * 100;
      expect(pct).toBeLessThan(-20);
      expect(t).toMatch(/height [\d.]+ mAU \(−?-?\d+(\.\d+)? %\)/);
    }
  });
  it('close clears the selection', async () => {
    await loadDemoSmoothed(5);
    useApp.getState().selectPeak(4.3);
    press(tree(FocusedFeature), 'close');
    expect(useApp.getState().selectedPeakX).toBeNull();
  });
  it('a place with no feature: says it is below the detection limit everywhere and offers the noise-level rows', async () => {
    await loadDemoSmoothed(5);
    useApp.getState().selectPeak(3.5);
    expect(text(html(FocusedFeature))).toContain('The feature at 3.5 min is not in the comparison: it is below the detection limit in every column.');
    press(tree(FocusedFeature), 'List noise-level features too');
    expect(useApp.getState().ledgerNoiseLevel).toBe(true);
  });
});
