import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { currentResult } from '../../../src/state/selectors.ts';
import { getBackend, loadBytes } from '../../../src/state/service.ts';
import { useApp } from '../../../src/state/store.ts';
import { startStandardsRunner } from '../../../src/ui/calibration/standards-runner.ts';
import { demoBytes, loadDemoSample, resetStore } from '../harness.ts';

// src/ui/calibration/standards-runner.ts: standard traces are measured with
// the sample's method (after a short pause that gathers changes) and their
// peaks go into the store. The demo sample loaded again as a "standard"
// must give the sample's own peaks.
async function until(ok: () => boolean, ms = 20000): Promise<void> {
  const t0 = Date.now();
  while (!ok()) {
    if (Date.now() - t0 > ms) throw new Error('timed out');
    await new Promise((r) => setTimeout(r, 10));
  }
}
let stop: (() => void) | null = null;
beforeEach(() => { resetStore(); });
afterEach(() => { stop?.(); stop = null; });

describe('startStandardsRunner', () => {
  it('measures a standard trace with the sample’s method: the same data gives the same peaks', async () => {
    await loadDemoSample();
    stop = startStandardsRunner();
    await loadBytes(demoBytes('demo-sample.csv'), 'std-1.csv', { roles: ['standard'], quiet: true });
    getBackend().setInputs(useApp.getState().traces);
    const id = useApp.getState().traces.find((t) => useApp.getState().roles[t.id] === 'standard')!.id;
    expect(useApp.getState().standardPeaks[id]).toBeUndefined(); // not at once: changes are gathered first
    await until(() => useApp.getState().standardPeaks[id] !== undefined);
    const sp = useApp.getState().standardPeaks[id];
    expect(sp.ok).toBe(true);
    const mine = currentResult(useApp.getState())!.peaks.map((p) => p.x);
    expect(sp.ok && sp.peaks.map((p) => p.x)).toEqual(mine);
    expect(useApp.getState().standardsBusy).toBe(false);
  });
  it('a standard that cannot be measured gets its problem, not a silent gap', async () => {
    await loadDemoSample();
    stop = startStandardsRunner();
    await loadBytes(demoBytes('demo-sample.csv'), 'std-1.csv', { roles: ['standard'], quiet: true });
    // The backend is never told about this trace: the analysis fails and its message is kept.
    const id = useApp.getState().traces.find((t) => useApp.getState().roles[t.id] === 'standard')!.id;
    await until(() => useApp.getState().standardPeaks[id] !== undefined);
    const sp = useApp.getState().standardPeaks[id];
    expect(sp).toEqual({ ok: false, problem: `No trace with id ${id}` });
  });
  it('changes that do not touch standards start no run; the last standard set aside empties the table', async () => {
    await loadDemoSample();
    stop = startStandardsRunner();
    useApp.getState().setStandardPeaks({ stale: { ok: false, problem: 'x' } });
    useApp.setState({ peakSettings: { ...useApp.getState().peakSettings } });
    await new Promise((r) => setTimeout(r, 400));
    expect(Object.keys(useApp.getState().standardPeaks)).toEqual(['stale']);
    await loadBytes(demoBytes('demo-sample.csv'), 'std-1.csv', { roles: ['standard'], quiet: true });
    const id = useApp.getState().traces.find((t) => useApp.getState().roles[t.id] === 'standard')!.id;
    useApp.getState().setRoles({ [id]: 'ignore' });
    await until(() => !('stale' in useApp.getState().standardPeaks));
    expect(useApp.getState().standardPeaks).toEqual({});
  });
});
