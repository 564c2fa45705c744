import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Records1764617000000 implements MigrationInterface {
  name = 'Records1764617000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "records" ("id" varchar PRIMARY KEY NOT NULL, "siteId" varchar NOT NULL, "wellId" varchar NOT NULL, "testType" varchar(16) NOT NULL, "source" varchar(8) NOT NULL, "reference" varchar(16) NOT NULL, "settings" text NOT NULL, "testDate" varchar(10), "clock" varchar(8) NOT NULL, "firstReadingSeconds" real NOT NULL, "testStartSeconds" real NOT NULL, "testStartIndex" integer NOT NULL, "testStartSource" varchar(8) NOT NULL, "durationSeconds" real NOT NULL, "fieldCrew" varchar(200) NOT NULL DEFAULT (''), "notes" text NOT NULL DEFAULT (''), "sampleCount" integer NOT NULL, "h0M" real NOT NULL, "staticLevelM" real NOT NULL, "staticSource" varchar(8) NOT NULL, "preTestCount" integer NOT NULL, "direction" varchar(16) NOT NULL, "slugVolumeM3" real, "createdById" varchar, "isDemo" boolean NOT NULL DEFAULT (0), "createdAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_59d7a2ad31fd87143821937286c" FOREIGN KEY ("siteId") REFERENCES "sites" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_4c5460e89c4ded1ffc9b80aded2" FOREIGN KEY ("wellId") REFERENCES "wells" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_8ba8ff09a3de183a4e9d04a9f2c" FOREIGN KEY ("createdById") REFERENCES "users" ("id") ON DELETE SET NULL ON UPDATE NO ACTION)`);
    await q.query(`CREATE INDEX "IDX_4c5460e89c4ded1ffc9b80aded" ON "records" ("wellId") `);
    await q.query(`CREATE TABLE "record_files" ("id" varchar PRIMARY KEY NOT NULL, "recordId" varchar NOT NULL, "role" varchar(16) NOT NULL, "name" varchar(255) NOT NULL, "mediaType" varchar(120) NOT NULL, "sizeBytes" integer NOT NULL, "sha256" varchar(64) NOT NULL, "content" blob NOT NULL, CONSTRAINT "FK_10f4fcff29e6fe3cd3a4c1f3b73" FOREIGN KEY ("recordId") REFERENCES "records" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`);
    await q.query(`CREATE UNIQUE INDEX "IDX_7814740f202f6156ff3b435db5" ON "record_files" ("recordId", "role") `);
    await q.query(`CREATE TABLE "record_series" ("recordId" varchar PRIMARY KEY NOT NULL, "count" integer NOT NULL, "elapsedSeconds" blob NOT NULL, "displacementM" blob NOT NULL, "normalizedHead" blob NOT NULL, CONSTRAINT "FK_590d99a7462ec0129eb7a48fa2b" FOREIGN KEY ("recordId") REFERENCES "records" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "record_series"`);
    await q.query(`DROP INDEX "IDX_7814740f202f6156ff3b435db5"`);
    await q.query(`DROP TABLE "record_files"`);
    await q.query(`DROP INDEX "IDX_4c5460e89c4ded1ffc9b80aded"`);
    await q.query(`DROP TABLE "records"`);
  }
}
