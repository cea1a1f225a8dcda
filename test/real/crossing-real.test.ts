/**
 * Issue 16: the peak table crosses from the worker as columns (transfer.ts; the marks and the pharmacopoeial noise
 * windows too) and the page shows the first rows and markers by S/N (peak-rank.ts, without a full sort). On traces
 * nobody here designed: the three MALDI-TOF spectra (test/fixtures/real, MALDIquant fiedler2009subset items 1, 2
 * and 9) and a long trace with a wandering baseline, bands over the whole range and correlated (AR(1)) noise, each
 * processed by a moving average so the processed-only marks appear. The reference is the structured clone of the
 * rows themselves (what crossed before) and a full sort of every row (the rule the page used before).
 *
 * What would fail it: a list's end read one code short (marks lost), a null window read back as absent or as an
 * object, a tie at the cut taken in the wrong order, a below-detection marker let past its cap.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/core/analysis/index.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import { createTrace, type Trace } from '../../src/core/trace.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import type { Peak } from '../../src/core/measure/peak-types.ts';
import { emptyRecipe, type Recipe } from '../../src/core/method.ts';
import { columnBuffers, fromColumns, lazyRows, toColumns } from '../../src/worker/transfer.ts';
import { PLOT_MARKERS, PLOT_MARKERS_BELOW, rankMarkers, rankTableRows } from '../../src/worker/peak-rank.ts';
import { loadReal, MALDI_FILES } from './load-real.ts';

const smooth = (window: number): Recipe => ({
  ...emptyRecipe(), steps: [{ uid: 'ma', step: 'moving-average', enabled: true, params: { window, edge: 'shrink' } }],
});

/** 2·10⁵ points: a slow wandering baseline, 400 bands of widths 3–80 samples spread over the whole range, AR(1) noise (ρ 0.6). */
function driftingTrace(): Trace {
  const rng = makeRng(1604);
  const n = 200_000;
  const x = new Float64Array(n), y = new Float64Array(n);
  for (let i = 0; i < n; i++) { x[i] = 400 + i * 0.005; y[i] = 2 * Math.sin(i / 23_000) + 0.8 * Math.sin(i / 4_100 + 1) + 1e-5 * i; }
  for (let k = 0; k < 400; k++) {
    const c = rng.uniform() * n, s = 3 + 77 * rng.uniform() ** 2, h = 0.05 + 3 * rng.uniform() ** 3;
    for (let i = Math.max(0, Math.floor(c - 6 * s)); i <= Math.min(n - 1, Math.ceil(c + 6 * s)); i++) y[i] += h * Math.exp(-0.5 * ((i - c) / s) ** 2);
  }
  let e = 0;
  for (let i = 0; i < n; i++) { e = 0.6 * e + 0.04 * Math.sqrt(1 - 0.36) * rng.normal(); y[i] += e; }
  return createTrace({ name: 'drifting', x, y, source: { fileName: 'drifting.csv', sha256: '0'.repeat(64), rowsRead: n, rowsSkipped: 0 } });
}

/** The rows first by S/N as the page ranked them before: decisions first, then a stable sort, cut at the cap. */
function tableRowsBefore(peaks: readonly Peak[], cap: number): Peak[] {
  const mine = (p: Peak) => p.origin === 'added-by-user' || p.removedByUser === true;
  return [...peaks.filter(mine), ...peaks.filter((p) => !mine(p)).sort((a, b) => (b.snr ?? -Infinity) - (a.snr ?? -Infinity))].slice(0, cap);
}

function check(trace: Trace, window: number) {
  const peaks = analyse({ sampleId: trace.id, scanIds: [], recipe: smooth(window) }, new Map([[trace.id, trace]]), STEP_REGISTRY).peaks;
  const rows = peaks as unknown as Record<string, unknown>[];
  const cols = toColumns(rows);
  // No field left to cross as one object per row.
  expect(Object.entries(cols.columns).filter(([, c]) => c.kind === 'plain').map(([f]) => f)).toEqual([]);
  const sent = structuredClone(cols, { transfer: columnBuffers(cols) });
  const before = structuredClone(rows);
  expect(JSON.stringify(fromColumns(sent))).toBe(JSON.stringify(before));
  expect(lazyRows(sent)).toEqual(before);
  for (const cap of [1, 50, 500]) expect([...rankTableRows(peaks, cap)].map((i) => peaks[i])).toEqual(tableRowsBefore(peaks, cap));
  const markers = [...rankMarkers(peaks, PLOT_MARKERS)].map((i) => peaks[i]);
  const below = markers.filter((p) => p.flag === 'below-detection' && p.origin !== 'added-by-user');
  expect(below.length).toBeLessThanOrEqual(PLOT_MARKERS_BELOW);
  // Every marker outranks every peak left out of its own group (above / below the detection limit).
  for (const group of [(p: Peak) => p.flag !== 'below-detection', (p: Peak) => p.flag === 'below-detection']) {
    const drawn = markers.filter(group), left = peaks.filter((p) => group(p) && !markers.includes(p));
    if (drawn.length && left.length) expect(Math.min(...drawn.map((p) => p.snr ?? 0))).toBeGreaterThanOrEqual(Math.max(...left.map((p) => p.snr ?? 0)));
  }
  return { peaks, marked: peaks.filter((p) => p.marks.length > 0).length, windows: peaks.filter((p) => p.pharmaNoise).length };
}

describe('the peak table crossing on traces nobody here designed', () => {
  it.each(MALDI_FILES)('MALDI-TOF spectrum %s, moving average of 5', (file) => {
    const { peaks, marked } = check(loadReal(file).traces[0], 5);
    expect(peaks.length).toBeGreaterThan(50);
    expect(marked).toBeGreaterThan(0);
  });

  it('2·10⁵ points, wandering baseline, bands over the whole range, AR(1) noise; moving average of 9', () => {
    const { peaks, marked, windows } = check(driftingTrace(), 9);
    expect(peaks.length).toBeGreaterThan(500); // more than the table shows: the cut is exercised
    expect(marked).toBeGreaterThan(0);
    expect(windows).toBeGreaterThan(0);
  });
});
