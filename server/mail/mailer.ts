import nodemailer from 'nodemailer';

export interface MailMessage {
  to: string[];
  subject: string;
  text: string;
  html?: string;
}

export interface Mailer {
  send(message: MailMessage): Promise<void>;
  close(): void;
}

/** Sends through any SMTP server: the local fake one by default, the hospital's relay in production. */
export function smtpMailer(options: { host: string; port: number; from: string; user?: string; pass?: string }): Mailer {
  const transport = nodemailer.createTransport({
    host: options.host,
    port: options.port,
    secure: false,
    ignoreTLS: options.host === '127.0.0.1' || options.host === 'localhost',
    auth: options.user ? { user: options.user, pass: options.pass ?? '' } : undefined,
  });
  return {
    async send(message) {
      await transport.sendMail({ from: options.from, to: message.to.join(', '), subject: message.subject, text: message.text, html: message.html });
    },
    close() {
      transport.close();
    },
  };
}
