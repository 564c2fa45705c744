import type { MigrationInterface, QueryRunner } from 'typeorm';

const bump = (site: string) =>
  `INSERT INTO "map_versions" ("siteId", "version") VALUES (${site}, 1) ON CONFLICT("siteId") DO UPDATE SET "version" = "version" + 1;`;

export class MapVersions1764620000000 implements MigrationInterface {
  name = 'MapVersions1764620000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "map_versions" ("siteId" varchar PRIMARY KEY NOT NULL, "version" integer NOT NULL DEFAULT (0))`);
    for (const table of ['wells', 'fits']) {
      await q.query(`CREATE TRIGGER "${table}_map_version_insert" AFTER INSERT ON "${table}" BEGIN ${bump('NEW."siteId"')} END`);
      await q.query(`CREATE TRIGGER "${table}_map_version_update" AFTER UPDATE ON "${table}" BEGIN ${bump('NEW."siteId"')} END`);
      await q.query(`CREATE TRIGGER "${table}_map_version_delete" AFTER DELETE ON "${table}" BEGIN ${bump('OLD."siteId"')} END`);
    }
  }

  async down(q: QueryRunner): Promise<void> {
    for (const table of ['wells', 'fits']) {
      for (const op of ['insert', 'update', 'delete']) await q.query(`DROP TRIGGER "${table}_map_version_${op}"`);
    }
    await q.query(`DROP TABLE "map_versions"`);
  }
}
