import type { ReactNode } from 'react';

/**
 * One printed section that starts on a new page and repeats `header` at the top of every page it
 * runs onto: a table's header group is repeated by the browser on each printed page (CSS 2.1
 * §17.2, `table-header-group`), which a fixed or running header cannot do per section in Chromium.
 * On screen the header row is hidden (the screen shows the same facts above).
 */
export function PrintPage({ header, children, first = false }: { header: ReactNode; children: ReactNode; first?: boolean }) {
  return (
    <table className={first ? 'wf-print-page wf-print-first' : 'wf-print-page'} role="presentation">
      <thead>
        <tr>
          <td className="wf-print-header">{header}</td>
        </tr>
      </thead>
      <tbody>
        <tr>
          <td>{children}</td>
        </tr>
      </tbody>
    </table>
  );
}

/** The print rules for PrintPage (one copy on the page). */
export const PRINT_PAGE_CSS = `
.wf-print-page { width: 100%; border-collapse: collapse; border: 0; }
.wf-print-page > thead > tr > td, .wf-print-page > tbody > tr > td { padding: 0; border: 0; vertical-align: top; }
@media screen { .wf-print-header { display: none; } }
@media print {
  @page { size: A4; margin: 10mm; }
  .wf-print-page { break-before: page; page-break-before: always; }
  .wf-print-page.wf-print-first { break-before: auto; page-break-before: auto; }
  .wf-print-page > thead { display: table-header-group; }
  .wf-print-header { font: 600 10pt/1.3 Inter, system-ui, sans-serif; padding: 0 0 4mm 0 !important; border-bottom: 0.3mm solid #000 !important; }
  .wf-screen-only { display: none !important; }
}
@media screen { .wf-print-only { display: none !important; } }
`;

export function PrintPageStyle() {
  return <style>{PRINT_PAGE_CSS}</style>;
}

/** Shown only on paper. */
export function PrintOnly({ children }: { children: ReactNode }) {
  return <div className="wf-print-only">{children}</div>;
}
