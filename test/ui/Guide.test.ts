import { afterEach, describe, expect, it, vi } from 'vitest';
import { DEFAULT_PEAK_SETTINGS } from '../../src/core/analysis/request.ts';
import { FLAG_TEXT } from '../../src/core/measure/snr-words.ts';
import { THIN_SAMPLING_POINTS } from '../../src/core/measure/peak-table.ts';
import { FirstUseGuide, GUIDE_KEY, guideDismissed, rememberGuideDismissed, SHORTCUTS, ShortcutList } from '../../src/ui/Guide.tsx';
import { html, press, text, tree } from './harness.ts';

// src/ui/Guide.tsx: the first-use guide and the keyboard shortcut list.
afterEach(() => vi.unstubAllGlobals());

describe('FirstUseGuide', () => {
  const t = text(html(FirstUseGuide, { onClose: () => {}, focus: false }), true);
  it('states the limits the page uses by default: detection 3, quantitation 10 (ICH Q2(R1) §6, common practice)', () => {
    expect(DEFAULT_PEAK_SETTINGS.detectionLimit).toBe(3);
    expect(DEFAULT_PEAK_SETTINGS.quantitationLimit).toBe(10);
    expect(t).toContain(`quantifiable: S/N at or above the quantitation limit (${DEFAULT_PEAK_SETTINGS.quantitationLimit} by default)`);
    expect(t).toContain(`between the detection limit (${DEFAULT_PEAK_SETTINGS.detectionLimit}) and the quantitation limit`);
  });
  it('uses the flag words of the peak table and exports, and the thin-peak point count the table uses', () => {
    for (const f of ['quantifiable', 'detectable', 'below-detection'] as const) expect(t).toContain(`${FLAG_TEXT[f]}:`);
    expect(t).toContain(`fewer than ${THIN_SAMPLING_POINTS} points across half height`);
  });
  it('says where σ comes from and that nothing leaves the computer', () => {
    expect(t).toContain('σ, the noise the S/N is measured against, comes from the raw trace');
    expect(t).toContain('it is never measured on the processed trace');
    expect(t).toContain('Nothing leaves this computer.');
  });
  it('Close calls back', () => {
    let closed = 0;
    press(tree(FirstUseGuide, { onClose: () => { closed++; }, focus: false }), 'Close the guide');
    expect(closed).toBe(1);
  });
});

describe('ShortcutList', () => {
  it('a table row per shortcut, keys and what they do', () => {
    const h = html(ShortcutList, { onClose: () => {} });
    expect(h.match(/<tr><td><kbd>/g)).toHaveLength(SHORTCUTS.length);
    for (const s of SHORTCUTS) expect(h).toContain(`<td><kbd>${s.keys}</kbd></td><td>${s.what}</td>`);
    expect(new Set(SHORTCUTS.map((s) => s.keys)).size).toBe(SHORTCUTS.length);
  });
});

describe('guideDismissed / rememberGuideDismissed', () => {
  it('remembered in localStorage under its key; unreadable storage means “not dismissed” and never throws', () => {
    const m = new Map<string, string>();
    vi.stubGlobal('localStorage', { getItem: (k: string) => m.get(k) ?? null, setItem: (k: string, v: string) => { m.set(k, v); } });
    expect(guideDismissed()).toBe(false);
    rememberGuideDismissed();
    expect(m.get(GUIDE_KEY)).toBe('1');
    expect(guideDismissed()).toBe(true);
    vi.stubGlobal('localStorage', { getItem: () => { throw new Error('SecurityError'); }, setItem: () => { throw new Error('SecurityError'); } });
    expect(guideDismissed()).toBe(false);
    expect(() => rememberGuideDismissed()).not.toThrow(); // throwing here would be the bug (blocked storage)
  });
});
