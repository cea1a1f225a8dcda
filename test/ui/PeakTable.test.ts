/**
 * src/ui/PeakTable.tsx: the peak table as a chemist reads it. Checked by
 * visible text and attributes (aria-labels, titles), not by the table's
 * layout: the status words against the detection (S/N 3) and quantitation
 * (S/N 10) limits of ICH Q2(R1) (2005), section 6 (common practice for
 * H/σ); the count sentence adds up; the cap on a long table keeps the
 * user's decisions first, then the highest S/N (DISPLAY_CAPS.peakRows,
 * ranked by src/worker/peak-rank.ts; here no worker ranked, so the page
 * runs the same functions) and says how many of how many it shows; a peak
 * that appears only after processing is marked; hand decisions are shown as
 * such. The ranking functions themselves are tested in
 * test/worker/peak-rank.test.ts.
 */
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { ReactNode } from 'react';
import type { Peak } from '../../src/core/measure/peak-types.ts';
import { MARK_TEXT } from '../../src/core/export/peak-csv.ts';
import { DISPLAY_CAPS } from '../../src/state/display-caps.ts';
import { useApp } from '../../src/state/store.ts';
import { num } from '../../src/ui/format.ts';
import { PeakTable } from '../../src/ui/PeakTable.tsx';
import { analyseNow, elements, html, loadDemoSample, press, resetStore, text, textOf, tree, withAllRows } from './harness.ts';

vi.mock('plotly.js-strict-dist-min', () => ({ default: {} }));
beforeEach(() => resetStore());

/** The table's peak rows, in the order shown: each with its aria-label, visible text and every title inside it. */
function rows(t: ReactNode) {
  return elements(withAllRows(t)).filter((e) => e.type === 'tr' && /^Peak \d+ at /.test(String(e.props['aria-label'] ?? ''))).map((r) => ({
    label: String(r.props['aria-label']),
    text: textOf(r),
    titles: elements(r.props.children).map((e) => String(e.props.title ?? '')).filter(Boolean),
    element: r,
  }));
}

/** The counts the summary sentence states. */
function summaryCounts(h: string) {
  const m = /(\d+) quantifiable \(S\/N ≥ (\d+)\), (\d+) detected but not quantifiable \((\d+) ≤ S\/N < (\d+)\), (\d+) below the detection limit/.exec(text(h));
  if (!m) throw new Error('no count sentence');
  return { q: Number(m[1]), loq: Number(m[2]), d: Number(m[3]), lod: Number(m[4]), loq2: Number(m[5]), b: Number(m[6]) };
}

/** The status the limits give an S/N (ICH Q2(R1): detection at 3, quantitation at 10). */
const expectedStatus = (snr: number) => (snr >= 10 ? 'quantifiable' : snr >= 3 ? 'detected, not quantifiable' : 'below detection limit');

describe('PeakTable on the demo sample', () => {
  it('nothing loaded: no table', () => {
    expect(html(PeakTable)).toBe('');
  });

  it('each row’s status words follow its S/N against the limits 3 and 10; rows in position order', async () => {
    await loadDemoSample();
    const peaks = useApp.getState().result!.peaks;
    expect(useApp.getState().result!.peakOptions!.limits).toEqual({ detection: 3, quantitation: 10 });
    const shown = rows(tree(PeakTable));
    expect(shown).toHaveLength(peaks.length);
    const byX = [...peaks].sort((a, b) => a.x - b.x);
    const statuses = new Set<string>();
    shown.forEach((r, i) => {
      const p = byX[i];
      expect(r.label).toBe(`Peak ${i + 1} at ${num(p.x)}; press Enter to zoom to it`);
      expect(r.text).toContain(num(p.snr, 3));
      const want = expectedStatus(p.snr!);
      statuses.add(want);
      expect(r.text, `S/N ${p.snr}`).toContain(want);
      if (want === 'quantifiable') expect(r.text).not.toContain('not quantifiable');
    });
    // The demo (public/demo/demo-truth.json) has peaks on each side of both limits: S/N 160 down to noise bumps.
    expect(statuses).toEqual(new Set(['quantifiable', 'detected, not quantifiable', 'below detection limit']));
  });

  it('the count sentence names the limits 3 and 10 and adds up to the rows; no "Showing" sentence when nothing is cut', async () => {
    await loadDemoSample();
    const peaks = useApp.getState().result!.peaks;
    const h = html(PeakTable);
    const c = summaryCounts(h);
    expect([c.lod, c.loq, c.loq2]).toEqual([3, 10, 10]);
    expect(c.q).toBe(peaks.filter((p) => p.snr! >= 10).length);
    expect(c.d).toBe(peaks.filter((p) => p.snr! >= 3 && p.snr! < 10).length);
    expect(c.b).toBe(peaks.filter((p) => p.snr! < 3).length);
    expect(c.q + c.d + c.b).toBe(rows(tree(PeakTable)).length);
    expect(text(h)).not.toContain('Showing');
  });

  it('a peak removed by hand stays in the table, says so, is left out of the counts, and can be restored', async () => {
    await loadDemoSample();
    const victim = useApp.getState().result!.peaks.find((p) => p.flag === 'detectable')!;
    useApp.getState().removePeakAt(victim.x);
    await analyseNow();
    const t = tree(PeakTable);
    const all = rows(t);
    const removed = all.filter((r) => r.text.includes('removed by hand'));
    expect(removed).toHaveLength(1);
    expect(removed[0].label).toContain(`at ${num(victim.x)}`);
    const c = summaryCounts(html(PeakTable));
    expect(c.q + c.d + c.b).toBe(all.length - 1);
    expect(text(html(PeakTable))).toContain('undo all hand edits');
    press(removed[0].element.props.children, 'restore');
    expect(useApp.getState().decisions.removed).toEqual([]);
  });

  it('a feature that appears only after processing is marked so, in words and in its title', async () => {
    await loadDemoSample();
    // A 41-point moving average on the 0.01-min grid (demo-truth.json) is far wider than the 0.047-min peak: it makes features of its own.
    useApp.getState().addStep('moving-average');
    useApp.getState().setParam(useApp.getState().recipe.steps[0].uid, 'window', 41);
    await analyseNow();
    const born = useApp.getState().result!.peaks.filter((p) => p.marks.includes('appears-only-after-processing'));
    expect(born.length).toBeGreaterThan(0);
    const shown = rows(tree(PeakTable));
    for (const p of born) {
      const r = shown.find((x) => x.label.includes(`at ${num(p.x)};`))!;
      expect(r.text).toContain('only after processing');
      expect(r.titles.join(' ')).toContain(MARK_TEXT['appears-only-after-processing']);
    }
    const plain = shown.filter((r) => !born.some((p) => r.label.includes(`at ${num(p.x)};`)));
    expect(plain.length).toBeGreaterThan(0);
    for (const r of plain) expect(r.text).not.toContain('only after processing');
  });
});

describe('PeakTable on a long table (more than DISPLAY_CAPS.peakRows candidates)', () => {
  const N = DISPLAY_CAPS.peakRows + 200;
  /** N invented peaks cloned from a demo peak: distinct S/N (i·7919 mod 1000 / 10, no ties), flags from the limits; three hand decisions with low S/N. */
  async function longTable(): Promise<Peak[]> {
    await loadDemoSample();
    const r = useApp.getState().result!;
    const base = r.peaks[0];
    const peaks: Peak[] = Array.from({ length: N }, (_, i) => {
      const snr = ((i * 7919) % 1000) / 10;
      return { ...base, index: i, x: 0.01 * i, start: 0.01 * i - 0.002, end: 0.01 * i + 0.002, snr, snrRms: snr, flag: snr >= 10 ? 'quantifiable' : snr >= 3 ? 'detectable' : 'below-detection', marks: [], origin: 'detected', removedByUser: false, note: undefined };
    });
    peaks[5] = { ...peaks[5], origin: 'added-by-user', snr: 0.5, flag: 'below-detection' };
    peaks[6] = { ...peaks[6], origin: 'added-by-user', snr: 0.4, flag: 'below-detection' };
    peaks[7] = { ...peaks[7], removedByUser: true, snr: 0.2, flag: 'below-detection' };
    useApp.setState({ result: { ...r, peaks } });
    return peaks;
  }

  it('shows the hand decisions and then the highest S/N, DISPLAY_CAPS.peakRows in all, highest S/N first', async () => {
    const peaks = await longTable();
    const shown = rows(tree(PeakTable));
    expect(shown).toHaveLength(DISPLAY_CAPS.peakRows);
    const hand = [peaks[5], peaks[6], peaks[7]];
    const rest = peaks.filter((p) => !hand.includes(p)).sort((a, b) => b.snr! - a.snr!).slice(0, DISPLAY_CAPS.peakRows - hand.length);
    const want = [...hand, ...rest].sort((a, b) => b.snr! - a.snr! || a.x - b.x);
    expect(shown.map((r) => r.label)).toEqual(want.map((p, i) => `Peak ${i + 1} at ${num(p.x)}; press Enter to zoom to it`));
    // The lowest S/N kept among the others is above every S/N left out.
    const leftOut = peaks.filter((p) => !want.includes(p));
    expect(Math.min(...rest.map((p) => p.snr!))).toBeGreaterThan(Math.max(...leftOut.map((p) => p.snr!)));
    expect(shown.filter((r) => r.text.includes('added by hand'))).toHaveLength(2);
    expect(shown.filter((r) => r.text.includes('removed by hand'))).toHaveLength(1);
  });

  it('issue 16: the page draws only the first rows of the long table; the table says it has them all, each drawn row its place', async () => {
    await longTable();
    const h = html(PeakTable);
    // The header row and DISPLAY_CAPS.peakRows rows (no detail row open).
    expect(h).toContain(`aria-rowcount="${DISPLAY_CAPS.peakRows + 1}"`);
    const drawn = Array.from(h.matchAll(/<tr aria-rowindex="(\d+)" data-row-key="[^"]+"[^>]*aria-label="Peak (\d+) at/g)).map((m) => [Number(m[1]), Number(m[2])]);
    expect(drawn.length).toBeGreaterThan(10);
    expect(drawn.length).toBeLessThan(DISPLAY_CAPS.peakRows / 5);
    // Peak n is row n + 1 (the header is row 1), drawn from the top in order.
    drawn.forEach(([index, n], k) => { expect(n).toBe(k + 1); expect(index).toBe(n + 1); });
    // One spacer row below, hidden from assistive technology, stands for the rest; the header keeps its <th scope="col"> and the caption.
    expect(h.match(/<tr class="spacer" aria-hidden="true">/g)).toHaveLength(1);
    expect(h).toContain('<caption class="sr-only">');
    expect(h).toMatch(/<thead><tr aria-rowindex="1"><th scope="col"/);
  });

  it('“Showing N of M” adds up: N rows shown of all M candidates; the counts cover every row not removed', async () => {
    const peaks = await longTable();
    const h = html(PeakTable);
    expect(text(h)).toContain(`Showing the ${DISPLAY_CAPS.peakRows} of ${N} candidates with the highest S/N (and every hand decision); the peak table CSV holds every one.`);
    const c = summaryCounts(h);
    const kept = peaks.filter((p) => !p.removedByUser);
    expect(c.q + c.d + c.b).toBe(N - 1);
    expect(c.q).toBe(kept.filter((p) => p.snr! >= 10).length);
    expect(c.b).toBe(kept.filter((p) => p.snr! < 3).length);
  });

  it('a capped table starts ordered by S/N, a short one by position; both orders are offered', async () => {
    await longTable();
    const order = () => elements(tree(PeakTable)).find((e) => e.type === 'select' && e.props.id === 'peak-order')!;
    expect(order().props.value).toBe('snr');
    expect(elements(order().props.children).map((o) => o.props.value)).toEqual(['x', 'snr']);
    resetStore();
    await loadDemoSample();
    expect(order().props.value).toBe('x');
    // Choosing another order is kept in the component's own state, which static rendering cannot show; e2e/bench-page.spec.ts chooses it in a browser.
  });
});
