import { useEffect, useState } from 'react';
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

/**
 * The time to print as "printed at": when the page was drawn, and again at the moment the browser
 * prints (its beforeprint event), so a handover opened at
 * the start of the shift and printed later says when it was printed.
 */
export function usePrintTime(): number {
  const [at, setAt] = useState(() => Date.now());
  useEffect(() => {
    // beforeprint is a discrete event to React: the update is drawn before the browser lays out the paper.
    const now = () => setAt(Date.now());
    window.addEventListener('beforeprint', now);
    return () => window.removeEventListener('beforeprint', now);
  }, []);
  return at;
}
