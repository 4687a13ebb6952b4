/**
 * The invented demo: Larkspur Vale Hospital, two neonatal units, fictional infants and staff.
 * Every name here is made up. Times are laid out relative to `now`, so the demo always shows
 * an open gap flag, an overdue check, a heat-stress case and a running skin-to-skin session.
 * It lays the history down through the app's own rules (`syncFlags`), so it lives beside them;
 * emptying the database and the demo's accounts are db/seed.ts.
 */
import { TZDate } from '@date-fns/tz';
import bcrypt from 'bcryptjs';
import { randomUUID } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import type { Database_ } from '../db/client';
import { actions, assignments, beds, bedStays, flags, infants, readings, skinToSkinSessions, units, userUnits, users } from '../db/schema';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../db/seed';
import { shiftAt } from '../shared/shifts';
import { appendAudit } from './audit';
import { syncFlags } from './services/flags';

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
  {
    id: 'inf-ashgrove',
    unit: 'unit-north',
    bed: 'N01',
    name: 'Baby Ashgrove',
    gaWeeks: 31,
    gaDays: 2,
    ageDays: 4,
    birthWeight: 1620,
    weight: 1580,
    heatSource: 'radiant-warmer',
    mode: 'skin-servo',
    nurse: 'u-nurse',
    scenario: 'gap-open',
  },
  {
    id: 'inf-brightwater',
    unit: 'unit-north',
    bed: 'N02',
    name: 'Baby Brightwater',
    gaWeeks: 28,
    gaDays: 5,
    ageDays: 9,
    birthWeight: 1110,
    weight: 1060,
    heatSource: 'incubator',
    mode: 'air-servo',
    nurse: 'u-nurse',
    scenario: 'overdue',
  },
  {
    id: 'inf-cinderford',
    unit: 'unit-north',
    bed: 'N03',
    name: 'Baby Cinderford',
    gaWeeks: 36,
    gaDays: 1,
    ageDays: 3,
    birthWeight: 2540,
    weight: 2480,
    heatSource: 'radiant-warmer',
    mode: 'skin-servo',
    nurse: 'u-nurse',
    scenario: 'heat-stress',
  },
  {
    id: 'inf-dunmere',
    unit: 'unit-north',
    bed: 'N04',
    name: 'Baby Dunmere',
    gaWeeks: 33,
    gaDays: 4,
    ageDays: 12,
    birthWeight: 1890,
    weight: 1960,
    heatSource: 'incubator',
    mode: 'skin-servo',
    nurse: 'u-nurse',
    scenario: 'skin-to-skin',
  },
  {
    id: 'inf-elderbrook',
    unit: 'unit-north',
    bed: 'N05',
    name: 'Baby Elderbrook',
    gaWeeks: 38,
    gaDays: 0,
    ageDays: 1,
    birthWeight: 3150,
    weight: 3120,
    heatSource: 'radiant-warmer',
    mode: 'skin-servo',
    nurse: 'u-nurse-2',
    scenario: 'manual',
  },
  {
    id: 'inf-fernhollow',
    unit: 'unit-north',
    bed: 'N06',
    name: 'Baby Fernhollow',
    gaWeeks: 30,
    gaDays: 6,
    ageDays: 20,
    birthWeight: 1450,
    weight: 1700,
    heatSource: 'incubator',
    mode: 'air-servo',
    nurse: 'u-nurse-2',
    scenario: 'due-soon',
  },
  {
    id: 'inf-glimmerton',
    unit: 'unit-north',
    bed: 'N07',
    name: 'Baby Glimmerton A',
    gaWeeks: 34,
    gaDays: 3,
    ageDays: 6,
    birthWeight: 2010,
    weight: 1985,
    heatSource: 'convertible',
    mode: 'skin-servo',
    nurse: 'u-nurse-4',
    scenario: 'steady',
  },
  {
    id: 'inf-glimmerton-b',
    unit: 'unit-north',
    bed: 'N08',
    name: 'Baby Glimmerton B',
    gaWeeks: 34,
    gaDays: 3,
    ageDays: 6,
    birthWeight: 1890,
    weight: 1870,
    heatSource: 'convertible',
    mode: 'skin-servo',
    nurse: 'u-nurse-4',
    scenario: 'steady',
  },
  {
    id: 'inf-hartsease',
    unit: 'unit-south',
    bed: 'S01',
    name: 'Baby Hartsease',
    gaWeeks: 35,
    gaDays: 0,
    ageDays: 5,
    birthWeight: 2300,
    weight: 2260,
    heatSource: 'incubator',
    mode: 'air-servo',
    nurse: 'u-nurse-3',
    scenario: 'cold',
  },
  {
    id: 'inf-ivybridge',
    unit: 'unit-south',
    bed: 'S02',
    name: 'Baby Ivystone',
    gaWeeks: 37,
    gaDays: 2,
    ageDays: 2,
    birthWeight: 2890,
    weight: 2850,
    heatSource: 'radiant-warmer',
    mode: 'skin-servo',
    nurse: 'u-nurse-3',
    scenario: 'steady',
  },
  {
    id: 'inf-juniper',
    unit: 'unit-south',
    bed: 'S03',
    name: 'Baby Juniperdale',
    gaWeeks: 32,
    gaDays: 1,
    ageDays: 15,
    birthWeight: 1700,
    weight: 1820,
    heatSource: 'incubator',
    mode: 'skin-servo',
    nurse: 'u-nurse-3',
    scenario: 'steady',
  },
  {
    id: 'inf-kestrel',
    unit: 'unit-south',
    bed: 'S04',
    name: 'Baby Kestrelmoor',
    gaWeeks: 29,
    gaDays: 4,
    ageDays: 25,
    birthWeight: 1240,
    weight: 1510,
    heatSource: 'incubator',
    mode: 'air-servo',
    nurse: 'u-nurse-3',
    scenario: 'due-soon',
  },
];

/** A small seeded generator, so the demo looks the same on every machine. */
function prng(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

type NewReading = typeof readings.$inferInsert;

export interface SeedOptions {
  now: Date;
  bcryptCost: number;
}

export async function seedDemo(database: Database_, { now, bcryptCost }: SeedOptions): Promise<void> {
  const { db, sqlite } = database;
  const hash = await bcrypt.hash(DEMO_PASSWORD, bcryptCost);
  const t0 = Math.floor(now.getTime() / 60_000) * 60_000;
  const min = (m: number) => t0 - m * 60_000;
  const at = (m: number) => new Date(min(m));
  const rand = prng(20261202);
  // Every infant's history also holds one caught gap around 03:00 in the last night shift, so
  // the educator's review of night shifts has something to open whatever hour the demo is laid down.
  const nightGapAt = lastLocalHour(t0 - 3 * 60 * 60_000, 'Europe/London', 3);
  const pendingActions: { infant: string; unit: string; readingId: string; by: string; at: number; at2: number }[] = [];
  // An infant's readings go in together: each statement that writes a chained table compiles its
  // triggers, so one insert of many rows costs about what one insert of a single row does.
  let charting: NewReading[] = [];
  const addReading = (r: NewReading) => charting.push(r);
  const chartAll = () => {
    for (let i = 0; i < charting.length; i += 250)
      db.insert(readings)
        .values(charting.slice(i, i + 250))
        .run();
    charting = [];
  };

  db.transaction(
    (tx) => {
      for (const id of ['unit-north', 'unit-south'] as const) {
        const name = id === 'unit-north' ? 'Neonatal Unit North' : 'Special Care South';
        tx.insert(units)
          .values({ id, name, hospitalName: 'Larkspur Vale Hospital', timeZone: 'Europe/London', createdAt: at(60 * 24 * 30) })
          .run();
      }
      for (let i = 1; i <= 14; i++)
        tx.insert(beds)
          .values({ id: `bed-N${pad(i)}`, unitId: 'unit-north', label: `N${pad(i)}`, sortOrder: i, active: true })
          .run();
      for (let i = 1; i <= 10; i++)
        tx.insert(beds)
          .values({ id: `bed-S${pad(i)}`, unitId: 'unit-south', label: `S${pad(i)}`, sortOrder: i, active: true })
          .run();

      for (const a of [...DEMO_ACCOUNTS, ...OTHER_STAFF]) {
        tx.insert(users)
          .values({
            id: a.id,
            email: a.email,
            name: a.name,
            role: a.role,
            passwordHash: hash,
            tempUnit: 'C',
            active: true,
            sessionVersion: 1,
            createdAt: at(60 * 24 * 30),
            updatedAt: at(60 * 24 * 30),
          })
          .run();
        for (const u of a.units) tx.insert(userUnits).values({ userId: a.id, unitId: u }).run();
      }

      const times = { dayShiftStart: '07:00', nightShiftStart: '19:00', timeZone: 'Europe/London' };
      const current = shiftAt(new Date(t0), times);
      const previous = shiftAt(new Date(current.startsAt.getTime() - 60_000), times);

      for (const inf of INFANTS) {
        const ageMin = inf.ageDays * 24 * 60;
        const admitted = min(Math.min(ageMin - 30, 72 * 60 + 30));
        // Invented hospital numbers, one per demo infant.
        const hospitalNumber = `LV${String(204100 + INFANTS.indexOf(inf) * 7).padStart(7, '0')}`;
        tx.insert(infants)
          .values({
            id: inf.id,
            unitId: inf.unit,
            bedId: `bed-${inf.bed}`,
            displayName: inf.name,
            birthAt: at(ageMin),
            gestationWeeks: inf.gaWeeks,
            gestationDays: inf.gaDays,
            birthWeightGrams: inf.birthWeight,
            weightGrams: inf.weight,
            heatSource: inf.heatSource,
            status: 'admitted',
            admittedAt: new Date(admitted),
            hospitalNumber,
            sex: INFANTS.indexOf(inf) % 2 ? 'male' : 'female',
          })
          .run();
        tx.insert(bedStays)
          .values({ id: `stay-${inf.id}-admitted`, infantId: inf.id, unitId: inf.unit, bedId: `bed-${inf.bed}`, event: 'admitted', at: new Date(admitted), recordedBy: null })
          .run();
        const charge = inf.unit === 'unit-north' ? 'u-charge' : 'u-charge-2';
        for (const shift of [previous, current]) {
          tx.insert(assignments)
            .values({
              id: randomUUID(),
              unitId: inf.unit,
              infantId: inf.id,
              nurseId: inf.nurse,
              shiftDate: shift.shiftDate,
              shift: shift.shift,
              createdBy: charge,
              createdAt: new Date(shift.startsAt.getTime() - 30 * 60_000),
            })
            .run();
        }

        const set = inf.mode === 'air-servo' ? 3320 : 3650;
        const base = 3680 + Math.round((rand() - 0.5) * 30);
        // The last routine remote check, in minutes before now, shapes each scenario.
        const lastCheck = inf.scenario === 'overdue' ? 170 : inf.scenario === 'due-soon' ? 110 : inf.scenario === 'gap-open' ? 35 : inf.scenario === 'heat-stress' ? 20 : 50;
        const charted = (m: number) => ({
          infantId: inf.id,
          unitId: inf.unit,
          takenAt: at(m),
          recordedAt: new Date(min(m) + 60_000),
          recordedBy: inf.nurse,
          enteredUnit: 'C' as const,
        });
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
          // The generator is drawn in this order (air, output, heart rate): the demo stays the same everywhere.
          addReading({
            id,
            ...charted(m),
            probeCenti: probe,
            remoteCenti: remote,
            remoteSite: 'axilla',
            airCenti: inf.mode === 'air-servo' ? set : 3150 + Math.round(rand() * 60),
            setCenti: set,
            controlMode: inf.mode,
            heaterOutputPct: 30 + Math.round(rand() * 25),
            heartRate: 135 + Math.round(rand() * 20),
            heatSigns: '[]',
            note: null,
            lateReason: null,
            sessionId: null,
          });
          if (historicGap) {
            // A caught gap: two actions, then a recheck within the limit.
            pendingActions.push({ infant: inf.id, unit: inf.unit, readingId: id, by: inf.nurse, at: min(m - 6), at2: min(m - 12) });
            addReading({
              id: randomUUID(),
              ...charted(m - 30),
              probeCenti: remote - 15,
              remoteCenti: remote,
              remoteSite: 'axilla',
              airCenti: 3150,
              setCenti: set,
              controlMode: inf.mode,
              heaterOutputPct: 35,
              heartRate: 142,
              heatSigns: '[]',
              note: 'Recheck after moving the probe.',
              lateReason: null,
              sessionId: null,
            });
          }
          // Hourly probe-only observation between remote checks.
          if (m - 60 > lastCheck) {
            addReading({
              id: randomUUID(),
              ...charted(m - 60),
              probeCenti: base - 20 + Math.round((rand() - 0.5) * 20),
              remoteCenti: null,
              remoteSite: null,
              airCenti: inf.mode === 'air-servo' ? set : 3150,
              setCenti: set,
              controlMode: inf.mode,
              heaterOutputPct: 30 + Math.round(rand() * 25),
              heartRate: 130 + Math.round(rand() * 25),
              heatSigns: '[]',
              note: null,
              lateReason: null,
              sessionId: null,
            });
          }
          m -= late ? 135 : 110 + Math.round(rand() * 8);
        }
        seedScenario(inf, {
          add: (mins, values) =>
            addReading({
              id: randomUUID(),
              ...charted(mins),
              probeCenti: null,
              remoteCenti: null,
              remoteSite: null,
              airCenti: inf.mode === 'air-servo' ? set : 3150,
              setCenti: set,
              controlMode: inf.mode,
              heaterOutputPct: 40,
              heartRate: 146,
              heatSigns: '[]',
              note: null,
              lateReason: null,
              sessionId: null,
              ...values,
            }),
          startSession: (mins) => {
            const session = randomUUID();
            tx.insert(skinToSkinSessions)
              .values({ id: session, infantId: inf.id, unitId: inf.unit, startedAt: at(mins), startedBy: inf.nurse, referenceCenti: 3680, limitCenti: 50, carer: 'Parent' })
              .run();
            return session;
          },
          base,
        });
        chartAll();
      }

      for (const p of pendingActions) {
        syncFlags(sqlite, p.infant, new Date(p.at + 60_000), p.by);
        const flag = tx
          .select({ id: flags.id })
          .from(flags)
          .where(and(eq(flags.infantId, p.infant), eq(flags.raisedByReadingId, p.readingId)))
          .get();
        if (!flag) continue;
        tx.insert(actions)
          .values([
            {
              id: randomUUID(),
              flagId: flag.id,
              infantId: p.infant,
              unitId: p.unit,
              kind: 'checked-probe-contact',
              note: null,
              at: new Date(p.at),
              recordedBy: p.by,
              createdAt: new Date(p.at),
            },
            {
              id: randomUUID(),
              flagId: flag.id,
              infantId: p.infant,
              unitId: p.unit,
              kind: 'moved-probe',
              note: 'Moved to the left flank under a new cover.',
              at: new Date(p.at2),
              recordedBy: p.by,
              createdAt: new Date(p.at2),
            },
          ])
          .run();
      }
      // The demo's history gets its audit trail too, so the chain covers every clinical row.
      for (const r of tx.select().from(readings).orderBy(readings.recordedAt, readings.id).all()) {
        appendAudit(sqlite, { at: r.recordedAt, actorId: r.recordedBy, action: 'reading-create', entityType: 'reading', entityId: r.id, unitId: r.unitId, after: r });
      }
      for (const a of tx.select().from(actions).orderBy(actions.at, actions.id).all()) {
        appendAudit(sqlite, { at: a.at, actorId: a.recordedBy, action: 'action-create', entityType: 'action', entityId: a.id, unitId: a.unitId, after: a });
      }
      for (const inf of INFANTS) syncFlags(sqlite, inf.id, new Date(t0), null);
      appendAudit(sqlite, { at: new Date(t0), actorId: null, action: 'demo-seeded', entityType: 'database', entityId: null, unitId: null, after: { infants: INFANTS.length } });
    },
    { behavior: 'immediate' },
  );
}

function pad(n: number): string {
  return String(n).padStart(2, '0');
}

/** What a scenario may add to an infant's chart: a reading `m` minutes before now, a skin-to-skin session. */
interface ScenarioTools {
  add: (m: number, values: Partial<NewReading>) => void;
  startSession: (m: number) => string;
  base: number;
}

function seedScenario(inf: DemoInfant, { add, startSession, base }: ScenarioTools): void {
  switch (inf.scenario) {
    case 'gap-open':
      add(35, { probeCenti: 3690, remoteCenti: 3620, remoteSite: 'axilla', heaterOutputPct: 52, heartRate: 150, note: 'Cover looked lifted at one edge.' });
      break;
    case 'overdue':
      add(170, { probeCenti: base - 10, remoteCenti: base, remoteSite: 'axilla' });
      add(70, { probeCenti: base - 20 });
      break;
    case 'heat-stress':
      add(140, { probeCenti: 3660, remoteCenti: 3700, remoteSite: 'axilla' });
      add(20, {
        probeCenti: 3720,
        remoteCenti: 3790,
        remoteSite: 'axilla',
        heaterOutputPct: 70,
        heartRate: 172,
        heatSigns: JSON.stringify(['red-skin', 'sweating']),
        note: 'Flushed and damp.',
      });
      break;
    case 'skin-to-skin': {
      add(50, { probeCenti: 3670, remoteCenti: 3680, remoteSite: 'axilla' });
      const session = startSession(40);
      add(20, { probeCenti: 3660, remoteCenti: 3670, remoteSite: 'axilla', sessionId: session, controlMode: 'skin-servo', heaterOutputPct: 0 });
      break;
    }
    case 'manual':
      add(50, { probeCenti: 3670, remoteCenti: 3690, remoteSite: 'axilla' });
      add(30, { probeCenti: 3700, controlMode: 'manual', heaterOutputPct: 85, note: 'Manual while the probe cable is changed.' });
      break;
    case 'due-soon':
      add(110, { probeCenti: base - 10, remoteCenti: base, remoteSite: 'axilla' });
      break;
    case 'cold':
      add(45, { probeCenti: 3600, remoteCenti: 3630, remoteSite: 'axilla', setCenti: 3350, note: 'Cool peripheries.' });
      break;
    case 'steady':
      add(50, { probeCenti: base - 15, remoteCenti: base, remoteSite: 'axilla' });
      break;
  }
}

/** The latest `hour`:00 in `timeZone` at or before `notAfter` (ms). */
function lastLocalHour(notAfter: number, timeZone: string, hour: number): number {
  const local = new TZDate(notAfter, timeZone);
  const at = new TZDate(local.getFullYear(), local.getMonth(), local.getDate(), hour, 0, 0, timeZone).getTime();
  return at <= notAfter ? at : new TZDate(local.getFullYear(), local.getMonth(), local.getDate() - 1, hour, 0, 0, timeZone).getTime();
}
