import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Fits1764619000000 implements MigrationInterface {
  name = 'Fits1764619000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "fits" ("id" varchar PRIMARY KEY NOT NULL, "siteId" varchar NOT NULL, "wellId" varchar NOT NULL, "recordId" varchar NOT NULL, "chainId" varchar NOT NULL, "revision" integer NOT NULL, "status" varchar(16) NOT NULL, "supersededAt" datetime, "method" varchar(16) NOT NULL, "line" varchar(16) NOT NULL, "windowInput" text, "geometry" text NOT NULL, "options" text NOT NULL, "note" text NOT NULL DEFAULT (''), "result" text NOT NULL, "flags" text NOT NULL, "kMetersPerSecond" real NOT NULL, "preparedById" varchar NOT NULL, "checkedById" varchar, "checkComment" text, "submittedAt" datetime, "checkedAt" datetime, "createdAt" datetime NOT NULL, "updatedAt" datetime NOT NULL, CONSTRAINT "FK_cd470745e731dec92f5440d1f92" FOREIGN KEY ("recordId") REFERENCES "records" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_3e4300dc7ecf572f2193400ba2e" FOREIGN KEY ("preparedById") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, CONSTRAINT "FK_7f37c7b4f79ddd30d7e067e3f34" FOREIGN KEY ("checkedById") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`);
    await q.query(`CREATE INDEX "IDX_82187353c06da00407988f5654" ON "fits" ("chainId") `);
    await q.query(`CREATE INDEX "IDX_c7333aba27729b3db4609d7980" ON "fits" ("siteId", "status") `);
    await q.query(`CREATE INDEX "IDX_8aff691199756170ac3c7aeac6" ON "fits" ("wellId", "status") `);
    await q.query(`CREATE INDEX "IDX_cd470745e731dec92f5440d1f9" ON "fits" ("recordId") `);
    await q.query(`CREATE TABLE "fit_events" ("id" varchar PRIMARY KEY NOT NULL, "fitId" varchar NOT NULL, "kind" varchar(24) NOT NULL, "actorId" varchar, "at" datetime NOT NULL, "details" text NOT NULL, CONSTRAINT "FK_7e0a2b62e812e4f0ebbee12b895" FOREIGN KEY ("fitId") REFERENCES "fits" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_ee840054b01fbcdad51779c38e9" FOREIGN KEY ("actorId") REFERENCES "users" ("id") ON DELETE SET NULL ON UPDATE NO ACTION)`);
    await q.query(`CREATE INDEX "IDX_0e55f46dfe11cd91362f3ba178" ON "fit_events" ("fitId", "at") `);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "fit_events"`);
    await q.query(`DROP TABLE "fits"`);
  }
}
