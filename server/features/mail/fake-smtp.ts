import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { DataSource } from 'typeorm';
import { LocalMail } from './local-mail.entity';

export interface FakeSmtp {
  port: number;
  close(): Promise<void>;
}

const addresses = (a: AddressObject | AddressObject[] | undefined): string[] =>
  (Array.isArray(a) ? a : a ? [a] : []).flatMap((o) => o.value.map((v) => v.address ?? '')).filter(Boolean);

/**
 * A local SMTP service that accepts every message and keeps it in the local mailbox table, so
 * invitations and password resets work on a machine with no mail service (the Admin outbox shows
 * what Kfield sent and whether it was delivered). Listens on loopback only.
 */
export async function startFakeSmtp(ds: DataSource, port: number, host = '127.0.0.1'): Promise<FakeSmtp> {
  const repo = ds.getRepository(LocalMail);
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    banner: 'Kfield local mail service',
    logger: false,
    // Loopback only: a reverse DNS look-up of 127.0.0.1 only adds delay on a machine with no network.
    disableReverseLookup: true,
    size: 5 * 1024 * 1024,
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((parsed) =>
          repo.save(
            repo.create({
              fromAddress: parsed.from?.text ?? '',
              toAddresses: addresses(parsed.to),
              subject: parsed.subject ?? '(no subject)',
              text: parsed.text ?? '',
              html: typeof parsed.html === 'string' ? parsed.html : null,
              receivedAt: new Date(),
            }),
          ),
        )
        .then(() => callback())
        .catch((e: Error) => callback(e));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve());
  });
  const address = server.server.address();
  const actualPort = typeof address === 'object' && address ? address.port : port;
  return {
    port: actualPort,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
