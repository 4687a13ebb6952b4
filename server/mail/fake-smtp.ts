import { simpleParser } from 'mailparser';
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import type { Database_ } from '../../db/client';
import { caughtMail } from '../../db/schema';
import { SENT_BY_HEADER } from './mailer';

export interface FakeSmtp {
  port: number;
  close(): Promise<void>;
}

/**
 * A real SMTP server on loopback that keeps every message it receives in the caught_mail
 * table, where each person's mailbox page reads the mail addressed to them (the demo only).
 * Nothing leaves the machine.
 */
export async function startFakeSmtp(database: Database_, port: number, host = '127.0.0.1'): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    banner: 'Warmfold local mail catcher',
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          const to = session.envelope.rcptTo.map((r) => r.address).join(', ');
          const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : '';
          const sentBy = mail.headers.get(SENT_BY_HEADER.toLowerCase());
          database.db
            .insert(caughtMail)
            .values({
              receivedAt: new Date(),
              from,
              to,
              subject: mail.subject ?? '',
              text: mail.text ?? '',
              html: typeof mail.html === 'string' ? mail.html : null,
              sentBy: typeof sentBy === 'string' ? sentBy : null,
            })
            .run();
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve());
  });
  const address = server.server.address() as AddressInfo;
  return {
    port: address.port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
