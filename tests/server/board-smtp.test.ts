import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp';
import { smtpMailer, type Mailer } from '../../server/mail/mailer';
import { runEscalations } from '../../server/services/escalations';
import { DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let fake: FakeSmtp;
let mailer: Mailer;

beforeAll(async () => {
  env = await makeEnv();
  fake = await startFakeSmtp(env.database, 0);
  mailer = smtpMailer({ host: '127.0.0.1', port: fake.port, from: 'Warmfold <warmfold@localhost>' });
  env.app.context.mailer = mailer;
});
afterAll(async () => {
  mailer.close();
  await fake.close();
  env.close();
});

async function caught(expected: number): Promise<{ to_addresses: string; subject: string; text_body: string }[]> {
  for (let i = 0; i < 50; i++) {
    const rows = env.database.sqlite.prepare('SELECT to_addresses, subject, text_body FROM caught_mail ORDER BY id').all() as {
      to_addresses: string;
      subject: string;
      text_body: string;
    }[];
    if (rows.length >= expected) return rows;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error('mail did not arrive');
}

it('sends the escalation e-mail through real SMTP to the local catcher, once', async () => {
  const run = await runEscalations(env.app.context, env.clock.now());
  expect(run.mailed).toHaveLength(2);
  const rows = await caught(2);
  const overdue = rows.find((r) => r.subject.includes('N02'))!;
  expect(overdue.to_addresses).toBe(DEMO.charge);
  expect(overdue.subject).toBe('Warmfold escalation: bed N02, remote-site check overdue');
  expect(overdue.text_body).toContain('Baby Brightwater');
  expect(overdue.text_body).toContain('/board');

  await runEscalations(env.app.context, env.clock.now());
  await new Promise((r) => setTimeout(r, 200));
  expect(await caught(2)).toHaveLength(2);
});
