/**
 * Reading an uploaded CSV file before any row is checked: is it text, which separator, and
 * its rows one physical line each. Pure, so the server and the tests agree.
 *
 * - UTF-8 with or without a byte-order mark; anything else (a spreadsheet saved in a legacy
 *   code page, a PNG renamed .csv) is refused as a whole with the reason.
 * - The separator is a comma or a semicolon, whichever the header line uses (a spreadsheet in a
 *   locale with decimal commas writes semicolons).
 * - Each row is one line (RFC 4180 allows a quoted line break; Warmfold's files have no free
 *   text, so a line break inside quotes is a broken row). A row whose quote is not closed is an
 *   error on that line alone and never takes the next line with it.
 */
import { tzOffset } from '@date-fns/tz';
import Papa from 'papaparse';

export type Row = Record<string, string>;
export type Delimiter = ',' | ';';

const SIGNATURES: [number[], string][] = [
  [[0x89, 0x50, 0x4e, 0x47], 'a PNG image'],
  [[0xff, 0xd8, 0xff], 'a JPEG image'],
  [[0x47, 0x49, 0x46, 0x38], 'a GIF image'],
  [[0x25, 0x50, 0x44, 0x46], 'a PDF document'],
  [[0x50, 0x4b, 0x03, 0x04], 'a zip file (an .xlsx workbook is one)'],
  [[0xd0, 0xcf, 0x11, 0xe0], 'an old Excel or Word file'],
];

/** The file's text, or why it is not UTF-8 text (the byte-order mark is dropped). */
export function decodeCsvBytes(bytes: Uint8Array): { text: string } | { error: string } {
  const sig = SIGNATURES.find(([magic]) => magic.every((b, i) => bytes[i] === b));
  if (sig) return { error: `This file is not text: it looks like ${sig[1]}. Save the readings as "CSV UTF-8" and upload that file.` };
  if (bytes.includes(0)) return { error: 'This file is not text (it holds binary data). Save the readings as "CSV UTF-8" and upload that file.' };
  try {
    const text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    return { text: text.replace(/^\uFEFF/, '') };
  } catch {
    return { error: 'This file is not UTF-8 text (perhaps saved in an older spreadsheet encoding). Save it as "CSV UTF-8" and upload it again.' };
  }
}

/** Count the separators outside quotes in the header line; a semicolon wins only when it is the more common. */
export function detectDelimiter(headerLine: string): Delimiter {
  let commas = 0;
  let semicolons = 0;
  let quoted = false;
  for (const ch of headerLine) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && ch === ',') commas += 1;
    else if (!quoted && ch === ';') semicolons += 1;
  }
  return semicolons > commas ? ';' : ',';
}

export interface CsvLines {
  delimiter: Delimiter;
  /** Column names, trimmed and lower-cased. */
  header: string[];
  /** Data rows; `line` counts the header line as 1 and blank lines too. */
  rows: { line: number; values: Row; error?: string }[];
}

/** Split into lines and parse each on its own, so a broken row stays on its line. */
export function parseCsvLines(text: string): CsvLines {
  const lines = text.split(/\r\n|\n|\r/);
  const headerIndex = lines.findIndex((l) => l.trim() !== '');
  if (headerIndex < 0) return { delimiter: ',', header: [], rows: [] };
  const delimiter = detectDelimiter(lines[headerIndex]!);
  const cells = (line: string) => Papa.parse<string[]>(line, { delimiter, header: false, skipEmptyLines: false });
  const header = (cells(lines[headerIndex]!).data[0] ?? []).map((h) => h.trim().toLowerCase());
  const rows: CsvLines['rows'] = [];
  for (let i = headerIndex + 1; i < lines.length; i++) {
    const raw = lines[i]!;
    if (raw.trim() === '' || raw.split(delimiter).every((c) => c.trim() === '')) continue;
    const parsed = cells(raw);
    const values: Row = {};
    const data = parsed.data[0] ?? [];
    header.forEach((h, k) => (values[h] = (data[k] ?? '').trim()));
    let error: string | undefined;
    if (parsed.errors.some((e) => e.code === 'MissingQuotes' || e.code === 'InvalidQuotes') || parsed.data.length > 1) {
      error = 'row: a quoted cell is not closed on this line (each row must be on one line)';
    } else if (data.length !== header.length) {
      error = `row: ${data.length} cells, but the header has ${header.length} (separator "${delimiter}")`;
    }
    rows.push({ line: i + 1, values, ...(error ? { error } : {}) });
  }
  return { delimiter, header, rows };
}

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];
const daysIn = (y: number, m: number) => new Date(Date.UTC(y, m, 0)).getUTCDate();
const TIME = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?(Z|[+-]\d{2}:\d{2})?$/;

/**
 * A row's time. With an offset (Z or ±hh:mm) it is that instant; without one it is the wall
 * clock in the unit's zone, refused when the clocks skip that time or pass it twice. Calendar
 * dates are strict: 2026-11-31 and 2026-02-30 are refused, never rolled into the next month.
 */
export function parseRowTime(text: string, timeZone: string): { at: Date } | { error: string } {
  const m = TIME.exec(text.trim());
  if (!m) return { error: "use a date and time such as 2026-11-16T08:00 (the unit's time) or 2026-11-16T08:00:00Z" };
  const [y, mo, d, h, mi, s] = m.slice(1, 7).map((v) => Number(v ?? '0')) as [number, number, number, number, number, number];
  const ms = Number((m[7] ?? '0').padEnd(3, '0'));
  const zone = m[8];
  if (mo < 1 || mo > 12) return { error: `${m[1]}-${m[2]}-${m[3]} is not a date (there is no month ${m[2]})` };
  if (d < 1 || d > daysIn(y, mo)) return { error: `${m[1]}-${m[2]}-${m[3]} is not a date (${MONTHS[mo - 1]} ${y} has ${daysIn(y, mo)} days)` };
  if (h > 23 || mi > 59 || s > 59) return { error: `${m[4]}:${m[5]} is not a time of day` };
  const wall = Date.UTC(y, mo - 1, d, h, mi, s, ms);
  if (zone) {
    if (zone === 'Z') return { at: new Date(wall) };
    const sign = zone.startsWith('-') ? -1 : 1;
    const [oh, om] = zone.slice(1).split(':').map(Number) as [number, number];
    if (oh > 14 || om > 59) return { error: `${zone} is not a time-zone offset` };
    return { at: new Date(wall - sign * (oh * 60 + om) * 60_000) };
  }
  const offsets = new Set([-86_400_000, 0, 86_400_000].map((delta) => tzOffset(timeZone, new Date(wall + delta))));
  const instants = [...offsets].map((o) => wall - o * 60_000).filter((at) => tzOffset(timeZone, new Date(at)) * 60_000 === wall - at);
  const unique = [...new Set(instants)].sort((a, b) => a - b);
  const shown = text.trim();
  if (unique.length === 0) return { error: `${shown} does not exist in ${timeZone} (the clocks went forward): give the time with its offset` };
  if (unique.length > 1) return { error: `${shown} happened twice in ${timeZone} (the clocks went back): give the time with its offset, such as +01:00 or Z` };
  return { at: new Date(unique[0]!) };
}
