/**
 * The service worker (scripts/sw-template.js, built to dist/sw.js) lets an installed Warmfold
 * open with no connection. It is registered after the page has loaded and the browser is idle,
 * never on the first paint's path, and only where browsers allow one (HTTPS, or localhost).
 */
import { useSyncExternalStore } from 'react';

/** The service worker's cache of API answers (patient data); the name is the worker's. */
const API_CACHE = 'warmfold-api';
/** The pages opened online, by path (their addresses name infants); the name is the worker's. */
const PAGE_CACHE = 'warmfold-pages';

let applyUpdate: (() => void) | null = null;
const listeners = new Set<() => void>();
function setUpdate(next: (() => void) | null) {
  applyUpdate = next;
  listeners.forEach((l) => l());
}

export function registerServiceWorker(): () => void {
  if (typeof window === 'undefined' || !('serviceWorker' in navigator) || !window.isSecureContext) return () => {};
  let cancelled = false;
  let idle: number | undefined;
  const start = () => {
    if (cancelled) return;
    void import('workbox-window').then(({ Workbox }) => {
      if (cancelled) return;
      const wb = new Workbox('/sw.js');
      // A new build waits until the nurse chooses to reload, so a form in progress is never lost.
      wb.addEventListener('waiting', () => {
        setUpdate(() => {
          wb.addEventListener('controlling', () => window.location.reload());
          wb.messageSkipWaiting();
        });
      });
      wb.register().catch(() => {
        // No worker (a private window, storage refused): the app works online as before.
      });
    });
  };
  const whenIdle = () => {
    idle = window.requestIdleCallback ? window.requestIdleCallback(start, { timeout: 5_000 }) : window.setTimeout(start, 1_000);
  };
  if (document.readyState === 'complete') whenIdle();
  else window.addEventListener('load', whenIdle, { once: true });
  return () => {
    cancelled = true;
    window.removeEventListener('load', whenIdle);
    if (idle !== undefined) (window.cancelIdleCallback ?? window.clearTimeout)(idle);
  };
}

/**
 * Sign-out and a change of user: forget every stored API answer on this device, and the pages
 * kept by their addresses. The worker's precache (the build's own files) holds no patient data.
 */
export function clearPatientData(): Promise<void> {
  if (typeof window === 'undefined' || !('caches' in window)) return Promise.resolve();
  navigator.serviceWorker?.controller?.postMessage({ type: 'CLEAR_PATIENT_DATA' });
  return Promise.all([caches.delete(API_CACHE), caches.delete(PAGE_CACHE)]).then(
    () => undefined,
    () => undefined,
  );
}

/** A function that switches to the new build and reloads, once one is waiting; else null. */
export function useUpdateReady(): (() => void) | null {
  return useSyncExternalStore(
    (cb) => {
      listeners.add(cb);
      return () => listeners.delete(cb);
    },
    () => applyUpdate,
    () => null,
  );
}
