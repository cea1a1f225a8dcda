/**
 * The sample's kept fits for the loss ledger's column "peak count by region
 * fit" (issue 18; core/measure/fit/ledger-fit.ts words the cells).
 */
import { useMemo } from 'react';
import type { LedgerFit } from '../../core/measure/fit/ledger-fit.ts';
import { useApp } from '../../state/store.ts';

/** The current sample's fits, oldest first, each marked out of date when a processed fit's stack changed since. */
export function useLedgerFits(): LedgerFit[] {
  const fits = useApp((s) => s.fits);
  const sampleId = useApp((s) => s.sampleId);
  const steps = useApp((s) => s.recipe.steps);
  return useMemo(() => {
    const key = JSON.stringify(steps);
    return fits.filter((f) => f.sampleId === sampleId).map((f) => ({ result: f.result, outOfDate: f.result.settings.on === 'processed' && f.stackKey !== key }));
  }, [fits, sampleId, steps]);
}
