/**
 * CSV writing for exports and report tables (RFC 4180: comma-separated, CRLF line ends, fields
 * quoted when they hold a comma, semicolon, quote or line break: a spreadsheet set to a
 * semicolon-separated locale splits on the semicolon). Downloads begin with CSV_BOM. A text cell that starts with = + - @ or
 * a tab is prefixed with an apostrophe so a spreadsheet never runs it as a formula; numbers are
 * written as they are.
 */
/** The UTF-8 byte-order mark: put before a downloaded CSV, it tells a spreadsheet the file is UTF-8. */
export const CSV_BOM = String.fromCharCode(0xfeff);

export type CsvCell = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;

export function csvCell(value: CsvCell): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (typeof value === 'boolean') return value ? 'true' : 'false';
  let text = value;
  if (FORMULA_START.test(text)) text = `'${text}`;
  return /[",;\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function toCsv(header: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
  return [header, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}
