/**
 * Property test over every write route (OWASP ASVS 5.1 input validation; API Security Top 10
 * 2023 API3/API8): arbitrary JSON, wrong types, huge strings, non-finite numbers, prototype
 * keys. Never a 5xx, and a rejected request leaves every table and the audit chain unchanged.
 */
import fc from 'fast-check';
import { randomUUID } from 'node:crypto';
import type { Router } from 'express';
import request from 'supertest';
import { can, ROLES, type Role } from '../../shared/roles';
import { verifyAuditChain } from '../../server/audit';
import type { AccessHandler } from '../../server/middleware/access';
import { apiRouters } from '../../server/routes';
import { DEMO, makeEnv, type TestEnv } from './helpers';

const RUNS = Number(process.env.FUZZ_RUNS ?? 12);
const SKIP = new Set(['/api/auth/sign-out']);
const VOLATILE = new Set(['sign_in_attempts', 'auth_sessions', 'caught_mail', '__drizzle_migrations', 'sqlite_sequence']);

let env: TestEnv;
const tokens: Partial<Record<Role, string>> = {};

beforeAll(async () => {
  env = await makeEnv();
  tokens.nurse = await env.signIn(DEMO.nurse);
  tokens.charge = await env.signIn(DEMO.charge);
  tokens.educator = await env.signIn(DEMO.educator);
  tokens.admin = await env.signIn(DEMO.admin);
});
afterAll(() => env.close());

function snapshot(): string {
  const { sqlite } = env.database;
  const tables = (sqlite.prepare("SELECT name FROM sqlite_master WHERE type = 'table'").all() as { name: string }[]).map((t) => t.name).filter((t) => !VOLATILE.has(t));
  const counts = tables.map((t) => `${t}:${(sqlite.prepare(`SELECT COUNT(*) AS n FROM "${t}"`).get() as { n: number }).n}`);
  const last = sqlite.prepare('SELECT hash FROM audit_events ORDER BY id DESC LIMIT 1').get() as { hash: string } | undefined;
  return `${counts.join(',')}|${last?.hash ?? ''}`;
}

const FIELDS = [
  'id',
  'unit',
  'probe',
  'remote',
  'remoteSite',
  'air',
  'set',
  'controlMode',
  'heaterOutputPct',
  'heartRate',
  'heatSigns',
  'note',
  'takenAt',
  'lateReason',
  'reason',
  'values',
  'kind',
  'reference',
  'limitCenti',
  'email',
  'password',
  'name',
  'role',
  'unitId',
  'bedId',
  'infantId',
  'nurseId',
  'shift',
  'displayName',
  'tempUnit',
  '__proto__',
  'constructor',
];

const nasty = fc.oneof(
  fc.jsonValue(),
  fc.string({ maxLength: 20 }),
  fc.constant('x'.repeat(60_000)),
  fc.double(),
  fc.integer(),
  fc.constantFrom(null, true, false, [], {}, -1, 1e308, -0, '36.5', '98.6°F', 'NaN', 'Infinity', '2026-13-45T99:00:00Z'),
  fc.constant(randomUUID()),
);
const body = fc.oneof(
  fc.jsonValue(),
  fc.dictionary(fc.constantFrom(...FIELDS), nasty, { maxKeys: 8 }),
  fc.record({ id: fc.uuid(), unit: fc.constantFrom('C', 'F', 'K'), probe: nasty, remote: nasty, remoteSite: nasty }),
);

interface WriteRoute {
  method: 'post' | 'patch' | 'put' | 'delete';
  path: string;
  role: Role;
}

function writeRoutes(): WriteRoute[] {
  const ids: Record<string, string> = {
    infants: 'inf-ashgrove',
    readings: (env.database.sqlite.prepare("SELECT id FROM readings WHERE infant_id = 'inf-cinderford' ORDER BY taken_at DESC LIMIT 1").get() as { id: string }).id,
    flags: (env.database.sqlite.prepare("SELECT id FROM flags WHERE unit_id = 'unit-north' LIMIT 1").get() as { id: string }).id,
    'skin-to-skin': (env.database.sqlite.prepare('SELECT id FROM skin_to_skin_sessions LIMIT 1').get() as { id: string }).id,
  };
  const routes: WriteRoute[] = [];
  for (const [mount, router] of apiRouters(env.app.context)) {
    const stack = (router as Router & { stack: { route?: { path: string; methods: Record<string, boolean>; stack: { handle: Partial<AccessHandler> }[] } }[] }).stack;
    for (const layer of stack) {
      if (!layer.route) continue;
      const access = layer.route.stack[0]!.handle.access!;
      for (const method of Object.keys(layer.route.methods)) {
        if (method === 'get') continue;
        const pattern = `/api${mount === '/' ? '' : mount}${layer.route.path}`;
        if (SKIP.has(pattern)) continue;
        const path = pattern.replace(/:(\w+)/g, (_m, name: string) => {
          if (name === 'unitId') return 'unit-north';
          if (name === 'flagId') return ids.flags!;
          const before = pattern.slice(0, pattern.indexOf(`:${name}`));
          const table = before.split('/').filter(Boolean).pop()!;
          return ids[table] ?? 'u-nurse-2';
        });
        const role = access === 'public' || access === 'signed-in' ? 'nurse' : ROLES.find((r) => can(r, access))!;
        routes.push({ method: method as WriteRoute['method'], path, role });
      }
    }
  }
  return routes;
}

describe('fuzzing every write route', () => {
  it('never answers 5xx and never writes half a change', async () => {
    const routes = writeRoutes();
    expect(routes.length).toBeGreaterThan(10);
    let runs = 0;
    let rejected = 0;
    for (const route of routes) {
      await fc.assert(
        fc.asyncProperty(body, async (payload) => {
          const before = snapshot();
          const res = await request(env.app)
            [route.method](route.path)
            .set('Authorization', `Bearer ${tokens[route.role]}`)
            .set('Content-Type', 'application/json')
            .send(JSON.stringify(payload) ?? 'null');
          runs += 1;
          if (res.status >= 500) throw new Error(`${route.method} ${route.path} answered ${res.status} to ${JSON.stringify(payload).slice(0, 200)}`);
          if (res.status >= 400) {
            rejected += 1;
            expect(res.body.error).toBeDefined();
            expect(snapshot()).toBe(before);
          }
        }),
        { numRuns: RUNS, seed: 20261202 },
      );
      // A prototype key must never leak into the parsed body's prototype.
      expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    }
    // Non-JSON and non-finite numbers as raw text.
    for (const raw of ['{"probe": NaN}', '{"probe": Infinity}', '{"__proto__": {"polluted": true}}', '[1,2', 'null']) {
      const route = routes[0]!;
      const before = snapshot();
      const res = await request(env.app)[route.method](route.path).set('Authorization', `Bearer ${tokens[route.role]}`).set('Content-Type', 'application/json').send(raw);
      runs += 1;
      expect(res.status).toBeLessThan(500);
      if (res.status >= 400) expect(snapshot()).toBe(before);
      expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    }
    const chain = verifyAuditChain(env.database.sqlite);
    expect(chain.ok).toBe(true);
    process.stdout.write(`fuzz: ${routes.length} write routes, ${runs} requests, ${rejected} rejected cleanly\n`);
  }, 300_000);
});
