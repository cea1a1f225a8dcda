import { describe, expect, it } from 'vitest';
import type { LedgerCell, LedgerRow } from '../../src/core/measure/loss-matching.ts';
import { againstRaw, columnVerdict, focusWindow, rowAt, sharedYRange } from '../../src/ui/focus.ts';

// Issue 17: the focused view's verdict words, the feature a click means, the window and the shared y scale.
// Hand-made ledger rows; the 80 % height rule is HEIGHT_LOSS_TOLERANCE (0.2) of core/measure/residual-tests.ts.
const cell = (found: boolean, over: Partial<LedgerCell> = {}): LedgerCell => ({
  found, peakIndex: found ? 0 : -1, x: found ? 5 : null, snr: found ? 20 : null, standing: found ? 'quantifiable' : 'lost',
  height: found ? 1 : null, area: found ? 2 : null, fwhm: found ? 0.1 : null,
  heightKept: found ? 100 : null, widthChange: found ? 0 : null, apexShift: found ? 0 : null, apexShiftPoints: found ? 0 : null, areaChange: found ? 0 : null, crossed: null, ...over,
});
const row = (cells: LedgerCell[], position = 5, firstFoundIn = 0): LedgerRow => ({ position, tolerance: 0.02, firstFoundIn, cells, crossed: cells.some((c) => c.crossed), sentences: [] });

describe('columnVerdict', () => {
  it('reads kept, weakened (limit crossed or under 80 % height), lost and appears only after processing', () => {
    const r = row([cell(true), cell(true, { heightKept: 80 }), cell(true, { heightKept: 79.9 }), cell(true, { crossed: 'down', standing: 'detectable' }), cell(false)]);
    expect(r.cells.map((_, k) => columnVerdict(r, k))).toEqual(['reference', 'kept', 'weakened', 'weakened', 'lost']);
    const born = row([cell(false), cell(true), cell(false)], 5, 1);
    expect(born.cells.map((_, k) => columnVerdict(born, k))).toEqual(['reference', 'appears only after processing', 'not found']);
  });
});

describe('rowAt, focusWindow, sharedYRange, againstRaw', () => {
  const rows = [row([cell(true)], 5), row([cell(true, { fwhm: 0.5 })], 6)];
  it('takes the nearest feature within its tolerance or half-height width, else none', () => {
    expect(rowAt(rows, 5.05)?.position).toBe(5);
    expect(rowAt(rows, 5.6)?.position).toBe(6);
    expect(rowAt(rows, 4.8)).toBeNull();
  });
  it('shows four half-height widths either side, at least ten samples', () => {
    expect(focusWindow(rows[1], 0.01)).toEqual([4, 8]);
    expect(focusWindow(row([cell(true, { fwhm: 0.001 })], 1), 0.01)).toEqual([0.9, 1.1]);
  });
  it('one y scale over every series inside the window', () => {
    const a = { x: [0, 1, 2, 3], y: [9, 1, 2, 9] }, b = { x: [1.5, 2.5, 9], y: [-1, 3, 50] };
    expect(sharedYRange([a, b], 1, 2.5)).toEqual([-1, 3]);
    expect(sharedYRange([a], 10, 20)).toBeNull();
  });
  it('changes against raw in %', () => {
    expect(againstRaw(2, 1.5)).toBe(-25);
    expect(againstRaw(0, 1)).toBeNull();
    expect(againstRaw(null, 1)).toBeNull();
  });
});
