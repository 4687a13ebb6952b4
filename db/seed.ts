/**
 * The invented demo: Larkspur Vale Hospital, two neonatal units, fictional infants and staff.
 * Every name here is made up. Times are laid out relative to `now`, so the demo always shows
 * an open gap flag, an overdue check, a heat-stress case and a running skin-to-skin session.
 */
import { TZDate } from '@date-fns/tz';
import bcrypt from 'bcryptjs';
import { randomUUID } from 'node:crypto';
import { writeTx, type Database_ } from './client';
import { bedStays } from './schema';
import { shiftAt } from '../shared/shifts';
import { appendAudit } from '../server/audit';
import { withoutLedger } from '../server/ledger';
import { syncFlags } from '../server/services/flags';

export const DEMO_PASSWORD = 'warm-hands-at-night';

export const DEMO_ACCOUNTS = [
  { id: 'u-nurse', email: 'nia.okafor@warmfold.test', name: 'Nia Okafor', role: 'nurse', units: ['unit-north'] },
  { id: 'u-charge', email: 'marta.lindqvist@warmfold.test', name: 'Marta Lindqvist', role: 'charge', units: ['unit-north'] },
  { id: 'u-educator', email: 'priya.raman@warmfold.test', name: 'Priya Raman', role: 'educator', units: ['unit-north', 'unit-south'] },
  { id: 'u-admin', email: 'tomas.vidal@warmfold.test', name: 'Tomás Vidal', role: 'admin', units: ['unit-north', 'unit-south'] },
] as const;

const OTHER_STAFF = [
  { id: 'u-nurse-2', email: 'kofi.mensah@warmfold.test', name: 'Kofi Mensah', role: 'nurse', units: ['unit-north'] },
  { id: 'u-nurse-3', email: 'sunniva.hale@warmfold.test', name: 'Sunniva Hale', role: 'nurse', units: ['unit-south'] },
  { id: 'u-nurse-4', email: 'ines.carvalho@warmfold.test', name: 'Inês Carvalho', role: 'nurse', units: ['unit-north'] },
  { id: 'u-charge-2', email: 'dawit.bekele@warmfold.test', name: 'Dawit Bekele', role: 'charge', units: ['unit-south'] },
] as const;

type Scenario = 'gap-open' | 'overdue' | 'heat-stress' | 'skin-to-skin' | 'manual' | 'due-soon' | 'steady' | 'cold';

interface DemoInfant {
  id: string;
  unit: 'unit-north' | 'unit-south';
  bed: string;
  name: string;
  gaWeeks: number;
  gaDays: number;
  ageDays: number;
  birthWeight: number;
  weight: number;
  heatSource: 'radiant-warmer' | 'incubator' | 'convertible';
  mode: 'skin-servo' | 'air-servo';
  nurse: string;
  scenario: Scenario;
}

const INFANTS: DemoInfant[] = [
  { id: 'inf-ashgrove', unit: 'unit-north', bed: 'N01', name: 'Baby Ashgrove', gaWeeks: 31, gaDays: 2, ageDays: 4, birthWeight: 1620, weight: 1580, heatSource: 'radiant-warmer', mode: 'skin-servo', nurse: 'u-nurse', scenario: 'gap-open' },
  { id: 'inf-brightwater', unit: 'unit-north', bed: 'N02', name: 'Baby Brightwater', gaWeeks: 28, gaDays: 5, ageDays: 9, birthWeight: 1110, weight: 1060, heatSource: 'incubator', mode: 'air-servo', nurse: 'u-nurse', scenario: 'overdue' },
  { id: 'inf-cinderford', unit: 'unit-north', bed: 'N03', name: 'Baby Cinderford', gaWeeks: 36, gaDays: 1, ageDays: 3, birthWeight: 2540, weight: 2480, heatSource: 'radiant-warmer', mode: 'skin-servo', nurse: 'u-nurse', scenario: 'heat-stress' },
  { id: 'inf-dunmere', unit: 'unit-north', bed: 'N04', name: 'Baby Dunmere', gaWeeks: 33, gaDays: 4, ageDays: 12, birthWeight: 1890, weight: 1960, heatSource: 'incubator', mode: 'skin-servo', nurse: 'u-nurse', scenario: 'skin-to-skin' },
  { id: 'inf-elderbrook', unit: 'unit-north', bed: 'N05', name: 'Baby Elderbrook', gaWeeks: 38, gaDays: 0, ageDays: 1, birthWeight: 3150, weight: 3120, heatSource: 'radiant-warmer', mode: 'skin-servo', nurse: 'u-nurse-2', scenario: 'manual' },
  { id: 'inf-fernhollow', unit: 'unit-north', bed: 'N06', name: 'Baby Fernhollow', gaWeeks: 30, gaDays: 6, ageDays: 20, birthWeight: 1450, weight: 1700, heatSource: 'incubator', mode: 'air-servo', nurse: 'u-nurse-2', scenario: 'due-soon' },
  { id: 'inf-glimmerton', unit: 'unit-north', bed: 'N07', name: 'Baby Glimmerton A', gaWeeks: 34, gaDays: 3, ageDays: 6, birthWeight: 2010, weight: 1985, heatSource: 'convertible', mode: 'skin-servo', nurse: 'u-nurse-4', scenario: 'steady' },
  { id: 'inf-glimmerton-b', unit: 'unit-north', bed: 'N08', name: 'Baby Glimmerton B', gaWeeks: 34, gaDays: 3, ageDays: 6, birthWeight: 1890, weight: 1870, heatSource: 'convertible', mode: 'skin-servo', nurse: 'u-nurse-4', scenario: 'steady' },
  { id: 'inf-hartsease', unit: 'unit-south', bed: 'S01', name: 'Baby Hartsease', gaWeeks: 35, gaDays: 0, ageDays: 5, birthWeight: 2300, weight: 2260, heatSource: 'incubator', mode: 'air-servo', nurse: 'u-nurse-3', scenario: 'cold' },
  { id: 'inf-ivybridge', unit: 'unit-south', bed: 'S02', name: 'Baby Ivystone', gaWeeks: 37, gaDays: 2, ageDays: 2, birthWeight: 2890, weight: 2850, heatSource: 'radiant-warmer', mode: 'skin-servo', nurse: 'u-nurse-3', scenario: 'steady' },
  { id: 'inf-juniper', unit: 'unit-south', bed: 'S03', name: 'Baby Juniperdale', gaWeeks: 32, gaDays: 1, ageDays: 15, birthWeight: 1700, weight: 1820, heatSource: 'incubator', mode: 'skin-servo', nurse: 'u-nurse-3', scenario: 'steady' },
  { id: 'inf-kestrel', unit: 'unit-south', bed: 'S04', name: 'Baby Kestrelmoor', gaWeeks: 29, gaDays: 4, ageDays: 25, birthWeight: 1240, weight: 1510, heatSource: 'incubator', mode: 'air-servo', nurse: 'u-nurse-3', scenario: 'due-soon' },
];

/** A small seeded generator, so the demo looks the same on every machine. */
function prng(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

export function isEmpty(database: Database_): boolean {
  const row = database.sqlite.prepare('SELECT COUNT(*) AS n FROM users').get() as { n: number };
  return row.n === 0;
}

const APPEND_ONLY = ['readings', 'flags', 'flag_resolutions', 'actions', 'reviews', 'audit_events'];

/** Empty every table (the seed command resets). Triggers keep the app from doing this, so drop them for the reset only. */
export function resetDatabase(database: Database_): void {
  const { sqlite } = database;
  const triggers = sqlite.prepare("SELECT name, sql FROM sqlite_master WHERE type = 'trigger'").all() as Array<{ name: string; sql: string }>;
  const tables = (sqlite.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name NOT LIKE '__drizzle%'").all() as Array<{ name: string }>).map((t) => t.name);
  sqlite.pragma('foreign_keys = OFF');
  // The row ledger's triggers are off for the reset, which empties the audit trail too; it starts again after.
  withoutLedger(sqlite, () =>
    writeTx(sqlite, () => {
      for (const t of triggers) sqlite.prepare(`DROP TRIGGER ${t.name}`).run();
      for (const t of tables) sqlite.prepare(`DELETE FROM ${t}`).run();
      for (const t of triggers) sqlite.prepare(t.sql).run();
    }),
  );
  sqlite.pragma('foreign_keys = ON');
  void APPEND_ONLY;
}

const pendingActions: Array<{ infant: string; unit: string; readingId: string; by: string; at: number; at2: number }> = [];

export interface SeedOptions {
  now: Date;
  bcryptCost: number;
}

export async function seedDemo(database: Database_, { now, bcryptCost }: SeedOptions): Promise<void> {
  const { sqlite } = database;
  const hash = await bcrypt.hash(DEMO_PASSWORD, bcryptCost);
  const t0 = Math.floor(now.getTime() / 60_000) * 60_000;
  const min = (m: number) => t0 - m * 60_000;
  const rand = prng(20261202);
  // Every infant's history also holds one caught gap around 03:00 in the last night shift, so
  // the educator's review of night shifts has something to open whatever hour the demo is laid down.
  const nightGapAt = lastLocalHour(t0 - 3 * 60 * 60_000, 'Europe/London', 3);

  writeTx(sqlite, () => {
    const unit = sqlite.prepare('INSERT INTO units (id, name, hospital_name, time_zone, created_at) VALUES (?, ?, ?, ?, ?)');
    unit.run('unit-north', 'Neonatal Unit North', 'Larkspur Vale Hospital', 'Europe/London', min(60 * 24 * 30));
    unit.run('unit-south', 'Special Care South', 'Larkspur Vale Hospital', 'Europe/London', min(60 * 24 * 30));

    const bed = sqlite.prepare('INSERT INTO beds (id, unit_id, label, sort_order, active) VALUES (?, ?, ?, ?, 1)');
    for (let i = 1; i <= 14; i++) bed.run(`bed-N${pad(i)}`, 'unit-north', `N${pad(i)}`, i);
    for (let i = 1; i <= 10; i++) bed.run(`bed-S${pad(i)}`, 'unit-south', `S${pad(i)}`, i);

    const user = sqlite.prepare(
      'INSERT INTO users (id, email, name, role, password_hash, temp_unit, active, session_version, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, 1, 1, ?, ?)',
    );
    const member = sqlite.prepare('INSERT INTO user_units (user_id, unit_id) VALUES (?, ?)');
    for (const a of [...DEMO_ACCOUNTS, ...OTHER_STAFF]) {
      user.run(a.id, a.email, a.name, a.role, hash, 'C', min(60 * 24 * 30), min(60 * 24 * 30));
      for (const u of a.units) member.run(a.id, u);
    }

    const infant = sqlite.prepare(
      `INSERT INTO infants (id, unit_id, bed_id, display_name, birth_at, gestation_weeks, gestation_days, birth_weight_grams, weight_grams, heat_source, status, admitted_at, hospital_number, sex)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'admitted', ?, ?, ?)`,
    );
    const reading = sqlite.prepare(
      `INSERT INTO readings (id, infant_id, unit_id, taken_at, recorded_at, recorded_by, probe_centi, remote_centi, remote_site, air_centi, set_centi,
        control_mode, heater_output_pct, heart_rate, heat_signs, note, entered_unit, late_reason, session_id)
       VALUES (@id, @infant, @unit, @taken, @recorded, @by, @probe, @remote, @site, @air, @set, @mode, @output, @hr, @signs, @note, 'C', @late, @session)`,
    );
    const assign = sqlite.prepare(
      'INSERT INTO assignments (id, unit_id, infant_id, nurse_id, shift_date, shift, created_by, created_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)',
    );
    const times = { dayShiftStart: '07:00', nightShiftStart: '19:00', timeZone: 'Europe/London' };
    const current = shiftAt(new Date(t0), times);
    const previous = shiftAt(new Date(current.startsAt.getTime() - 60_000), times);

    for (const inf of INFANTS) {
      const ageMin = inf.ageDays * 24 * 60;
      const admitted = min(Math.min(ageMin - 30, 72 * 60 + 30));
      // Invented hospital numbers, one per demo infant.
      const hospitalNumber = `LV${String(204100 + INFANTS.indexOf(inf) * 7).padStart(7, '0')}`;
      infant.run(inf.id, inf.unit, `bed-${inf.bed}`, inf.name, min(ageMin), inf.gaWeeks, inf.gaDays, inf.birthWeight, inf.weight, inf.heatSource, admitted, hospitalNumber, INFANTS.indexOf(inf) % 2 ? 'male' : 'female');
      database.db.insert(bedStays).values({ id: `stay-${inf.id}-admitted`, infantId: inf.id, unitId: inf.unit, bedId: `bed-${inf.bed}`, event: 'admitted', at: new Date(admitted), recordedBy: null }).run();
      const charge = inf.unit === 'unit-north' ? 'u-charge' : 'u-charge-2';
      assign.run(randomUUID(), inf.unit, inf.id, inf.nurse, previous.shiftDate, previous.shift, charge, previous.startsAt.getTime() - 30 * 60_000);
      assign.run(randomUUID(), inf.unit, inf.id, inf.nurse, current.shiftDate, current.shift, charge, current.startsAt.getTime() - 30 * 60_000);

      const set = inf.mode === 'air-servo' ? 3320 : 3650;
      const base = 3680 + Math.round((rand() - 0.5) * 30);
      // The last routine remote check, in minutes before now, shapes each scenario.
      const lastCheck =
        inf.scenario === 'overdue' ? 170 : inf.scenario === 'due-soon' ? 110 : inf.scenario === 'gap-open' ? 35 : inf.scenario === 'heat-stress' ? 20 : 50;
      let m = Math.floor((admitted - t0) / -60_000) - 5;
      let checkNo = 0;
      let nightGapDone = false;
      while (m > lastCheck) {
        checkNo += 1;
        // Most checks land on time; now and then one slips past two hours.
        const late = checkNo % 9 === 4;
        const remote = base + Math.round((rand() - 0.5) * 40);
        // The usual probe value draws from the generator exactly as it always has, so adding the
        // night-shift gap leaves every other value of the demo as it was.
        const usual = checkNo % 11 === 6 ? null : remote - 10 - Math.round(rand() * 20);
        const nightGap = !nightGapDone && Math.abs(min(m) - nightGapAt) <= 60 * 60_000;
        if (nightGap) nightGapDone = true;
        const historicGap = usual === null || nightGap;
        const probe = historicGap ? remote + 70 : usual;
        const id = randomUUID();
        reading.run({
          id, infant: inf.id, unit: inf.unit, taken: min(m), recorded: min(m) + 60_000, by: inf.nurse,
          probe, remote, site: 'axilla', air: inf.mode === 'air-servo' ? set : 3150 + Math.round(rand() * 60), set,
          mode: inf.mode, output: 30 + Math.round(rand() * 25), hr: 135 + Math.round(rand() * 20), signs: '[]', note: null, late: null, session: null,
        });
        if (historicGap) {
          // A caught gap: two actions, then a recheck within the limit.
          pendingActions.push({ infant: inf.id, unit: inf.unit, readingId: id, by: inf.nurse, at: min(m - 6), at2: min(m - 12) });
          const recheck = randomUUID();
          reading.run({
            id: recheck, infant: inf.id, unit: inf.unit, taken: min(m - 30), recorded: min(m - 30) + 60_000, by: inf.nurse,
            probe: remote - 15, remote, site: 'axilla', air: 3150, set, mode: inf.mode, output: 35, hr: 142, signs: '[]',
            note: 'Recheck after moving the probe.', late: null, session: null,
          });
        }
        // Hourly probe-only observation between remote checks.
        if (m - 60 > lastCheck) {
          reading.run({
            id: randomUUID(), infant: inf.id, unit: inf.unit, taken: min(m - 60), recorded: min(m - 60) + 60_000, by: inf.nurse,
            probe: base - 20 + Math.round((rand() - 0.5) * 20), remote: null, site: null, air: inf.mode === 'air-servo' ? set : 3150, set,
            mode: inf.mode, output: 30 + Math.round(rand() * 25), hr: 130 + Math.round(rand() * 25), signs: '[]', note: null, late: null, session: null,
          });
        }
        m -= late ? 135 : 110 + Math.round(rand() * 8);
      }
      seedScenario(inf, { reading, min, set, base, sqlite });
    }

    for (const p of pendingActions.splice(0)) {
      syncFlags(sqlite, p.infant, new Date(p.at + 60_000), p.by);
      const flag = sqlite.prepare('SELECT id FROM flags WHERE infant_id = ? AND raised_by_reading_id = ?').get(p.infant, p.readingId) as { id: string } | undefined;
      if (!flag) continue;
      const action = sqlite.prepare('INSERT INTO actions (id, flag_id, infant_id, unit_id, kind, note, at, recorded_by, created_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)');
      action.run(randomUUID(), flag.id, p.infant, p.unit, 'checked-probe-contact', null, p.at, p.by, p.at);
      action.run(randomUUID(), flag.id, p.infant, p.unit, 'moved-probe', 'Moved to the left flank under a new cover.', p.at2, p.by, p.at2);
    }
    // The demo's history gets its audit trail too, so the chain covers every clinical row.
    const rows = sqlite.prepare('SELECT * FROM readings ORDER BY recorded_at, id').all() as Array<Record<string, unknown>>;
    for (const r of rows) {
      appendAudit(sqlite, { at: new Date(r.recorded_at as number), actorId: r.recorded_by as string, action: 'reading-create', entityType: 'reading', entityId: r.id as string, unitId: r.unit_id as string, after: r });
    }
    const acts = sqlite.prepare('SELECT * FROM actions ORDER BY at, id').all() as Array<Record<string, unknown>>;
    for (const a of acts) {
      appendAudit(sqlite, { at: new Date(a.at as number), actorId: a.recorded_by as string, action: 'action-create', entityType: 'action', entityId: a.id as string, unitId: a.unit_id as string, after: a });
    }
    for (const inf of INFANTS) syncFlags(sqlite, inf.id, new Date(t0), null);
    appendAudit(sqlite, { at: new Date(t0), actorId: null, action: 'demo-seeded', entityType: 'database', entityId: null, unitId: null, after: { infants: INFANTS.length } });
  });
}

function pad(n: number): string {
  return String(n).padStart(2, '0');
}

function seedScenario(
  inf: DemoInfant,
  { reading, min, set, base, sqlite }: { reading: import('better-sqlite3').Statement; min: (m: number) => number; set: number; base: number; sqlite: import('better-sqlite3').Database },
): void {
  const row = (m: number, values: Partial<Record<string, unknown>>) =>
    reading.run({
      id: randomUUID(), infant: inf.id, unit: inf.unit, taken: min(m), recorded: min(m) + 60_000, by: inf.nurse,
      probe: null, remote: null, site: null, air: inf.mode === 'air-servo' ? set : 3150, set, mode: inf.mode,
      output: 40, hr: 146, signs: '[]', note: null, late: null, session: null, ...values,
    });
  switch (inf.scenario) {
    case 'gap-open':
      row(35, { probe: 3690, remote: 3620, site: 'axilla', output: 52, hr: 150, note: 'Cover looked lifted at one edge.' });
      break;
    case 'overdue':
      row(170, { probe: base - 10, remote: base, site: 'axilla' });
      row(70, { probe: base - 20 });
      break;
    case 'heat-stress':
      row(140, { probe: 3660, remote: 3700, site: 'axilla' });
      row(20, { probe: 3720, remote: 3790, site: 'axilla', output: 70, hr: 172, signs: JSON.stringify(['red-skin', 'sweating']), note: 'Flushed and damp.' });
      break;
    case 'skin-to-skin': {
      row(50, { probe: 3670, remote: 3680, site: 'axilla' });
      const session = randomUUID();
      sqlite
        .prepare('INSERT INTO skin_to_skin_sessions (id, infant_id, unit_id, started_at, started_by, reference_centi, limit_centi, carer) VALUES (?, ?, ?, ?, ?, ?, ?, ?)')
        .run(session, inf.id, inf.unit, min(40), inf.nurse, 3680, 50, 'Parent');
      row(20, { probe: 3660, remote: 3670, site: 'axilla', session, mode: 'skin-servo', output: 0 });
      break;
    }
    case 'manual':
      row(50, { probe: 3670, remote: 3690, site: 'axilla' });
      row(30, { probe: 3700, mode: 'manual', output: 85, note: 'Manual while the probe cable is changed.' });
      break;
    case 'due-soon':
      row(110, { probe: base - 10, remote: base, site: 'axilla' });
      break;
    case 'cold':
      row(45, { probe: 3600, remote: 3630, site: 'axilla', set: 3350, note: 'Cool peripheries.' });
      break;
    case 'steady':
      row(50, { probe: base - 15, remote: base, site: 'axilla' });
      break;
  }
}

/** The latest `hour`:00 in `timeZone` at or before `notAfter` (ms). */
function lastLocalHour(notAfter: number, timeZone: string, hour: number): number {
  const local = new TZDate(notAfter, timeZone);
  const at = new TZDate(local.getFullYear(), local.getMonth(), local.getDate(), hour, 0, 0, timeZone).getTime();
  return at <= notAfter ? at : new TZDate(local.getFullYear(), local.getMonth(), local.getDate() - 1, hour, 0, 0, timeZone).getTime();
}
