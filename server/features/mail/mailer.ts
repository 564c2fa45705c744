import nodemailer from 'nodemailer';
import { AppError } from '../../lib/errors';

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
  /** The outbox id, so that a receiver can tell a repeated delivery. */
  messageId?: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  close(): void;
}

export interface SmtpSettings {
  host: string;
  port: number;
  secure: boolean;
  user?: string;
  password?: string;
  from: string;
}

export function createMailer(s: SmtpSettings): Mailer {
  const transport = nodemailer.createTransport({
    host: s.host,
    port: s.port,
    secure: s.secure,
    auth: s.user ? { user: s.user, pass: s.password ?? '' } : undefined,
    // The local fake service speaks plain SMTP on loopback.
    ignoreTLS: !s.secure && (s.host === '127.0.0.1' || s.host === 'localhost'),
    // One kept-open connection: a new SMTP session per message costs ~100 ms even on loopback.
    pool: true,
    maxConnections: 1,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    // A relay that holds a message this long is treated as a failure; the outbox retries later.
    socketTimeout: 60_000,
  });
  return {
    async send(mail) {
      try {
        await transport.sendMail({ from: s.from, ...mail });
      } catch (e) {
        throw new AppError('MAIL_UNAVAILABLE', `The mail relay did not accept the message: ${(e as Error).message}`, 503);
      }
    },
    close: () => transport.close(),
  };
}
