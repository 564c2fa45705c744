import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Wells1764616000000 implements MigrationInterface {
  name = 'Wells1764616000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "wells" ("id" varchar PRIMARY KEY NOT NULL, "siteId" varchar NOT NULL, "name" varchar(80) NOT NULL, "inputEpsg" integer NOT NULL, "inputX" real NOT NULL, "inputY" real NOT NULL, "lon" real NOT NULL, "lat" real NOT NULL, "siteX" real NOT NULL, "siteY" real NOT NULL, "groundElevationM" real NOT NULL, "measuringPointElevationM" real NOT NULL, "screenTopDepthM" real NOT NULL, "screenBottomDepthM" real NOT NULL, "screenTopElevationM" real NOT NULL, "screenBottomElevationM" real NOT NULL, "casingRadiusM" real NOT NULL, "screenRadiusM" real NOT NULL, "boreholeRadiusM" real NOT NULL, "filterPackPorosity" real, "hydroUnit" varchar(80), "aquiferCondition" varchar(16) NOT NULL, "saturatedThicknessM" real, "staticWaterDepthM" real, "staticToScreenBottomM" real, "status" varchar(16) NOT NULL, "notes" text NOT NULL DEFAULT (''), "isDemo" boolean NOT NULL DEFAULT (0), "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "updatedAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_5b02dc2b5b543d9e7babf052fec" FOREIGN KEY ("siteId") REFERENCES "sites" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`);
    await q.query(`CREATE UNIQUE INDEX "IDX_577a523ef32bb908b29fc3e6ac" ON "wells" ("siteId", "name") `);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX "IDX_577a523ef32bb908b29fc3e6ac"`);
    await q.query(`DROP TABLE "wells"`);
  }
}
