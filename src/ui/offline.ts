/**
 * The offline copy: in the built page, served over http(s), a service worker
 * (src/offline/service-worker.js, written into the build as sw.js with the
 * list of the build's files) keeps every file of the page, so after one
 * visit it opens and works with the server stopped. The dev server and a
 * page opened from disk get none.
 */
import { useApp } from '../state/store.ts';

/** Register the service worker once the page has loaded. Never throws. */
export function registerOfflineCopy(): void {
  if (!import.meta.env.PROD) return;
  if (typeof navigator === 'undefined' || !('serviceWorker' in navigator)) return;
  if (location.protocol !== 'http:' && location.protocol !== 'https:') return;
  const register = () => {
    navigator.serviceWorker.register('./sw.js').then(
      (reg) => {
        const ready = () => useApp.getState().setOfflineReady(true);
        if (reg.active) ready();
        else void navigator.serviceWorker.ready.then(ready);
      },
      (e: Error) => useApp.getState().notify('warning', 'This browser will not keep an offline copy of the page', [
        `${e.message}. The page works as long as its server runs; nothing else changes.`,
      ]),
    );
  };
  if (document.readyState === 'complete') register();
  else window.addEventListener('load', register, { once: true });
}
