import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Foundation1764615600000 implements MigrationInterface {
  name = 'Foundation1764615600000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "users" ("id" varchar PRIMARY KEY NOT NULL, "email" varchar(254) NOT NULL, "name" varchar(120) NOT NULL, "passwordHash" varchar(100) NOT NULL, "isAdmin" boolean NOT NULL DEFAULT (0), "disabled" boolean NOT NULL DEFAULT (0), "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "lastSignInAt" datetime)`);
    await q.query(`CREATE UNIQUE INDEX "IDX_97672ac88f789774dd47f7c8be" ON "users" ("email") `);
    await q.query(`CREATE TABLE "sessions" ("sid" varchar(128) PRIMARY KEY NOT NULL, "data" text NOT NULL, "expiresAtMs" integer NOT NULL, "userId" varchar, "createdAt" datetime NOT NULL DEFAULT (datetime('now')))`);
    await q.query(`CREATE INDEX "IDX_f49d0ae1c9396960c5007ee328" ON "sessions" ("expiresAtMs") `);
    await q.query(`CREATE INDEX "IDX_57de40bc620f456c7311aa3a1e" ON "sessions" ("userId") `);
    await q.query(`CREATE TABLE "sites" ("id" varchar PRIMARY KEY NOT NULL, "name" varchar(120) NOT NULL, "description" text NOT NULL DEFAULT (''), "epsgCode" integer NOT NULL, "crsName" varchar(200) NOT NULL, "displayUnits" varchar(8) NOT NULL, "hydroUnits" text NOT NULL, "isDemo" boolean NOT NULL DEFAULT (0), "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "updatedAt" datetime NOT NULL DEFAULT (datetime('now')))`);
    await q.query(`CREATE TABLE "memberships" ("siteId" varchar NOT NULL, "userId" varchar NOT NULL, "role" varchar(16) NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_8bc39d5d9eb215de7248f381e1a" FOREIGN KEY ("siteId") REFERENCES "sites" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_187d573e43b2c2aa3960df20b78" FOREIGN KEY ("userId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, PRIMARY KEY ("siteId", "userId"))`);
    await q.query(`CREATE TABLE "invitations" ("id" varchar PRIMARY KEY NOT NULL, "siteId" varchar NOT NULL, "email" varchar(254) NOT NULL, "role" varchar(16) NOT NULL, "tokenHash" varchar(64) NOT NULL, "invitedById" varchar NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "expiresAt" datetime NOT NULL, "usedAt" datetime, "revokedAt" datetime, CONSTRAINT "FK_111bacd3c2f53b5b589519c0e03" FOREIGN KEY ("siteId") REFERENCES "sites" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_b60325e5302be0dad38b423314c" FOREIGN KEY ("invitedById") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`);
    await q.query(`CREATE UNIQUE INDEX "IDX_a6eb6f2543de8a5a4c148b32a1" ON "invitations" ("tokenHash") `);
    await q.query(`CREATE TABLE "password_resets" ("id" varchar PRIMARY KEY NOT NULL, "userId" varchar NOT NULL, "tokenHash" varchar(64) NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "expiresAt" datetime NOT NULL, "usedAt" datetime, CONSTRAINT "FK_d95569f623f28a0bf034a55099e" FOREIGN KEY ("userId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`);
    await q.query(`CREATE UNIQUE INDEX "IDX_7f6aae0fcc807c9e7194ca5cc4" ON "password_resets" ("tokenHash") `);
    await q.query(`CREATE TABLE "outbox_messages" ("id" varchar PRIMARY KEY NOT NULL, "fromAddress" varchar(400) NOT NULL, "toAddresses" text NOT NULL, "subject" varchar(500) NOT NULL, "text" text NOT NULL, "html" text, "receivedAt" datetime NOT NULL DEFAULT (datetime('now')))`);
  }

  async down(q: QueryRunner): Promise<void> {
    for (const t of ['outbox_messages', 'password_resets', 'invitations', 'memberships', 'sites', 'sessions', 'users']) {
      await q.query(`DROP TABLE "${t}"`);
    }
  }
}
