/**
 * src/ui/LossPanel.tsx: "what each choice keeps", read as a chemist reads
 * it: the ledger has one row per feature with its standing in each column
 * in words; what the current stack loses or weakens is said in sentences;
 * noise-level features are left out (and counted) until the box is ticked;
 * a ledger longer than DISPLAY_CAPS.ledgerRows shows the rows that cross a
 * limit first and says "Showing N of M rows"; the window advice states a
 * height kept that follows from the moving average's definition. Checked
 * by visible text and aria-labels on the invented demo (public/demo,
 * demo-truth.json).
 */
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { ReactNode } from 'react';
import { FLAG_TEXT } from '../../src/core/measure/snr-words.ts';
import type { LedgerRow } from '../../src/core/measure/loss-matching.ts';
import { MAX_ALTERNATIVES } from '../../src/core/analysis/index.ts';
import { DISPLAY_CAPS } from '../../src/state/display-caps.ts';
import { useApp } from '../../src/state/store.ts';
import { num } from '../../src/ui/format.ts';
import { LossPanel } from '../../src/ui/LossPanel.tsx';
import { PRESETS } from '../../src/ui/alternatives.ts';
import { analyseNow, button, elements, html, loadDemoSample, loadDemoSmoothed, press, resetStore, text, textOf, tree, withAllRows } from './harness.ts';

vi.mock('plotly.js-strict-dist-min', () => ({ default: {} }));
beforeEach(() => resetStore());

/** The ledger's rows as shown: aria-label and visible text. */
const ledgerRows = (t: ReactNode) => elements(withAllRows(t)).filter((e) => e.type === 'tr' && /^Feature at /.test(String(e.props['aria-label'] ?? '')))
  .map((r) => ({ label: String(r.props['aria-label']), text: textOf(r), cells: elements(r.props.children).filter((e) => e.type === 'td').map(textOf) }));


describe('LossPanel', () => {
  it('nothing to compare: says how to get a comparison, and no ledger', async () => {
    await loadDemoSample();
    const t = text(html(LossPanel));
    expect(t).toContain('Add a step or an alternative to see what each choice keeps.');
    expect(ledgerRows(tree(LossPanel))).toHaveLength(0);
  });

  it('a 41-point moving average (8.7 × the 0.047-min peak’s width) loses the sharp peak at 1.2 min, and the panel says so in words', async () => {
    await loadDemoSmoothed(41);
    const loss = useApp.getState().result!.loss!;
    const t = text(html(LossPanel));
    expect(t).toContain(`The current stack loses or weakens ${loss.currentWarnings.length} features:`);
    for (const w of loss.currentWarnings) expect(t).toContain(w);
    // demo-truth.json: the sharp peak at 1.2 min (S/N 30) is the narrowest; a window 8.7 × its FWHM flattens it.
    const m = /The feature at ([\d.]+) min \(S\/N ([\d.]+) raw\) is lost with the current stack\./.exec(t)!;
    expect(Math.abs(Number(m[1]) - 1.2)).toBeLessThan(0.01);
    expect(Number(m[2])).toBeGreaterThan(10);
    expect(t).not.toContain('No feature found on the raw trace at or above the detection limit is lost');
  });

  it('the ledger: one row per feature, each column’s standing in words, height kept as the ledger measured it', async () => {
    await loadDemoSmoothed(41);
    const loss = useApp.getState().result!.loss!;
    const shown = ledgerRows(tree(LossPanel));
    expect(shown).toHaveLength(loss.ledger.rows.length);
    expect(loss.ledger.alternatives.map((a) => a.label)).toEqual(['no processing (raw)', 'the current stack']);
    loss.ledger.rows.forEach((r, i) => {
      expect(shown[i].label).toBe(`Feature at ${num(r.position, 5)}; press Enter to see it under each choice`);
      r.cells.forEach((c, k) => {
        const words = shown[i].cells[k];
        if (!c.found) expect(words).toBe('lost');
        else {
          expect(words.startsWith(`${FLAG_TEXT[c.standing as keyof typeof FLAG_TEXT]}, S/N ${num(c.snr, 3)}`)).toBe(true);
          if (k > r.firstFoundIn && c.heightKept !== null) expect(words).toContain(`height ${c.heightKept.toFixed(Math.abs(c.heightKept) < 10 ? 1 : 0)} %`);
        }
      });
    });
    // The large peak at 4.3 min (demo-truth.json, FWHM 0.188 min = 18.8 points) is kept but lower: a 41-point average of a Gaussian that wide keeps about half its height.
    const big = shown.find((r) => Math.abs(Number(/^Feature at ([\d.]+);/.exec(r.label)![1]) - 4.3) < 0.01)!;
    expect(big.cells[0]).toMatch(/^quantifiable/);
    expect(big.cells[1]).toMatch(/^quantifiable, S\/N [\d.]+height (\d+) %/);
    const kept = Number(/height (\d+) %/.exec(big.cells[1])![1]);
    // Σ_{k=-20..20} exp(−k²/(2σ²)) / 41 with σ = 18.84/2.3548 points: the mean of a Gaussian over the window (from the definition).
    const sigma = 18.8386 / 2.3548;
    let s = 0;
    for (let k = -20; k <= 20; k++) s += Math.exp(-(k * k) / (2 * sigma * sigma));
    expect(Math.abs(kept - (100 * s) / 41)).toBeLessThan(5); // the measured apex also rides on noise and drift
  });

  it('window advice: the height kept follows from the window and the narrowest peak’s width (mean of a Gaussian over the window)', async () => {
    await loadDemoSmoothed(41);
    const t = text(html(LossPanel));
    const w = Number(/Narrowest quantifiable peak: half-height width ([\d.]+) points on the raw trace\./.exec(t)![1]);
    const m = /Moving average: window = ([\d.]+) × that width; a Gaussian that narrow keeps ([\d.]+) % of its height\./.exec(t)!;
    expect(Math.abs(Number(m[1]) - 41 / w)).toBeLessThan(0.01);
    const sigma = w / (2 * Math.sqrt(2 * Math.log(2)));
    let s = 0;
    for (let k = -20; k <= 20; k++) s += Math.exp(-(k * k) / (2 * sigma * sigma));
    expect(Math.abs(Number(m[2]) - (100 * s) / 41)).toBeLessThan(0.2);
    expect(t).toContain('(Moving-average window up to about 0.5 × the narrowest FWHM (common practice).)');
  });

  it('noise-level features: left out and counted until the box is ticked, then listed as rows', async () => {
    await loadDemoSmoothed(41);
    const before = useApp.getState().result!.loss!;
    expect(before.noiseLevelRows).toBeGreaterThan(0);
    const n = before.noiseLevelRows;
    expect(text(html(LossPanel))).toContain(`${n} noise-level candidate${n === 1 ? '' : 's'} (below the detection limit in every column) left out of the ledger; tick the box above to list them.`);
    const rowsBefore = ledgerRows(tree(LossPanel)).length;
    const box = elements(tree(LossPanel)).find((e) => e.props['data-testid'] === 'ledger-noise-toggle')!;
    expect(box.props.checked).toBe(false);
    (box.props.onChange as (e: unknown) => void)({ target: { checked: true } });
    expect(useApp.getState().ledgerNoiseLevel).toBe(true);
    await analyseNow();
    const after = ledgerRows(tree(LossPanel));
    expect(after.length).toBe(rowsBefore + n);
    expect(text(html(LossPanel))).not.toContain('left out of the ledger');
    // The added rows are below the detection limit in every column that found them.
    const added = after.filter((r) => !before.ledger.rows.some((b) => r.label.startsWith(`Feature at ${num(b.position, 5)};`)));
    expect(added).toHaveLength(n);
    for (const r of added) for (const c of r.cells) expect(c === 'lost' || c.startsWith(FLAG_TEXT['below-detection'])).toBe(true);
  });

  it('a ledger longer than DISPLAY_CAPS.ledgerRows: rows that cross a limit first, in position order, and “Showing N of M rows”', async () => {
    await loadDemoSmoothed(41);
    const r = useApp.getState().result!;
    const proto = r.loss!.ledger.rows[0];
    const M = DISPLAY_CAPS.ledgerRows + 100;
    const rows: LedgerRow[] = Array.from({ length: M }, (_, i) => ({ ...proto, position: 0.01 * (i + 1), crossed: i % 7 === 0 }));
    useApp.setState({ result: { ...r, loss: { ...r.loss!, ledger: { ...r.loss!.ledger, rows } } } });
    const shown = ledgerRows(tree(LossPanel));
    expect(shown).toHaveLength(DISPLAY_CAPS.ledgerRows);
    expect(text(html(LossPanel))).toContain(`Showing ${DISPLAY_CAPS.ledgerRows} of ${M} rows (every row where a limit is crossed first).`);
    const labels = new Set(shown.map((s) => s.label));
    for (const row of rows.filter((x) => x.crossed)) expect(labels.has(`Feature at ${num(row.position, 5)}; press Enter to see it under each choice`)).toBe(true);
    const pos = shown.map((s) => Number(/^Feature at ([\d.]+);/.exec(s.label)![1]));
    expect(pos).toEqual([...pos].sort((a, b) => a - b));
    // Issue 16: the page draws only the first rows of the box; the table counts all of them, and one hidden spacer stands for the rest.
    const h = html(LossPanel);
    expect(h).toContain(`aria-rowcount="${DISPLAY_CAPS.ledgerRows + 1}"`);
    const drawn = Array.from(h.matchAll(/<tr aria-rowindex="(\d+)" data-row-key="([^"]+)"/g));
    expect(drawn.length).toBeGreaterThan(10);
    expect(drawn.length).toBeLessThan(DISPLAY_CAPS.ledgerRows / 5);
    drawn.forEach((m, k) => { expect(Number(m[1])).toBe(k + 2); expect(Number(m[2])).toBe(pos[k]); });
    expect(h.match(/<tr class="spacer" aria-hidden="true">/g)).toHaveLength(1);
  });

  it('an empty stack compared with an alternative loses nothing (the current stack is the raw trace), and the panel says so', async () => {
    await loadDemoSample();
    press(tree(LossPanel), PRESETS[0].label);
    await analyseNow();
    const loss = useApp.getState().result!.loss!;
    expect(loss.ledger.alternatives).toHaveLength(3); // raw, the current stack, the alternative
    for (const r of loss.ledger.rows) expect(r.cells[1].found).toBe(r.cells[0].found);
    const t = text(html(LossPanel));
    expect(t).toContain('No feature found on the raw trace at or above the detection limit is lost or weakened by the current stack.');
    expect(t).not.toContain('The current stack loses or weakens');
  });

  it('a preset adds its alternative once (a second press says it is already there); the buttons stop at MAX_ALTERNATIVES', async () => {
    await loadDemoSample();
    press(tree(LossPanel), PRESETS[1].label);
    expect(useApp.getState().alternatives.map((a) => a.label)).toEqual([PRESETS[1].label]);
    press(tree(LossPanel), PRESETS[1].label);
    expect(useApp.getState().alternatives).toHaveLength(1);
    expect(useApp.getState().notices[0].lines.join(' ') + useApp.getState().notices[0].title).toContain('is already in the comparison');
    expect(text(html(LossPanel))).toContain(PRESETS[1].label);
    expect(button(tree(LossPanel), `Remove alternative ${PRESETS[1].label}`)).toBeTruthy();
    useApp.setState({ alternatives: Array.from({ length: MAX_ALTERNATIVES }, (_, i) => ({ ...useApp.getState().alternatives[0], id: `a${i}`, label: `alt ${i}` })) });
    for (const p of PRESETS) expect(button(tree(LossPanel), p.label).props.disabled).toBe(true);
  });
});
