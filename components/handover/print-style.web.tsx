import { useSyncExternalStore } from 'react';
/**
 * A print stylesheet for the handover: A4 or Letter margins, no navigation or buttons, and every
 * scrolling area opened out so the whole handover prints, not just what is on screen.
 */
const PRINT_CSS = `
@page { margin: 12mm 10mm; }
@media print {
  html, body, #root { height: auto !important; overflow: visible !important; background: #fff !important; }
  #root div { overflow: visible !important; }
  [role="navigation"], [data-noprint] { display: none !important; }
  [role="main"] { width: 100% !important; }
  * { color: #000 !important; box-shadow: none !important; }
  [data-print-block] { break-inside: avoid; page-break-inside: avoid; }
  /* The unit summary is one page: compact type for a full 14-bed unit. */
  [aria-label="Unit summary, one row per bed"] * { font-size: 9pt !important; line-height: 1.25 !important; }
  [aria-label="Unit summary, one row per bed"] [role="row"] { padding-top: 2px !important; padding-bottom: 2px !important; }
}
`;

export function PrintStyle() {
  return <style media="print">{PRINT_CSS}</style>;
}

/** When the page was last printed (or opened, until it is printed). */
let printedAt = Date.now();
const listeners = new Set<() => void>();

function onBeforePrint() {
  printedAt = Date.now();
  listeners.forEach((l) => l());
}

function subscribe(listener: () => void): () => void {
  if (listeners.size === 0) {
    window.addEventListener('beforeprint', onBeforePrint);
    // Opened now: until it is printed, "printed at" is the time the handover was opened.
    printedAt = Date.now();
  }
  listeners.add(listener);
  return () => {
    listeners.delete(listener);
    if (listeners.size === 0) window.removeEventListener('beforeprint', onBeforePrint);
  };
}

/**
 * The time to print as "printed at": the moment the browser prints (its beforeprint event), so a
 * handover opened at the start of the shift and printed later says when it was printed. An
 * external store's change is drawn at once (synchronously, before the browser lays out the
 * paper), where a state update from this event could come after the page is printed.
 */
export function usePrintTime(): number {
  return useSyncExternalStore(
    subscribe,
    () => printedAt,
    () => printedAt,
  );
}
