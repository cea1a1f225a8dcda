import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { CAUTION } from '../../src/core/export/version.ts';
import { useApp } from '../../src/state/store.ts';
import { App } from '../../src/ui/App.tsx';
import { html, loadDemoSample, resetStore, text } from './harness.ts';

// src/ui/App.tsx: the whole page, rendered once without a browser (Plotly,
// which needs one, stands aside; the figures are empty boxes here). The
// keyboard shortcuts and drag-and-drop are wired in effects and events a
// static render does not run; they are covered by the e2e specs.
vi.mock('plotly.js-strict-dist-min', () => ({ default: {} }));
beforeEach(() => resetStore());
afterEach(() => vi.unstubAllGlobals());

describe('App', () => {
  it('the caution that this is not a validated system and the lab’s procedures govern, as the exports say it', () => {
    const t = text(html(App));
    expect(t).toContain('Not a validated system. Results are for exploration and review; your laboratory’s procedures, validated methods and regulators’ requirements govern. Data stays on this computer.');
    expect(CAUTION.toLowerCase()).toContain('not a validated system');
  });
  it('an empty page opens without error: nothing loaded, the guide open on a first visit, no axis editor', () => {
    const h = html(App);
    const t = text(h, true);
    expect(t).toContain('Nothing loaded.');
    expect(t).toContain('Getting started');
    expect(t).toContain('No trace yet. Drop a file here or choose one with “Open file”.');
    expect(h).not.toContain('>Axis names and units…</button>');
  });
  it('the guide stays closed once put away (remembered in this browser)', () => {
    vi.stubGlobal('localStorage', { getItem: (k: string) => (k === 'tracewright.guide-dismissed' ? '1' : null), setItem: () => {} });
    expect(text(html(App))).not.toContain('Getting started');
  });
  it('with the demo: the plot titled by the sample, every panel present, each inside its own error boundary', async () => {
    await loadDemoSample();
    const h = html(App);
    const s = useApp.getState();
    const sample = s.traces.find((t) => t.id === s.sampleId)!;
    expect(h).toContain(`<h2 id="plot-title">${sample.name}</h2>`);
    for (const id of ['noise-panel', 'residual-panel', 'fit-panel', 'calibration-panel', 'export-panel', 'excluded-ranges', 'readout']) expect(h).toContain(`data-testid="${id}"`);
    expect(h).toContain('>Axis names and units…</button>');
    expect(h).not.toContain('data-testid="part-failed"');
  });
  it('a marked range is shown with four significant digits; a hand note with its dismiss', async () => {
    await loadDemoSample();
    useApp.getState().setMarkedRange([1.23456, 2.5]);
    useApp.getState().setHandNote({ kind: 'refused', text: 'Peak not added: no top within 5 points.' });
    const t = text(html(App));
    expect(t).toContain('marked 1.235 – 2.500');
    expect(t).toContain('Peak not added: no top within 5 points. dismiss');
  });
});
