import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { beforeEach, describe, expect, it } from 'vitest';
import { emptyRecipe, makeRecipeStep } from '../../../src/core/method.ts';
import type { FitJobResult } from '../../../src/core/measure/fit/job.ts';
import { stepDefinition } from '../../../src/core/steps/registry.ts';
import { useApp } from '../../../src/state/store.ts';
import { useLedgerFits } from '../../../src/ui/fit/ledger-fits.ts';
import { resetStore } from '../harness.ts';

// src/ui/fit/ledger-fits.ts: the current sample's kept fits for the loss
// ledger, a processed-trace fit marked out of date once the stack changed.
function read() {
  let out!: ReturnType<typeof useLedgerFits>;
  const Probe = () => { out = useLedgerFits(); return null; };
  renderToStaticMarkup(createElement(Probe));
  return out;
}
const result = (on: 'raw' | 'processed', count: number) => ({ settings: { on }, count }) as unknown as FitJobResult;

beforeEach(() => resetStore());

describe('useLedgerFits', () => {
  it('only the current sample’s fits, oldest first; raw fits never out of date; processed ones once the stack changed', () => {
    const steps = JSON.stringify(emptyRecipe().steps);
    useApp.setState({ sampleId: 'a' });
    const add = useApp.getState().addFit;
    add({ sampleId: 'a', madeAt: 't1', stackKey: steps, result: result('raw', 1) });
    add({ sampleId: 'b', madeAt: 't2', stackKey: steps, result: result('raw', 9) });
    add({ sampleId: 'a', madeAt: 't3', stackKey: steps, result: result('processed', 2) });
    let f = read();
    expect(f.map((x) => [x.result.count, x.outOfDate])).toEqual([[1, false], [2, false]]);
    useApp.setState({ recipe: { ...emptyRecipe(), steps: [makeRecipeStep(stepDefinition('moving-average')!)] } });
    f = read();
    expect(f.map((x) => [x.result.count, x.outOfDate])).toEqual([[1, false], [2, true]]);
    useApp.setState({ sampleId: 'b' });
    expect(read().map((x) => x.result.count)).toEqual([9]);
  });
});
