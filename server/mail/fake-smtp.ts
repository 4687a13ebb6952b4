import { simpleParser } from 'mailparser';
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import type { Database_ } from '../../db/client';

export interface FakeSmtp {
  port: number;
  close(): Promise<void>;
}

/**
 * A real SMTP server on loopback that keeps every message it receives in the caught_mail
 * table, where the admin's mailbox page reads it. Nothing leaves the machine.
 */
export async function startFakeSmtp(database: Database_, port: number, host = '127.0.0.1'): Promise<FakeSmtp> {
  const insert = database.sqlite.prepare(
    'INSERT INTO caught_mail (received_at, from_address, to_addresses, subject, text_body, html_body) VALUES (?, ?, ?, ?, ?, ?)',
  );
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
          insert.run(Date.now(), from, to, mail.subject ?? '', mail.text ?? '', typeof mail.html === 'string' ? mail.html : null);
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
