import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The intake radius lives on the well (decision 012). Existing wells with a filter pack (borehole
 * radius larger than the screen's) take the borehole; stored fits keep their own geometry and K.
 * Bouwer-Rice fits always used the borehole radius as rw, whatever their stored `intake` said, so
 * their stored geometry is made to say so (their K does not change).
 */
export class WellIntakeRadius1764625000000 implements MigrationInterface {
  name = 'WellIntakeRadius1764625000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "wells" ADD COLUMN "intakeRadius" varchar(16) NOT NULL DEFAULT ('screen')`);
    await q.query(`UPDATE "wells" SET "intakeRadius" = 'borehole' WHERE "boreholeRadiusM" > "screenRadiusM"`);
    await q.query(
      `UPDATE "fits" SET "geometry" = json_set("geometry", '$.intake', 'borehole')
       WHERE "method" = 'bouwer-rice' AND json_extract("geometry", '$.boreholeRadiusM') > json_extract("geometry", '$.screenRadiusM')`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    // The Bouwer-Rice fits' `intake: 'borehole'` stays: it is what their K was computed with.
    await q.query(`ALTER TABLE "wells" DROP COLUMN "intakeRadius"`);
  }
}
