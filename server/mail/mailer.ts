import nodemailer from 'nodemailer';

export interface MailMessage {
  to: string[];
  subject: string;
  text: string;
  html?: string;
  /** The user whose action sent this (an admin's invitation); the demo's mailbox shows it to them without its links. */
  sentBy?: string | null;
}

export interface Mailer {
  send(message: MailMessage): Promise<void>;
  close(): void;
}

/** The header that carries `sentBy` to the local mail catcher; never added for a real relay. */
export const SENT_BY_HEADER = 'X-Warmfold-Sent-By';

/** Sends through any SMTP server: the local fake one in the demo, the hospital's relay in production. */
export function smtpMailer(options: { host: string; port: number; from: string; user?: string; pass?: string; markSender?: boolean }): Mailer {
  const transport = nodemailer.createTransport({
    host: options.host,
    port: options.port,
    secure: false,
    ignoreTLS: options.host === '127.0.0.1' || options.host === 'localhost',
    auth: options.user ? { user: options.user, pass: options.pass ?? '' } : undefined,
  });
  return {
    async send(message) {
      const headers = options.markSender && message.sentBy ? { [SENT_BY_HEADER]: message.sentBy } : undefined;
      await transport.sendMail({ from: options.from, to: message.to.join(', '), subject: message.subject, text: message.text, html: message.html, headers });
    },
    close() {
      transport.close();
    },
  };
}
