/**
 * src/state/display-caps.ts: how much of a long list the page shows at once.
 * Its promises: every cap is a positive whole number; a cap limits only what
 * is drawn, the full list stays in the store and in the exports (checked
 * here where src/state/service.ts applies one: the skipped lines named in a
 * load notice, while the load report keeps all); the notices shown are a
 * part of the notices kept. The peak-table cap ("the user's decisions
 * always, then the highest S/N") is applied in src/ui/PeakTable.tsx (issue
 * 16's file; test/ui/PeakTable.test.ts); the notices kept in the notices slice
 * (test/state/notices-slice.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { DISPLAY_CAPS } from '../../src/state/display-caps.ts';
import { createService } from '../../src/state/service.ts';
import { createAppStore } from '../../src/state/store.ts';
import { inProcessBackend } from '../../src/worker/bridge.ts';

describe('display caps', () => {
  it('every cap is a positive whole number; the notices shown are at most the notices kept', () => {
    for (const [name, cap] of Object.entries(DISPLAY_CAPS)) expect(Number.isInteger(cap) && cap > 0, name).toBe(true);
    expect(DISPLAY_CAPS.noticesShown).toBeLessThanOrEqual(DISPLAY_CAPS.noticesKept);
  });

  it('a load notice names at most skippedLinesNamed skipped lines and counts the rest; the store’s load report keeps every one', async () => {
    const extra = 4;
    const bad = DISPLAY_CAPS.skippedLinesNamed + extra;
    const lines = ['time,signal'];
    // Every fifth row has a cell that is not a number: `bad` such rows in all.
    for (let i = 0; i < 5 * bad; i++) lines.push(i % 5 === 4 ? `${i},abc` : `${i},${Math.sin(i)}`);
    const store = createAppStore();
    const service = createService(store, () => inProcessBackend());
    expect(await service.loadBytes(new TextEncoder().encode(lines.join('\n')), 'gaps.csv')).toBe(true);
    const s = store.getState();
    const notice = s.notices[0];
    const named = notice.lines.filter((l) => /^Line \d+ skipped: /.test(l));
    expect(named).toHaveLength(DISPLAY_CAPS.skippedLinesNamed);
    // Header on line 1, data row i on line i + 2: the first bad row (i = 4) is line 6.
    expect(named[0]).toMatch(/^Line 6 skipped: not a number in column 2/);
    expect(notice.lines).toContain(`… and ${extra} more skipped rows (all are in the load report).`);
    expect(s.reports[s.traces[0].id].skipped).toHaveLength(bad);
  });
});
