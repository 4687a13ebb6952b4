/**
 * One router per resource, mounted at its prefix under /api. The prefixes are written out by hand
 * here, not read from server/routes/index.ts. (The role matrix checks that every public path still
 * answers as before; this file checks where the routers sit.)
 */
import type { Router } from 'express';
import request from 'supertest';
import { apiRouters } from '@/server/routes';
import { DEMO, makeEnv, type TestEnv } from './helpers';

/** The resources' prefixes under /api. */
const PREFIXES = new Set([
  '/auth',
  '/infants',
  '/units/:unitId',
  '/nurses',
  '/readings',
  '/flags',
  '/skin-to-skin',
  '/escalations',
  '/review',
  '/reviews',
  '/reports',
  '/exports',
  '/admin',
  '/readings-import',
  '/mailbox',
]);

/** The one router left at the root: the two probes /api/health and /api/ping. */
const ROOT_ROUTES = ['GET /health', 'GET /ping'];

type Layer = { route?: { path: string; methods: Record<string, boolean> } };

function routesOf(router: Router): string[] {
  const stack = (router as unknown as { stack: Layer[] }).stack;
  return stack.flatMap((layer) => (layer.route ? Object.keys(layer.route.methods).map((m) => `${m.toUpperCase()} ${layer.route!.path}`) : []));
}

let env: TestEnv;
beforeAll(async () => {
  env = await makeEnv();
});
afterAll(() => env.close());

describe('API routers', () => {
  it('mounts every router at a resource prefix; only the health probes sit at the root', () => {
    const mounts = apiRouters(env.app.context);
    expect(mounts.length).toBe(PREFIXES.size + 1);
    for (const [mount, router] of mounts) {
      if (mount === '/') expect(routesOf(router).sort()).toEqual(ROOT_ROUTES);
      else expect(PREFIXES).toContain(mount);
    }
    expect(mounts.filter(([mount]) => mount === '/')).toHaveLength(1);
  });

  it('serves each prefix in demo mode, the mailbox among them', () => {
    const mounted = new Set(apiRouters(env.app.context).map(([mount]) => mount));
    for (const prefix of PREFIXES) expect(mounted).toContain(prefix);
  });

  it('keeps paths inside a router relative to its prefix (no prefix written twice)', () => {
    for (const [mount, router] of apiRouters(env.app.context)) {
      if (mount === '/') continue;
      for (const route of routesOf(router)) {
        const path = route.slice(route.indexOf(' ') + 1);
        expect(`${mount}: ${path}`).not.toMatch(new RegExp(`^${mount}: ${mount.replace(/[/:]/g, '\\$&')}(/|$)`));
      }
    }
  });

  it('mounts exactly one router at each prefix, so a resource is read in one place', () => {
    const mounts = apiRouters(env.app.context).map(([mount]) => mount);
    expect(mounts.filter((mount, i) => mounts.indexOf(mount) !== i)).toEqual([]);
    // The four prefixes that used to be shared by several routers, each written out here.
    for (const prefix of ['/auth', '/infants', '/units/:unitId', '/admin']) expect(mounts.filter((mount) => mount === prefix)).toHaveLength(1);
  });

  it('builds the one router mounted under /units/:unitId with mergeParams, so it sees the unit', () => {
    const unitRouters = apiRouters(env.app.context).filter(([mount]) => mount.includes(':'));
    expect(unitRouters.map(([mount]) => mount)).toEqual(['/units/:unitId']);
    expect((unitRouters[0]![1] as Router & { mergeParams?: boolean }).mergeParams).toBe(true);
    // Its routes, the board's and the shift change's among them, all read the unit from the mount path.
    expect(routesOf(unitRouters[0]![1])).toEqual(expect.arrayContaining(['GET /board', 'GET /warmings', 'GET /handover', 'GET /handover-plans', 'POST /assignments/bulk']));
  });

  it("checks the unit in the mount path: the charge nurse's own board answers, a unit that does not exist is 404", async () => {
    const token = await env.signIn(DEMO.charge);
    const own = await request(env.app).get('/api/units/unit-north/board').set('Authorization', `Bearer ${token}`);
    expect(own.status).toBe(200);
    const none = await request(env.app).get('/api/units/unit-nowhere/board').set('Authorization', `Bearer ${token}`);
    expect(none.status).toBe(404);
    const plans = await request(env.app).get('/api/units/unit-nowhere/handover-plans').set('Authorization', `Bearer ${token}`);
    expect(plans.status).toBe(404);
  });
});
