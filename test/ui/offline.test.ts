/// <reference types="vite/client" />
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { registerOfflineCopy } from '../../src/ui/offline.ts';
import { useApp } from '../../src/state/store.ts';
import { resetStore } from './harness.ts';

// src/ui/offline.ts: the built page over http(s) registers sw.js; a refusal
// is a warning that says the page still works; dev, file:// and browsers
// without service workers get nothing. Stand-ins for navigator, location,
// document and window.
let registered: string[];
let outcome: () => Promise<unknown>;
function page(protocol: string, readyState = 'complete') {
  registered = [];
  const listeners: Record<string, () => void> = {};
  vi.stubGlobal('navigator', { serviceWorker: { register: (u: string) => { registered.push(u); return outcome(); }, ready: Promise.resolve({}) } });
  vi.stubGlobal('location', { protocol });
  vi.stubGlobal('document', { readyState });
  vi.stubGlobal('window', { addEventListener: (e: string, f: () => void) => { listeners[e] = f; } });
  return listeners;
}
const settle = () => new Promise((r) => setTimeout(r, 0));

beforeEach(() => { resetStore(); vi.stubEnv('PROD', true); outcome = () => Promise.resolve({ active: {} }); });
afterEach(() => { vi.unstubAllEnvs(); vi.unstubAllGlobals(); });

describe('registerOfflineCopy', () => {
  it('built page over http: registers ./sw.js and says the offline copy is ready', async () => {
    page('http:');
    registerOfflineCopy();
    await settle();
    expect(registered).toEqual(['./sw.js']);
    expect(useApp.getState().offlineReady).toBe(true);
  });
  it('waits for the page’s load event when the page is still loading', async () => {
    const l = page('https:', 'loading');
    registerOfflineCopy();
    expect(registered).toEqual([]);
    l.load();
    await settle();
    expect(registered).toEqual(['./sw.js']);
  });
  it('a refused registration is a warning that says the page works as long as its server runs', async () => {
    page('http:');
    outcome = () => Promise.reject(new Error('SecurityError: insecure'));
    registerOfflineCopy();
    await settle();
    const n = useApp.getState().notices[0];
    expect(n.kind).toBe('warning');
    expect(n.title).toBe('This browser will not keep an offline copy of the page');
    expect(n.lines[0]).toBe('SecurityError: insecure. The page works as long as its server runs; nothing else changes.');
    expect(useApp.getState().offlineReady).toBe(false);
  });
  it('no registration for a page opened from disk, the dev server, or a browser without service workers', () => {
    page('file:');
    registerOfflineCopy();
    expect(registered).toEqual([]);
    page('http:');
    vi.stubEnv('PROD', false);
    registerOfflineCopy();
    expect(registered).toEqual([]);
    vi.stubEnv('PROD', true);
    vi.stubGlobal('navigator', {});
    expect(() => registerOfflineCopy()).not.toThrow(); // "never throws" is its promise
  });
});
