/**
 * The two CSV files Warmfold accepts, with their row checks: pure, so the server and the
 * screens agree. Files are UTF-8 (with or without a byte-order mark), comma- or
 * semicolon-separated (see csv-text.ts), one row per line, with a header row; column names are
 * matched without regard to case or surrounding spaces. Line numbers count the header as 1.
 */
import { emailSchema } from '../schemas/auth';
import { unsafeTextReason } from '../schemas/safe-text';
import { ROLES, type Role } from '../roles';
import { isThermalInputError } from '../thermal/errors';
import { HARD_LIMITS } from '../thermal/limits';
import { toCentiCelsius, type TempUnit } from '../thermal/units';
import { CONTROL_MODES, REMOTE_SITES, type ControlMode, type RemoteSite } from '../vocabulary';
import { unusualValues } from '../plausibility';
import { parseRowTime } from './csv-text';

export const MAX_UPLOAD_BYTES = 1024 * 1024;
export const MAX_UPLOAD_ROWS = 5000;

/** Roster: one person per row. `unit` is the unit's name or id. */
export const ROSTER_COLUMNS = ['name', 'email', 'role', 'unit'] as const;

/**
 * Readings, our own format. One reading per row:
 *
 * | column      | required | meaning |
 * | ----------- | -------- | ------- |
 * | infant      | yes      | the bed label (e.g. N01) or the infant's id, in the chosen unit |
 * | time        | yes      | when taken: 2026-11-16T08:00 is the unit's local time; with an offset (2026-11-16T08:00:00Z, …+01:00) that instant |
 * | probe       | no       | skin probe temperature |
 * | remote      | no       | remote-site temperature (needs `site`) |
 * | site        | with remote | axilla, rectal or other |
 * | unit        | yes      | C or F: the unit of probe and remote |
 * | mode        | no       | skin-servo, air-servo or manual |
 * | output      | no       | heater output, 0–100 (%) |
 * | heart_rate  | no       | beats per minute, 30–300 |
 * | air         | no       | air temperature |
 * | set         | no       | set temperature (a skin set point in skin servo, an air set point otherwise) |
 * | taken_by    | no       | e-mail of the nurse who took the reading, staff of the unit |
 *
 * A row needs at least one of probe, remote or heart_rate. Temperatures may use a decimal comma
 * in a semicolon-separated file. A value outside its usual range (shared/plausibility.ts) is
 * imported only when the charge nurse confirms that row.
 */
export const READINGS_COLUMNS = ['infant', 'time', 'probe', 'remote', 'site', 'unit', 'mode', 'output', 'heart_rate', 'air', 'set', 'taken_by'] as const;
export const READINGS_REQUIRED = ['infant', 'time', 'unit'] as const;

export type Row = Record<string, string>;

/** Which required columns a header lacks. */
export function missingColumns(header: readonly string[], required: readonly string[]): string[] {
  const have = new Set(header.map((h) => h.trim().toLowerCase()));
  return required.filter((c) => !have.has(c));
}

export interface RosterRow {
  name: string;
  email: string;
  role: Role;
  unit: string;
}

export function checkRosterRow(row: Row): { value?: RosterRow; errors: string[] } {
  const errors: string[] = [];
  const name = (row.name ?? '').trim();
  if (name.length < 2) errors.push('name: enter the full name');
  if (name.length > 120) errors.push('name: too long');
  const unsafeName = unsafeTextReason(name);
  if (unsafeName) errors.push(`name: ${unsafeName}`);
  const email = emailSchema.safeParse(row.email ?? '');
  if (!email.success) errors.push(`email: ${email.error.issues[0]?.message ?? 'not valid'}`);
  const role = (row.role ?? '').trim().toLowerCase();
  if (!(ROLES as readonly string[]).includes(role)) errors.push(`role: use one of ${ROLES.join(', ')}`);
  const unit = (row.unit ?? '').trim();
  if (!unit) errors.push('unit: enter the unit name or id');
  if (errors.length) return { errors };
  return { value: { name, email: email.data!, role: role as Role, unit }, errors };
}

export interface ParsedReadingRow {
  infant: string;
  takenAt: Date;
  probeCenti: number | null;
  remoteCenti: number | null;
  remoteSite: RemoteSite | null;
  unit: TempUnit;
  controlMode: ControlMode | null;
  heaterOutputPct: number | null;
  heartRate: number | null;
  airCenti: number | null;
  setCenti: number | null;
  /** The `taken_by` e-mail, lower-cased; null when the file names nobody. */
  takenBy: string | null;
  /** Values outside their usual range: the row is imported only once confirmed. */
  unusual: string[];
}

const DECIMAL = /^-?\d{1,3}(\.\d{1,2})?$/;
const WHOLE = /^\d{1,3}$/;

function temperature(value: string, unit: TempUnit | null, column: string, errors: string[]): number | null {
  // A decimal comma (36,6) is what a semicolon-separated file from a spreadsheet holds.
  const v = value.trim().replace(/^(-?\d{1,3}),(\d{1,2})$/, '$1.$2');
  if (!v) return null;
  if (!DECIMAL.test(v)) {
    errors.push(`${column}: "${v}" is not a number with at most two decimals`);
    return null;
  }
  if (!unit) return null;
  try {
    return toCentiCelsius(Number(v), unit, column);
  } catch (err) {
    errors.push(`${column}: ${isThermalInputError(err) ? `${v} °${unit} is outside 20–45 °C (68–113 °F)` : 'not a temperature'}`);
    return null;
  }
}

/** "a, b or c": the values a column takes, as they are typed in the file. */
function orList(values: readonly string[]): string {
  return values.length < 2 ? values.join('') : `${values.slice(0, -1).join(', ')} or ${values[values.length - 1]}`;
}

function whole(value: string, column: string, min: number, max: number, errors: string[]): number | null {
  const v = value.trim();
  if (!v) return null;
  if (!WHOLE.test(v) || Number(v) < min || Number(v) > max) {
    errors.push(`${column}: use a whole number from ${min} to ${max}`);
    return null;
  }
  return Number(v);
}

/**
 * Check one readings row on its own; a time without an offset is read in `timeZone` (the
 * unit's). The infant, the nurse and the time against admission are checked by the server.
 */
export function checkReadingRow(row: Row, timeZone: string): { value?: ParsedReadingRow; errors: string[] } {
  const errors: string[] = [];
  const infant = (row.infant ?? '').trim();
  if (!infant) errors.push('infant: enter the bed label or infant id');
  const time = (row.time ?? '').trim();
  let takenAt: Date | null = null;
  const parsedTime = parseRowTime(time, timeZone);
  if ('error' in parsedTime) errors.push(`time: ${parsedTime.error}`);
  else takenAt = parsedTime.at;
  const unitText = (row.unit ?? '').trim().toUpperCase();
  const unit: TempUnit | null = unitText === 'C' || unitText === 'F' ? unitText : null;
  if (!unit) errors.push('unit: use C or F');
  const probeCenti = temperature(row.probe ?? '', unit, 'probe', errors);
  const remoteCenti = temperature(row.remote ?? '', unit, 'remote', errors);
  const airCenti = temperature(row.air ?? '', unit, 'air', errors);
  const setCenti = temperature(row.set ?? '', unit, 'set', errors);
  const takenByText = (row.taken_by ?? '').trim().toLowerCase();
  const takenBy = takenByText ? emailSchema.safeParse(takenByText) : null;
  if (takenBy && !takenBy.success) errors.push('taken_by: give the e-mail of the nurse who took the reading');
  const siteText = (row.site ?? '').trim().toLowerCase();
  let remoteSite: ParsedReadingRow['remoteSite'] = null;
  if (siteText) {
    remoteSite = REMOTE_SITES.find((s) => s === siteText) ?? null;
    if (!remoteSite) errors.push(`site: use ${orList(REMOTE_SITES)}`);
  }
  if ((row.remote ?? '').trim() && !siteText) errors.push('site: say where the remote-site temperature was taken');
  if (siteText && !(row.remote ?? '').trim()) errors.push('site: given without a remote-site temperature');
  const modeText = (row.mode ?? '').trim().toLowerCase();
  let controlMode: ParsedReadingRow['controlMode'] = null;
  if (modeText) {
    controlMode = CONTROL_MODES.find((m) => m === modeText) ?? null;
    if (!controlMode) errors.push(`mode: use ${orList(CONTROL_MODES)}`);
  }
  const heaterOutputPct = whole(row.output ?? '', 'output', HARD_LIMITS.heaterOutputPct.min, HARD_LIMITS.heaterOutputPct.max, errors);
  const heartRate = whole(row.heart_rate ?? '', 'heart_rate', HARD_LIMITS.heartRate.min, HARD_LIMITS.heartRate.max, errors);
  if (!(row.probe ?? '').trim() && !(row.remote ?? '').trim() && !(row.heart_rate ?? '').trim()) errors.push('row: give at least a probe, remote-site or heart-rate value');
  if (errors.length || !takenAt || !unit) return { errors };
  const unusual = unusualValues({ probeCenti, remoteCenti, airCenti, setCenti, heartRate, controlMode }, unit).map((u) => u.reason);
  return {
    value: { infant, takenAt, probeCenti, remoteCenti, remoteSite, unit, controlMode, heaterOutputPct, heartRate, airCenti, setCenti, takenBy: takenBy?.data ?? null, unusual },
    errors,
  };
}
