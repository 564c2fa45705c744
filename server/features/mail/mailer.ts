import nodemailer from 'nodemailer';
import { AppError } from '../../lib/errors';

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
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
    connectionTimeout: 10_000,
  });
  return {
    async send(mail) {
      try {
        await transport.sendMail({ from: s.from, ...mail });
      } catch (e) {
        throw new AppError(
          'MAIL_UNAVAILABLE',
          `The e-mail could not be sent (${(e as Error).message}); nothing was saved, try again later`,
          503,
        );
      }
    },
    close: () => transport.close(),
  };
}
