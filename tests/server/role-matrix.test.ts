/**
 * Every route × every role (and an anonymous caller) × own unit and another unit, enumerated
 * from the Express routers themselves, with the expected outcome from shared/access-matrix.ts.
 * (OWASP API Security Top 10 2023: API1 broken object level authorization, API5 broken
 * function level authorization.)
 */
import type { Router } from 'express';
import request from 'supertest';
import { CALLERS, expectedOutcome, type Caller } from '../../shared/access-matrix';
import type { AccessHandler } from '../../server/middleware/access';
import { apiRouters } from '../../server/routes';
import { DEMO, makeEnv, type TestEnv } from './helpers';

interface RouteInfo {
  method: 'get' | 'post' | 'patch' | 'put' | 'delete';
  pattern: string;
  access: AccessHandler['access'];
}

function listRoutes(env: TestEnv): RouteInfo[] {
  const routes: RouteInfo[] = [];
  for (const [mount, router] of apiRouters(env.app.context)) {
    const stack = (router as Router & { stack: Array<{ route?: { path: string; methods: Record<string, boolean>; stack: Array<{ handle: Partial<AccessHandler> }> } }> }).stack;
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
    .prepare("INSERT INTO infants (id, unit_id, bed_id, display_name, birth_at, gestation_weeks, gestation_days, birth_weight_grams, weight_grams, heat_source, admitted_at) VALUES ('inf-far', 'unit-far', 'bed-far', 'Baby Faraway', ?, 34, 0, 2000, 2000, 'incubator', ?)")
    .run(now - 86_400_000, now - 86_400_000);
  sqlite.prepare("INSERT INTO readings (id, infant_id, unit_id, taken_at, recorded_at, recorded_by, probe_centi, remote_centi, remote_site) VALUES ('rd-far', 'inf-far', 'unit-far', ?, ?, 'u-far', 3650, 3720, 'axilla')").run(now - 3_600_000, now - 3_600_000);
  sqlite.prepare("INSERT INTO flags (id, infant_id, unit_id, key, kind, raised_at, raised_by_reading_id, created_at) VALUES ('fl-far', 'inf-far', 'unit-far', 'gap:rd-far', 'gap', ?, 'rd-far', ?)").run(now - 3_600_000, now);
  sqlite.prepare("INSERT INTO skin_to_skin_sessions (id, infant_id, unit_id, started_at, started_by, reference_centi, limit_centi) VALUES ('s2s-far', 'inf-far', 'unit-far', ?, 'u-far', 3680, 50)").run(now - 600_000);
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
  it('covers every route, and each answers as the permission table says', async () => {
    const routes = listRoutes(env);
    expect(routes.length).toBeGreaterThan(20);
    const ids = idsFor(env);
    const failures: string[] = [];
    let cases = 0;
    for (const route of routes) {
      expect(route.access).toBeDefined();
      for (const caller of CALLERS) {
        for (const unit of ['own', 'other'] as const) {
          const { path, scoped } = fill(route.pattern, ids[unit]);
          if (unit === 'other' && !scoped) continue;
          const expected = expectedOutcome(route.access, caller, unit, scoped);
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
