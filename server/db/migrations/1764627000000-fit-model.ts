import type { MigrationInterface, QueryRunner } from 'typeorm';

/** The model a fit uses: the straight line (every fit so far) or the high-K model (docs/methods.md 6a). */
export class FitModel1764627000000 implements MigrationInterface {
  name = 'FitModel1764627000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "fits" ADD COLUMN "model" varchar(16) NOT NULL DEFAULT ('line')`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "fits" DROP COLUMN "model"`);
  }
}
