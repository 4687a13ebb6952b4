/**
 * The stored flag lifecycle, read alike by every view: severity, escalation (who was told, when),
 * the mode-aware check clocks, recheck settle time and late entries. Each clinical check names
 * its source.
 */
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { runEscalations } from '../../server/services/escalations';
import type { BoardResponse } from '../../shared/types/board';
import type { Flowsheet, InfantSummary } from '../../shared/types/bedside';
import { DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let nurse: string;
let charge: string;
beforeAll(async () => {
  env = await makeEnv();
  [nurse, charge] = await Promise.all([env.signIn(DEMO.nurse), env.signIn(DEMO.charge)]);
});
afterAll(() => env.close());
/** Tokens age with the app clock: sign in again before each test. */
const signInAgain = async () => {
  [nurse, charge] = await Promise.all([env.signIn(DEMO.nurse), env.signIn(DEMO.charge)]);
};
beforeEach(signInAgain);

const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
const get = async <T>(path: string, token = nurse): Promise<T> => {
  const res = await request(env.app).get(`/api${path}`).set(auth(token));
  if (res.status !== 200) throw new Error(`GET ${path}: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body as T;
};
const post = (path: string, body: object, token = nurse) => request(env.app).post(`/api${path}`).set(auth(token)).send(body);
const iso = (ms: number) => new Date(ms).toISOString();

/** Admit an infant to `bed` on skin servo and assign it to the demo nurse for this shift. */
async function admit(bed: string, name: string, controlMode = 'skin-servo'): Promise<string> {
  const res = await post(
    '/units/unit-north/infants',
    {
      bedId: bed,
      displayName: name,
      birthAt: iso(env.clock.now().getTime() - 86_400_000),
      gestationWeeks: 34,
      gestationDays: 0,
      birthWeightGrams: 2100,
      heatSource: 'radiant-warmer',
      controlMode,
      setTemperature: 36.5,
    },
    charge,
  );
  expect(res.status).toBe(201);
  const id = res.body.infant?.id ?? res.body.id;
  expect((await post('/units/unit-north/assignments', { infantId: id, nurseId: 'u-nurse' }, charge)).status).toBe(201);
  // The next reading comes a minute after the admission's (two readings at one instant have no order).
  env.clock.advanceMinutes(1);
  return id;
}

async function chart(infantId: string, values: Record<string, unknown>, takenAt?: number) {
  const res = await post(`/infants/${infantId}/readings`, {
    id: randomUUID(),
    unit: 'C',
    confirmedImplausible: true,
    ...(takenAt !== undefined ? { takenAt: iso(takenAt) } : {}),
    ...values,
  });
  expect([200, 201]).toContain(res.status);
  return res.body;
}

/** The infant as each view shows it. */
async function views(infantId: string) {
  const board = await get<BoardResponse>('/units/unit-north/board', charge);
  const tile = board.beds.find((b) => b.infant?.id === infantId)!;
  const mine = (await get<{ infants: InfantSummary[] }>('/infants/mine')).infants.find((i) => i.id === infantId)!;
  const detail = (await get<{ infant: InfantSummary }>(`/infants/${infantId}`)).infant;
  const flowsheet = await get<Flowsheet>(`/infants/${infantId}/flowsheet?hours=12`);
  const handover = (await get<{ infants: { infant: { id: string }; flags: { kind: string; closedAt: string | null; severity?: string }[] }[] }>(`/infants/${infantId}/handover`))
    .infants?.[0];
  return { board, tile, mine, detail, flowsheet, handover };
}

const openKinds = (i: InfantSummary) => i.openFlags.map((f) => `${f.kind}:${f.severity}`).sort();

describe('severity and escalation', () => {
  it('an axillary 31.8 °C is critical, tops the board and reaches the charge nurse at once; the nurse sees whom it reached (WHO 1997 via Miller 2011: below 32.0 °C is severe hypothermia)', async () => {
    const id = await admit('bed-N10', 'Baby Moorgate');
    const sentBefore = env.mailer.sent.length;
    await chart(id, { probe: 32.1, remote: 31.8, remoteSite: 'axilla', controlMode: 'skin-servo' });
    let v = await views(id);
    expect(openKinds(v.mine)).toEqual(['cold-stress:critical']);
    expect(v.board.beds[0]!.infant!.id).toBe(id);
    // A zero delay: the write itself escalated it and the mail goes out right after; a sweep
    // meanwhile sends nothing twice.
    await runEscalations(env.app.context, env.clock.now());
    for (let i = 0; i < 40 && !env.mailer.sent.slice(sentBefore).some((m) => m.subject.includes('severe hypothermia')); i += 1) await new Promise((r) => setTimeout(r, 50));
    expect(env.mailer.sent.slice(sentBefore).filter((m) => m.subject.includes('severe hypothermia'))).toHaveLength(1);
    const mail = env.mailer.sent.slice(sentBefore).find((m) => m.subject.includes('severe hypothermia'))!;
    expect(mail.to).toEqual([DEMO.charge]);
    expect(mail.text).toMatch(/medical team/);

    v = await views(id);
    const flag = v.mine.openFlags[0]!;
    expect(flag.escalated).toBe(true);
    expect(flag.escalation).toMatchObject({ sentAt: env.clock.now().toISOString(), how: 'email', to: [{ email: DEMO.charge, name: 'Marta Lindqvist' }] });
    const onBoard = v.tile.escalations.find((e) => e.flagId === flag.id)!;
    expect(onBoard).toMatchObject({ severity: 'critical', acknowledgedAt: null, to: [{ email: DEMO.charge }] });
    const ack = await post(`/escalations/${onBoard.id}/acknowledge`, { note: 'Coming.' }, charge);
    expect(ack.status).toBe(200);
    const after = (await views(id)).mine.openFlags[0]!.escalation!;
    expect(after.acknowledgedBy).toMatchObject({ name: 'Marta Lindqvist' });
  });

  it('38.2 °C raises a critical fever flag, not a heat-stress prompt (Bedside Clinical Guidelines Partnership: 38.0 °C and over is fever)', async () => {
    const id = await admit('bed-N11', 'Baby Nettlebed');
    await chart(id, { probe: 37.9, remote: 38.2, remoteSite: 'axilla', controlMode: 'skin-servo' });
    const v = await views(id);
    expect(openKinds(v.mine)).toEqual(['fever:critical']);
  });

  it('mild cold stress (36.3 °C) is a caution that never escalates by default, and does not make the bed need attention (WHO 1997 via Miller 2011)', async () => {
    const id = await admit('bed-N12', 'Baby Oakhanger');
    await chart(id, { probe: 36.4, remote: 36.3, remoteSite: 'axilla', controlMode: 'skin-servo' });
    env.clock.advanceMinutes(45);
    await runEscalations(env.app.context, env.clock.now());
    await signInAgain();
    const v = await views(id);
    expect(openKinds(v.mine)).toEqual(['cold-stress:caution']);
    expect(v.mine.openFlags[0]!.escalated).toBe(false);
    expect(v.mine.attention).toEqual({ severity: 'caution', needsAttention: false });

    // Unless the unit says so: a delay the administrator sets makes it escalate.
    const admin = await env.signIn(DEMO.admin);
    const bad = await request(env.app)
      .patch('/api/admin/units/unit-north')
      .set(auth(admin))
      .send({ escalationDelays: { lukewarm: 5 } });
    expect(bad.status).toBe(400);
    expect(
      (
        await request(env.app)
          .patch('/api/admin/units/unit-north')
          .set(auth(admin))
          .send({ escalationDelays: { 'cold-stress': 30 } })
      ).status,
    ).toBe(200);
    env.clock.advanceMinutes(1);
    await runEscalations(env.app.context, env.clock.now());
    await signInAgain();
    const told = (await views(id)).mine.openFlags[0]!;
    expect(told.escalation).toMatchObject({ to: [{ email: DEMO.charge }] });
    expect(
      (
        await request(env.app)
          .patch('/api/admin/units/unit-north')
          .set(auth(admin))
          .send({ escalationDelays: { 'cold-stress': null } })
      ).status,
    ).toBe(200);
  });
});

describe('check clocks that know the mode', () => {
  it('manual mode needs a check every 15 minutes, any temperature counts, and every view shows the same due time (ECRI)', async () => {
    const id = await admit('bed-N13', 'Baby Pebblecombe');
    const t = env.clock.now().getTime();
    await chart(id, { probe: 36.8, remote: 36.7, remoteSite: 'axilla', controlMode: 'manual', heaterOutputPct: 40 });
    env.clock.advanceMinutes(10);
    await chart(id, { probe: 36.9 });
    env.clock.advanceMinutes(3);
    const v = await views(id);
    const due = iso(t + 25 * 60_000);
    for (const summary of [v.tile.infant!, v.mine, v.detail, v.flowsheet.infant]) {
      expect(summary.checks!.manual).toMatchObject({ since: iso(t), dueAt: due, outputPct: 40, limitMinutes: 15 });
      expect(summary.checks!.next).toMatchObject({ clock: 'manual', dueAt: due });
    }
    expect(v.flowsheet.checks!.manual!.dueAt).toBe(due);
    env.clock.advanceMinutes(13);
    const late = await views(id);
    expect(late.mine.checks!.manual!.status).toBe('overdue');
    expect(late.tile.tier).toBe(0);
  });

  it('a recheck taken before the settle time after an action does not close a gap; one after it does (common practice: recheck 15–30 minutes after a change)', async () => {
    const id = await admit('bed-N14', 'Baby Quarrendon');
    await chart(id, { probe: 37.4, remote: 36.8, remoteSite: 'axilla', controlMode: 'skin-servo' });
    const gap = (await views(id)).mine.openFlags.find((f) => f.kind === 'gap')!;
    const action = await post(`/flags/${gap.id}/actions`, { id: randomUUID(), kind: 'moved-probe', probeSite: 'back-or-flank' });
    expect(action.status).toBe(201);
    env.clock.advanceMinutes(2);
    await chart(id, { probe: 36.9, remote: 36.8, remoteSite: 'axilla' });
    let v = await views(id);
    expect(openKinds(v.mine)).toEqual(['gap:urgent']);
    expect(v.mine.checks!.rechecks[0]).toMatchObject({ flagId: gap.id, kind: 'gap' });
    expect(v.tile.infant!.checks!.rechecks[0]!.dueAt).toBe(v.mine.checks!.rechecks[0]!.dueAt);
    env.clock.advanceMinutes(14);
    await chart(id, { probe: 36.9, remote: 36.8, remoteSite: 'axilla' });
    v = await views(id);
    expect(openKinds(v.mine)).toEqual([]);
    const events = env.database.sqlite.prepare('SELECT event FROM flag_events WHERE flag_id = ? ORDER BY created_at, rowid').all(gap.id) as { event: string }[];
    expect(events.map((e) => e.event)).toEqual(['raised', 'action', 'closed']);
  });
});

describe('settings in force at the time', () => {
  it('changing the check interval or the time zone never rewrites earlier figures, and the report marks the change (common practice: a policy applies from when it is adopted)', async () => {
    const educator = await env.signIn(DEMO.educator);
    const admin = await env.signIn(DEMO.admin);
    const today = env.clock.now().toISOString().slice(0, 10);
    const weekAgo = new Date(env.clock.now().getTime() - 7 * 86_400_000).toISOString().slice(0, 10);
    const report = async () => get<{ report?: unknown } & Record<string, unknown>>(`/reports?unitId=unit-north&from=${weekAgo}&to=${today}`, educator);
    const before = await report();
    // The change takes effect from now; every check in the report was taken before it.
    env.clock.advanceMinutes(1);
    const onTime = (r: Record<string, unknown>) => JSON.stringify(((r.report ?? r) as { onTime: unknown }) && ((r.report ?? r) as { onTime: unknown }).onTime);
    expect((await request(env.app).patch('/api/admin/units/unit-north').set(auth(admin)).send({ checkIntervalMinutes: 90 })).status).toBe(200);
    expect((await request(env.app).patch('/api/admin/units/unit-north').set(auth(admin)).send({ timeZone: 'America/New_York' })).status).toBe(200);
    const after = await report();
    expect(onTime(after)).toBe(onTime(before));
    const changes = ((after.report ?? after) as { settingsChanges: { checkIntervalMinutes: number; timeZone: string }[] }).settingsChanges;
    // (earlier tests in this file changed other settings: the last two are these)
    expect(changes.slice(-2).map((c) => [c.checkIntervalMinutes, c.timeZone])).toEqual([
      [90, 'Europe/London'],
      [90, 'America/New_York'],
    ]);
    const versions = env.database.sqlite.prepare("SELECT COUNT(*) AS n FROM unit_policy_versions WHERE unit_id = 'unit-north' AND created_by IS NOT NULL").get() as { n: number };
    expect(versions.n).toBe(changes.length);
    // Put the unit back for the other tests.
    await request(env.app).patch('/api/admin/units/unit-north').set(auth(admin)).send({ checkIntervalMinutes: 120, timeZone: 'Europe/London' });
  });
});

describe('late entries', () => {
  it('a check charted late with an on-time taken time withdraws the overdue flag raised meanwhile, with the reason and the reading (common practice)', async () => {
    const id = 'inf-glimmerton-b';
    // N08 was checked 50 minutes before the demo's now; advance past its due time and sweep.
    const flowsheet0 = await get<Flowsheet>(`/infants/${id}/flowsheet?hours=12`, charge);
    const due = Date.parse(flowsheet0.nextCheck.dueAt!);
    env.clock.set(new Date(due + 20 * 60_000));
    await runEscalations(env.app.context, env.clock.now());
    await signInAgain();
    let f = await get<Flowsheet>(`/infants/${id}/flowsheet?hours=12`, charge);
    expect(f.flags.filter((x) => x.kind === 'overdue-check' && x.status === 'open')).toHaveLength(1);
    const res = await post(
      `/infants/${id}/readings`,
      { id: randomUUID(), unit: 'C', probe: 36.8, remote: 36.7, remoteSite: 'axilla', takenAt: iso(due - 5 * 60_000), lateReason: 'Charted after a busy round.' },
      charge,
    );
    expect(res.status).toBe(201);
    f = await get<Flowsheet>(`/infants/${id}/flowsheet?hours=12`, charge);
    const withdrawn = f.flags.find((x) => x.kind === 'overdue-check' && x.status === 'withdrawn')!;
    expect(withdrawn.withdrawn).toMatchObject({ reason: 'late-entry-on-time', readingId: res.body.reading.id });
    expect(f.infant.openFlags.filter((x) => x.kind === 'overdue-check')).toEqual([]);
    // The educator sees it struck through, never as a late check; reports leave it out.
    const educator = await env.signIn(DEMO.educator);
    const queue = await get<{ items: { flagId: string; kind: string; withdrawn?: boolean }[] }>(`/review/queue?status=all&limit=200`, educator);
    expect(queue.items.find((i) => i.flagId === withdrawn.id)).toMatchObject({ withdrawn: true });
    // Cold stress is reviewed like the other kinds (WHO 1997 via Miller 2011 bands).
    expect(queue.items.some((i) => i.kind === 'cold-stress')).toBe(true);
  });
});

describe('one clinical truth: every view reads the stored flags', () => {
  it('a gap with no action stays open on every view after 48 in-limit readings 100 minutes apart (common practice: only a recheck after an action closes a gap)', async () => {
    const id = await admit('bed-N09', 'Baby Larkspur');
    await chart(id, { probe: 37.3, remote: 36.7, remoteSite: 'axilla', controlMode: 'skin-servo' });
    for (let i = 0; i < 48; i++) {
      env.clock.advanceMinutes(100);
      nurse = await env.signIn(DEMO.nurse); // an idle session ends: a new shift signs in
      await chart(id, { probe: 36.8, remote: 36.7, remoteSite: 'axilla' });
    }
    await signInAgain();
    // 80 hours later: a new shift, so assign the infant to the nurse again.
    expect((await post('/units/unit-north/assignments', { infantId: id, nurseId: 'u-nurse' }, charge)).status).toBe(201);
    const v = await views(id);
    for (const summary of [v.tile.infant!, v.mine, v.detail, v.flowsheet.infant]) {
      expect(openKinds(summary)).toEqual(['gap:urgent']);
    }
    expect(v.tile.tier).toBe(0);
    expect(v.flowsheet.flags.filter((f) => f.status === 'open').map((f) => f.kind)).toEqual(['gap']);
    // The gap says which reading is lower: the probe read higher than the axilla.
    expect(v.mine.openFlags[0]!.detail).toMatchObject({ direction: 'probe-higher', gapCenti: 60 });
  });
});
