import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Basemaps1764618000000 implements MigrationInterface {
  name = 'Basemaps1764618000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "basemaps" ("id" varchar(36) PRIMARY KEY NOT NULL, "name" varchar(120) NOT NULL, "fileName" varchar(200) NOT NULL, "sizeBytes" integer NOT NULL, "metadata" text NOT NULL, "isDefault" boolean NOT NULL DEFAULT (0), "createdAt" datetime NOT NULL DEFAULT (datetime('now')))`);
    // A site's chosen basemap: "default" (the built-in one), an uploaded basemap's id, or null for the instance default.
    await q.query(`ALTER TABLE "sites" ADD COLUMN "basemapId" varchar(64)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "sites" DROP COLUMN "basemapId"`);
    await q.query(`DROP TABLE "basemaps"`);
  }
}
