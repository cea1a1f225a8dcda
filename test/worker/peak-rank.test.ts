/**
 * Issue 16: the worker ranks the peak table's shown rows (worker/peak-rank.ts)
 * instead of the page. The rows must be exactly those the page's own ranking
 * chose before (kept below as the reference definition: the user's decisions
 * first in table order, then the rest by S/N, highest first, not measured
 * last, a stable sort, cut at the cap), on random tables and on a real one.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { PLOT_MARKERS_BELOW, firstByKey, peakTableRows, peakTotals, peakView, plotMarkers, rankMarkers, rankTableRows, rememberPeakView, tableTotals } from '../../src/worker/peak-rank.ts';
import type { Peak } from '../../src/core/measure/peak-types.ts';
import { analyse } from '../../src/core/analysis/index.ts';
import { emptyRecipe } from '../../src/core/method.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import { createTrace } from '../../src/core/trace.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { fromColumns, lazyRows, toColumns } from '../../src/worker/transfer.ts';

/** The page's ranking before issue 16 moved it (PeakTable.tsx's pickRows), word for word. */
function pickRowsBefore(all: readonly Peak[], cap: number): Peak[] {
  const snrOf = (p: Peak) => p.snr ?? -Infinity;
  const mine = (p: Peak) => p.origin === 'added-by-user' || p.removedByUser === true;
  const rest = all.filter((p) => !mine(p)).sort((a, b) => snrOf(b) - snrOf(a));
  return [...all.filter(mine), ...rest].slice(0, cap);
}

/**
 * The plot's choice of markers, written plainly: before issue 16 moved it (TracePlot.tsx), then with at most
 * `belowCap` markers below the detection limit (issue 16, PLOT_MARKERS_BELOW; peaks added by hand always drawn).
 */
function markersRule(peaks: readonly Peak[], cap: number, belowCap: number): Peak[] {
  let live = peaks.filter((pk) => !pk.removedByUser);
  const below = (pk: Peak) => pk.origin !== 'added-by-user' && pk.flag === 'below-detection';
  if (live.length > cap || live.filter(below).length > belowCap) {
    const mine = live.filter((pk) => pk.origin === 'added-by-user').slice(0, cap);
    const ranked = live.filter((pk) => pk.origin !== 'added-by-user').sort((a, b) => (b.snr ?? 0) - (a.snr ?? 0));
    const belowKept = ranked.filter(below).slice(0, belowCap);
    live = [...mine, ...ranked.filter((pk) => !below(pk) || belowKept.includes(pk))].slice(0, cap);
  }
  return live;
}

/** The table's counts and summed area before issue 16 (PeakTable.tsx). */
function totalsBefore(all: readonly Peak[]) {
  const counts = { q: 0, d: 0, b: 0 };
  for (const p of all) if (!p.removedByUser) { if (p.flag === 'quantifiable') counts.q++; else if (p.flag === 'detectable') counts.d++; else counts.b++; }
  let totalArea = 0;
  for (const p of all) if (!p.removedByUser) totalArea += p.area;
  return { quantifiable: counts.q, detectable: counts.d, below: counts.b, area: totalArea };
}

/** Just the fields the ranking reads, plus x to tell rows apart. */
const fakePeak = (x: number, snr: number | null, origin: string, removed: boolean, flag = 'detectable') =>
  ({ x, snr, origin, removedByUser: removed || undefined, flag }) as unknown as Peak;

describe('the peak table ranked in the worker', () => {
  it('chooses the same rows in the same order as the page did, on random tables (ties, nulls, infinities, decisions)', () => {
    fc.assert(fc.property(
      fc.array(fc.record({
        snr: fc.option(fc.oneof(fc.constantFrom(3, 3, 10, Infinity, -Infinity, 0), fc.double({ noNaN: true })), { nil: null }),
        origin: fc.constantFrom('detected', 'detected', 'detected', 'added-by-user'),
        removed: fc.integer({ min: 0, max: 4 }).map((k) => k === 0),
        flag: fc.constantFrom('quantifiable', 'detectable', 'below-detection', 'below-detection', 'not-measured'),
      }), { maxLength: 80 }),
      fc.integer({ min: 0, max: 90 }),
      fc.integer({ min: 0, max: 40 }),
      (specs, cap, belowCap) => {
        const peaks = specs.map((s, i) => fakePeak(i, s.snr, s.origin, s.removed, s.flag));
        const rows = rankTableRows(peaks, cap);
        expect([...rows].map((i) => peaks[i])).toEqual(pickRowsBefore(peaks, cap));
        // The same objects, not copies: the page finds them in its own table.
        rows.forEach((i, k) => expect(peaks[i]).toBe(pickRowsBefore(peaks, cap)[k]));
        expect([...rankMarkers(peaks, cap, belowCap)].map((i) => peaks[i])).toEqual(markersRule(peaks, cap, belowCap));
      },
    ), { numRuns: 300 });
  });

  it('keeps only the first rows without sorting them all, and they are the same as after a full sort (long tables, few kept)', () => {
    fc.assert(fc.property(
      fc.array(fc.record({
        snr: fc.option(fc.oneof(fc.constantFrom(3, 3, 3, 10, 0, -0, Infinity, -Infinity), fc.integer({ min: -5, max: 40 }), fc.double({ noNaN: true })), { nil: null }),
        origin: fc.constantFrom('detected', 'detected', 'detected', 'detected', 'added-by-user'),
        removed: fc.integer({ min: 0, max: 9 }).map((k) => k === 0),
        flag: fc.constantFrom('quantifiable', 'detectable', 'below-detection', 'below-detection'),
      }), { minLength: 100, maxLength: 1500 }),
      fc.integer({ min: 0, max: 120 }),
      fc.integer({ min: 0, max: 60 }),
      (specs, cap, belowCap) => {
        const peaks = specs.map((s, i) => fakePeak(i, s.snr, s.origin, s.removed, s.flag));
        expect([...rankTableRows(peaks, cap)].map((i) => peaks[i])).toEqual(pickRowsBefore(peaks, cap));
        expect([...rankMarkers(peaks, cap, belowCap)].map((i) => peaks[i])).toEqual(markersRule(peaks, cap, belowCap));
      },
    ), { numRuns: 150 });
  });

  it('the first k by key equal a full sort cut at k, −0 and +0 equal, ties in index order; a NaN key sorts all as before', () => {
    fc.assert(fc.property(
      fc.array(fc.oneof(fc.constantFrom(0, -0, 1, 1, 2, Infinity, -Infinity), fc.double({ noNaN: true })), { maxLength: 400 }),
      fc.integer({ min: -2, max: 420 }),
      fc.boolean(),
      (keys, k, withNaN) => {
        const key = Float64Array.from(withNaN && keys.length ? [...keys.slice(1), NaN] : keys);
        const idx = Array.from(key, (_, i) => i).filter((i) => i % 3 !== 1);
        const full = [...idx].sort((a, b) => key[b] - key[a] || a - b).slice(0, Math.max(0, k));
        expect(firstByKey(idx, key, k)).toEqual(full);
      },
    ), { numRuns: 300 });
  });

  it('on a real long table: the worker ranks, the columns cross, and the page gets the same rows as its own ranking', () => {
    const rng = makeRng(16);
    const n = 40_000;
    const x = Array.from({ length: n }, (_, i) => i * 0.001);
    const y = x.map((_, i) => rng.normal() + (i % 997 < 5 ? 12 : 0));
    const t = createTrace({ name: 't', x, y, source: { fileName: 't.csv', sha256: '0'.repeat(64), rowsRead: n, rowsSkipped: 0 } });
    const r = analyse({ sampleId: t.id, scanIds: [], recipe: emptyRecipe() }, new Map([[t.id, t]]), STEP_REGISTRY);
    expect(r.peaks.length).toBeGreaterThan(100); // a capped table, as on a long noisy trace
    // A peak removed and one added by hand, as the user's decisions make them.
    const peaks = r.peaks.map((p, i) => (i === 7 ? { ...p, removedByUser: true } : i === 11 ? { ...p, origin: 'added-by-user' as const } : p));
    const view = structuredClone(peakView(peaks, 100, 50));
    const cols = structuredClone(toColumns(peaks as unknown as Record<string, unknown>[]));
    // Count the rows the page makes: each made row reads the values of the x column once.
    let made = 0;
    cols.columns.x = new Proxy(cols.columns.x, { get: (t, k, r) => { if (k === 'values') made++; return Reflect.get(t, k, r); } });
    const onPage = lazyRows<Peak>(cols);
    rememberPeakView(onPage, view);
    const shown = peakTableRows(onPage, 100);
    const drawn = plotMarkers(onPage, 50);
    const totals = tableTotals(onPage);
    // Only the rows shown and drawn were made on the page.
    expect(made).toBe(new Set([...view.rows, ...view.markers]).size);
    expect(made).toBeLessThan(peaks.length);
    expect(shown).toEqual(pickRowsBefore(peaks, 100));
    expect(shown[0]).toBe(onPage[view.rows[0]]);
    expect(drawn).toEqual(markersRule(peaks, 50, PLOT_MARKERS_BELOW));
    expect(drawn.filter((p) => p.flag === 'below-detection' && p.origin !== 'added-by-user').length).toBeLessThanOrEqual(PLOT_MARKERS_BELOW);
    expect(totals).toEqual(totalsBefore(peaks));
    // Without the worker's view (the in-process backend) the page ranks and counts the same itself.
    const plain = fromColumns<Peak>(toColumns(peaks as unknown as Record<string, unknown>[]));
    expect(peakTableRows(plain, 100)).toEqual(shown);
    expect(plotMarkers(plain, 50)).toEqual(drawn);
    expect(tableTotals(plain)).toEqual(totals);
    expect(peakTotals(plain)).toEqual(totals);
  });
});
