import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The transactional outbox (mail_outbox) and the mail-request log behind the mail limits. The old
 * outbox_messages table held what the local fake SMTP service received: it becomes local_mailbox.
 */
export class MailOutbox1764621000000 implements MigrationInterface {
  name = 'MailOutbox1764621000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "outbox_messages" RENAME TO "local_mailbox"`);
    await q.query(`CREATE TABLE "mail_outbox" ("id" varchar PRIMARY KEY NOT NULL, "kind" varchar(40) NOT NULL, "toAddresses" text NOT NULL, "subject" varchar(500) NOT NULL, "text" text NOT NULL, "html" text, "status" varchar(10) NOT NULL DEFAULT ('pending'), "attempts" integer NOT NULL DEFAULT (0), "nextAttemptAt" datetime NOT NULL, "lastError" text, "createdAt" datetime NOT NULL, "sentAt" datetime)`);
    await q.query(`CREATE INDEX "IDX_mail_outbox_due" ON "mail_outbox" ("status", "nextAttemptAt") `);
    await q.query(`CREATE TABLE "mail_requests" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "kind" varchar(40) NOT NULL, "targetKey" varchar(320) NOT NULL, "requestedById" varchar, "clientAddress" varchar(64), "mailed" boolean NOT NULL, "createdAt" datetime NOT NULL)`);
    await q.query(`CREATE INDEX "IDX_mail_requests_account" ON "mail_requests" ("kind", "requestedById", "createdAt") `);
    await q.query(`CREATE INDEX "IDX_mail_requests_client" ON "mail_requests" ("kind", "clientAddress", "createdAt") `);
    await q.query(`CREATE INDEX "IDX_mail_requests_target" ON "mail_requests" ("kind", "targetKey", "createdAt") `);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "mail_requests"`);
    await q.query(`DROP TABLE "mail_outbox"`);
    await q.query(`ALTER TABLE "local_mailbox" RENAME TO "outbox_messages"`);
  }
}
