import { beforeEach, describe, expect, it } from 'vitest';
import { useApp } from '../../src/state/store.ts';
import { ExcludedRanges } from '../../src/ui/ExcludedRanges.tsx';
import { button, html, press, resetStore, text, tree } from './harness.ts';

// src/ui/ExcludedRanges.tsx: ranges left out of peak finding; the trace is never changed.
beforeEach(() => resetStore());

describe('ExcludedRanges', () => {
  it('without a marked range the button is disabled and says to mark one first', () => {
    const b = button(tree(ExcludedRanges, { xUnit: 'min' }), 'Leave the marked range out of peak finding');
    expect(b.props.disabled).toBe(true);
    expect(b.props.title).toBe('Mark a range on the plot first.');
    expect(text(html(ExcludedRanges, { xUnit: 'min' }))).not.toContain('Left out of peak finding:');
  });
  it('with a marked range: pressing keeps it (in order, merged with an overlapping one) and clears the mark', () => {
    useApp.getState().setPeakSettings({ excluded: [[2, 3]] });
    useApp.getState().setMarkedRange([0.8, 0.2]); // dragged right to left
    const b = button(tree(ExcludedRanges, { xUnit: 'min' }), 'Leave the marked range out of peak finding');
    expect(b.props.disabled).toBe(false);
    expect(String(b.props.title)).toContain('the trace itself is not changed');
    press(tree(ExcludedRanges, { xUnit: 'min' }), 'Leave the marked range out of peak finding');
    expect(useApp.getState().peakSettings.excluded).toEqual([[0.2, 0.8], [2, 3]]);
    expect(useApp.getState().markedRange).toBeNull();
    useApp.getState().setMarkedRange([2.5, 4]);
    press(tree(ExcludedRanges, { xUnit: 'min' }), 'Leave the marked range out of peak finding');
    expect(useApp.getState().peakSettings.excluded).toEqual([[0.2, 0.8], [2, 4]]);
  });
  it('lists each range with its unit and puts one back on its own', () => {
    useApp.getState().setPeakSettings({ excluded: [[0.2, 0.8], [2, 4]] });
    expect(text(html(ExcludedRanges, { xUnit: 'min' }))).toBe('Leave the marked range out of peak finding Left out of peak finding: 0.2 – 0.8 min put back 2 – 4 min put back');
    press(tree(ExcludedRanges, { xUnit: 'min' }), 'Put 0.2 – 0.8 min back into peak finding');
    expect(useApp.getState().peakSettings.excluded).toEqual([[2, 4]]);
    press(tree(ExcludedRanges, { xUnit: 'min' }), 'Put 2 – 4 min back into peak finding');
    expect(useApp.getState().peakSettings.excluded).toBeUndefined();
  });
});
