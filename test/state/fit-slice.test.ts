// Issue 18: the fit slice keeps the user's fits for the session (newest shown, oldest dropped past the limit).
import { describe, expect, it } from 'vitest';
import { createAppStore } from '../../src/state/store.ts';
import { DEFAULT_FIT_CHOICES, MAX_KEPT_FITS } from '../../src/state/fit-slice.ts';
import type { FitJobResult } from '../../src/core/measure/fit/job.ts';

const fake = (from: number) => ({ settings: { ...DEFAULT_FIT_CHOICES, from, to: from + 1 } }) as unknown as FitJobResult;

describe('fit slice', () => {
  it('keeps fits in order, shows the newest, forgets one on request and drops the oldest past the limit', () => {
    const useApp = createAppStore();
    const s = useApp.getState();
    expect(s.fitChoices).toEqual(DEFAULT_FIT_CHOICES);
    s.setFitChoices({ shape: 'emg' });
    expect(useApp.getState().fitChoices.shape).toBe('emg');
    expect(useApp.getState().fitChoices.on).toBe('raw');
    for (let i = 0; i < MAX_KEPT_FITS + 2; i++) s.addFit({ sampleId: 'a', madeAt: 't', stackKey: '[]', result: fake(i) });
    const fits = useApp.getState().fits;
    expect(fits).toHaveLength(MAX_KEPT_FITS);
    expect(fits[0].result.settings.from).toBe(2);
    expect(useApp.getState().shownFitId).toBe(fits.at(-1)!.id);
    s.setFitError('x');
    s.removeFit(fits.at(-1)!.id);
    expect(useApp.getState().fits).toHaveLength(MAX_KEPT_FITS - 1);
    expect(useApp.getState().shownFitId).toBeNull();
    // Ids stay unique after removal.
    s.addFit({ sampleId: 'a', madeAt: 't', stackKey: '[]', result: fake(99) });
    const ids = useApp.getState().fits.map((f) => f.id);
    expect(new Set(ids).size).toBe(ids.length);
    expect(useApp.getState().fitError).toBeNull();
  });
});
