/** Off the web there is no service worker (service-worker.web.ts is the web build's). */
export function registerServiceWorker(): () => void {
  return () => {};
}

export function clearPatientData(): Promise<void> {
  return Promise.resolve();
}

export function useUpdateReady(): (() => void) | null {
  return null;
}
