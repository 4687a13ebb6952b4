/**
 * The clinical scenarios, each through the real API on a real SQLite file, each named after the
 * behaviour it checks and with its source beside the check. Every scenario admits its own
 * infant to a bed of its own and discharges it at the end, so the board holds only the demo
 * unit and the infant at hand.
 */
import { runEscalations } from '../../server/services/escalations';
import { sendWeeklyDigests } from '../../server/services/digest';
import { evaluateModel } from '../reference/thermal-model';
import { differences, modelView, UNIT, Ward, type ViewState } from './clinical-views';
import { makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let ward: Ward;
let infant: string | null = null;

beforeAll(async () => {
  env = await makeEnv();
  ward = new Ward(env);
});
afterAll(() => env.close());
afterEach(async () => {
  if (infant) await ward.discharge(infant).catch(() => undefined);
  infant = null;
  ward.advance(60);
});

const MIN = 60_000;
const iso = (t: number) => new Date(t).toISOString();
const sweep = () => runEscalations(env.app.context, env.clock.now());

async function admit(mode: 'skin-servo' | 'air-servo' | 'manual' = 'skin-servo') {
  infant = await ward.admit(mode);
  return infant;
}

/** Every view agrees with the reference model (and so with each other). */
async function expectViewsMatchModel(id: string): Promise<ViewState[]> {
  const views = await ward.views(id);
  const model = modelView(ward, id, evaluateModel);
  expect(views.flatMap((v) => differences(v, model))).toEqual([]);
  return views;
}

const kindsIn = (v: ViewState) => v.flags.map((f) => f.kind).sort();

const summaryFlags = (id: string) => ward.summaries(id);

/** A gap flag (0.7 °C) with an action two minutes later. */
async function gapWithAction(id: string) {
  const res = await ward.chart(id, { probe: 37.3, remote: 36.6 });
  const gap = res.body.openFlags.find((f: any) => f.kind === 'gap');
  ward.advance(2);
  await ward.act(id, gap.id, gap.key);
  return gap;
}

describe('views agree on stored flags', () => {
  it('a 0.6 °C gap followed by 48 in-limit readings 100 min apart stays open in every view (common practice: a gap closes only after an action)', async () => {
    const id = await admit();
    await ward.chart(id, { probe: 37.3, remote: 36.7 });
    for (let i = 0; i < 48; i += 1) {
      ward.advance(100);
      await ward.chart(id, { probe: 36.9, remote: 36.8 });
    }
    ward.advance(10);
    const views = await expectViewsMatchModel(id);
    for (const v of views) expect({ view: v.view, kinds: kindsIn(v) }).toEqual({ view: v.view, kinds: ['gap'] });
    const { bed } = await summaryFlags(id);
    expect(bed.tier).toBe(0);
  });
});

describe('severity and escalation', () => {
  it('axillary 31.8 °C is severe hypothermia: critical, tops the board, escalated with zero delay naming the charge nurse (WHO 1997 via Miller 2011)', async () => {
    const id = await admit();
    await ward.chart(id, { remote: 31.8, remoteSite: 'axilla', confirmedImplausible: true });
    await sweep(); // the same instant: no delay
    const { board, bed, mine } = await summaryFlags(id);
    expect(board.beds[0].infant.id).toBe(id);
    expect(bed.tier).toBe(0);
    const flag = mine.openFlags.find((f: any) => f.kind === 'cold-stress');
    expect(flag).toMatchObject({ severity: 'critical', escalated: true });
    expect(flag.band ?? flag.detail.band).toBe('severe-hypothermia');
    expect(flag.escalation.to.map((p: any) => p.name)).toContain('Marta Lindqvist');
    expect(flag.escalation.sentAt).toBe(iso(ward.now()));
    const esc = bed.escalations.find((e: any) => e.flagId === flag.id);
    expect(esc).toBeDefined();
    expect(JSON.stringify(esc.to ?? esc.recipient)).toContain('Marta Lindqvist');
    await expectViewsMatchModel(id);
  });

  it('heat stress escalates after the unit delay, not before, and "escalated" appears only once someone was told (NHS GG&C signs; 30 min delay from memory)', async () => {
    const id = await admit();
    await ward.chart(id, { probe: 36.9, remote: 37.0, heatSigns: ['sweating'] });
    ward.advance(30);
    await sweep();
    for (const v of [(await summaryFlags(id)).mine, (await summaryFlags(id)).detail]) {
      const flag = v.openFlags.find((f: any) => f.kind === 'heat-stress');
      expect(flag).toMatchObject({ severity: 'urgent', escalated: false, escalation: null });
    }
    const sheet = (await summaryFlags(id)).sheet;
    expect(sheet.flags.find((f: any) => f.kind === 'heat-stress').escalation).toBeNull();
    expect(JSON.stringify(sheet)).not.toMatch(/\(escalated\)/);
    ward.advance(1);
    await sweep();
    const { mine, bed } = await summaryFlags(id);
    const flag = mine.openFlags.find((f: any) => f.kind === 'heat-stress');
    expect(flag).toMatchObject({ escalated: true });
    expect(flag.escalation.to.map((p: any) => p.name)).toContain('Marta Lindqvist');
    expect(bed.escalations.map((e: any) => e.flagId)).toContain(flag.id);
    await expectViewsMatchModel(id);
  });

  it('manual mode at 100 % for more than 15 min raises the manual-mode flag, which escalates after the delay (ECRI; from memory)', async () => {
    const id = await admit();
    await ward.chart(id, { probe: 36.8, controlMode: 'manual', heaterOutputPct: 100 });
    for (let i = 0; i < 4; i += 1) {
      ward.advance(10);
      await ward.chart(id, { probe: 36.9 });
    }
    // 40 min in: high output since 0, flag raised at 15, escalation due after 45.
    ward.advance(4);
    await sweep();
    let flag = (await summaryFlags(id)).mine.openFlags.find((f: any) => f.kind === 'manual-mode');
    expect(flag).toMatchObject({ severity: 'urgent', escalated: false });
    await expectViewsMatchModel(id);
    ward.advance(2);
    await sweep();
    flag = (await summaryFlags(id)).mine.openFlags.find((f: any) => f.kind === 'manual-mode');
    expect(flag.escalated).toBe(true);
    expect(flag.escalation.to.length).toBeGreaterThan(0);
  });

  it('a skin-to-skin deviation escalates after the delay and says warmer (common practice: 0.5 or 1.0 °C limits)', async () => {
    const id = await admit();
    await ward.startSession(id, 36.8, 50);
    ward.advance(5);
    await ward.chart(id, { probe: 37.3, remote: 37.4 });
    const { mine } = await summaryFlags(id);
    const flag = mine.openFlags.find((f: any) => f.kind === 'skin-to-skin-deviation');
    // Warmer than the reference: said in words, or by the sign of reading − reference.
    expect(flag.detail.direction ?? (flag.detail.deviationCenti > 0 ? 'warmer' : 'colder')).toBe('warmer');
    expect(flag.detail.deviationCenti).toBe(60);
    ward.advance(31);
    await sweep();
    const after = (await summaryFlags(id)).mine.openFlags.find((f: any) => f.kind === 'skin-to-skin-deviation');
    expect(after.escalated).toBe(true);
    await expectViewsMatchModel(id);
  });
});

describe('the check clock knows the mode', () => {
  it('manual mode gives a 15-min check on the board, My infants, the flowsheet and the handover, with why (ECRI: at least every 15 minutes)', async () => {
    const id = await admit();
    await ward.chart(id, { probe: 36.8, remote: 36.8 });
    ward.advance(20);
    const t0 = ward.now();
    await ward.chart(id, { probe: 36.8, controlMode: 'manual', heaterOutputPct: 40 });
    ward.advance(5);
    const views = await ward.views(id);
    for (const v of views.filter((x) => x.next !== undefined)) {
      expect({ view: v.view, manual: v.manualDueAt, next: v.next }).toEqual({ view: v.view, manual: iso(t0 + 15 * MIN), next: { clock: 'manual', dueAt: iso(t0 + 15 * MIN) } });
    }
    const { mine } = await summaryFlags(id);
    expect(mine.checks.manual).toMatchObject({ since: iso(t0), outputPct: 40, limitMinutes: 15, status: 'due-soon' });
    await expectViewsMatchModel(id);
    ward.advance(11);
    await sweep(); // the scheduler's minute: time-raised flags are stored by it
    const late = await ward.views(id);
    for (const v of late) expect({ view: v.view, kinds: kindsIn(v) }).toEqual({ view: v.view, kinds: ['manual-mode'] });
    await expectViewsMatchModel(id);
  });

  it('an overdue recheck after an action shows on My infants and the board (common practice: recheck 15–30 min after an action)', async () => {
    const id = await admit();
    const gap = await gapWithAction(id);
    ward.advance(31);
    const { mine, bed } = await summaryFlags(id);
    for (const s of [mine, bed.infant]) {
      expect(s.checks.rechecks[0]).toMatchObject({ flagId: gap.id, status: 'overdue' });
      expect(s.checks.next).toMatchObject({ clock: 'recheck', status: 'overdue' });
    }
    expect(bed.tier).toBe(0);
    await expectViewsMatchModel(id);
  });

  it('a recheck seconds after an action does not close a gap flag; one after the settle time does (common practice: 15–30 min to settle)', async () => {
    const id = await admit();
    const gap = await gapWithAction(id);
    env.clock.set(new Date(ward.now() + 20_000));
    const early = await ward.chart(id, { probe: 36.9, remote: 36.8 });
    expect(early.body.openFlags.map((f: any) => f.kind)).toContain('gap');
    await expectViewsMatchModel(id);
    ward.advance(15);
    const later = await ward.chart(id, { probe: 36.9, remote: 36.8 });
    expect(later.body.closedFlagIds).toContain(gap.id);
    await expectViewsMatchModel(id);
  });

  it('the gap says which reading is lower (common practice: in skin servo a low probe drives the heater up)', async () => {
    const id = await admit();
    await ward.chart(id, { probe: 36.1, remote: 36.8 });
    const { mine, sheet } = await summaryFlags(id);
    expect(mine.openFlags.find((f: any) => f.kind === 'gap').detail.direction).toBe('probe-lower');
    expect(sheet.flags.find((f: any) => f.kind === 'gap' && f.status === 'open').detail.direction).toBe('probe-lower');
    const handover = (await ward.ok('nurse', 'get', `/infants/${id}/handover`)).body.infants[0];
    expect(JSON.stringify(handover.flags)).toMatch(/probe-lower|probe (is )?lower/i);
  });

  it('a probe-only reading does not close a skin-to-skin flag raised on the remote site (IEC 60601-2-21:2020 scope note: a probe is not a body temperature)', async () => {
    const id = await admit();
    await ward.startSession(id, 36.8, 50);
    ward.advance(5);
    await ward.chart(id, { probe: 37.0, remote: 37.4 });
    ward.advance(10);
    await ward.chart(id, { probe: 36.8 });
    for (const v of await ward.views(id)) expect({ view: v.view, kinds: kindsIn(v) }).toEqual({ view: v.view, kinds: ['skin-to-skin-deviation'] });
    await expectViewsMatchModel(id);
    ward.advance(10);
    await ward.chart(id, { probe: 36.8, remote: 36.9 });
    for (const v of await ward.views(id)) expect({ view: v.view, kinds: kindsIn(v) }).toEqual({ view: v.view, kinds: [] });
  });
});

describe('late entries and settings', () => {
  const today = () => new Intl.DateTimeFormat('en-CA', { timeZone: 'Europe/London' }).format(env.clock.now());
  const report = async (from: string, to: string) =>
    (await ward.ok('educator', 'get', `/reports?unitId=${UNIT}&from=${from}&to=${to}`)).body.report ??
    (await ward.ok('educator', 'get', `/reports?unitId=${UNIT}&from=${from}&to=${to}`)).body;
  const lateOf = (r: any) => r.onTime.overall.checks - r.onTime.overall.onTime;
  const overdueFlagsOf = (r: any) => r.responseTimes.find((x: any) => x.kind === 'overdue-check')?.flags ?? 0;

  it('a late-charted on-time check withdraws the overdue flag; the review queue and reports do not count it (common practice)', async () => {
    const id = await admit();
    await ward.chart(id, { probe: 36.8, remote: 36.8 });
    const t0 = ward.now();
    const before = await report(today(), today());
    ward.advance(125);
    await sweep();
    const overdue = (await summaryFlags(id)).mine.openFlags.find((f: any) => f.kind === 'overdue-check');
    expect(overdue).toBeDefined();
    // The unit's other infants go overdue meanwhile too: compare at this instant, before and after the entry.
    const withOverdue = await report(today(), today());
    await ward.chart(id, { probe: 36.8, remote: 36.9 }, t0 + 115 * MIN);
    const views = await expectViewsMatchModel(id);
    for (const v of views) expect({ view: v.view, kinds: kindsIn(v) }).toEqual({ view: v.view, kinds: [] });
    const sheet = (await summaryFlags(id)).sheet;
    expect(sheet.flags.find((f: any) => f.id === overdue.id)).toMatchObject({ status: 'withdrawn', withdrawn: { reason: expect.any(String) } });
    const queue = (await ward.ok('educator', 'get', `/review/queue?infantId=${id}`)).body.items;
    const item = queue.find((i: any) => i.flagId === overdue.id);
    if (item) expect(item).toMatchObject({ withdrawn: expect.anything() });
    expect(JSON.stringify(queue)).not.toMatch(/min(utes)? late/);
    const after = await report(today(), today());
    expect(lateOf(after) - lateOf(before)).toBe(0);
    expect(overdueFlagsOf(after)).toBeLessThanOrEqual(overdueFlagsOf(withOverdue));
  });

  it("changing the interval 120 → 90 or the time zone leaves last week's figures unchanged, and reports mark the change (common practice)", async () => {
    const id = await admit();
    const day = today();
    // Checks 100 and 110 min apart: on time at 120, and some would be late at 90.
    for (let i = 0; i < 8; i += 1) {
      await ward.chart(id, { probe: 36.8, remote: 36.8 });
      ward.advance(i % 2 ? 100 : 110);
    }
    ward.advance(24 * 60);
    const before = await report(day, day);
    await ward.setCheckInterval(90);
    const changedAt = ward.now();
    expect((await report(day, day)).onTime).toEqual(before.onTime);
    ward.advance(1);
    await ward.ok('admin', 'patch', `/admin/units/${UNIT}`, { timeZone: 'America/New_York' });
    expect((await report(day, day)).onTime).toEqual(before.onTime);
    ward.advance(1);
    await ward.ok('admin', 'patch', `/admin/units/${UNIT}`, { timeZone: 'Europe/London' });
    await ward.setCheckInterval(120);
    const spanning = await report(day, today());
    const marks = JSON.stringify(Object.entries(spanning).filter(([k]) => /setting|polic/i.test(k)));
    expect(marks).toContain(new Date(changedAt).toISOString().slice(0, 16));
  });

  it('cold stress is in the review queue, the reports and the weekly digest (WHO 1997 via Miller 2011: 36.0–36.4 °C)', async () => {
    const id = await admit();
    const day = today();
    const res = await ward.chart(id, { probe: 36.4, remote: 36.2 });
    const cold = res.body.openFlags.find((f: any) => f.kind === 'cold-stress');
    expect(cold).toMatchObject({ severity: 'caution' });
    expect(cold.band ?? cold.detail.band).toBe('cold-stress');
    await expectViewsMatchModel(id);
    const queue = (await ward.ok('educator', 'get', `/review/queue?infantId=${id}`)).body.items;
    expect(queue.map((i: any) => i.flagId)).toContain(cold.id);
    const r = await report(day, day);
    expect(r.responseTimes.find((x: any) => x.kind === 'cold-stress')?.flags).toBeGreaterThanOrEqual(1);
    ward.advance(2 * 24 * 60);
    env.mailer.sent = [];
    await sendWeeklyDigests(env.app.context, env.clock.now(), { unitIds: [UNIT], force: true });
    expect(env.mailer.sent.map((m) => m.text).join('\n')).toMatch(/cold stress/i);
  });
});
