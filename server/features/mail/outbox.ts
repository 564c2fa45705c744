import type { DataSource, EntityManager } from 'typeorm';
import { In, LessThanOrEqual } from 'typeorm';
import type { MailKind } from '@shared/schemas/users';
import { outsideTransaction } from '../../db/serialize';
import type { Mailer, OutgoingMail } from './mailer';
import { OutboxMessage } from './outbox-message.entity';

export interface QueuedMail extends OutgoingMail {
  kind: MailKind;
}

/** What services see: put a message in the outbox inside their own transaction. */
export interface Outbox {
  queue(m: EntityManager, mail: QueuedMail): Promise<void>;
}

export interface MailWorker extends Outbox {
  /** Look for due messages now (after a commit); cheap to call often. */
  kick(): void;
  /** Wait until no message is pending and due, or the time is up (tests, shutdown). */
  drain(timeoutMs?: number): Promise<void>;
  /** Put a failed message back in the queue, due now. */
  retry(id: string): Promise<boolean>;
  stop(): Promise<void>;
}

export interface MailWorkerOptions {
  log?: (msg: string, e?: unknown) => void;
  /** First retry after this long; each later one waits twice as long, up to maxDelayMs. */
  retryBaseMs?: number;
  maxDelayMs?: number;
  /** Attempts before a message is marked failed (an Admin can retry it). */
  maxAttempts?: number;
  /** How often the worker looks for due retries without being kicked. */
  pollMs?: number;
}

/** A message queued where no mail should go (the demo seed's fits). */
export const discardingOutbox: Outbox = { queue: async () => undefined };

export const retryDelayMs = (attempts: number, baseMs: number, maxMs: number) => Math.min(maxMs, baseMs * 2 ** Math.max(0, attempts - 1));

/**
 * The transactional outbox's worker. Messages are written by the services in the transaction of
 * the change they announce; this delivers them after the commit, one at a time, outside any
 * transaction, with retries and exponential backoff. A message is claimed (pending → sending) by a
 * single UPDATE before it is handed to the relay, so it is sent once per claim; a process that dies
 * between the relay's acceptance and the 'sent' mark re-sends it after restart (at least once), and
 * the message carries its outbox id as Message-ID so that a receiver can tell a repeat.
 */
export function createMailWorker(ds: DataSource, transport: Mailer, opts: MailWorkerOptions = {}): MailWorker {
  const log = opts.log ?? ((m, e) => console.error(m, e ?? ''));
  const retryBaseMs = opts.retryBaseMs ?? 5_000;
  const maxDelayMs = opts.maxDelayMs ?? 15 * 60_000;
  const maxAttempts = opts.maxAttempts ?? 8;
  const repo = ds.getRepository(OutboxMessage);
  let running: Promise<void> | null = null;
  let again = false;
  let stopped = false;

  async function deliver(row: OutboxMessage): Promise<void> {
    const claimed = await repo.update({ id: row.id, status: 'pending' }, { status: 'sending' });
    if (!claimed.affected) return;
    const attempts = row.attempts + 1;
    try {
      await transport.send({ to: row.toAddresses, subject: row.subject, text: row.text, html: row.html ?? undefined, messageId: `<${row.id}@kfield.outbox>` });
      await repo.update({ id: row.id }, { status: 'sent', attempts, sentAt: new Date(), lastError: null });
    } catch (e) {
      const lastError = ((e as Error).message ?? String(e)).slice(0, 1000);
      const failed = attempts >= maxAttempts;
      await repo.update(
        { id: row.id },
        { status: failed ? 'failed' : 'pending', attempts, lastError, nextAttemptAt: new Date(Date.now() + retryDelayMs(attempts, retryBaseMs, maxDelayMs)) },
      );
      if (failed) log(`mail: giving up on message ${row.id} after ${attempts} attempts`, lastError);
    }
  }

  async function pass(): Promise<void> {
    for (;;) {
      if (stopped) return;
      const due = await repo.find({ where: { status: 'pending', nextAttemptAt: LessThanOrEqual(new Date()) }, order: { createdAt: 'ASC' }, take: 20 });
      if (!due.length) return;
      for (const row of due) {
        if (stopped) return;
        await deliver(row);
      }
    }
  }

  function kick(): void {
    if (stopped) return;
    if (running) {
      again = true;
      return;
    }
    // Never inside the caller's transaction: the worker reads only what has been committed.
    running = outsideTransaction(() =>
      pass()
        .catch((e) => log('mail: the outbox worker failed; it tries again shortly', e))
        .finally(() => {
          running = null;
          if (again) {
            again = false;
            setImmediate(kick);
          }
        }),
    );
  }

  // Messages left 'sending' by a process that stopped mid-delivery go back in the queue.
  void outsideTransaction(() => repo.update({ status: 'sending' }, { status: 'pending', nextAttemptAt: new Date() }))
    .then(kick)
    .catch((e) => log('mail: could not requeue interrupted messages', e));
  const timer = setInterval(kick, opts.pollMs ?? 2_000);
  timer.unref();

  return {
    async queue(m, mail) {
      const now = new Date();
      const to = Array.isArray(mail.to) ? mail.to : [mail.to];
      await m.getRepository(OutboxMessage).insert({
        kind: mail.kind, toAddresses: to, subject: mail.subject, text: mail.text, html: mail.html ?? null,
        status: 'pending', attempts: 0, nextAttemptAt: now, lastError: null, createdAt: now, sentAt: null,
      });
      // Runs after the caller's transaction: the worker waits for the connection like anyone else.
      setImmediate(kick);
    },
    kick,
    async drain(timeoutMs = 10_000) {
      const until = Date.now() + timeoutMs;
      for (;;) {
        kick();
        if (running) await running;
        const left = await repo.count({ where: { status: In(['pending', 'sending']), nextAttemptAt: LessThanOrEqual(new Date()) } });
        if (!left && !running) return;
        if (Date.now() > until) throw new Error(`mail: ${left} message(s) still due after ${timeoutMs} ms`);
        await new Promise((r) => setTimeout(r, 20));
      }
    },
    async retry(id) {
      const r = await repo.update({ id, status: 'failed' }, { status: 'pending', nextAttemptAt: new Date(), attempts: 0 });
      kick();
      return Boolean(r.affected);
    },
    async stop() {
      stopped = true;
      clearInterval(timer);
      if (running) await running;
    },
  };
}
