import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';

// src/ui/draw-health.ts: a note in localStorage says whether the restored
// session drew. A fake Storage stands in for the browser's; the module is
// imported afresh for each test (it caches whether a note is stored).
class FakeStorage {
  map = new Map<string, string>();
  writes = 0;
  getItem(k: string) { return this.map.get(k) ?? null; }
  setItem(k: string, v: string) { this.writes++; this.map.set(k, v); }
  removeItem(k: string) { this.writes++; this.map.delete(k); }
}
let storage: FakeStorage;
const fresh = async () => { vi.resetModules(); return import('../../src/ui/draw-health.ts'); };

beforeEach(() => { storage = new FakeStorage(); vi.stubGlobal('localStorage', storage); });
afterEach(() => { vi.unstubAllGlobals(); });

describe('draw-health', () => {
  it('nothing stored: no problem', async () => {
    const m = await fresh();
    expect(m.lastDrawProblem()).toBeNull();
  });
  it('a restore that never drew is still noted at the next start', async () => {
    const m = await fresh();
    m.markRestoring();
    const next = await fresh(); // the page reloaded
    const p = next.lastDrawProblem();
    expect(p?.state).toBe('restoring');
    expect(Number.isNaN(Date.parse(p!.at))).toBe(false);
  });
  it('a drawing clears the note', async () => {
    const m = await fresh();
    m.markRestoring();
    m.markDrawn();
    expect(m.lastDrawProblem()).toBeNull();
    expect((await fresh()).lastDrawProblem()).toBeNull();
  });
  it('a failed drawing keeps what failed, cut to 500 characters', async () => {
    const m = await fresh();
    m.markDrawFailed('x'.repeat(800));
    const p = m.lastDrawProblem();
    expect(p?.state).toBe('failed');
    expect(p?.message).toHaveLength(500);
  });
  it('after the first clean drawing, later drawings do not touch storage', async () => {
    const m = await fresh();
    m.markDrawn();
    const w = storage.writes;
    for (let i = 0; i < 5; i++) m.markDrawn();
    expect(storage.writes).toBe(w);
  });
  it('a note from an older start (not yet known to this module) is still cleared by a drawing', async () => {
    storage.setItem('tracewright-draw-health', JSON.stringify({ state: 'failed', at: '2026-01-01T00:00:00Z', message: 'x' }));
    const m = await fresh();
    m.markDrawn();
    expect(m.lastDrawProblem()).toBeNull();
  });
  it('a damaged or foreign note reads as no problem, never an exception', async () => {
    const m = await fresh();
    storage.setItem('tracewright-draw-health', '{not json');
    expect(m.lastDrawProblem()).toBeNull();
    storage.setItem('tracewright-draw-health', JSON.stringify({ state: 'other', at: 'x' }));
    expect(m.lastDrawProblem()).toBeNull();
  });
  it('storage that refuses to write: the page simply does not remember', async () => {
    vi.stubGlobal('localStorage', { getItem: () => null, setItem: () => { throw new Error('QuotaExceededError'); }, removeItem: () => { throw new Error('no'); } });
    const m = await fresh();
    expect(() => m.markDrawFailed('boom')).not.toThrow(); // throwing here would be the bug: it runs inside the plot's error path
    expect(m.lastDrawProblem()).toBeNull();
  });
});
