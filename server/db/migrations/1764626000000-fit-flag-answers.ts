import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Answers to the flags that change K: the analyst's reason per flag code, and the flags resolved by
 * applying their suggested action (kept so the fit says what was resolved, and how).
 */
export class FitFlagAnswers1764626000000 implements MigrationInterface {
  name = 'FitFlagAnswers1764626000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "fits" ADD COLUMN "flagReasons" text NOT NULL DEFAULT ('{}')`);
    await q.query(`ALTER TABLE "fits" ADD COLUMN "resolvedFlags" text NOT NULL DEFAULT ('[]')`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "fits" DROP COLUMN "resolvedFlags"`);
    await q.query(`ALTER TABLE "fits" DROP COLUMN "flagReasons"`);
  }
}
