import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Viewer links: read-only, revocable, expiring links to a site's K map; only the token's SHA-256 is stored. */
export class ViewerLinks1764624000000 implements MigrationInterface {
  name = 'ViewerLinks1764624000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "viewer_links" ("id" varchar PRIMARY KEY NOT NULL, "siteId" varchar NOT NULL, "tokenHash" varchar(64) NOT NULL, "label" varchar(120) NOT NULL, "layers" text NOT NULL, "showNames" boolean NOT NULL, "showConstruction" boolean NOT NULL, "createdById" varchar NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "expiresAt" datetime NOT NULL, "revokedAt" datetime, "lastViewedAt" datetime, "viewCount" integer NOT NULL DEFAULT (0), CONSTRAINT "FK_a06657a95a95c9a60dd373ac67b" FOREIGN KEY ("siteId") REFERENCES "sites" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`);
    await q.query(`CREATE UNIQUE INDEX "IDX_viewer_links_token_hash" ON "viewer_links" ("tokenHash") `);
    await q.query(`CREATE INDEX "IDX_viewer_links_site" ON "viewer_links" ("siteId", "createdAt") `);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "viewer_links"`);
  }
}
