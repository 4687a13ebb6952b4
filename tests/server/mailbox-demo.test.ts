/**
 * The demo's mailbox, through the real local SMTP server: each person reads only the mail
 * addressed to them, and nobody reads a link that would let them act as someone else (the
 * takeover: an admin read a South nurse's reset link and charted as her). Common practice for
 * single-use account links: only the addressee can open them.
 */
import request from 'supertest';
import { createApp } from '../../server/app';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp';
import { smtpMailer, type Mailer } from '../../server/mail/mailer';
import { drainMailQueue } from '../../server/mail/queue';
import { mailboxView } from '../../server/routes/mailbox';
import { DEMO, makeEnv, type TestEnv } from './helpers';

const NEW_PASSWORD = 'lantern-over-the-quiet-ward';

let env: TestEnv;
let fake: FakeSmtp;
let mailer: Mailer;
const tokens: Record<string, string> = {};

beforeAll(async () => {
  env = await makeEnv();
  fake = await startFakeSmtp(env.database, 0);
  mailer = smtpMailer({ host: '127.0.0.1', port: fake.port, from: 'Warmfold <warmfold@localhost>', markSender: true });
  env.app.context.mailer = mailer;
  for (const who of ['nurse', 'charge', 'admin', 'southNurse'] as const) tokens[who] = await env.signIn(DEMO[who]);
});
afterAll(async () => {
  mailer.close();
  await fake.close();
  env.close();
});

async function caughtCount(expected: number): Promise<void> {
  for (let i = 0; i < 100; i++) {
    const { n } = env.database.sqlite.prepare('SELECT COUNT(*) AS n FROM caught_mail').get() as { n: number };
    if (n >= expected) return;
    await new Promise((r) => setTimeout(r, 30));
  }
  throw new Error(`expected ${expected} caught messages`);
}

const mailbox = async (who: string) => {
  const res = await request(env.app).get('/api/mailbox').set('Authorization', `Bearer ${tokens[who]}`);
  expect(res.status).toBe(200);
  return res.body.messages as { to: string; subject: string; text: string }[];
};
const linkIn = (text: string) => /\/reset-password\?token=([^\s]+)/.exec(text)?.[1];

it("an admin's reset of another person's password shows in his mailbox without the link; only she can follow it", async () => {
  const before = (env.database.sqlite.prepare('SELECT COUNT(*) AS n FROM caught_mail').get() as { n: number }).n;
  const reset = await request(env.app).post('/api/admin/users/u-nurse-3/password-reset').set('Authorization', `Bearer ${tokens.admin}`);
  expect(reset.status).toBe(202);
  await caughtCount(before + 1);

  const his = (await mailbox('admin')).filter((m) => m.to === DEMO.southNurse);
  expect(his).toHaveLength(1);
  expect(his[0]!.text).not.toMatch(/token=/);
  expect(his[0]!.text).toContain('link withheld');
  for (const who of ['nurse', 'charge']) expect((await mailbox(who)).some((m) => m.to === DEMO.southNurse)).toBe(false);

  const hers = (await mailbox('southNurse')).find((m) => m.subject === 'Reset your Warmfold password');
  const token = linkIn(hers!.text);
  expect(token).toBeDefined();
  expect(
    (
      await request(env.app)
        .post('/api/auth/password-reset')
        .send({ token: decodeURIComponent(token!), password: NEW_PASSWORD })
    ).status,
  ).toBe(204);
  // Her password changed, so her sessions ended; she signs in with the new one.
  tokens.southNurse = await env.signIn(DEMO.southNurse, NEW_PASSWORD);
});

it('a demo nurse who asks for a reset finds her own link in her own mailbox, and nobody else sees it', async () => {
  const before = (env.database.sqlite.prepare('SELECT COUNT(*) AS n FROM caught_mail').get() as { n: number }).n;
  expect((await request(env.app).post('/api/auth/password-reset/request').send({ email: DEMO.nurse })).status).toBe(202);
  await drainMailQueue(env.app.context);
  await caughtCount(before + 1);
  const hers = (await mailbox('nurse')).find((m) => m.subject === 'Reset your Warmfold password');
  expect(linkIn(hers!.text)).toBeDefined();
  for (const who of ['admin', 'charge', 'southNurse']) {
    const theirs = await mailbox(who);
    expect(theirs.some((m) => m.to === DEMO.nurse)).toBe(false);
    expect(theirs.some((m) => /token=/.test(m.text) && m.to !== DEMO[who as 'admin'])).toBe(false);
  }
});

it('a message to several people keeps its token links from every one of them', () => {
  const row = {
    id: 1,
    receivedAt: new Date(0),
    from: 'w@x.test',
    to: `${DEMO.nurse}, ${DEMO.charge}`,
    subject: 's',
    text: 'Open https://h.test/reset-password?token=abc123 now',
    html: null,
    sentBy: null,
  };
  const view = mailboxView(row, { userId: 'u-nurse', email: DEMO.nurse });
  expect(view!.text).not.toContain('abc123');
  expect(mailboxView(row, { userId: 'u-educator', email: DEMO.educator })).toBeNull();
  // A longer address that merely contains hers is not hers.
  expect(mailboxView({ ...row, to: `x${DEMO.nurse}` }, { userId: 'u-nurse', email: DEMO.nurse })).toBeNull();
});

it('anonymous callers get 401; the old admin route is gone', async () => {
  expect((await request(env.app).get('/api/mailbox')).status).toBe(401);
  expect((await request(env.app).get('/api/admin/mailbox').set('Authorization', `Bearer ${tokens.admin}`)).status).toBe(404);
});

it('a production app has no mailbox at all', async () => {
  const production = createApp({ db: env.database, mailer, clock: env.clock, config: { ...env.config, mode: 'production' }, log: () => {} });
  const token = await request(production).post('/api/auth/sign-in').send({ email: DEMO.admin, password: DEMO.password });
  expect(token.status).toBe(200);
  const res = await request(production).get('/api/mailbox').set('Authorization', `Bearer ${token.body.token}`);
  expect(res.status).toBe(404);
  expect((await request(production).get('/api/health')).body.mode).toBe('production');
});
