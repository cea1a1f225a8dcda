import { beforeEach, describe, expect, it } from 'vitest';
import { DISPLAY_CAPS } from '../../src/state/display-caps.ts';
import { service } from '../../src/state/service.ts';
import { useApp } from '../../src/state/store.ts';
import { Notices } from '../../src/ui/Notices.tsx';
import { html, press, resetStore, text, tree } from './harness.ts';

// src/ui/Notices.tsx: load reports, warnings and errors, newest first.
beforeEach(() => resetStore());

describe('Notices', () => {
  it('a bad file’s message names the file, the line and the problem, and says nothing loaded was changed', async () => {
    await service.loadBytes(new TextEncoder().encode('time,signal\n0,1\n1,2\n2,abc\n3,4\n'), 'run-07.csv');
    await service.loadBytes(new Uint8Array(0), 'empty.csv');
    const t = text(html(Notices));
    expect(t).toContain('empty.csv: The file is empty (0 bytes).');
    expect(t).toContain('Nothing already loaded was changed.');
    // "2,abc" is on line 4 of run-07.csv; too few rows are left for a trace.
    expect(t).toContain('run-07.csv, line 4: ');
    expect(t).toContain('not a number in column 2 (signal): "abc"');
    expect(t.indexOf('empty.csv')).toBeLessThan(t.indexOf('run-07.csv')); // newest first
  });
  it('errors are alerts for screen readers; info is not', () => {
    useApp.getState().notify('info', 'Loaded a.csv');
    useApp.getState().notify('error', 'b.csv, line 3: not a number');
    const h = html(Notices);
    expect(h).toMatch(/<div class="notice notice-error" role="alert"[^>]*><div class="notice-head"><strong>b\.csv, line 3: not a number<\/strong>/);
    expect(h).not.toMatch(/notice-info" role="alert"/);
  });
  it('shows at most the display cap of notices', () => {
    for (let i = 0; i < DISPLAY_CAPS.noticesShown + 3; i++) useApp.getState().notify('info', `n${i}`);
    expect(html(Notices).match(/data-testid="notice-info"/g)).toHaveLength(DISPLAY_CAPS.noticesShown);
  });
  it('a file being read shows its name, progress and a cancel button; a failed computation is an alert', () => {
    useApp.getState().setLoading({ fileName: 'big.csv', fraction: 0.25 });
    useApp.getState().setComputeError('out of memory');
    const h = html(Notices);
    expect(text(h)).toContain('Reading big.csv…');
    expect(h).toContain('<progress max="1" value="0.25" aria-label="Reading big.csv">');
    expect(text(h)).toContain('Computation failed: out of memory');
    press(tree(Notices), 'cancel');
    expect(useApp.getState().loading).toBeNull();
    expect(useApp.getState().notices[0].title).toBe('Loading cancelled');
  });
  it('dismiss removes that notice only', () => {
    useApp.getState().notify('info', 'keep me');
    useApp.getState().notify('warning', 'drop me');
    press(tree(Notices), 'Dismiss notice: drop me');
    expect(useApp.getState().notices.map((n) => n.title)).toEqual(['keep me']);
  });
  it('a file with one bad row loads with a warning naming the skipped line', async () => {
    const rows = ['time,signal', ...Array.from({ length: 8 }, (_, i) => `${i},${i % 3}`)];
    rows.splice(3, 0, '2.5,n/a'); // line 4
    await service.loadBytes(new TextEncoder().encode(rows.join('\n') + '\n'), 'run-08.csv');
    const h = html(Notices);
    expect(h).toContain('data-testid="notice-warning"');
    expect(text(h)).toMatch(/Line 4 skipped: .+\(“2\.5,n\/a”\)/);
  });
});
