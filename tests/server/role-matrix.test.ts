/**
 * Every route × every role (and an anonymous caller) × own unit and another unit, enumerated
 * from the Express routers themselves. The expected outcome of each call is written out by hand
 * in EXPECTED below, from what each role is for (a bedside nurse charts, a charge nurse runs the
 * unit, an educator reviews, an administrator manages people and units and never charts), not
 * read from the server's permission table, so a wrong entry in that table fails here.
 * (OWASP API Security Top 10 2023: API1 broken object level authorization, API5 broken
 * function level authorization.)
 */
import type { Router } from 'express';
import request from 'supertest';
import type { AccessHandler } from '../../server/middleware/access';
import { apiRouters } from '../../server/routes';
import { DEMO, makeEnv, type TestEnv } from './helpers';

type Caller = 'nurse' | 'charge' | 'educator' | 'admin' | 'anonymous';
type Outcome = 'allowed' | 'unauthorized' | 'forbidden';
const CALLERS: Caller[] = ['nurse', 'charge', 'educator', 'admin', 'anonymous'];

/**
 * One letter per caller, in the order nurse, charge nurse, educator, administrator, anonymous:
 * Y allowed; U allowed for a record of one's own unit, 403 for another unit's; F 403; N 401.
 * "Allowed" means neither 401 nor 403 (the empty body may still be a 400).
 */
const EXPECTED: Record<string, string> = {
  'GET /api/health': 'YYYYY',
  'GET /api/ping': 'YYYYY',
  'POST /api/auth/sign-in': 'YYYYY',
  'POST /api/auth/invitations/accept': 'YYYYY',
  'POST /api/auth/password-reset': 'YYYYY',
  'POST /api/auth/password-reset/request': 'YYYYY',
  'POST /api/auth/sign-out': 'YYYYN',
  'GET /api/auth/me': 'YYYYN',
  'PATCH /api/auth/me/preferences': 'YYYYN',
  'POST /api/auth/me/password': 'YYYYN',
  'GET /api/mailbox': 'YYYYN',
  'GET /api/reviews/mine': 'YYYYN',
  // Reading the chart: the clinical roles, in their own units; an administrator never.
  'GET /api/infants/mine': 'YYYFN',
  'GET /api/infants/': 'YYYFN',
  'GET /api/infants/:id': 'UUUFN',
  'GET /api/infants/:id/flowsheet': 'UUUFN',
  'GET /api/units/:unitId/board': 'UUUFN',
  'GET /api/nurses/me/handover': 'YYYFN',
  'GET /api/infants/:id/handover': 'UUUFN',
  'GET /api/infants/:id/handover.csv': 'UUUFN',
  // Charting: bedside and charge nurses.
  'POST /api/infants/:id/readings': 'UUFFN',
  'POST /api/infants/:id/skin-to-skin': 'UUFFN',
  'POST /api/infants/:id/placement': 'UUFFN',
  'POST /api/readings/:id/corrections': 'UUFFN',
  'POST /api/flags/:id/actions': 'UUFFN',
  'POST /api/flags/:flagId/actions/:id/undo': 'UUFFN',
  'GET /api/flags/:id/history': 'UUUFN',
  'POST /api/skin-to-skin/:id/end': 'UUFFN',
  // Running the unit: the charge nurse.
  'GET /api/units/:unitId/nurses': 'FUFFN',
  'POST /api/units/:unitId/assignments': 'FUFFN',
  'POST /api/units/:unitId/infants': 'FUFFN',
  'POST /api/units/:unitId/beds/:bedId/warming': 'FUFFN',
  'POST /api/units/:unitId/beds/:bedId/warming/end': 'FUFFN',
  // Beds warmed for the next admission: shown on the board to the clinical roles of the unit.
  'GET /api/units/:unitId/warmings': 'UUUFN',
  // Shift change: the plan per infant (charting roles write it), every nurse's infants in one step.
  'GET /api/infants/:id/handover-plan': 'UUUFN',
  'POST /api/infants/:id/handover-plan': 'UUFFN',
  'GET /api/units/:unitId/handover-plans': 'FUFFN',
  'POST /api/units/:unitId/assignments/bulk': 'FUFFN',
  'POST /api/infants/:id/move': 'FUFFN',
  'PATCH /api/infants/:id': 'FUFFN',
  'POST /api/infants/:id/discharge': 'FUFFN',
  'POST /api/escalations/:id/acknowledge': 'FUFFN',
  'GET /api/units/:unitId/handover': 'FUFFN',
  'POST /api/readings-import/preview': 'FYFFN',
  'POST /api/readings-import/:uploadId/import': 'FYFFN',
  'GET /api/readings-import/:uploadId/errors.csv': 'FYFFN',
  // Review, reports and exports: the educator.
  'GET /api/review/queue': 'FFYFN',
  'GET /api/review/items/:flagId': 'FFUFN',
  'POST /api/review/items/:flagId/notes': 'FFUFN',
  'POST /api/review/items/:flagId/no-teaching-point': 'FFUFN',
  'POST /api/reviews/:id/amend': 'FFYFN',
  'POST /api/reviews/:id/withdraw': 'FFYFN',
  // Only the nurse a note is for may acknowledge it (checked in the handler); any signed-in caller reaches it.
  'POST /api/reviews/:id/acknowledge': 'YYYYN',
  'GET /api/review/nurses': 'FFYFN',
  'GET /api/reports/trends': 'FFYFN',
  'GET /api/reports/compare': 'FFYFN',
  // The admission-temperature measure: the educator and the charge nurse.
  'GET /api/reports/admission-measure': 'FYYFN',
  'GET /api/reports': 'FFYFN',
  'GET /api/reports/tables/:table.csv': 'FFYFN',
  'GET /api/exports/readings.csv': 'FFYFN',
  'GET /api/exports/fhir': 'FFYFN',
  'GET /api/exports/flags.csv': 'FFYFN',
  'GET /api/exports/infants/:infantId/fhir': 'FFUFN',
  // People, units and beds: the administrator, inside their units.
  'GET /api/admin/users': 'FFFYN',
  'POST /api/admin/users': 'FFFYN',
  'PATCH /api/admin/users/:id': 'FFFUN',
  'POST /api/admin/users/:id/units': 'FFFUN',
  'DELETE /api/admin/users/:id/units/:unit': 'FFFUN',
  'GET /api/admin/audit': 'FFFYN',
  'POST /api/admin/units': 'FFFYN',
  'POST /api/admin/users/:id/deactivate': 'FFFUN',
  'POST /api/admin/users/:id/reactivate': 'FFFUN',
  'POST /api/admin/users/:id/invitation': 'FFFUN',
  'POST /api/admin/users/:id/password-reset': 'FFFUN',
  'GET /api/admin/units': 'FFFYN',
  'PATCH /api/admin/units/:id': 'FFFUN',
  'POST /api/admin/units/:id/beds': 'FFFUN',
  'PATCH /api/admin/beds/:id': 'FFFUN',
  'POST /api/admin/digest/send': 'FFFYN',
  'POST /api/admin/roster/preview': 'FFFYN',
  'POST /api/admin/roster/:uploadId/import': 'FFFYN',
};

function expectedOutcome(route: string, caller: Caller, unit: 'own' | 'other'): Outcome {
  const letter = EXPECTED[route]![CALLERS.indexOf(caller)];
  if (letter === 'N') return 'unauthorized';
  if (letter === 'F') return 'forbidden';
  if (letter === 'U' && unit === 'other') return 'forbidden';
  return 'allowed';
}

interface RouteInfo {
  method: 'get' | 'post' | 'patch' | 'put' | 'delete';
  pattern: string;
  access: AccessHandler['access'];
}

function listRoutes(env: TestEnv): RouteInfo[] {
  const routes: RouteInfo[] = [];
  for (const [mount, router] of apiRouters(env.app.context)) {
    const stack = (router as Router & { stack: { route?: { path: string; methods: Record<string, boolean>; stack: { handle: Partial<AccessHandler> }[] } }[] }).stack;
    for (const layer of stack) {
      if (!layer.route) continue;
      const access = layer.route.stack[0]?.handle.access;
      for (const method of Object.keys(layer.route.methods)) {
        routes.push({ method: method as RouteInfo['method'], pattern: `/api${mount === '/' ? '' : mount}${layer.route.path}`, access: access! });
      }
    }
  }
  return routes;
}

let env: TestEnv;
const tokens: Partial<Record<Caller, string>> = {};
const EMAILS: Record<Exclude<Caller, 'anonymous'>, string> = { nurse: DEMO.nurse, charge: DEMO.charge, educator: DEMO.educator, admin: DEMO.admin };

/** Records of a third unit nobody in the demo belongs to: "another unit" for every caller. */
function addFarUnit(env: TestEnv) {
  const { sqlite } = env.database;
  const now = env.clock.now().getTime();
  sqlite.prepare("INSERT INTO units (id, name, hospital_name, created_at) VALUES ('unit-far', 'Far Unit', 'Elsewhere General', ?)").run(now);
  sqlite.prepare("INSERT INTO beds (id, unit_id, label, sort_order) VALUES ('bed-far', 'unit-far', 'F01', 1)").run();
  sqlite.prepare("INSERT INTO users (id, email, name, role, created_at, updated_at) VALUES ('u-far', 'far.nurse@warmfold.test', 'Far Nurse', 'nurse', ?, ?)").run(now, now);
  sqlite.prepare("INSERT INTO user_units (user_id, unit_id) VALUES ('u-far', 'unit-far')").run();
  sqlite
    .prepare(
      "INSERT INTO infants (id, unit_id, bed_id, display_name, birth_at, gestation_weeks, gestation_days, birth_weight_grams, weight_grams, heat_source, admitted_at) VALUES ('inf-far', 'unit-far', 'bed-far', 'Baby Faraway', ?, 34, 0, 2000, 2000, 'incubator', ?)",
    )
    .run(now - 86_400_000, now - 86_400_000);
  sqlite
    .prepare(
      "INSERT INTO readings (id, infant_id, unit_id, taken_at, recorded_at, recorded_by, probe_centi, remote_centi, remote_site) VALUES ('rd-far', 'inf-far', 'unit-far', ?, ?, 'u-far', 3650, 3720, 'axilla')",
    )
    .run(now - 3_600_000, now - 3_600_000);
  sqlite
    .prepare(
      "INSERT INTO flags (id, infant_id, unit_id, key, kind, raised_at, raised_by_reading_id, created_at) VALUES ('fl-far', 'inf-far', 'unit-far', 'gap:rd-far', 'gap', ?, 'rd-far', ?)",
    )
    .run(now - 3_600_000, now);
  sqlite
    .prepare(
      "INSERT INTO skin_to_skin_sessions (id, infant_id, unit_id, started_at, started_by, reference_centi, limit_centi) VALUES ('s2s-far', 'inf-far', 'unit-far', ?, 'u-far', 3680, 50)",
    )
    .run(now - 600_000);
  sqlite.prepare("INSERT INTO escalations (id, flag_id, unit_id, escalated_at) VALUES ('esc-far', 'fl-far', 'unit-far', ?)").run(now);
}

function idsFor(env: TestEnv) {
  const { sqlite } = env.database;
  const one = (sql: string) => (sqlite.prepare(sql).get() as { id: string } | undefined)?.id ?? 'missing';
  return {
    own: {
      unitId: 'unit-north',
      infant: 'inf-ashgrove',
      reading: one("SELECT id FROM readings WHERE infant_id = 'inf-ashgrove' ORDER BY taken_at DESC LIMIT 1"),
      flag: one("SELECT id FROM flags WHERE unit_id = 'unit-north' LIMIT 1"),
      session: one("SELECT id FROM skin_to_skin_sessions WHERE unit_id = 'unit-north' LIMIT 1"),
      escalation: one("SELECT id FROM escalations WHERE unit_id = 'unit-north' LIMIT 1"),
      user: 'u-nurse-2',
      bed: 'bed-N09',
    },
    other: { unitId: 'unit-far', infant: 'inf-far', reading: 'rd-far', flag: 'fl-far', session: 's2s-far', escalation: 'esc-far', user: 'u-far', bed: 'bed-far' },
  };
}

type Fixture = ReturnType<typeof idsFor>['own'];

function fill(pattern: string, f: Fixture): { path: string; scoped: boolean } {
  let scoped = false;
  const path = pattern.replace(/:(\w+)/g, (_m, name: string) => {
    scoped = true;
    if (name === 'unitId') return f.unitId;
    if (name === 'flagId') return f.flag;
    const before = pattern.slice(0, pattern.indexOf(`:${name}`));
    if (before.endsWith('/infants/')) return f.infant;
    if (before.endsWith('/readings/')) return f.reading;
    if (before.endsWith('/flags/')) return f.flag;
    if (before.endsWith('/skin-to-skin/')) return f.session;
    if (before.endsWith('/escalations/')) return f.escalation;
    if (before.endsWith('/users/')) return f.user;
    if (before.endsWith('/beds/')) return f.bed;
    if (before.endsWith('/units/')) return f.unitId;
    scoped = false;
    return 'unknown-id';
  });
  return { path, scoped };
}

beforeAll(async () => {
  env = await makeEnv();
  addFarUnit(env);
  for (const [role, email] of Object.entries(EMAILS)) tokens[role as Caller] = await env.signIn(email);
});
afterAll(() => env.close());

describe('role × route × unit matrix', () => {
  it('covers every route, and each answers as the hand-written table says', async () => {
    const routes = listRoutes(env);
    expect(routes.length).toBeGreaterThan(20);
    // Every route has a row, and every row a route: a new route needs its expected outcomes here.
    const keys = routes.map((r) => `${r.method.toUpperCase()} ${r.pattern}`);
    expect(keys.filter((k) => !(k in EXPECTED))).toEqual([]);
    expect(Object.keys(EXPECTED).filter((k) => !keys.includes(k))).toEqual([]);
    for (const row of Object.values(EXPECTED)) expect(row).toMatch(/^[YUF]{4}[YN]$/);
    const ids = idsFor(env);
    const failures: string[] = [];
    let cases = 0;
    for (const route of routes) {
      expect(route.access).toBeDefined();
      for (const caller of CALLERS) {
        for (const unit of ['own', 'other'] as const) {
          const key = `${route.method.toUpperCase()} ${route.pattern}`;
          // Only routes that name a unit's record in their path have an "other unit" call.
          if (unit === 'other' && !EXPECTED[key]!.includes('U')) continue;
          const { path } = fill(route.pattern, ids[unit]);
          const expected = expectedOutcome(key, caller, unit);
          let req = request(env.app)[route.method](path);
          const token = tokens[caller];
          if (caller !== 'anonymous' && token) req = req.set('Authorization', `Bearer ${token}`);
          const res = route.method === 'get' ? await req : await req.send({});
          cases += 1;
          const got = res.status === 401 ? 'unauthorized' : res.status === 403 ? 'forbidden' : 'allowed';
          if (res.status >= 500) failures.push(`${route.method.toUpperCase()} ${path} as ${caller}: ${res.status}`);
          else if (got !== expected) failures.push(`${route.method.toUpperCase()} ${route.pattern} as ${caller} (${unit} unit): expected ${expected}, got ${res.status}`);
          // Signing out ends that caller's session: sign in again for the rest of the matrix.
          if (caller !== 'anonymous' && route.pattern.endsWith('/sign-out') && res.status === 204) tokens[caller] = await env.signIn(EMAILS[caller]);
        }
      }
    }
    process.stdout.write(`role matrix: ${routes.length} routes, ${cases} calls checked\n`);
    expect(failures).toEqual([]);
  }, 120_000);
});
