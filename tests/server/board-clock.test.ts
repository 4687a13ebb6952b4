import request from 'supertest';
import { runEscalations } from '../../server/services/escalations';
import type { BoardResponse } from '../../shared/types/board';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let token: string;
beforeAll(async () => {
  env = await makeEnv();
  token = await env.signIn(DEMO.charge);
});
afterAll(() => env.close());

const board = async () => {
  const res = await request(env.app).get('/api/units/unit-north/board').set('Authorization', `Bearer ${token}`);
  expect(res.status).toBe(200);
  return res.body as BoardResponse;
};
/** Mail to unit North's charge nurse (unit South has its own matters as time passes). */
const north = () => env.mailer.sent.filter((m) => m.to.includes(DEMO.charge));
const bed = (b: BoardResponse, label: string) => b.beds.find((x) => x.label === label)!;

describe('the board as time passes (fixed clock)', () => {
  it('escalates the demo gap and overdue check once, with one e-mail each, however often the job runs', async () => {
    const before = await board();
    expect(before.beds.slice(0, 2).map((b) => b.label)).toEqual(['N02', 'N01']);
    expect(bed(before, 'N06').tier).toBe(1);
    expect(bed(before, 'N06').infant!.nextCheck.status).toBe('due-soon');
    expect(before.beds.every((b) => b.escalations.length === 0)).toBe(true);

    const [a, b] = await Promise.all([runEscalations(env.app.context, env.clock.now()), runEscalations(env.app.context, env.clock.now())]);
    const again = await runEscalations(env.app.context, env.clock.now());
    expect(a.created.length + b.created.length + again.created.length).toBe(2);
    expect(env.mailer.sent).toHaveLength(2);
    expect(count(env.database, 'escalations')).toBe(2);
    for (const mail of env.mailer.sent) expect(mail.to).toEqual([DEMO.charge]);
    const subjects = env.mailer.sent.map((m) => m.subject).sort();
    expect(subjects).toEqual(['Warmfold escalation: bed N01, probe and remote site still apart', 'Warmfold escalation: bed N02, remote-site check overdue']);
    expect(env.mailer.sent.find((m) => m.subject.includes('N02'))!.text).toContain('Baby Brightwater');

    const after = await board();
    expect(bed(after, 'N02').escalations).toHaveLength(1);
    expect(bed(after, 'N02').escalations[0]!.mailedAt).not.toBeNull();
    expect(bed(after, 'N01').escalations[0]!.flagKind).toBe('gap');
  });

  it('moves a bed up when its check falls due, and escalates each matter only after the delay', async () => {
    // N06's check is due 10 minutes after the seed; N03's gap flag was raised 20 minutes before it.
    env.clock.advanceMinutes(11);
    let b = await board();
    expect(bed(b, 'N06').tier).toBe(0);
    expect(bed(b, 'N06').infant!.nextCheck.status).toBe('overdue');
    // Longest waiting first: N02 (overdue since -50), N01 (gap since -35), N03 (gap since -20),
    // N05 (manual mode beyond its 15-minute limit since -15: urgent, ECRI), N06 (due at +10).
    expect(b.beds.slice(0, 5).map((x) => x.label)).toEqual(['N02', 'N01', 'N03', 'N05', 'N06']);

    // N03's gap and heat-stress prompt are now 31 minutes old: both escalate (urgent, after the
    // unit's 30 minutes, from memory); N05's manual mode (26 minutes) and N06's overdue check
    // (1 minute) do not yet.
    const subjects = () => north().map((m) => m.subject);
    await runEscalations(env.app.context, env.clock.now());
    expect(subjects().slice(2)).toEqual(['Warmfold escalation: bed N03, probe and remote site still apart', 'Warmfold escalation: bed N03, heat stress']);
    expect(bed(await board(), 'N06').escalations).toHaveLength(0);

    // Exactly at the delay it waits; past it, it escalates, once.
    env.clock.advanceMinutes(29);
    await runEscalations(env.app.context, env.clock.now());
    expect(subjects().slice(4)).toEqual(['Warmfold escalation: bed N05, manual mode beyond its limit']);
    env.clock.advanceMinutes(1);
    await runEscalations(env.app.context, env.clock.now());
    await runEscalations(env.app.context, env.clock.now());
    expect(subjects().slice(5)).toEqual(['Warmfold escalation: bed N06, remote-site check overdue']);
    b = await board();
    expect(bed(b, 'N06').escalations).toHaveLength(1);
    expect(bed(b, 'N06').escalations[0]!.to.map((r) => r.email)).toEqual([DEMO.charge]);
    expect(env.database.sqlite.prepare("SELECT COUNT(*) AS n FROM escalations WHERE unit_id = 'unit-north'").get()).toEqual({ n: 6 });
  });

  it('lets a settled bed slide into "due soon" and then overdue', async () => {
    // N07 was checked 50 minutes before the seed: due at +70, due soon from +55. Now +41.
    let b = await board();
    expect(bed(b, 'N07').tier).toBe(2);
    env.clock.advanceMinutes(15);
    b = await board();
    expect(bed(b, 'N07').tier).toBe(1);
    env.clock.advanceMinutes(15);
    b = await board();
    expect(bed(b, 'N07').tier).toBe(0);
  });

  it('re-sends a mail that failed, and only that one', async () => {
    const failing = env.app.context.mailer;
    let calls = 0;
    env.app.context.mailer = {
      send: async () => {
        calls += 1;
        throw new Error('relay down');
      },
      close: () => {},
    };
    env.clock.advanceMinutes(31);
    const first = await runEscalations(env.app.context, env.clock.now());
    expect(first.created.length).toBeGreaterThan(0);
    expect(first.mailed).toHaveLength(0);
    expect(calls).toBe(first.created.length);
    env.app.context.mailer = failing;
    const sentBefore = env.mailer.sent.length;
    const second = await runEscalations(env.app.context, env.clock.now());
    expect(second.created).toHaveLength(0);
    expect(second.mailed).toHaveLength(first.created.length);
    expect(env.mailer.sent.length).toBe(sentBefore + first.created.length);
    await runEscalations(env.app.context, env.clock.now());
    expect(env.mailer.sent.length).toBe(sentBefore + first.created.length);
  });
});
