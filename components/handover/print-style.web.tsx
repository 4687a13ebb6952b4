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
}
`;

export function PrintStyle() {
  return <style media="print">{PRINT_CSS}</style>;
}
