import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Plume outlines (WGS84 GeoJSON) and capture sketches (inputs and the server's results), both per site. */
export class OutlinesSketches1764623000000 implements MigrationInterface {
  name = 'OutlinesSketches1764623000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "outlines" ("id" varchar PRIMARY KEY NOT NULL, "siteId" varchar NOT NULL, "name" varchar(120) NOT NULL, "geometry" text NOT NULL, "areaM2" real NOT NULL, "createdById" varchar NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "updatedAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_ffd8498189b2d34dc3fa8a06b97" FOREIGN KEY ("siteId") REFERENCES "sites" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`);
    await q.query(`CREATE INDEX "IDX_outlines_site" ON "outlines" ("siteId", "createdAt") `);
    await q.query(`CREATE TABLE "capture_sketches" ("id" varchar PRIMARY KEY NOT NULL, "siteId" varchar NOT NULL, "name" varchar(120) NOT NULL, "x" real NOT NULL, "y" real NOT NULL, "lon" real NOT NULL, "lat" real NOT NULL, "inputs" text NOT NULL, "results" text NOT NULL, "createdById" varchar NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_a8b9e6c6962d2afc5568e201eb4" FOREIGN KEY ("siteId") REFERENCES "sites" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`);
    await q.query(`CREATE INDEX "IDX_capture_sketches_site" ON "capture_sketches" ("siteId", "createdAt") `);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "capture_sketches"`);
    await q.query(`DROP TABLE "outlines"`);
  }
}
