/**
 * A large invented unit for the benchmark: by default 60 beds, 60 infants and 14 days of hourly
 * readings each (about 20,000), with gap flags, the actions that answered them, staff and the
 * current shift's assignments. Every name is made up. Rows go in through prepared statements in
 * one transaction, because one transaction per row would cost an fsync each under synchronous=FULL.
 */
import bcrypt from 'bcryptjs';
import { randomUUID } from 'node:crypto';
import { openDatabase, writeTx } from '../db/client';
import { syncFlags } from '../server/services/flags';
import { shiftAt } from '../shared/shifts';

export const BENCH_PASSWORD = 'warm-hands-at-night';
export const NURSE_EMAIL = 'nia.okafor@warmfold.test';
export const CHARGE_EMAIL = 'marta.lindqvist@warmfold.test';
export const UNIT_ID = 'unit-bench';

export interface SeedSize {
  infants: number;
  days: number;
  /** Infants assigned to the benchmark nurse this shift (her "My infants" list). */
  nurseInfants: number;
}

export interface SeededUnit {
  unitId: string;
  infantIds: string[];
  /** The nurse's infants for the current shift; the first is the flowsheet the bench opens. */
  nurseInfantIds: string[];
  readings: number;
  flags: number;
  actions: number;
  seconds: number;
}

const SURNAMES = [
  'Alder',
  'Bramble',
  'Corrie',
  'Dapple',
  'Eskdale',
  'Fallow',
  'Gorsey',
  'Heron',
  'Inchmoor',
  'Jessamy',
  'Kilnsey',
  'Larchfield',
  'Mossop',
  'Nettlebed',
  'Oakhanger',
  'Pennock',
  'Quarrie',
  'Rushmere',
  'Sallow',
  'Tansy',
];
const TIMES = { dayShiftStart: '07:00', nightShiftStart: '19:00', timeZone: 'Europe/London' };

/** A small seeded generator, so every run builds the same unit. */
function prng(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

const pad = (n: number, w = 2) => String(n).padStart(w, '0');

export async function seedLargeUnit(file: string, size: SeedSize, now = new Date()): Promise<SeededUnit> {
  const started = performance.now();
  const database = openDatabase(file);
  const { sqlite } = database;
  // bcrypt cost 10 as in production; one hash shared by every account keeps the seed quick.
  const hash = await bcrypt.hash(BENCH_PASSWORD, 10);
  const rand = prng(20260601);
  const t0 = Math.floor(now.getTime() / 60_000) * 60_000;
  const HOUR = 3_600_000;
  const infantIds: string[] = [];
  let readingCount = 0;

  writeTx(sqlite, () => {
    const created = t0 - 60 * 86_400_000;
    sqlite
      .prepare('INSERT INTO units (id, name, hospital_name, time_zone, created_at) VALUES (?, ?, ?, ?, ?)')
      .run(UNIT_ID, 'Bench Neonatal Unit', 'Thornbury Fen Hospital', TIMES.timeZone, created);
    const bed = sqlite.prepare('INSERT INTO beds (id, unit_id, label, sort_order, active) VALUES (?, ?, ?, ?, 1)');
    for (let i = 1; i <= size.infants; i++) bed.run(`bed-${pad(i)}`, UNIT_ID, `B${pad(i)}`, i);

    const user = sqlite.prepare(
      "INSERT INTO users (id, email, name, role, password_hash, temp_unit, active, session_version, created_at, updated_at) VALUES (?, ?, ?, ?, ?, 'C', 1, 1, ?, ?)",
    );
    const member = sqlite.prepare('INSERT INTO user_units (user_id, unit_id) VALUES (?, ?)');
    const staff: [string, string, string, string][] = [
      ['u-nurse', NURSE_EMAIL, 'Nia Okafor', 'nurse'],
      ['u-charge', CHARGE_EMAIL, 'Marta Lindqvist', 'charge'],
    ];
    for (let i = 1; i <= 9; i++) staff.push([`u-nurse-${i}`, `bench.nurse${i}@warmfold.test`, `Bench Nurse ${i}`, 'nurse']);
    for (const [id, email, name, role] of staff) {
      user.run(id, email, name, role, hash, created, created);
      member.run(id, UNIT_ID);
    }
    const nurses = staff.filter((s) => s[3] === 'nurse').map((s) => s[0]);

    const infant = sqlite.prepare(
      `INSERT INTO infants (id, unit_id, bed_id, display_name, birth_at, gestation_weeks, gestation_days, birth_weight_grams, weight_grams, heat_source, status, admitted_at)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'admitted', ?)`,
    );
    const reading = sqlite.prepare(
      `INSERT INTO readings (id, infant_id, unit_id, taken_at, recorded_at, recorded_by, probe_centi, remote_centi, remote_site, air_centi, set_centi,
        control_mode, heater_output_pct, heart_rate, heat_signs, entered_unit)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, '[]', 'C')`,
    );
    const assign = sqlite.prepare('INSERT INTO assignments (id, unit_id, infant_id, nurse_id, shift_date, shift, created_by, created_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)');
    const current = shiftAt(new Date(t0), TIMES);

    for (let i = 0; i < size.infants; i++) {
      const id = `inf-bench-${pad(i + 1, 3)}`;
      infantIds.push(id);
      const admitted = t0 - size.days * 86_400_000 - 30 * 60_000;
      const gaWeeks = 27 + Math.floor(rand() * 12);
      const weight = 900 + Math.round(rand() * 2400);
      const airServo = i % 3 === 2;
      const set = airServo ? 3320 : 3650;
      infant.run(
        id,
        UNIT_ID,
        `bed-${pad(i + 1)}`,
        `Baby ${SURNAMES[i % SURNAMES.length]} ${Math.floor(i / SURNAMES.length) + 1}`,
        admitted - 86_400_000,
        gaWeeks,
        Math.floor(rand() * 7),
        weight,
        weight,
        airServo ? 'incubator' : 'radiant-warmer',
        admitted,
      );
      const nurse = i < size.nurseInfants ? 'u-nurse' : nurses[1 + (i % (nurses.length - 1))]!;
      assign.run(randomUUID(), UNIT_ID, id, nurse, current.shiftDate, current.shift, 'u-charge', current.startsAt.getTime() - 30 * 60_000);

      // The last reading lands between 5 and 170 minutes ago, so the board shows every status.
      const lastOffset = (5 + ((i * 37) % 166)) * 60_000;
      // 37.0 °C ± a little: inside the normal band, so cold and heat flags stay rare as on a real unit.
      const base = 3700 + Math.round((rand() - 0.5) * 30);
      const hours = size.days * 24;
      for (let h = hours - 1; h >= 0; h--) {
        const taken = t0 - lastOffset - h * HOUR;
        const remoteHour = h % 2 === 0;
        const remote = base + Math.round((rand() - 0.5) * 30);
        // Now and then the probe drifts off the skin: a gap over 0.5 °C, caught by the next check.
        const gap = remoteHour && rand() < 0.04;
        const probe = gap ? remote + 60 + Math.round(rand() * 30) : remote - 10 - Math.round(rand() * 20);
        reading.run(
          randomUUID(),
          id,
          UNIT_ID,
          taken,
          taken + 60_000,
          nurse,
          probe,
          remoteHour ? remote : null,
          remoteHour ? 'axilla' : null,
          airServo ? set : 3150 + Math.round(rand() * 60),
          set,
          airServo ? 'air-servo' : 'skin-servo',
          30 + Math.round(rand() * 25),
          130 + Math.round(rand() * 30),
        );
        readingCount += 1;
      }
    }

    const at = new Date(t0);
    // The actions a nurse takes on a gap: checked the probe, then moved it. A gap flag closes at
    // the first check within the limit after an action, and only then can the next gap raise a
    // flag of its own; so the rules run, the new gaps are answered, and the rules run again, as
    // the unit would have charted it over the fortnight.
    const unanswered = sqlite.prepare(
      "SELECT id, infant_id, raised_at FROM flags f WHERE unit_id = ? AND kind = 'gap' AND NOT EXISTS (SELECT 1 FROM actions a WHERE a.flag_id = f.id)",
    );
    const action = sqlite.prepare('INSERT INTO actions (id, flag_id, infant_id, unit_id, kind, note, at, recorded_by, created_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)');
    for (let round = 0; round < 100; round++) {
      for (const id of infantIds) syncFlags(sqlite, id, at, null);
      const gaps = unanswered.all(UNIT_ID) as { id: string; infant_id: string; raised_at: number }[];
      if (gaps.length === 0) break;
      for (const g of gaps) {
        action.run(randomUUID(), g.id, g.infant_id, UNIT_ID, 'checked-probe-contact', null, g.raised_at + 5 * 60_000, 'u-nurse', g.raised_at + 5 * 60_000);
        action.run(
          randomUUID(),
          g.id,
          g.infant_id,
          UNIT_ID,
          'moved-probe',
          'Moved to the flank under a new cover.',
          g.raised_at + 10 * 60_000,
          'u-nurse',
          g.raised_at + 10 * 60_000,
        );
      }
    }
  });

  const count = (table: string) => (sqlite.prepare(`SELECT COUNT(*) AS n FROM ${table}`).get() as { n: number }).n;
  const result: SeededUnit = {
    unitId: UNIT_ID,
    infantIds,
    nurseInfantIds: infantIds.slice(0, size.nurseInfants),
    readings: readingCount,
    flags: count('flags'),
    actions: count('actions'),
    seconds: (performance.now() - started) / 1000,
  };
  sqlite.pragma('wal_checkpoint(TRUNCATE)');
  database.close();
  return result;
}
